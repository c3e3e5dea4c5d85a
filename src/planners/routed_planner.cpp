#include "qftplan/planners/routed_planner.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <random>

#include <fmt/format.h>

#include "qftplan/core/run_budget.hpp"
#include "qftplan/planners/chain_search.hpp"
#include "qftplan/planners/plan.hpp"

namespace qftplan {

namespace {

// The register's starting region: the longest chain found (up to n qubits), then the nearest
// qubits by breadth-first search from it. Returns the qubits in wire order: along the chain, each
// added qubit right after the region qubit it hangs from, so consecutive wires start close.
std::vector<int> starting_region(const Device& dev, int n, std::uint64_t seed, const RunBudget* budget) {
  ChainSearchOptions cso;
  cso.seed = seed;
  cso.budget = budget;  // out of time: start from the longest chain found so far
  cso.work_budget = 5'000'000;
  auto found = find_chain(dev, n, cso);
  std::vector<int> chain = found.chain.empty() ? found.longest : found.chain;
  // No chain at all (no component holds n qubits): grow from the first qubit in service, which then
  // reports how short its component falls.
  for (int q = 0; chain.empty() && q < dev.qubit_count(); ++q)
    if (dev.usable(q)) chain.push_back(q);
  if (static_cast<int>(chain.size()) > n) chain.resize(n);
  const int N = dev.qubit_count();
  std::vector<int> parent(N, -2);
  std::vector<int> bfs;
  for (int q : chain) parent[q] = -1, bfs.push_back(q);
  int total = static_cast<int>(chain.size());
  for (std::size_t h = 0; h < bfs.size() && total < n; ++h)
    for (int nb : dev.neighbours(bfs[h]))
      if (parent[nb] == -2 && total < n) {
        parent[nb] = bfs[h];
        bfs.push_back(nb);
        ++total;
      }
  if (total < n)
    throw PlanningError(fmt::format("the component of {} holding the register has only {} qubits, fewer than {}",
                                    dev.name(), total, n));
  // Order: depth-first over the region tree, chain qubits in chain order, children after parents.
  std::vector<std::vector<int>> children(N);
  for (int q : bfs)
    if (parent[q] >= 0) children[parent[q]].push_back(q);
  std::vector<int> order;
  std::vector<int> stack;
  for (int c : chain) {
    stack.push_back(c);
    while (!stack.empty()) {
      const int q = stack.back();
      stack.pop_back();
      order.push_back(q);
      for (auto it = children[q].rbegin(); it != children[q].rend(); ++it) stack.push_back(*it);
    }
  }
  return order;
}

class Router {
 public:
  Router(const Device& dev, const QftSpec& spec, const RoutingOptions& opt)
      : dev_(dev), spec_(spec), opt_(opt), n_(spec.qubits), d_(spec.max_distance()), N_(dev.qubit_count()),
        rng_(opt.seed) {}

