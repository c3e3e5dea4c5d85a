#pragma once
/// \file planned_circuit.hpp
/// What a planning strategy produces: a circuit on physical qubits that knows its qubit maps and
/// its network's name, and streams itself into any gate sink (counters, noise model, writers,
/// checkers, drawings). Nothing outside the planners needs to know which strategy made it.

#include <array>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "qftplan/core/gate.hpp"
#include "qftplan/core/qft_spec.hpp"
#include "qftplan/networks/chain_qft.hpp"
#include "qftplan/networks/qft_network.hpp"
#include "qftplan/sinks/detour_sink.hpp"

namespace qftplan {

struct RoutedCircuit;

/// A planned circuit. Implementations: a chain network on a line of qubits (make_line_circuit) and
/// a routed gate list (make_gate_list_circuit).
class PlannedCircuit {
 public:
  virtual ~PlannedCircuit() = default;
  /// The network's name as the report gives it ("anchored", "parity", "routed", ...).
  virtual std::string network_name() const = 0;
  /// Streams the transform (without the final measurement) into `sink`; does not call finish().
  virtual void emit(GateSink& sink) const = 0;
  /// True when consecutive region qubits form the line the network runs along (chain, spine).
  virtual bool region_is_line() const = 0;
  /// Rotations kept when the stream carries them inside other gates (the parity network has no
  /// controlled phase: each kept rotation is the phase of one parity step); nullopt: count the cp gates.
  virtual std::optional<long long> rotations_inside_gates() const { return std::nullopt; }
  /// True when emit() measures every register qubit itself (the semi-classical form, whose
  /// measurements come mid-circuit): then no final measurement is appended.
  virtual bool measures_itself() const { return false; }
  /// The transform the circuit carries out (its degree filled in).
  const QftSpec& spec() const { return spec_; }
  /// Where the register's bits start and end.
  const QubitMaps& maps() const { return maps_; }
  /// Physical qubits the plan runs on, in order: the chain, the spine's virtual line, or the routed
  /// starting region.
  const std::vector<int>& region() const { return region_; }
  /// Line neighbours joined through a third qubit (spine plans); empty otherwise.
  const std::vector<Detour>& detours() const { return detours_; }

 protected:
  /// Stores what every planned circuit knows.
  PlannedCircuit(QftSpec spec, QubitMaps maps, std::vector<int> region, std::vector<Detour> detours)
      : spec_(std::move(spec)), maps_(std::move(maps)), region_(std::move(region)), detours_(std::move(detours)) {}

 private:
  QftSpec spec_;
  QubitMaps maps_;
  std::vector<int> region_;
  std::vector<Detour> detours_;
};

/// The chain network `network` run along `line` (line[p] = physical qubit at position p); gates
/// between line neighbours listed in `detours` run along their detour paths (sinks/detour_sink.hpp).
std::shared_ptr<const PlannedCircuit> make_line_circuit(const QftSpec& spec, std::shared_ptr<const QftNetwork> network,
                                                        std::vector<int> line, std::vector<Detour> detours = {});

/// The semi-classical measured QFT of `spec` (Griffiths and Niu 1996) on the register qubits
/// `placement` (placement[k] holds input bit k): round k = 0 .. n-1 works on placement[n-1-k], applying
/// for every earlier outcome c[m] with 0 < k - m <= spec.max_distance() the phase spec.rotation(k - m)
/// conditioned on c[m], then h, then measures it into c[k] (output bit k, weight 2^k).
std::shared_ptr<const PlannedCircuit> make_semiclassical_circuit(const QftSpec& spec, std::vector<int> placement);

/// A gate list with its maps (the routed and cover strategies); `network` is the name the report gives.
std::shared_ptr<const PlannedCircuit> make_gate_list_circuit(const QftSpec& spec, RoutedCircuit circuit,
                                                             std::string network = "routed");

}  // namespace qftplan
