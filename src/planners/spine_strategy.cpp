// The spine strategy: a main chain plus every other qubit in trees hanging from it, read as one
// virtual line (spine_layout.cpp); the chain networks run on that line, and a gate between line
// neighbours that are not coupled runs along a path of coupled qubits (SWAPs out, gate, SWAPs back). For registers that do not fit on one chain: heavy-hexagon lattices
// (the setting of Gao, Jin, Guo, Chen and Zhang, arXiv:2402.09705, 2024) and defective chips.

#include "qftplan/core/run_budget.hpp"
#include "qftplan/planners/circuit_figures.hpp"
#include "qftplan/planners/spine_layout.hpp"
#include "strategies.hpp"

namespace qftplan {

namespace {

// One spine plan for a fixed degree on a given layout. The end order restores along the virtual
// line; its SWAPs between uncoupled neighbours take the same detours as every other gate.
PreparedPlan spine_plan(const Device& device, const PlanOptions& options, const SpineLayout& layout,
                        const QftSpec& spec) {
  PreparedPlan plan;
  plan.spec = spec;
  plan.strategy = "spine";
  plan.gates = options.gates.value_or(gate_set_of(device.native_2q()));
  std::shared_ptr<const QftNetwork> network = choose_network(plan.spec, options.end_order, options.network);
  plan.end_swaps = end_swap_count(*network);
  plan.circuit = make_line_circuit(plan.spec, std::move(network), layout.line, layout.detours);
  plan.maps = plan.circuit->maps();
  plan.placement.method = "spine";
  return plan;
}

// The line of the layout or one of its alternatives, whichever gives the fewest native two-qubit gates
// when counted (ties: the layout's own line).
SpineLayout cheapest_line(const Device& device, const PlanOptions& options, SpineLayout layout, const QftSpec& spec) {
  if (layout.alternatives.empty()) return layout;
  const CountSettings settings = count_settings(options, options.gates.value_or(gate_set_of(device.native_2q())));
  auto cx = [&](const SpineLayout& l) {
    return count_circuit(device, *spine_plan(device, options, l, spec).circuit, settings, nullptr).cx_count;
  };
  long long best = cx(layout);
  SpineLayout candidate;
  candidate.spine = layout.spine;
  for (auto& [line, detours] : layout.alternatives) {
    candidate.line = line;
    candidate.detours = detours;
    const long long c = cx(candidate);
    if (c < best) best = c, layout.line = std::move(line), layout.detours = std::move(detours);
  }
  layout.alternatives.clear();
  return layout;
}

}  // namespace

PreparedPlan prepare_spine(const Device& device, const PlanOptions& options) {
  QftSpec spec = options.spec;
  if (options.auto_approx) spec.approx_degree.reset();
  validate_spec(device, spec);
  if (options.placement) throw SettingError("placement", " pins a chain; the spine strategy chooses its own line");
  SpineLayout layout = make_spine_layout(device, spec.qubits, options.search.seed, options.budget,
                                                 options.objective == Objective::depth ||
                                                     options.objective == Objective::duration,
                                                 choose_network(spec, options.end_order, options.network)->rendering() ==
                                                     QftNetwork::Rendering::parity);
  throw_if_interrupted(options.budget);
  layout = cheapest_line(device, options, std::move(layout), spec);
  if (layout.detours.empty() || static_cast<int>(layout.spine.size()) >= spec.qubits)
    throw PlanningError("the register fits on one chain: the chain strategy covers it");
  if (!options.auto_approx) return spine_plan(device, options, layout, spec);
  // Each degree is scored by streaming its spine plan through the counters.
  PreparedPlan scored;
  scored.spec = spec;
  choose_degree_by_counting(device, scored, count_settings(options, gate_set_of(device.native_2q())),
                            [&](const QftSpec& s) { return spine_plan(device, options, layout, s).circuit; });
  PreparedPlan plan = spine_plan(device, options, layout, scored.spec);
  plan.degree_choice = scored.degree_choice;
  plan.cut_short = scored.cut_short;
  return plan;
}

}  // namespace qftplan
