#include "qftplan/device/device_summary.hpp"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>
#include <utility>
#include <vector>

#include <fmt/format.h>

namespace qftplan {
namespace {

/// Up to this many qubits the diameter is exact (a search from every qubit); above it, the
/// double-sweep lower bound keeps summaries of 20k-qubit lattices fast.
constexpr int kExactDiameterQubits = 5000;

bool diameter_is_exact(int qubits) { return qubits <= kExactDiameterQubits; }

/// Breadth-first search with scratch arrays reused across calls (only touched entries are reset),
/// so many searches on small components of a big device stay cheap.
class Bfs {
 public:
  explicit Bfs(const Device& d) : d_(d), dist_(d.qubit_count(), -1) { queue_.reserve(d.qubit_count()); }

  /// Eccentricity of `source` within its component, and the last qubit reached (a farthest one).
  std::pair<int, int> run(int source) {
    queue_.clear();
    queue_.push_back(source);
    dist_[source] = 0;
    for (std::size_t head = 0; head < queue_.size(); ++head) {
      const int q = queue_[head];
      for (int nb : d_.neighbours(q))
        if (dist_[nb] < 0) {
          dist_[nb] = dist_[q] + 1;
          queue_.push_back(nb);
        }
    }
    const int far = queue_.back();
    const int ecc = dist_[far];
    for (int q : queue_) dist_[q] = -1;
    return {ecc, far};
  }

