#include "qftplan/planners/placement_search.hpp"

#include <algorithm>
#include <cmath>
#include <random>
#include <set>

#include "qftplan/core/gate_program.hpp"
#include "qftplan/core/run_budget.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/networks/chain_qft.hpp"
#include "qftplan/sinks/circuit_metrics.hpp"
#include "qftplan/sinks/native_gates.hpp"
#include "qftplan/sinks/noise_model.hpp"

namespace qftplan {

namespace {

// The error-carrying native gates of one gate of kind k, by the gate's two qubits: from the native
// program the planner's counters replay, so the loads cannot drift from what is emitted.
struct StepLoad {
  double one_q[2] = {0, 0};  // h/x/sx on the gate's first and second qubit
  double two_q = 0;          // native two-qubit gates on its coupler
};

StepLoad kind_load(TwoQubitGate native, GateKind k) {
  StepLoad l;
  const GateProgram program = native_program(native, k);  // keep alive: view() points into it
  for (const ProgramStep& s : program.view()) {
    if (is_two_qubit(s.kind)) l.two_q += 1;
    else if (s.kind == GateKind::h || s.kind == GateKind::x || s.kind == GateKind::sx) l.one_q[s.a] += 1;
  }
  return l;
}

}  // namespace

namespace {

// Counts the error-carrying native gates of a logical stream on the chain 0..n-1 by position and
// edge, replaying each gate's native program (the same programs the planner's counters replay).
class LoadSink final : public GateSink {
 public:
  LoadSink(TwoQubitGate native, ChainLoads& loads, const RunBudget* budget) : loads_(loads), budget_(budget) {
    for (int k = 0; k < kGateKindCount; ++k)
      if (!uses_bit(static_cast<GateKind>(k))) per_kind_[k] = kind_load(native, static_cast<GateKind>(k));
  }
  void gate(const Gate& g) override { batch({&g, 1}); }
  void batch(std::span<const Gate> run) override {
    // A dry run of a big network is long and has no partial result worth keeping: throw.
    since_poll_ += run.size();
    if (since_poll_ >= 65536) {
      since_poll_ = 0;
      throw_if_exhausted(budget_, "the ESP scoring of a network");
    }
    for (const Gate& g : run) {
      if (uses_bit(g.kind)) continue;
      const StepLoad& l = per_kind_[static_cast<int>(g.kind)];
      loads_.pos_1q[g.q0] += l.one_q[0];
      if (!is_two_qubit(g.kind)) continue;
      loads_.pos_1q[g.q1] += l.one_q[1];
      loads_.edge_2q[std::min(g.q0, g.q1)] += l.two_q;
    }
  }

