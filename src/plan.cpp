#include "qftplan/plan.hpp"

#include <chrono>
#include <cmath>

#include <fmt/format.h>

#include "qftplan/approximation.hpp"
#include "qftplan/circuit_metrics.hpp"
#include "qftplan/input_error.hpp"

namespace qftplan {

std::vector<int> parse_id_list(const std::string& text, const std::string& what) {
  std::vector<int> out;
  std::size_t i = 0;
  while (i <= text.size()) {
    const std::size_t j = text.find(',', i);
    const std::string part = text.substr(i, j == std::string::npos ? std::string::npos : j - i);
    std::size_t used = 0;
    long long v = -1;
    try {
      v = std::stoll(part, &used);
    } catch (const std::exception&) {
      used = 0;
    }
    if (part.empty() || used != part.size() || v < 0 || v > kMaxDeviceQubits)
      throw InputError(fmt::format("{}: '{}' is not a qubit id (expected comma-separated non-negative integers)", what, part));
    out.push_back(static_cast<int>(v));
    if (j == std::string::npos) break;
    i = j + 1;
  }
  return out;
}

namespace {

void validate_spec(const Device& device, const QftSpec& spec) {
  if (spec.qubits < 1) throw InputError(fmt::format("--qubits must be at least 1, got {}", spec.qubits));
  if (spec.qubits > device.qubit_count())
    throw PlanningError(fmt::format("device {} has {} qubits, fewer than the {} requested", device.name(),
                                    device.qubit_count(), spec.qubits));
  if (spec.approx_degree && *spec.approx_degree < 1)
    throw InputError(fmt::format("--approx must be at least 1 (1 keeps Hadamards only), got {}", *spec.approx_degree));
}

// The chain that puts input bit k on pinned[k] at the start of the (possibly inverse) network.
std::vector<int> chain_from_pin(const Device& device, const QftSpec& spec, const QftNetwork& net,
                                const std::vector<int>& pinned) {
  const int n = spec.qubits;
  if (static_cast<int>(pinned.size()) != n)
    throw InputError(fmt::format("--placement lists {} qubits but the register has {}", pinned.size(), n));
  std::vector<bool> seen(device.qubit_count(), false);
  for (int q : pinned) {
    if (q < 0 || q >= device.qubit_count())
      throw InputError(fmt::format("--placement names qubit {}, but {} has qubits 0..{}", q, device.name(),
                                   device.qubit_count() - 1));
    if (seen[q]) throw InputError(fmt::format("--placement names qubit {} twice", q));
    seen[q] = true;
  }
  const auto start = spec.inverse ? net.final_positions() : net.initial_positions();
  std::vector<int> chain(n);
  for (int k = 0; k < n; ++k) chain[start[spec.input_wire(k)]] = pinned[k];
  if (!is_chain(device, chain)) {
    for (int p = 0; p + 1 < n; ++p)
      if (!device.coupled(chain[p], chain[p + 1]))
        throw InputError(fmt::format(
            "--placement is not a chain for the chain strategy: this network needs qubits {} and {} coupled "
            "(chain order {})",
            chain[p], chain[p + 1], fmt::join(chain, ",")));
  }
  return chain;
}

}  // namespace

namespace {

// True when every coupler has the same two-qubit error and every qubit the same one-qubit error:
// then all chains of a network have the same ESP and there is nothing to choose.
bool uniform_errors(const Device& device) {
  for (int c = 1; c < device.coupler_count(); ++c)
    if (device.coupler_calibration(c).error != device.coupler_calibration(0).error) return false;
  for (int q = 1; q < device.qubit_count(); ++q)
    if (device.qubit_calibration(q).error_1q != device.qubit_calibration(0).error_1q) return false;
  return true;
}

// Largest network (in blocks) whose ESP we evaluate by a dry run during --approx auto.
constexpr long long kMaxScoredBlocks = 4'000'000;

DegreeCandidate score_degree(const Device& device, const QftSpec& base, std::optional<int> degree,
                             const std::vector<int>& chain) {
  QftSpec spec = base;
  spec.approx_degree = degree;
  const auto net = choose_network(spec);
  DegreeCandidate c;
  c.degree = degree;
  c.log_esp = chain_log_esp(device, chain_loads(spec, *net, device.native_2q()), chain);
  c.error_bound = approx_error_bound(spec.qubits, degree);
  c.fidelity_bound = approx_fidelity_lower_bound(c.error_bound);
  c.score = std::exp(c.log_esp) * c.fidelity_bound;
  return c;
}

// Scores degrees 1, 2, ... until the fidelity bound is 1 to within 1e-12 (more rotations then only
// add gates), plus the exact transform when small enough to score, and keeps the best score;
// near-ties (within 1e-12 relative) go to the smaller degree, which has fewer gates.
DegreeChoice choose_degree(const Device& device, const QftSpec& base, const std::vector<int>& chain) {
  DegreeChoice out;
  const int n = base.qubits;
  for (int m = 1; m < n; ++m) {
    out.considered.push_back(score_degree(device, base, m, chain));
    if (out.considered.back().fidelity_bound >= 1.0 - 1e-12) break;
  }
  if (static_cast<long long>(n) * (n - 1) / 2 <= kMaxScoredBlocks || out.considered.empty())
    out.considered.push_back(score_degree(device, base, std::nullopt, chain));
  double best = -1;
  for (const auto& c : out.considered) best = std::max(best, c.score);
  for (const auto& c : out.considered)
    if (c.score >= best * (1.0 - 1e-12)) {
      out.chosen = c.degree;
      break;
    }
  return out;
}

}  // namespace

PreparedPlan prepare_plan(const Device& device, const PlanOptions& options) {
  PreparedPlan plan;
  plan.spec = options.spec;
  if (options.auto_approx) plan.spec.approx_degree.reset();
  validate_spec(device, plan.spec);
  plan.strategy = "chain";
  plan.gates = options.gates.value_or(gate_set_of(device.native_2q()));
  const int n = plan.spec.qubits;

  // A first chain: pinned, or found by the chain finder.
  std::vector<int> chain;
  if (options.placement) {
    // The pin is of input bits; which chain that is depends on the network, so for --approx auto
    // we re-derive it once the degree is known.
    chain = chain_from_pin(device, plan.spec, *choose_network(plan.spec), *options.placement);
    plan.placement.method = "pinned";
  } else {
    const auto found = find_chain(device, n, options.search);
    plan.search_work = found.work;
    if (found.chain.empty()) {
      throw PlanningError(fmt::format(
          "no chain of {} qubits found in {} (longest found: {} qubits{}); a chain strategy needs one",
          n, device.name(), found.longest.size(), found.budget_exhausted ? ", search budget exhausted" : ""));
    }
    chain = found.chain;
    plan.placement.method = "first-found";
  }
  const bool choose_chain = !options.placement && options.calibration_aware && device.has_calibration() &&
                            !uniform_errors(device) && n >= 2;
  // Degree and chain depend on each other; two rounds settle them in practice.
  for (int round = 0; round < 2; ++round) {
    if (options.auto_approx) {
      plan.degree_choice = choose_degree(device, plan.spec, chain);
      plan.spec.approx_degree = plan.degree_choice->chosen;
      if (options.placement) chain = chain_from_pin(device, plan.spec, *choose_network(plan.spec), *options.placement);
    }
    if (!choose_chain) break;
    const auto net = choose_network(plan.spec);
    const auto loads = chain_loads(plan.spec, *net, device.native_2q());
    PlacementSearchOptions pso = options.placement_search;
    pso.seed = options.search.seed;
    const auto choice = best_chain(device, loads, chain, pso);
    plan.placement.method = choice.exhaustive ? "exhaustive" : "beam";
    plan.placement.chains_scored = choice.chains_scored;
    plan.placement.best = choice.best;
    const bool changed = !choice.best.empty() && choice.best.front().chain != chain;
    if (!choice.best.empty()) chain = choice.best.front().chain;
    if (!options.auto_approx || !changed) break;
  }
  if (plan.placement.best.empty()) {
    plan.placement.best.push_back({chain, 0.0});
    const auto net = choose_network(plan.spec);
    plan.placement.best.front().log_esp = chain_log_esp(device, chain_loads(plan.spec, *net, device.native_2q()), chain);
    plan.placement.chains_scored = 1;
  }
  plan.network = choose_network(plan.spec);
  plan.chain = chain;
  plan.maps = chain_maps(plan.spec, *plan.network, plan.chain);
  return plan;
}

PlanReport execute_plan(const Device& device, const PlanOptions& options, const PreparedPlan& plan, GateSink* output) {
  const auto t0 = std::chrono::steady_clock::now();
  const int D = device.qubit_count();
  MetricsSink logical(D), native(D), emitted(D);
  const TwoQubitGate native_gate = device.native_2q();

  // Sinks: the fused stream feeds the logical counters and two decomposition paths; when the
  // emitted gate set is the native one, one decomposition serves both.
  NoiseSink noise(device, plan.maps.placement);
  std::vector<GateSink*> native_targets{&native, &noise};
  std::vector<GateSink*> emitted_targets{&emitted};
  if (output) emitted_targets.push_back(output);
  TeeSink emitted_tee(emitted_targets);
  const bool emitted_is_native = plan.gates == gate_set_of(native_gate);
  if (emitted_is_native) native_targets.push_back(&emitted_tee);
  TeeSink native_tee(native_targets);
  NativeDecomposer to_native(native_gate, native_tee);
  std::unique_ptr<GateSink> emit_path, swap_expander;
  if (!emitted_is_native) {
    if (plan.gates == GateSet::logical) {
      if (options.swap_as_cx) {
        swap_expander = std::make_unique<SwapExpander>(emitted_tee);
        emit_path = std::make_unique<FusedBlockSplitter>(*swap_expander);
      } else {
        emit_path = std::make_unique<FusedBlockSplitter>(emitted_tee);
      }
    }
    else emit_path = std::make_unique<NativeDecomposer>(plan.gates == GateSet::cz ? TwoQubitGate::cz : TwoQubitGate::cx, emitted_tee);
  }
  std::vector<GateSink*> top{&logical, &to_native};
  if (emit_path) top.push_back(emit_path.get());
  TeeSink all(top);

  emit_chain_qft(plan.spec, *plan.network, plan.chain, all);
  if (options.measure)
    for (int k = 0; k < plan.spec.qubits; ++k)
      all.gate(make_gate(GateKind::measure, plan.maps.final_placement[k], k));
  all.finish();

  PlanReport r;
  r.qubits = plan.spec.qubits;
  r.device = device.name();
  r.device_qubits = D;
  r.strategy = plan.strategy;
  r.network = plan.network->name();
  r.approx_degree = plan.spec.approx_degree;
  r.inverse = plan.spec.inverse;
  r.gates = gate_set_name(plan.gates);
  r.native_2q = two_qubit_gate_name(native_gate);
  r.placement = plan.maps.placement;
  r.final_placement = plan.maps.final_placement;
  r.chain = plan.chain;
  r.two_qubit_blocks = logical.two_qubit_count();
  r.swaps = logical.count(GateKind::swap) + logical.count(GateKind::cp_swap);
  r.rotations = logical.count(GateKind::cp) + logical.count(GateKind::cp_swap);
  r.depth_2q = logical.depth_2q();
  r.depth = emitted.depth();
  r.cx_count = native.two_qubit_count();
  r.cx_depth = native.depth_2q();
  r.gate_counts = emitted.counts_by_name();
  r.noise = noise.figures();
  r.calibrated = device.has_calibration();
  r.measured = options.measure;
  r.approx_error_bound = approx_error_bound(plan.spec.qubits, plan.spec.approx_degree);
  r.degree_choice = plan.degree_choice;
  r.placement_choice = plan.placement;
  r.elapsed_ms = std::chrono::duration<double, std::milli>(std::chrono::steady_clock::now() - t0).count();
  return r;
}

PlanReport plan_qft(const Device& device, const PlanOptions& options) {
  const auto t0 = std::chrono::steady_clock::now();
  const auto plan = prepare_plan(device, options);
  auto r = execute_plan(device, options, plan, nullptr);
  r.elapsed_ms = std::chrono::duration<double, std::milli>(std::chrono::steady_clock::now() - t0).count();
  return r;
}

}  // namespace qftplan
