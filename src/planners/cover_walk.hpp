#pragma once
// The cover construction (private to src/planners): the QFT on any connected set of qubits as a
// cascade of walks, one per wire, each walk meeting every unfinished wire once. See cover_walk.cpp
// for the construction and the proof of its CX bound.

#include <cstdint>
#include <vector>

#include "qftplan/device/device.hpp"
#include "qftplan/planners/routed_planner.hpp"

namespace qftplan {

class RunBudget;

/// The register's qubits: the longest chain found (up to n), then the nearest qubits by
/// breadth-first search from it; `region.front()` and the chain's other end are the root candidates.
struct CoverRegion {
  std::vector<int> qubits;  ///< n connected physical qubits, the chain first
  int chain_length = 0;     ///< the longest chain found: qubits[0 .. chain_length - 1]
  std::vector<int> roots;   ///< where the walks may start (one or two chain ends)
};

/// Chooses the region; PlanningError when the component holding it has fewer than n qubits.
CoverRegion cover_region(const Device& device, int n, std::uint64_t seed, const RunBudget* budget);

/// The forward-or-inverse QFT of `spec` on `region` with every walk starting at `root` (a region
/// qubit); `seed` varies the tie-breaking of the walks. `cx_cost` receives the CX count of the
/// construction (cp 2, swap 3, cp_swap 3, parity_step 2).
/// With a `tail_chain` (a path of region qubits from `root`), the walks park on the other region
/// qubits only, and the wires left on the chain finish with the chain network choose_network() picks.
RoutedCircuit build_cover_qft(const Device& device, const QftSpec& spec, const std::vector<int>& region, int root,
                              std::uint64_t seed, const RunBudget* budget, long long* cx_cost,
                              const std::vector<int>& tail_chain = {});

/// The proved bound on the CX count of build_cover_qft for an n-qubit register (cp = 2 CX,
/// cp_swap = 3 CX, parity_step = 2 CX): 0 for n <= 1, 2n^2 - 3n for n >= 2.
long long cover_cx_bound(int n);

}  // namespace qftplan
