// The routed strategy: SWAP routing on any connected device (routed_planner.hpp), also the in-house
// baseline the structured strategies are compared with.

#include "qftplan/core/run_budget.hpp"
#include "strategies.hpp"

namespace qftplan {

PreparedPlan prepare_routed(const Device& device, const PlanOptions& options) {
  PreparedPlan plan = start_plan(device, options, "routed");
  refuse_block_construction(plan, options);
  if (options.placement)
    throw SettingError("placement", " pins a chain; the routed strategy chooses its own starting region");
  RoutingOptions ro = options.routing;
  ro.seed = options.search.seed;
  if (!ro.budget) ro.budget = options.budget;
  if (options.auto_approx) {
    // Each degree is scored by routing it and streaming the gate list through the counters.
    CountSettings count = count_settings(options, gate_set_of(device.native_2q()));
    count.measure = false;
    choose_degree_by_counting(device, plan, count,
                              [&](const QftSpec& s) { return make_gate_list_circuit(s, route_qft(device, s, ro)); });
  }
  RoutedCircuit routed = route_qft(device, plan.spec, ro);
  if (options.end_order == EndOrder::same) plan.end_swaps = restore_order(device, routed.gates, routed.maps);
  plan.circuit = make_gate_list_circuit(plan.spec, std::move(routed));
  plan.maps = plan.circuit->maps();
  plan.placement.method = "routed";
  plan.placement.chains_scored = 0;
  return plan;
}

}  // namespace qftplan