  RoutedCircuit run() {
    if (N_ > opt_.max_device_qubits)
      throw PlanningError(fmt::format("the routed strategy handles devices of at most {} qubits; {} has {}",
                                      opt_.max_device_qubits, dev_.name(), N_));
    dist_.assign(static_cast<std::size_t>(N_) * N_, 0);
    for (int s = 0; s < N_; ++s) {
      const auto d = dev_.distances_from(s);
      std::copy(d.begin(), d.end(), dist_.begin() + static_cast<std::size_t>(s) * N_);
    }
    region_ = starting_region(dev_, n_, opt_.seed, opt_.budget);
    phys_of_.assign(n_, -1);
    wire_at_.assign(N_, -1);
    for (int w = 0; w < n_; ++w) {
      phys_of_[w] = region_[w];
      wire_at_[region_[w]] = w;
    }
    const auto start = phys_of_;
    h_done_.assign(n_, false);
    owed_before_.assign(n_, 0);
    met_.assign(n_, {});
    for (int j = 0; j < n_; ++j) {
      owed_before_[j] = std::min(j, d_);
      if (owed_before_[j] == 0) ready_h_.push_back(j);
    }
    std::reverse(ready_h_.begin(), ready_h_.end());
    for (int i = 0; i < n_; ++i) met_[i].assign(std::min(d_, n_ - 1 - i), false);

    const long long limit = opt_.max_swaps > 0 ? opt_.max_swaps : 64LL * n_ * n_ + 4096;
    long long swaps = 0;
    BudgetPoll poll(opt_.budget, 256);
    // The greedy choice can circle; after a stall of a few SWAPs without a new rotation, walk the
    // most urgent pending pair together along a shortest path, which always makes progress.
    int stall = 0;
    bool forcing = false;
    const int stall_limit = 8 + 2 * static_cast<int>(std::sqrt(static_cast<double>(N_)));
    while (first_open_ < n_) {
      // A half-routed circuit is of no use: out of time means no routed plan.
      if (poll.stop()) throw_if_exhausted(opt_.budget, "the routed strategy's SWAP search");
      if (progress()) {
        stall = 0;
        forcing = false;
        continue;
      }
      if (++swaps > limit) throw PlanningError("the routed strategy gave up (SWAP limit reached)");
      if (forcing || ++stall > stall_limit) {
        forcing = true;  // until the next rotation lands
        force_step();
      } else {
        swap_step();
      }
    }
    RoutedCircuit out;
    out.gates = fuse_phases_with_swaps(std::move(gates_));
    out.region = region_;
    out.maps.placement.resize(n_);
    out.maps.final_placement.resize(n_);
    for (int k = 0; k < n_; ++k) {
      out.maps.placement[k] = start[spec_.input_wire(k)];
      out.maps.final_placement[k] = phys_of_[spec_.output_wire(k)];
    }
    return out;
  }

 private:
  // A controlled phase and a SWAP on the same pair with nothing between them on either qubit are one
  // fused block, in either order (cp is symmetric, so SWAP cp = cp SWAP): 3 CX instead of 5. The
  // greedy steps make such pairs when a SWAP brings two wires together whose rotation is then
  // applied, and the next SWAP parts them again.
  static std::vector<Gate> fuse_phases_with_swaps(std::vector<Gate> gates) {
    int qubits = 0;
    for (const Gate& g : gates) qubits = std::max({qubits, g.q0 + 1, is_two_qubit(g.kind) ? g.q1 + 1 : 0});
    std::vector<long long> last(qubits, -1);  // index of the last kept gate on each qubit
    std::vector<char> gone(gates.size(), 0);
    for (std::size_t k = 0; k < gates.size(); ++k) {
      const Gate& g = gates[k];
      if (!is_two_qubit(g.kind)) {
        last[g.q0] = static_cast<long long>(k);
        continue;
      }
      const long long p = last[g.q0];
      if (p >= 0 && p == last[g.q1]) {
        Gate& prev = gates[static_cast<std::size_t>(p)];
        const bool cp_then_swap = prev.kind == GateKind::cp && g.kind == GateKind::swap;
        const bool swap_then_cp = prev.kind == GateKind::swap && g.kind == GateKind::cp;
        if (cp_then_swap || swap_then_cp) {
          prev = make_gate(GateKind::cp_swap, prev.q0, prev.q1, cp_then_swap ? prev.angle : g.angle);
          gone[k] = 1;
          continue;
        }
      }
      last[g.q0] = last[g.q1] = static_cast<long long>(k);
    }
    std::vector<Gate> out;
    out.reserve(gates.size());
    for (std::size_t k = 0; k < gates.size(); ++k)
      if (!gone[k]) out.push_back(gates[k]);
    return out;
  }

  int dist(int a, int b) const { return dist_[static_cast<std::size_t>(a) * N_ + b]; }

  // Rotation between wires i < j is pending when H(i) is done and they have not met.
  bool pending(int i, int j) const { return h_done_[i] && !h_done_[j] && j - i <= d_ && !met_[i][j - i - 1]; }

