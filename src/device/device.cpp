#include "qftplan/device/device.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <queue>

#include <boost/graph/adjacency_list.hpp>
#include <boost/graph/connected_components.hpp>
#include <fmt/format.h>

#include "qftplan/core/input_error.hpp"

namespace qftplan {

const char* two_qubit_gate_name(TwoQubitGate g) { return g == TwoQubitGate::cz ? "cz" : "cx"; }

bool CalibrationValues::empty() const {
  return !error_1q && !error_2q && !error_readout && !duration_1q_ns && !duration_2q_ns && !t1_us && !t2_us &&
         !duration_readout_ns && !feed_forward_ns;
}

namespace {

void check_rate(const std::optional<double>& v, const std::string& what) {
  if (v && !(*v >= 0.0 && *v <= 1.0))
    throw InputError(fmt::format("{} must be a probability in [0, 1], got {}", what, *v));
}
// A gate time in ns: positive, and at most kMaxGateDurationNs so that schedules stay finite.
void check_duration(const std::optional<double>& v, const std::string& what) {
  if (v && !(*v > 0.0 && *v <= kMaxGateDurationNs))
    throw InputError(fmt::format("{} must be a positive number of ns, at most 1e9 (one second), got {}", what, *v));
}
// A T1 or T2 time: positive, infinite for a qubit that does not decay.
void check_lifetime(const std::optional<double>& v, const std::string& what) {
  if (v && !(*v > 0.0))
    throw InputError(fmt::format("{} must be a positive number (or infinite), got {}", what, *v));
}

}  // namespace

std::string lifetime_violation(std::optional<double> t1, std::optional<double> t2, const std::string& who) {
  if (!t1 || !t2 || !std::isfinite(*t1) || !(*t2 > 2.0 * *t1)) return {};
  return fmt::format("{} has t2_us {} above 2 x t1_us = {}: physically impossible (T2 <= 2 T1, since pure "
                     "dephasing cannot be negative)",
                     who, *t2, 2.0 * *t1);
}

Device::Device(DeviceDescription description) : d_(std::move(description)) {
  const int n = d_.qubits;
  if (n <= 0) throw InputError("a device needs at least one qubit");
  if (n > kMaxDeviceQubits)
    throw InputError(fmt::format("{} qubits is more than the limit of {}", n, kMaxDeviceQubits));
  check_rate(d_.calibration.error_1q, "calibration.error_1q");
  check_rate(d_.calibration.error_2q, "calibration.error_2q");
  check_rate(d_.calibration.error_readout, "calibration.error_readout");
  check_duration(d_.calibration.duration_1q_ns, "calibration.duration_1q_ns");
  check_duration(d_.calibration.duration_2q_ns, "calibration.duration_2q_ns");
  check_lifetime(d_.calibration.t1_us, "calibration.t1_us");
  check_lifetime(d_.calibration.t2_us, "calibration.t2_us");
  check_duration(d_.calibration.duration_readout_ns, "calibration.duration_readout_ns");
  check_duration(d_.calibration.feed_forward_ns, "calibration.feed_forward_ns");

  std::vector<int> deg(n, 0);
  for (auto& c : d_.couplers) {
    if (c.a < 0 || c.a >= n || c.b < 0 || c.b >= n)
      throw InputError(fmt::format("coupler [{}, {}] names a qubit outside 0..{}", c.a, c.b, n - 1));
    if (c.a == c.b) throw InputError(fmt::format("coupler [{}, {}] joins a qubit to itself", c.a, c.b));
    if (c.a > c.b) std::swap(c.a, c.b);
    check_rate(c.error, fmt::format("error of coupler [{}, {}]", c.a, c.b));
    check_duration(c.duration_ns, fmt::format("duration_ns of coupler [{}, {}]", c.a, c.b));
    ++deg[c.a];
    ++deg[c.b];
  }
  offsets_.assign(n + 1, 0);
  for (int q = 0; q < n; ++q) offsets_[q + 1] = offsets_[q] + deg[q];
  adj_.assign(offsets_[n], 0);
  adj_coupler_.assign(offsets_[n], 0);
  std::vector<int> fill(offsets_.begin(), offsets_.end() - 1);
  for (int i = 0; i < static_cast<int>(d_.couplers.size()); ++i) {
    const auto& c = d_.couplers[i];
    adj_[fill[c.a]] = c.b;
    adj_coupler_[fill[c.a]++] = i;
    adj_[fill[c.b]] = c.a;
    adj_coupler_[fill[c.b]++] = i;
  }
  for (int q = 0; q < n; ++q) {
    // Sort each neighbour list (with its coupler ids) so lookups can binary-search.
    std::vector<std::pair<int, int>> tmp;
    for (int k = offsets_[q]; k < offsets_[q + 1]; ++k) tmp.emplace_back(adj_[k], adj_coupler_[k]);
    std::sort(tmp.begin(), tmp.end());
    for (int k = offsets_[q]; k < offsets_[q + 1]; ++k) {
      const auto& [nb, ci] = tmp[k - offsets_[q]];
      if (k > offsets_[q] && adj_[k - 1] == nb)
        throw InputError(fmt::format("coupler [{}, {}] is listed twice", std::min(q, nb), std::max(q, nb)));
      adj_[k] = nb;
      adj_coupler_[k] = ci;
    }
  }

  override_of_.assign(n, -1);
  for (int i = 0; i < static_cast<int>(d_.qubit_calibration.size()); ++i) {
    const auto& o = d_.qubit_calibration[i];
    if (o.id < 0 || o.id >= n)
      throw InputError(fmt::format("qubit_calibration names qubit {} outside 0..{}", o.id, n - 1));
    if (override_of_[o.id] >= 0) throw InputError(fmt::format("qubit_calibration lists qubit {} twice", o.id));
    override_of_[o.id] = i;
    const auto what = fmt::format("qubit_calibration of qubit {}", o.id);
    check_rate(o.error_1q, what + ": error_1q");
    check_rate(o.error_readout, what + ": error_readout");
    check_duration(o.duration_1q_ns, what + ": duration_1q_ns");
    check_lifetime(o.t1_us, what + ": t1_us");
    check_lifetime(o.t2_us, what + ": t2_us");
    check_duration(o.duration_readout_ns, what + ": duration_readout_ns");
    check_duration(o.feed_forward_ns, what + ": feed_forward_ns");
  }
  // T2 <= 2 T1 for every qubit as applied: the overrides are indexed, so this is one pass.
  {
    const auto& c = d_.calibration;
    for (int q = 0; q < n; ++q) {
      const QubitOverride* o = override_of_[q] >= 0 ? &d_.qubit_calibration[override_of_[q]] : nullptr;
      const auto t1 = o && o->t1_us ? o->t1_us : c.t1_us;
      const auto t2 = o && o->t2_us ? o->t2_us : c.t2_us;
      if (auto why = lifetime_violation(t1, t2, fmt::format("qubit {}", q)); !why.empty()) throw InputError(why);
    }
  }
  index_service();
  if (!d_.positions.empty() && static_cast<int>(d_.positions.size()) != n)
    throw InputError(fmt::format("positions must list one entry per qubit ({}), got {}", n, d_.positions.size()));
}

void Device::index_service() {
  const int n = d_.qubits;
  qubit_on_.assign(n, 1);
  for (int q = 0; q < n; ++q) qubit_on_[q] = out_of_service_reason(q).empty();
  coupler_on_.assign(d_.couplers.size(), 1);
  for (int i = 0; i < coupler_count(); ++i) coupler_on_[i] = coupler_out_of_service_reason(i).empty();
  usable_qubits_ = static_cast<int>(std::count(qubit_on_.begin(), qubit_on_.end(), 1));
  usable_couplers_ = static_cast<int>(std::count(coupler_on_.begin(), coupler_on_.end(), 1));
  if (usable_couplers_ == coupler_count()) return;
  // Keep the full index for any_coupler_index, and make the graph that of the couplers in service.
  all_offsets_ = offsets_;
  all_adj_ = adj_;
  all_adj_coupler_ = adj_coupler_;
  std::size_t out = 0;
  for (int q = 0; q < n; ++q) {
    const std::size_t begin = out;
    for (int k = all_offsets_[q]; k < all_offsets_[q + 1]; ++k)
      if (coupler_on_[all_adj_coupler_[k]]) {
        adj_[out] = all_adj_[k];
        adj_coupler_[out++] = all_adj_coupler_[k];
      }
    offsets_[q] = static_cast<int>(begin);
  }
  offsets_[n] = static_cast<int>(out);
  adj_.resize(out);
  adj_coupler_.resize(out);
}

std::string Device::out_of_service_reason(int q) const {
  const int i = override_of_[q];
  if (i >= 0 && d_.qubit_calibration[i].disabled) return "disabled";
  // A one-qubit gate that always fails: every plan puts at least a Hadamard on each register qubit.
  if (qubit_calibration(q).error_1q >= 1.0) return "error_1q 1";
  return {};
}

std::string Device::coupler_out_of_service_reason(int coupler) const {
  const Coupler& c = d_.couplers[coupler];
  if (c.disabled) return "disabled";
  for (int q : {c.a, c.b})
    if (!out_of_service_reason(q).empty()) return fmt::format("qubit {} out of service", q);
  // Certain failure: a plan over it would have ESP 0.
  if (coupler_calibration(coupler).error >= 1.0) return "error 1";
  return {};
}

int Device::any_coupler_index(int a, int b) const {
  if (all_offsets_.empty()) return coupler_index(a, b);
  if (a < 0 || b < 0 || a >= d_.qubits || b >= d_.qubits) return -1;
  const auto first = all_adj_.begin() + all_offsets_[a], last = all_adj_.begin() + all_offsets_[a + 1];
  auto it = std::lower_bound(first, last, b);
  if (it == last || *it != b) return -1;
  return all_adj_coupler_[static_cast<std::size_t>(it - all_adj_.begin())];
}

int Device::coupler_index(int a, int b) const {
  if (a < 0 || b < 0 || a >= d_.qubits || b >= d_.qubits) return -1;
  const auto nb = neighbours(a);
  auto it = std::lower_bound(nb.begin(), nb.end(), b);
  if (it == nb.end() || *it != b) return -1;
  return adj_coupler_[offsets_[a] + static_cast<int>(it - nb.begin())];
}

std::vector<int> Device::distances_from(int source) const {
  std::vector<int> dist(d_.qubits, -1);
  std::vector<int> queue;
  queue.reserve(d_.qubits);
  dist[source] = 0;
  queue.push_back(source);
  for (std::size_t head = 0; head < queue.size(); ++head) {
    const int q = queue[head];
    for (int nb : neighbours(q))
      if (dist[nb] < 0) {
        dist[nb] = dist[q] + 1;
        queue.push_back(nb);
      }
  }
  return dist;
}

std::pair<std::vector<int>, int> Device::components() const {
  using Graph = boost::adjacency_list<boost::vecS, boost::vecS, boost::undirectedS>;
  Graph g(d_.qubits);
  for (int i = 0; i < coupler_count(); ++i)
    if (coupler_on_[i]) boost::add_edge(d_.couplers[i].a, d_.couplers[i].b, g);
  std::vector<int> comp(d_.qubits);
  const int count = boost::connected_components(g, comp.data());
  // Renumber so component ids follow the order of their smallest qubit (Boost already visits
  // vertices in index order, but say so explicitly rather than rely on it).
  std::vector<int> renum(count, -1);
  int next = 0;
  for (int& c : comp) {
    if (renum[c] < 0) renum[c] = next++;
    c = renum[c];
  }
  return {comp, count};
}

int Device::diameter() const {
  int best = 0;
  for (int s = 0; s < d_.qubits; ++s)
    for (int d : distances_from(s)) best = std::max(best, d);
  return best;
}

bool Device::has_calibration() const {
  if (!d_.calibration.empty() || !d_.qubit_calibration.empty()) return true;
  return std::any_of(d_.couplers.begin(), d_.couplers.end(),
                     [](const Coupler& c) { return c.error || c.duration_ns; });
}

QubitCalibration Device::qubit_calibration(int q) const {
  const auto inf = std::numeric_limits<double>::infinity();
  const auto& c = d_.calibration;
  QubitCalibration out{c.error_1q.value_or(0.0), c.error_readout.value_or(0.0),
                       c.duration_1q_ns.value_or(kDefaultDuration1qNs), c.t1_us.value_or(inf), c.t2_us.value_or(inf),
                       c.duration_readout_ns.value_or(kDefaultDurationReadoutNs), c.feed_forward_ns};
  if (const int i = override_of_[q]; i >= 0) {
    const auto& o = d_.qubit_calibration[i];
    if (o.error_1q) out.error_1q = *o.error_1q;
    if (o.error_readout) out.error_readout = *o.error_readout;
    if (o.duration_1q_ns) out.duration_1q_ns = *o.duration_1q_ns;
    if (o.t1_us) out.t1_us = *o.t1_us;
    if (o.t2_us) out.t2_us = *o.t2_us;
    if (o.duration_readout_ns) out.duration_readout_ns = *o.duration_readout_ns;
    if (o.feed_forward_ns) out.feed_forward_ns = o.feed_forward_ns;
  }
  return out;
}

CouplerCalibration Device::coupler_calibration(int coupler) const {
  const auto& c = d_.couplers[coupler];
  return {c.error.value_or(d_.calibration.error_2q.value_or(0.0)),
          c.duration_ns.value_or(d_.calibration.duration_2q_ns.value_or(kDefaultDuration2qNs))};
}

CouplerCalibration Device::coupler_calibration(int a, int b) const { return coupler_calibration(coupler_index(a, b)); }

std::optional<Point> Device::position(int q) const {
  if (d_.positions.empty()) return std::nullopt;
  return d_.positions[q];
}

}  // namespace qftplan
