#pragma once
// Upper bounds on how far a simple path can go (private to src/planners; the complete chain search
// prunes with them).

#include <vector>

#include "qftplan/device/device.hpp"

namespace qftplan {

/// The most qubits a simple path can have that starts at `start` and otherwise uses only qubits
/// where `usable` is true (`start` itself need not be usable). Computed on the blocks (biconnected
/// components) of that subgraph, rooted at `start`: a simple path passes through the blocks of one
/// root-to-leaf chain of the block-cut tree, and in a bipartite graph it alternates colours, so it
/// holds at most min(size, 2 A + 1, 2 B) qubits, where A and B count the usable qubits of the two
/// colours along the chain (B: the colour of `start`). Ours, from two textbook facts: the block
/// structure of paths (Harary, "Graph Theory", 1969, ch. 3) and the alternation of colours on a path
/// of a bipartite graph (common practice).
class PathBound {
 public:
  /// Prepares the work arrays for `device`; `colour` is a proper 2-colouring (0/1 per qubit) when the
  /// graph is bipartite, else empty.
  PathBound(const Device& device, std::vector<signed char> colour);
  /// The bound for a path from `start` through qubits with usable[q] != 0. Costs O(qubits + couplers)
  /// of the part reachable from `start`; adds that to `work`.
  int from(int start, const std::vector<char>& usable, long long& work);
  /// The qubits the last call to `from` reached (`start` first), valid until the next call.
  const std::vector<int>& reached() const { return touched_; }

 private:
  const Device& dev_;
  std::vector<signed char> colour_;
  std::vector<int> disc_, low_, parent_, next_child_;
  std::vector<int> stack_;           // Tarjan's vertex stack
  std::vector<int> best_size_, best_a_, best_b_;  // best chain below each vertex (blocks attached there)
  std::vector<int> touched_;
  int clock_ = 0;
};

/// A proper 2-colouring of `device` (0/1 per qubit), or empty when some component has an odd cycle.
std::vector<signed char> two_colouring(const Device& device);

}  // namespace qftplan
