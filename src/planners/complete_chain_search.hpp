#pragma once
// The complete search for a simple path of n qubits (private to src/planners; find_chain runs it
// after its greedy phase).

#include <vector>

#include "qftplan/core/run_budget.hpp"
#include "qftplan/device/device.hpp"

namespace qftplan {

/// Outcome of the complete search.
struct CompleteSearchResult {
  std::vector<int> chain;     ///< n qubits when found
  std::vector<int> longest;   ///< the longest path seen
  bool proved_none = false;   ///< every start was searched to the end: no chain of n qubits exists
  long long work = 0;         ///< neighbour inspections spent
};

/// Depth-first search from every start qubit, extending one end in order of fewest free neighbours
/// (Warnsdorff's rule) and cutting a branch when PathBound shows that the qubits still reachable from
/// the path's end cannot make up n. Stops after `work_budget` inspections or when `poll` says so;
/// `proved_none` only when it ran to the end. Deterministic.
CompleteSearchResult complete_chain_search(const Device& device, int n, long long work_budget, BudgetPoll& poll);

}  // namespace qftplan
