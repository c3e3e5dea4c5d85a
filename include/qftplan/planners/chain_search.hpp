#pragma once
/// \file chain_search.hpp
/// Finding a simple path (chain) of n qubits in a device graph.

#include <cstdint>
#include <vector>

#include "qftplan/device/device.hpp"

namespace qftplan {

class RunBudget;

/// Settings of the search. Defaults suit devices up to ~10^5 qubits.
struct ChainSearchOptions {
  std::uint64_t seed = 1;                    ///< varies tie-breaking and restarts; same seed, same chain
  long long work_budget = 50'000'000;        ///< neighbour inspections before giving up
  int complete_limit = 4000;                 ///< devices whose components able to hold the chain have at most
                                             ///< this many qubits in all get the complete search (within budget)
  const RunBudget* budget = nullptr;         ///< time limit / interruption, polled in the loops (null: none)
};

/// Outcome: `chain` has exactly n qubits when found, else is empty and `longest` is the longest
/// simple path seen.
struct ChainSearchResult {
  std::vector<int> chain;
  std::vector<int> longest;
  long long work = 0;
  bool budget_exhausted = false;
  bool time_out = false;  ///< stopped by the RunBudget (deadline or interruption) before finishing
  bool proved_none = false;  ///< the complete search ran to its end: no chain of n qubits exists
};

/// Looks for a simple path of `n` qubits. Strategy: greedy extension from several starting qubits
/// (ends of long shortest paths, low-degree qubits, then seeded random ones), preferring the
/// neighbour that keeps the drawing direction (snakes on grids and heavy-hexagon rows) and then the
/// one with fewest free neighbours (Warnsdorff's rule); when stuck, Pósa rotations (reverse the
/// path's tail at a neighbour of its end) open new ends. When that finds none, devices up to
/// `complete_limit` qubits get a complete depth-first search pruned by upper bounds on the path's
/// reach (block-cut tree and colour alternation), which either finds a chain or proves there is none.
/// Deterministic for a given seed.
ChainSearchResult find_chain(const Device& device, int n, const ChainSearchOptions& options = {});

/// True when `chain` is a simple path in the device (distinct, in range, consecutive ones coupled).
bool is_chain(const Device& device, const std::vector<int>& chain);

}  // namespace qftplan
