#pragma once
/// \file spine_layout.hpp
/// A main chain (spine) with the other qubits hanging off it in trees, read as one virtual line.

#include <cstdint>
#include <vector>

#include "qftplan/device/device.hpp"
#include "qftplan/sinks/detour_sink.hpp"

namespace qftplan {

class RunBudget;

/// A virtual line over the device: `line[p]` is a physical qubit; consecutive entries are either
/// coupled or joined by a path of coupled qubits listed in `detours`.
struct SpineLayout {
  std::vector<int> spine;                      ///< the main chain
  std::vector<int> line;                       ///< spine qubits, each followed by the trees hanging from it
  std::vector<Detour> detours;                 ///< uncoupled neighbours on the line and the path joining them
  /// The same qubits in other orders that the layout's cost estimate ranks close to `line` (the line
  /// improved by local moves under two readings of the cost); the planner counts each and keeps the
  /// cheapest. Each is a line with its detours, like `line` and `detours`.
  std::vector<std::pair<std::vector<int>, std::vector<Detour>>> alternatives;
};

/// Builds the layout from the graph alone (no positions, any numbering): a long chain grown in the
/// largest connected piece, then every other qubit of that piece in a tree hanging from the chain
/// qubit nearest to it, each tree visited depth first right after its chain qubit. Truncated to `n`
/// qubits; throws PlanningError when the piece has fewer than `n` qubits. `budget` (may be null)
/// bounds the chain's growth; out of time, the longest chain so far is the spine. Deterministic for a seed.
/// The trees are read in place or, for fewer CX, partly gathered at the line's end where detours are
/// cheap; `in_place` keeps them in place, whose short detours keep the depth linear (more CX).
/// Unless `in_place`, lines of up to 1,000 qubits are also improved by local moves (`alternatives`).
/// `fused_swaps`: the network is the parity network, whose step on a line pair fuses with a detour's
/// first SWAP on that pair (sinks/detour_sink.hpp), so detours that start on a line pair cost less.
SpineLayout make_spine_layout(const Device& device, int n, std::uint64_t seed, const RunBudget* budget = nullptr,
                              bool in_place = false, bool fused_swaps = true);

}  // namespace qftplan
