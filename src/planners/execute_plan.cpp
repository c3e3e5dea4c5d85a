// Executing a prepared plan: its circuit through the counters (and an output), then the report.

#include <chrono>
#include <cmath>

#include "qftplan/core/approximation.hpp"
#include "strategies.hpp"

namespace qftplan {

namespace {

// The chosen strategy's row of the comparison gets the report's own figures (the same plan), also
// when it was the only strategy that could plan and so was never streamed for a comparison.
void fill_chosen_outcome(PlanReport& r, const CircuitFigures& f) {
  for (auto& o : r.alternatives)
    if (o.ok && o.strategy == r.strategy) {
      fill_figures(o, f);
      o.log_readout_success = r.approx.log_readout_success;
    }
}

PlanReport assemble_report(const Device& device, const PlanOptions& options, const PreparedPlan& plan,
                           const CircuitFigures& f) {
  PlanReport r;
  r.qubits = plan.spec.qubits;
  r.device = device.name();
  r.device_qubits = device.qubit_count();
  r.strategy = plan.strategy;
  r.network = plan.circuit->network_name();
  r.approx_degree = plan.spec.approx_degree;
  r.inverse = plan.spec.inverse;
  r.gates = gate_set_name(plan.gates);
  r.native_2q = two_qubit_gate_name(device.native_2q());
  r.placement = plan.maps.placement;
  r.final_placement = plan.maps.final_placement;
  r.chain = plan.circuit->region();
  r.two_qubit_blocks = f.two_qubit_blocks;
  r.swaps = f.swaps;
  r.rotations = f.rotations;
  r.depth_2q = f.depth_2q;
  r.depth = f.depth;
  r.cx_count = f.cx_count;
  r.cx_depth = f.cx_depth;
  r.gate_counts = f.gate_counts;
  r.peephole_removed = f.peephole_removed;
  r.noise = f.noise;
  r.calibrated = device.has_calibration();
  r.measured = options.measure;
  r.approx = spec_figures(plan.spec, true, options.column_threshold());
  r.block_length = plan.spec.block_length;
  r.approx_error_bound = r.approx.error_bound;
  r.degree_choice = plan.degree_choice;
  r.placement_choice = plan.placement;
  // A chain the time limit left unscored gets the ESP just measured (the same quantity).
  if (!r.placement_choice.best.empty() && std::isnan(r.placement_choice.best.front().log_esp))
    r.placement_choice.best.front().log_esp = r.noise.log_esp_total;
  r.depth_2q_unfused = f.depth_2q_unfused;
  // Lower bounds (ours). Blocks: every kept controlled phase needs a two-qubit gate of its own, and
  // a block carries at most one. Depth: the Hadamard of wire j waits for the rotation between wires
  // j-1 and j, which waits for the Hadamard of wire j-1, so the rotations (0,1), (1,2), ..., (n-2,n-1)
  // form a chain of n-1 two-qubit gates that must run one after another (when d >= 1).
  r.lower_bound_blocks = plan.spec.kept_rotations();
  r.lower_bound_depth_2q = plan.spec.qubits >= 2 && plan.spec.max_distance() >= 1 ? plan.spec.qubits - 1 : 0;
  // The block construction is another unitary: the bounds of the textbook transform do not apply to it.
  if (plan.spec.block_length) r.lower_bound_blocks = r.lower_bound_depth_2q = 0;
  // The semi-classical readout turns every rotation into a phase conditioned on a measured bit: it needs
  // no two-qubit gate, and the bounds of the unitary transform do not apply.
  if (plan.circuit->measures_itself()) r.lower_bound_blocks = r.lower_bound_depth_2q = 0;
  r.alternatives = plan.alternatives;
  fill_chosen_outcome(r, f);
  r.end_order = end_order_name(options.end_order);
  r.end_swaps = plan.end_swaps;
  r.seed = options.search.seed;
  r.cx_bound = plan.cx_bound;
  r.readout = plan.readout;
  if (plan.cx_bound && *plan.cx_bound > 0) r.cx_bound_ratio = double(r.cx_count) / double(*plan.cx_bound);
  return r;
}

}  // namespace

PlanReport execute_plan(const Device& device, const PlanOptions& options, const PreparedPlan& plan, GateSink* output) {
  const auto t0 = std::chrono::steady_clock::now();
  // --strategy auto already streamed this plan through the counters while choosing it.
  const CircuitFigures f = !output && plan.counted
                               ? *plan.counted
                               : count_circuit(device, *plan.circuit, count_settings(options, plan.gates), output);
  PlanReport r = assemble_report(device, options, plan, f);
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
