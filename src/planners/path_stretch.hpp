#pragma once
// Lengthening a simple path by re-routing its stretches (private to src/planners; find_chain runs it
// on the longest path its greedy passes found, before the complete search).

#include <vector>

#include "qftplan/core/run_budget.hpp"
#include "qftplan/device/device.hpp"

namespace qftplan {

/// Re-routes stretches of `path` through qubits off it until it holds `target` qubits or no window
/// gains: for each stretch path[i .. i+w] (w in 4, 8, 16, and every stretch running to an end of the
/// path), a depth-first search looks for a longer path between the same two qubits (or from path[i]
/// to anywhere, at an end) through the stretch's inner qubits and the usable qubits off the path,
/// and splices in the longest it finds within a small cap. The path stays simple and keeps every
/// qubit outside the stretches it re-routes. Spends at most about `work_budget` neighbour
/// inspections (added to `work`); true when the path grew.
bool stretch_path(const Device& device, std::vector<int>& path, int target, long long work_budget, long long& work,
                  BudgetPoll& poll);

}  // namespace qftplan
