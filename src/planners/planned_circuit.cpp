#include "qftplan/planners/planned_circuit.hpp"

#include "qftplan/planners/routed_planner.hpp"
#include "qftplan/sinks/detour_sink.hpp"

namespace qftplan {

namespace {

// A chain network on a line: the chain strategy (every neighbour coupled) and the spine strategy
// (some neighbours joined through a detour).
class LineCircuit final : public PlannedCircuit {
 public:
  LineCircuit(const QftSpec& spec, std::shared_ptr<const QftNetwork> network, std::vector<int> line,
              std::vector<Detour> detours)
      : PlannedCircuit(spec, chain_maps(spec, *network, line), line, std::move(detours)), network_(std::move(network)) {}

  std::string network_name() const override { return network_->name(); }
  bool region_is_line() const override { return true; }
  std::optional<long long> rotations_inside_gates() const override {
    if (!network_->parity()) return std::nullopt;
    return spec().kept_rotations();
  }
  void emit(GateSink& sink) const override {
    if (detours().empty()) {
      emit_chain_qft(spec(), *network_, region(), sink);
      return;
    }
    DetourSink detour(sink);
    for (const Detour& d : detours()) detour.add(d);
    emit_chain_qft(spec(), *network_, region(), detour);
  }

 private:
  std::shared_ptr<const QftNetwork> network_;
};

// A gate list made by the router.
class GateListCircuit final : public PlannedCircuit {
 public:
  GateListCircuit(const QftSpec& spec, RoutedCircuit c, std::string network)
      : PlannedCircuit(spec, std::move(c.maps), std::move(c.region), {}),
        gates_(std::move(c.gates)),
        network_(std::move(network)) {}

  std::string network_name() const override { return network_; }
  bool region_is_line() const override { return false; }
  void emit(GateSink& sink) const override { sink.batch(gates_); }

 private:
  std::vector<Gate> gates_;
  std::string network_;
};

}  // namespace

std::shared_ptr<const PlannedCircuit> make_line_circuit(const QftSpec& spec, std::shared_ptr<const QftNetwork> network,
                                                        std::vector<int> line, std::vector<Detour> detours) {
  return std::make_shared<LineCircuit>(spec, std::move(network), std::move(line), std::move(detours));
}

std::shared_ptr<const PlannedCircuit> make_gate_list_circuit(const QftSpec& spec, RoutedCircuit circuit,
                                                             std::string network) {
  return std::make_shared<GateListCircuit>(spec, std::move(circuit), std::move(network));
}

}  // namespace qftplan
