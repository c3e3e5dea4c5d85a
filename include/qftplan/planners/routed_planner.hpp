#pragma once
/// \file routed_planner.hpp
/// The general strategy: SWAP routing of the QFT on any connected device, guided by hop distances
/// and a look-ahead over the rotations the QFT order allows next. Also our in-house baseline.

#include <cstdint>
#include <string>
#include <vector>

#include "qftplan/core/gate.hpp"
#include "qftplan/core/qft_spec.hpp"
#include "qftplan/device/device.hpp"
#include "qftplan/networks/chain_qft.hpp"

namespace qftplan {

class RunBudget;

/// Settings of the router.
struct RoutingOptions {
  std::uint64_t seed = 1;           ///< tie-breaking among equally good SWAPs
  int lookahead_wires = 4;          ///< unfinished wires whose pending rotations steer the SWAP choice
  long long max_swaps = 0;          ///< give up after this many SWAPs (0: 64 n^2 + 4096)
  int max_device_qubits = 5000;     ///< refuse larger devices (the router keeps all hop distances)
  const RunBudget* budget = nullptr;  ///< time limit / interruption: TimeLimitReached or Interrupted (null: none)
};

/// A routed circuit: the logical gate list (h, cp, swap, cp_swap) and its qubit maps.
struct RoutedCircuit {
  std::vector<Gate> gates;
  QubitMaps maps;
  std::vector<int> region;          ///< physical qubits holding the register at the start
  /// Kept rotations done inside exchanges (parity_step with its phase split over rz gates: the cover
  /// strategy's forest visits), which a count of cp and cp_swap gates does not see.
  long long exchange_rotations = 0;
  /// The cover strategy's chain tail: the chain network that finishes the transform (empty: none).
  std::string tail_network;
};

/// Routes the QFT of `spec` on `device`. The register starts on a connected region grown around the
/// longest chain found (the rest added nearest first) and wires are numbered along it, so that
/// consecutive wires start close. Then, repeatedly: apply every Hadamard whose rotations are done
/// and every pending rotation whose two wires sit on a coupler; otherwise apply the SWAP that most
/// reduces the weighted hop distance of the pending rotations of the next `lookahead_wires`
/// unfinished wires (the earliest wire weighing most), with a penalty on undoing the last SWAP; a
/// SWAP between two wires that still owe each other a rotation becomes a fused cp_swap. Controlled
/// phases commute, so any order that keeps each rotation between its two Hadamards is legal.
/// Throws PlanningError when the device is too small, disconnected around the register, or too big.
RoutedCircuit route_qft(const Device& device, const QftSpec& spec, const RoutingOptions& options = {});

}  // namespace qftplan