 private:
  StepLoad per_kind_[kGateKindCount];
  ChainLoads& loads_;
  const RunBudget* budget_;
  std::size_t since_poll_ = 0;
};

}  // namespace

ChainLoads chain_loads(const QftSpec& spec, const QftNetwork& network, TwoQubitGate native,
                       const RunBudget* budget) {
  const int n = spec.qubits;
  ChainLoads loads;
  loads.edge_2q.assign(n > 1 ? n - 1 : 0, 0.0);
  loads.pos_1q.assign(n, 0.0);
  // The network emitted on the chain 0..n-1 itself (positions are qubits), so the loads follow
  // whatever the network emits, forwards or backwards, fused or parity.
  std::vector<int> chain(n);
  for (int p = 0; p < n; ++p) chain[p] = p;
  LoadSink sink(native, loads, budget);
  emit_chain_qft(spec, network, chain, sink);
  return loads;
}

ChainLoads chain_loads_with_idling(const Device& device, const QftSpec& spec, const QftNetwork& network,
                                   bool measured, const RunBudget* budget) {
  const int n = spec.qubits;
  const TwoQubitGate native = device.native_2q();
  // The device's typical gate times: its defaults as written, else the common defaults.
  const auto& cal = device.description().calibration;
  const double d1 = cal.duration_1q_ns.value_or(kDefaultDuration1qNs);
  const double d2 = cal.duration_2q_ns.value_or(kDefaultDuration2qNs);
  DeviceDescription line = make_line(n).description();
  line.calibration.duration_1q_ns = d1;
  line.calibration.duration_2q_ns = d2;
  line.native_2q = native;
  const Device timed(line);
  std::vector<int> chain(n);
  for (int p = 0; p < n; ++p) chain[p] = p;
  ChainLoads loads;
  loads.edge_2q.assign(n > 1 ? n - 1 : 0, 0.0);
  loads.pos_1q.assign(n, 0.0);
  loads.measured = measured;
  // One dry run feeds the loads and the schedule (the noise model's own, so the two cannot drift).
  LoadSink load_sink(native, loads, budget);
  MetricsSink metrics(n);
  NoiseSink schedule(timed, chain);
  NativeReplay replay(native, metrics, schedule);
  TeeSink both({&load_sink, &replay});
  emit_chain_qft(spec, network, chain, both);
  both.finish();
  const double makespan = schedule.figures().duration_ns;
  loads.pos_idle_ns.assign(n, 0.0);
  for (int p = 0; p < n; ++p) {
    const double busy = loads.pos_1q[p] * d1 + ((p > 0 ? loads.edge_2q[p - 1] : 0.0) +
                                                (p + 1 < n ? loads.edge_2q[p] : 0.0)) * d2;
    loads.pos_idle_ns[p] = std::max(0.0, makespan - busy);
  }
  return loads;
}

namespace {

struct Scorer {
  const Device& dev;
  const ChainLoads& loads;
  std::vector<double> log_1q;     // per physical qubit ln(1 - error_1q)
  std::vector<double> idle_rate;  // per physical qubit 1/(4 T1) + 1/(2 T2), per ns (with idling)
  std::vector<double> log_read;   // per physical qubit ln(1 - error_readout) (when measured)
  Scorer(const Device& d, const ChainLoads& l) : dev(d), loads(l), log_1q(d.qubit_count()) {
    for (int q = 0; q < d.qubit_count(); ++q) log_1q[q] = std::log1p(-d.qubit_calibration(q).error_1q);
    if (!loads.pos_idle_ns.empty()) {
      idle_rate.resize(d.qubit_count());
      for (int q = 0; q < d.qubit_count(); ++q) {
        const auto c = d.qubit_calibration(q);  // T1, T2 in microseconds; +infinity gives 0
        idle_rate[q] = 1.0 / (4000.0 * c.t1_us) + 1.0 / (2000.0 * c.t2_us);
      }
    }
    if (loads.measured) {
      log_read.resize(d.qubit_count());
      for (int q = 0; q < d.qubit_count(); ++q) log_read[q] = std::log1p(-d.qubit_calibration(q).error_readout);
    }
  }
  double at(int pos, int q) const {
    double s = loads.pos_1q[pos] * log_1q[q];
    if (!idle_rate.empty()) s -= loads.pos_idle_ns[pos] * idle_rate[q];
    if (!log_read.empty()) s += log_read[q];
    return s;
  }
  double edge(int pos, int a, int b) const {
    if (loads.edge_2q[pos] == 0) return 0.0;
    return loads.edge_2q[pos] * std::log1p(-dev.coupler_calibration(a, b).error);
  }
  double chain(std::span<const int> c) const {
    double s = 0;
    for (std::size_t p = 0; p < c.size(); ++p) {
      s += at(static_cast<int>(p), c[p]);
      if (p > 0) s += edge(static_cast<int>(p - 1), c[p - 1], c[p]);
    }
    return s;
  }
};

class Best {
 public:
  explicit Best(int keep) : keep_(keep) {}
  void offer(const std::vector<int>& c, double s) {
    for (const auto& e : list_)
      if (e.chain == c) return;
    list_.push_back({c, s});
    std::stable_sort(list_.begin(), list_.end(), [](const ScoredChain& a, const ScoredChain& b) { return a.log_esp > b.log_esp; });
    if (static_cast<int>(list_.size()) > keep_) list_.pop_back();
  }
  // The score a new chain must beat to enter the list.
  double threshold() const {
    return static_cast<int>(list_.size()) < keep_ ? -INFINITY : list_.back().log_esp;
  }
  std::vector<ScoredChain> list_;

 private:
  int keep_;
};

class Exhaustive {
 public:
  Exhaustive(const Device& d, const Scorer& s, int n, long long budget, Best& best, const RunBudget* run_budget)
      : dev_(d), sc_(s), n_(n), budget_(budget), best_(best), on_(d.qubit_count(), false), poll_(run_budget) {}
  bool run() {
    for (int q = 0; q < dev_.qubit_count(); ++q) {
      if (!dev_.usable(q)) continue;  // out of service: never placed on
      path_.assign(1, q);
      on_[q] = true;
      dfs(sc_.at(0, q));
      on_[q] = false;
      if (work_ > budget_ || poll_.stopped()) return false;
    }
    return true;
  }
  long long work_ = 0, scored_ = 0;

 private:
  void dfs(double partial) {
    // Every remaining term is <= 0: a partial score at or below the threshold cannot improve.
    if (partial <= best_.threshold() || work_ > budget_ || poll_.stop()) return;
    if (static_cast<int>(path_.size()) == n_) {
      ++scored_;
      best_.offer(path_, partial);
      return;
    }
    const int p = static_cast<int>(path_.size());
    for (int nb : dev_.neighbours(path_.back())) {
      ++work_;
      if (on_[nb]) continue;
      on_[nb] = true;
      path_.push_back(nb);
      dfs(partial + sc_.edge(p - 1, path_[p - 1], nb) + sc_.at(p, nb));
      path_.pop_back();
      on_[nb] = false;
    }
  }
  const Device& dev_;
  const Scorer& sc_;
  int n_;
  long long budget_;
  Best& best_;
  std::vector<bool> on_;
  std::vector<int> path_;

