#pragma once
/// \file spine_layout.hpp
/// A main chain (spine) with dangling qubits, read as one virtual line.

#include <array>
#include <cstdint>
#include <vector>

#include "qftplan/device/device.hpp"

namespace qftplan {

class RunBudget;

/// A virtual line over the device: `line[p]` is a physical qubit; consecutive entries are either
/// coupled or both coupled to a spine qubit listed in `detours` as (a, b, via).
struct SpineLayout {
  std::vector<int> spine;                      ///< the main chain
  std::vector<int> line;                       ///< spine qubits, each followed by its dangling qubits
  std::vector<std::array<int, 3>> detours;     ///< uncoupled neighbours on the line and their via qubit
};

/// Builds the layout: the longest chain found in the largest component, then every qubit one hop
/// off the chain inserted after the chain qubit it hangs from. Truncated to `n` qubits; throws
/// PlanningError when fewer than `n` qubits are within one hop of the spine.
/// `budget` (may be null) bounds the chain search; out of time, the longest chain so far is the spine.
SpineLayout make_spine_layout(const Device& device, int n, std::uint64_t seed, const RunBudget* budget = nullptr);

}  // namespace qftplan