  void mark_met(int i, int j) {
    met_[i][j - i - 1] = true;
    if (--owed_before_[j] == 0) ready_h_.push_back(j);
  }

  // Applies every available Hadamard and adjacent rotation; true when something happened. Only
  // wires that moved or got their Hadamard since the last call can have new work ("dirty").
  bool progress() {
    bool any = false;
    while (!ready_h_.empty() || !dirty_.empty()) {
      while (!ready_h_.empty()) {
        const int j = ready_h_.back();
        ready_h_.pop_back();
        if (h_done_[j]) continue;
        gates_.push_back(make_gate(GateKind::h, phys_of_[j]));
        h_done_[j] = true;
        last_h_ = std::max(last_h_, j);
        dirty_.push_back(j);
        any = true;
      }
      while (!dirty_.empty()) {
        const int w = dirty_.back();
        dirty_.pop_back();
        for (int i = std::max(0, w - d_); i <= std::min(n_ - 1, w + d_); ++i) {
          if (i == w) continue;
          const int lo = std::min(i, w), hi = std::max(i, w);
          if (!pending(lo, hi) || !dev_.coupled(phys_of_[lo], phys_of_[hi])) continue;
          gates_.push_back(make_gate(GateKind::cp, phys_of_[lo], phys_of_[hi], spec_.rotation(hi - lo)));
          mark_met(lo, hi);
          any = true;
        }
      }
    }
    while (first_open_ < n_ && h_done_[first_open_] && all_after_done(first_open_)) ++first_open_;
    return any;
  }

  bool all_after_done(int i) const {
    for (int k = 0; k < static_cast<int>(met_[i].size()); ++k)
      if (!met_[i][k]) return false;
    return true;
  }

  // Pending rotations that steer the SWAP choice: those of the next few wires still waiting for
  // their Hadamard, the earliest weighing most.
  void collect_front(std::vector<std::tuple<int, int, double>>& front) const {
    front.clear();
    int taken = 0;
    for (int j = first_open_; j < n_ && taken < opt_.lookahead_wires; ++j) {
      if (h_done_[j]) continue;
      const double w = 1.0 / (1 + taken) / (1 + taken);
      bool any = false;
      for (int i = std::max(0, j - d_); i < j; ++i)
        if (pending(i, j)) {
          front.emplace_back(i, j, w);
          any = true;
        }
      if (any || owed_before_[j] > 0) ++taken;
    }
  }

  void swap_step() {
    std::vector<std::tuple<int, int, double>> front;
    collect_front(front);
    if (front.empty()) throw PlanningError("the routed strategy is stuck: no pending rotation");
    // Candidate SWAPs: couplers touching a qubit of a front rotation.
    double best = std::numeric_limits<double>::infinity();
    std::vector<std::pair<int, int>> best_swaps;
    std::vector<int> touched;
    for (const auto& [i, j, w] : front) touched.push_back(phys_of_[i]), touched.push_back(phys_of_[j]);
    std::sort(touched.begin(), touched.end());
    touched.erase(std::unique(touched.begin(), touched.end()), touched.end());
    for (int a : touched)
      for (int b : dev_.neighbours(a)) {
        double cost = 0;
        for (const auto& [i, j, w] : front) {
          int pi = phys_of_[i], pj = phys_of_[j];
          if (pi == a) pi = b; else if (pi == b) pi = a;
          if (pj == a) pj = b; else if (pj == b) pj = a;
          cost += w * dist(pi, pj);
        }
        if ((a == last_swap_.first && b == last_swap_.second) || (a == last_swap_.second && b == last_swap_.first))
          cost += 0.5;
        // A SWAP that also settles a rotation is worth more.
        const int wa = wire_at_[a], wb = wire_at_[b];
        if (wa >= 0 && wb >= 0 && pending(std::min(wa, wb), std::max(wa, wb))) cost -= 0.25;
        if (cost < best - 1e-12) {
          best = cost;
          best_swaps.assign(1, {std::min(a, b), std::max(a, b)});
        } else if (cost < best + 1e-12) {
          best_swaps.push_back({std::min(a, b), std::max(a, b)});
        }
      }
    std::sort(best_swaps.begin(), best_swaps.end());
    best_swaps.erase(std::unique(best_swaps.begin(), best_swaps.end()), best_swaps.end());
    const auto [a, b] = best_swaps[std::uniform_int_distribution<std::size_t>(0, best_swaps.size() - 1)(rng_)];
    apply_swap(a, b);
  }