 public:
  BudgetPoll poll_;
};

}  // namespace

double chain_log_esp(const Device& device, const ChainLoads& loads, std::span<const int> chain) {
  return Scorer(device, loads).chain(chain);
}

double uniform_log_esp(const Device& device, const QftNetwork& network, TwoQubitGate native) {
  double one_q = 0, two_q = 0;  // native gates that carry an error
  if (network.parity()) {
    // Parity steps are not the network's step kinds: count what it emits.
    QftSpec spec;
    spec.qubits = network.wires();
    spec.approx_degree = network.max_distance() + 1;
    const ChainLoads loads = chain_loads(spec, network, native);
    for (double l : loads.pos_1q) one_q += l;
    for (double l : loads.edge_2q) two_q += l;
  } else {
    // The fused networks' steps are gates of these kinds, one each.
    static constexpr GateKind kinds[] = {GateKind::h, GateKind::cp, GateKind::swap, GateKind::cp_swap};
    const auto counts = network.step_counts();
    for (int k = 0; k < 4; ++k) {
      const StepLoad l = kind_load(native, kinds[k]);
      one_q += static_cast<double>(counts[k]) * (l.one_q[0] + l.one_q[1]);
      two_q += static_cast<double>(counts[k]) * l.two_q;
    }
  }
  // Uniform over the parts in service: read the calibration of the first qubit and coupler in service.
  int q0 = 0, c0 = 0;
  while (q0 < device.qubit_count() && !device.usable(q0)) ++q0;
  while (c0 < device.coupler_count() && !device.coupler_usable(c0)) ++c0;
  const double log_1q = q0 < device.qubit_count() ? std::log1p(-device.qubit_calibration(q0).error_1q) : 0.0;
  const double log_2q = c0 < device.coupler_count() ? std::log1p(-device.coupler_calibration(c0).error) : 0.0;
  return (one_q > 0 ? one_q * log_1q : 0.0) + (two_q > 0 ? two_q * log_2q : 0.0);
}

PlacementChoice best_chain(const Device& device, const ChainLoads& loads, const std::vector<int>& fallback,
                           const PlacementSearchOptions& options) {
  const int n = static_cast<int>(loads.pos_1q.size());
  const Scorer sc(device, loads);
  Best best(options.keep);
  PlacementChoice out;
  if (!fallback.empty()) {
    best.offer(fallback, sc.chain(fallback));
    // Its reverse is another orientation of the same chain.
    std::vector<int> r(fallback.rbegin(), fallback.rend());
    best.offer(r, sc.chain(r));
    out.chains_scored += 2;
  }
  Exhaustive ex(device, sc, n, options.work_budget, best, options.budget);
  out.exhaustive = ex.run();
  out.time_out = ex.poll_.stopped();
  out.work = ex.work_;
  out.chains_scored += ex.scored_;
  // Out of time already: keep what the exhaustive search found (always at least the fallback).
  if (!out.exhaustive && !out.time_out) {
    BudgetPoll poll(options.budget, 64);
    // Beam search over positions. Each extension checks the path for repeats (O(n)), so the width
    // is chosen to keep width * n * n * max_degree within the budget.
    int max_deg = 1;
    for (int q = 0; q < device.qubit_count(); ++q) max_deg = std::max(max_deg, device.degree(q));
    const double per_width = static_cast<double>(n) * n * max_deg + 1;
    const int width = static_cast<int>(std::clamp(options.work_budget / per_width, 1.0, 256.0));
    struct State {
      std::vector<int> path;
      double score;
    };
    std::vector<State> beam;
    // Start from the best single positions: every qubit, ranked by its first-position score.
    std::vector<int> qs;
    for (int q = 0; q < device.qubit_count(); ++q)
      if (device.usable(q)) qs.push_back(q);
    std::mt19937_64 rng(options.seed);
    std::shuffle(qs.begin(), qs.end(), rng);
    std::stable_sort(qs.begin(), qs.end(), [&](int a, int b) { return sc.at(0, a) > sc.at(0, b); });
    for (int i = 0; i < static_cast<int>(qs.size()) && i < 4 * width; ++i) beam.push_back({{qs[i]}, sc.at(0, qs[i])});
    for (int p = 1; p < n && !beam.empty() && !poll.stopped(); ++p) {
      std::vector<State> next;
      for (const auto& s : beam)
        for (int nb : device.neighbours(s.path.back())) {
          out.work += p;
          if (poll.stop()) break;
          if (std::find(s.path.begin(), s.path.end(), nb) != s.path.end()) continue;
          State t{s.path, s.score + sc.edge(p - 1, s.path.back(), nb) + sc.at(p, nb)};
          t.path.push_back(nb);
          next.push_back(std::move(t));
        }
      std::stable_sort(next.begin(), next.end(), [](const State& a, const State& b) { return a.score > b.score; });
      if (static_cast<int>(next.size()) > width) next.resize(width);
      beam = std::move(next);
    }
    out.time_out = poll.stopped();
    for (const auto& s : beam)
      if (static_cast<int>(s.path.size()) == n && !out.time_out) {
        best.offer(s.path, s.score);
        ++out.chains_scored;
      }
  }
  out.best = best.list_;
  return out;
}

}  // namespace qftplan
