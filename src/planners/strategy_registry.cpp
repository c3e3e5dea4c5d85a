// The table of planning strategies: dispatch, the --help text, the Python module and the one
// "unknown strategy" error all come from it. A new strategy is one new file and one row here.

#include <stdexcept>

#include <fmt/format.h>

#include "qftplan/core/run_budget.hpp"
#include "strategies.hpp"

namespace qftplan {

// The strategies, one file each (NAME_strategy.cpp).
PreparedPlan prepare_auto(const Device& device, const PlanOptions& options);
PreparedPlan prepare_chain(const Device& device, const PlanOptions& options);
PreparedPlan prepare_spine(const Device& device, const PlanOptions& options);
PreparedPlan prepare_cover(const Device& device, const PlanOptions& options);
PreparedPlan prepare_routed(const Device& device, const PlanOptions& options);
// A measured plan's readout form (semiclassical_strategy.cpp): the unitary plan of `unitary`, the
// semi-classical one, or the better of the two (--readout).
PreparedPlan prepare_measured(const Device& device, const PlanOptions& options,
                              PreparedPlan (*unitary)(const Device&, const PlanOptions&));

const std::vector<StrategyInfo>& plan_strategies() {
  static const std::vector<StrategyInfo> table{
      {"auto", "try every strategy that applies and keep the best by --objective", &prepare_auto, true, true},
      {"chain", "a chain of n qubits carrying one of the networks of --network (needs a simple path of n qubits)",
       &prepare_chain, true, true},
      {"spine", "a main chain plus the qubits dangling off it as one line (heavy-hexagon, defective chips)",
       &prepare_spine, false, true},
      {"cover", "a cascade of walks, one per wire, on any connected region, with a proved CX bound (arXiv:2510.09824)",
       &prepare_cover, false, false},
      {"routed", "SWAP routing with look-ahead on any connected device; also the in-house baseline", &prepare_routed, false, false},
  };
  return table;
}

const StrategyInfo& find_strategy(const std::string& name) {
  for (const auto& s : plan_strategies())
    if (name == s.name) return s;
  std::string names;
  for (const auto& s : plan_strategies()) names += std::string(names.empty() ? "" : ", ") + s.name;
  throw InputError("unknown strategy '" + name + "' (valid: " + names + ")");
}

namespace {

// A pinned placement may not name a qubit out of service (whatever the strategy).
void refuse_pins_out_of_service(const Device& device, const std::vector<int>& pinned) {
  for (int q : pinned)
    if (q >= 0 && q < device.qubit_count() && !device.usable(q))
      throw SettingError("placement", fmt::format(" names qubit {}, which is out of service on {} ({})", q,
                                                  device.name(), device.out_of_service_reason(q)));
}

// The guarantee that no plan touches a part out of service, checked where every plan passes: every
// planner works on Device's graph of the parts in service; this catches a planner that picked an
// isolated qubit out of service by looping over all qubits.
void assert_in_service(const Device& device, const PreparedPlan& plan) {
  if (!device.has_parts_out_of_service() || !plan.circuit) return;
  for (const auto* qs : {&plan.circuit->region(), &plan.maps.placement, &plan.maps.final_placement})
    for (int q : *qs)
      if (q < 0 || q >= device.qubit_count() || !device.usable(q))
        throw std::logic_error(fmt::format("the {} strategy placed the register on qubit {}, which is out of service",
                                           plan.strategy, q));
}

}  // namespace

PreparedPlan prepare_plan(const Device& device, const PlanOptions& options) {
  const StrategyInfo& s = find_strategy(options.strategy);
  // A named network is never replaced silently by a strategy that builds its own circuit.
  if (options.network != NetworkChoice::automatic && !s.runs_networks)
    throw SettingError("network", fmt::format(" {} names a chain network, which the {} strategy does not use; plan "
                                              "with a strategy that runs chain networks or leave the network to auto",
                                              network_choice_name(options.network), s.name));
  if (options.placement) refuse_pins_out_of_service(device, *options.placement);
  PreparedPlan p = options.measure ? prepare_measured(device, options, s.prepare) : s.prepare(device, options);
  assert_in_service(device, p);
  throw_if_interrupted(options.budget);
  // A search that stopped at the deadline without saying so (it kept its best so far) still means
  // the time limit decided: report it, so the command line exits 3.
  if (p.cut_short.empty() && options.budget && options.budget->stop_reason() == StopReason::time_limit)
    p.cut_short = "the searches";
  return p;
}

}  // namespace qftplan