  // Moves the first front rotation's later wire one hop toward the other along a shortest path.
  void force_step() {
    std::vector<std::tuple<int, int, double>> front;
    collect_front(front);
    if (front.empty()) throw PlanningError("the routed strategy is stuck: no pending rotation");
    const auto [i, j, w] = front.front();
    const int from = phys_of_[j], to = phys_of_[i];
    for (int nb : dev_.neighbours(from))
      if (dist(nb, to) < dist(from, to)) {
        apply_swap(from, nb);
        return;
      }
    throw PlanningError("the routed strategy is stuck: the register's qubits are not connected");
  }

  void apply_swap(int a, int b) {
    const int wa = wire_at_[a], wb = wire_at_[b];
    if (wa >= 0 && wb >= 0 && pending(std::min(wa, wb), std::max(wa, wb))) {
      const int i = std::min(wa, wb), j = std::max(wa, wb);
      gates_.push_back(make_gate(GateKind::cp_swap, a, b, spec_.rotation(j - i)));
      mark_met(i, j);
    } else {
      gates_.push_back(make_gate(GateKind::swap, a, b));
    }
    std::swap(wire_at_[a], wire_at_[b]);
    if (wire_at_[a] >= 0) phys_of_[wire_at_[a]] = a, dirty_.push_back(wire_at_[a]);
    if (wire_at_[b] >= 0) phys_of_[wire_at_[b]] = b, dirty_.push_back(wire_at_[b]);
    last_swap_ = {a, b};
  }

  const Device& dev_;
  QftSpec spec_;
  RoutingOptions opt_;
  int n_, d_, N_;
  std::mt19937_64 rng_;
  std::vector<int> dist_;
  std::vector<int> region_, phys_of_, wire_at_;
  std::vector<bool> h_done_;
  std::vector<int> owed_before_;
  std::vector<int> ready_h_, dirty_;
  std::vector<std::vector<bool>> met_;
  std::vector<Gate> gates_;
  int first_open_ = 0, last_h_ = -1;
  std::pair<int, int> last_swap_{-1, -1};
};

}  // namespace

RoutedCircuit route_qft(const Device& device, const QftSpec& spec, const RoutingOptions& options) {
  if (spec.qubits > device.qubit_count())
    throw PlanningError(fmt::format("device {} has {} qubits, fewer than the {} requested", device.name(),
                                    device.qubit_count(), spec.qubits));
  QftSpec forward = spec;
  forward.inverse = false;
  RoutedCircuit c = Router(device, forward, options).run();
  if (!spec.inverse) return c;
  // The inverse: the forward circuit backwards with negated angles; its start is the forward end.
  std::reverse(c.gates.begin(), c.gates.end());
  for (auto& g : c.gates) g.angle = -g.angle;
  QubitMaps inv;
  const int n = spec.qubits;
  inv.placement.resize(n);
  inv.final_placement.resize(n);
  // Forward: input bit k on wire n-1-k, output bit k on wire k. Inverse input bit k is forward
  // output bit k (wire k, at the forward end); inverse output bit k is forward input bit k.
  for (int k = 0; k < n; ++k) {
    inv.placement[k] = c.maps.final_placement[k];
    inv.final_placement[k] = c.maps.placement[k];
  }
  c.maps = inv;
  return c;
}

}  // namespace qftplan