 private:
  const Device& d_;
  std::vector<int> dist_;
  std::vector<int> queue_;
};

/// Exact diameter for dense graphs: breadth-first search on bit sets, 64 qubits per word.
int dense_diameter(const Device& d) {
  const int n = d.qubit_count();
  const std::size_t words = (static_cast<std::size_t>(n) + 63) / 64;
  std::vector<std::uint64_t> adj(words * n, 0);
  for (int i = 0; i < d.coupler_count(); ++i) {
    if (!d.coupler_usable(i)) continue;
    const Coupler& c = d.couplers()[i];
    adj[c.a * words + c.b / 64] |= std::uint64_t{1} << (c.b % 64);
    adj[c.b * words + c.a / 64] |= std::uint64_t{1} << (c.a % 64);
  }
  std::vector<std::uint64_t> seen(words), frontier(words), next(words);
  int best = 0;
  for (int s = 0; s < n; ++s) {
    std::fill(seen.begin(), seen.end(), 0);
    std::fill(frontier.begin(), frontier.end(), 0);
    seen[s / 64] = frontier[s / 64] = std::uint64_t{1} << (s % 64);
    for (int depth = 0;; ++depth) {
      std::fill(next.begin(), next.end(), 0);
      for (std::size_t w = 0; w < words; ++w)
        for (std::uint64_t bits = frontier[w]; bits; bits &= bits - 1) {
          const std::size_t v = w * 64 + static_cast<std::size_t>(__builtin_ctzll(bits));
          const std::uint64_t* row = &adj[v * words];
          for (std::size_t k = 0; k < words; ++k) next[k] |= row[k];
        }
      bool any = false;
      for (std::size_t k = 0; k < words; ++k) {
        next[k] &= ~seen[k];
        seen[k] |= next[k];
        any = any || next[k];
      }
      if (!any) {
        best = std::max(best, depth);
        break;
      }
      std::swap(frontier, next);
    }
  }
  return best;
}

/// Largest hop distance within any component: exact up to kExactDiameterQubits, else the
/// double-sweep lower bound per component (search from one qubit, then from the farthest one found;
/// C. Magnien, M. Latapy, M. Habib, "Fast computation of empirically tight bounds for the diameter of
/// massive graphs", ACM J. Experimental Algorithmics 13, 2009 — reference from memory).
int diameter_value(const Device& d, const std::vector<int>& comp, int components) {
  const int n = d.qubit_count();
  const auto m = static_cast<std::int64_t>(d.usable_coupler_count());
  if (diameter_is_exact(n)) {
    // A bit-set search costs about n/64 words per reached qubit; a plain one about its degree.
    if (2 * m > std::int64_t{n} * n / 32) return dense_diameter(d);
    Bfs bfs(d);
    int best = 0;
    for (int s = 0; s < n; ++s) best = std::max(best, bfs.run(s).first);
    return best;
  }
  Bfs bfs(d);
  std::vector<bool> done(components, false);
  int best = 0;
  for (int q = 0; q < n; ++q) {
    if (done[comp[q]]) continue;
    done[comp[q]] = true;
    const int far = bfs.run(q).second;
    best = std::max(best, bfs.run(far).first);
  }
  return best;
}

bool is_bipartite(const Device& d) {
  std::vector<int> colour(d.qubit_count(), -1);
  std::vector<int> queue;
  for (int s = 0; s < d.qubit_count(); ++s) {
    if (colour[s] >= 0) continue;
    colour[s] = 0;
    queue.assign(1, s);
    for (std::size_t head = 0; head < queue.size(); ++head) {
      const int q = queue[head];
      for (int nb : d.neighbours(q)) {
        if (colour[nb] < 0) {
          colour[nb] = 1 - colour[q];
          queue.push_back(nb);
        } else if (colour[nb] == colour[q]) {
          return false;
        }
      }
    }
  }
  return true;
}

void widen(Range& r, double v, bool first) {
  if (first) r = {v, v};
  r.min = std::min(r.min, v);
  r.max = std::max(r.max, v);
}

/// Only T1 and T2 can be infinite: not given anywhere, or given as .inf (no decay).
std::string number(double v) {
  if (std::isinf(v)) return "infinite";
  return fmt::format("{:g}", v);
}

std::string range_text(const Range& r) {
  if (r.min == r.max) return number(r.min);
  return number(r.min) + " .. " + number(r.max);
}

}  // namespace

DeviceSummary summarize(const Device& device) {
  DeviceSummary s;
  const int n = device.qubit_count();
  s.name = device.name();
  s.qubits = n;
  s.couplers = device.coupler_count();
  for (int q = 0; q < n; ++q)
    if (!device.usable(q)) s.out_of_service.push_back({{q}, device.out_of_service_reason(q)});
  for (int i = 0; i < s.couplers; ++i)
    if (!device.coupler_usable(i))
      s.out_of_service.push_back({{device.couplers()[i].a, device.couplers()[i].b},
                                  device.coupler_out_of_service_reason(i)});
  // The graph in service: qubits out of service are not counted (they are isolated there).
  const bool any_usable = device.usable_qubit_count() > 0;
  s.min_degree = any_usable ? std::numeric_limits<int>::max() : 0;
  for (int q = 0; q < n; ++q) {
    if (!device.usable(q)) continue;
    s.min_degree = std::min(s.min_degree, device.degree(q));
    s.max_degree = std::max(s.max_degree, device.degree(q));
  }
  const auto [comp, count] = device.components();
  std::vector<int> sizes(count, 0);
  for (int q = 0; q < n; ++q) sizes[comp[q]] += device.usable(q);
  s.components = static_cast<int>(std::count_if(sizes.begin(), sizes.end(), [](int z) { return z > 0; }));
  s.largest_component = *std::max_element(sizes.begin(), sizes.end());
  s.diameter = diameter_value(device, comp, count);
  s.bipartite = is_bipartite(device);
  s.native_2q = two_qubit_gate_name(device.native_2q());
  s.calibrated = device.has_calibration();
  if (s.calibrated) {
    // Ranges over the parts in service (all parts when none is in service).
    bool first = true;
    for (int q = 0; q < n; ++q) {
      if (any_usable && !device.usable(q)) continue;
      const auto c = device.qubit_calibration(q);
      widen(s.error_1q, c.error_1q, first);
      widen(s.error_readout, c.error_readout, first);
      widen(s.duration_1q_ns, c.duration_1q_ns, first);
      widen(s.t1_us, c.t1_us, first);
      widen(s.t2_us, c.t2_us, first);
      first = false;
    }
    if (s.couplers == 0) {
      // No coupler to look at: show what a coupler would get.
      const auto& cal = device.description().calibration;
      s.error_2q = Range{cal.error_2q.value_or(0.0), cal.error_2q.value_or(0.0)};
      const double t = cal.duration_2q_ns.value_or(kDefaultDuration2qNs);
      s.duration_2q_ns = Range{t, t};
    }
    const bool any_coupler = device.usable_coupler_count() > 0;
    first = true;
    for (int i = 0; i < s.couplers; ++i) {
      if (any_coupler && !device.coupler_usable(i)) continue;
      const auto c = device.coupler_calibration(i);
      widen(s.error_2q, c.error, first);
      widen(s.duration_2q_ns, c.duration_ns, first);
      first = false;
    }
  }
  return s;
}

std::string format_summary(const DeviceSummary& s) {
  std::vector<std::pair<std::string, std::string>> rows;
  rows.emplace_back("name", s.name);
  long long qubits_out = 0;
  for (const auto& p : s.out_of_service) qubits_out += p.qubits.size() == 1;
  const long long couplers_out = static_cast<long long>(s.out_of_service.size()) - qubits_out;
  const auto out_note = [](long long k) { return k > 0 ? fmt::format(" ({} out of service)", k) : std::string(); };
  rows.emplace_back("qubits", fmt::format("{}{}", s.qubits, out_note(qubits_out)));
  rows.emplace_back("couplers", fmt::format("{}{}", s.couplers, out_note(couplers_out)));
  if (!s.out_of_service.empty()) {
    // Each part with its reason; a long list is cut after kListed parts.
    constexpr std::size_t kListed = 16;
    std::string list;
    for (std::size_t i = 0; i < s.out_of_service.size() && i < kListed; ++i) {
      const auto& p = s.out_of_service[i];
      const std::string part = p.qubits.size() == 1 ? fmt::format("qubit {}", p.qubits[0])
                                                    : fmt::format("coupler [{}, {}]", p.qubits[0], p.qubits[1]);
      list += fmt::format("{}{} ({})", i ? ", " : "", part, p.reason);
    }
    if (s.out_of_service.size() > kListed) list += fmt::format(", ... and {} more", s.out_of_service.size() - kListed);
    rows.emplace_back("out of service", list);
  }
  rows.emplace_back("degree", s.min_degree == s.max_degree ? fmt::format("{} (every qubit)", s.min_degree)
                                                           : fmt::format("{} .. {}", s.min_degree, s.max_degree));
  std::string diameter =
      diameter_is_exact(s.qubits)
          ? fmt::format("{}", s.diameter)
          : fmt::format("≥ {} (double-sweep lower bound; exact up to {} qubits)", s.diameter, kExactDiameterQubits);
  if (s.components > 1) diameter += " within a component";
  rows.emplace_back("diameter", diameter);
  if (s.components <= 1)
    rows.emplace_back("components", fmt::format("{} (connected{})", s.components, qubits_out ? " in service" : ""));
  else
    rows.emplace_back(
        "components",
        fmt::format("{}, largest {} qubit{} — disconnected: {} qubit{} cannot reach the largest component",
                    s.components, s.largest_component, s.largest_component == 1 ? "" : "s",
                    s.qubits - qubits_out - s.largest_component,
                    s.qubits - qubits_out - s.largest_component == 1 ? "" : "s"));
  rows.emplace_back("bipartite", s.bipartite ? "yes" : "no");
  rows.emplace_back("native 2q gate", s.native_2q);
  if (!s.calibrated) {
    rows.emplace_back("calibration", "none (gates and readout treated as error-free)");
  } else {
    rows.emplace_back("error 1q", range_text(s.error_1q));
    rows.emplace_back("error 2q", range_text(s.error_2q));
    rows.emplace_back("error readout", range_text(s.error_readout));
    rows.emplace_back("T1 (us)", range_text(s.t1_us));
    rows.emplace_back("T2 (us)", range_text(s.t2_us));
    rows.emplace_back("1q gate (ns)", range_text(s.duration_1q_ns));
    rows.emplace_back("2q gate (ns)", range_text(s.duration_2q_ns));
  }
  std::size_t width = 0;
  for (const auto& [key, value] : rows) width = std::max(width, key.size());
  std::string out;
  for (const auto& [key, value] : rows) out += fmt::format("{:<{}}  {}\n", key, width, value);
  return out;
}

}  // namespace qftplan
