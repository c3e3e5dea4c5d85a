#include "qftplan/planners/planned_circuit.hpp"

#include <algorithm>

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
    detour.drain();
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
        network_(std::move(network)),
        exchange_rotations_(c.exchange_rotations) {}

  std::string network_name() const override { return network_; }
  bool region_is_line() const override { return false; }
  std::optional<long long> rotations_inside_gates() const override {
    if (exchange_rotations_ == 0) return std::nullopt;
    long long fused = 0;
    for (const Gate& g : gates_) fused += g.kind == GateKind::cp || g.kind == GateKind::cp_swap;
    return fused + exchange_rotations_;
  }
  void emit(GateSink& sink) const override { sink.batch(gates_); }

 private:
  std::vector<Gate> gates_;
  std::string network_;
  long long exchange_rotations_;
};

// The semi-classical measured transform: one qubit at a time, measured as soon as it is done, the
// controlled phases of the unitary network replaced by phases conditioned on earlier outcomes
// (Griffiths and Niu, "Semiclassical Fourier transform for quantum computation", PRL 76, 3228, 1996).
// Round k works on the qubit holding input bit n-1-k: in the unitary network (without its final
// reversal) that qubit ends holding output bit k and takes part only as the control of diagonal gates
// after its Hadamard, so measuring it right after the Hadamard and conditioning those phases on the
// outcome gives the same outcome distribution (the deferred measurement principle; Nielsen and
// Chuang, "Quantum Computation and Quantum Information", 2000, sections 4.4 and 5.2).
class SemiclassicalCircuit final : public PlannedCircuit {
 public:
  SemiclassicalCircuit(const QftSpec& spec, std::vector<int> placement)
      : PlannedCircuit(spec, maps_of(placement), placement, {}) {}

  static QubitMaps maps_of(const std::vector<int>& placement) {
    QubitMaps m;
    m.placement = placement;
    m.final_placement.assign(placement.rbegin(), placement.rend());
    return m;
  }
  std::string network_name() const override { return "semiclassical"; }
  bool region_is_line() const override { return false; }
  bool measures_itself() const override { return true; }
  std::optional<long long> rotations_inside_gates() const override { return spec().kept_rotations(); }
  void emit(GateSink& sink) const override {
    const int n = spec().qubits, reach = spec().max_distance();
    std::vector<Gate> run;
    for (int k = 0; k < n; ++k) {
      const int q = maps().final_placement[k];
      for (int m = std::max(0, k - reach); m < k; ++m) run.push_back(make_gate(GateKind::p_if, q, m, spec().rotation(k - m)));
      run.push_back(make_gate(GateKind::h, q));
      run.push_back(make_gate(GateKind::measure, q, k));
      // Hand on in runs: a big register's stream is never held whole.
      if (run.size() >= 1024) {
        sink.batch(run);
        run.clear();
      }
    }
    if (!run.empty()) sink.batch(run);
  }
};

}  // namespace

std::shared_ptr<const PlannedCircuit> make_semiclassical_circuit(const QftSpec& spec, std::vector<int> placement) {
  return std::make_shared<SemiclassicalCircuit>(spec, std::move(placement));
}

std::shared_ptr<const PlannedCircuit> make_line_circuit(const QftSpec& spec, std::shared_ptr<const QftNetwork> network,
                                                        std::vector<int> line, std::vector<Detour> detours) {
  return std::make_shared<LineCircuit>(spec, std::move(network), std::move(line), std::move(detours));
}

std::shared_ptr<const PlannedCircuit> make_gate_list_circuit(const QftSpec& spec, RoutedCircuit circuit,
                                                             std::string network) {
  return std::make_shared<GateListCircuit>(spec, std::move(circuit), std::move(network));
}

}  // namespace qftplan
