#include "qftplan/report/circuit_header.hpp"

#include <fmt/format.h>

namespace qftplan {

CircuitHeader circuit_header(const Device& device, const PlanOptions& options, const PreparedPlan& plan) {
  CircuitHeader h;
  h.device_name = device.name();
  h.device_qubits = device.qubit_count();
  const std::string network = plan.circuit->network_name();
  h.strategy = network == plan.strategy ? plan.strategy : fmt::format("{} ({} network)", plan.strategy, network);
  h.spec = plan.spec;
  h.placement = plan.maps.placement;
  h.final_placement = plan.maps.final_placement;
  h.measured_bits = options.measure ? plan.spec.qubits : 0;
  h.conditioned = plan.circuit->measures_itself();
  return h;
}

}  // namespace qftplan
