#pragma once
// Private to the checker: the block construction of Kahanamoku-Meyer, Blue, Bergamaschi, Gidney and
// Chuang (arXiv:2505.00701, 2025) as its description reads, written once for both checks (the
// state-vector reference, qft_reference.cpp, and the structural proof's schedule, structural_checker.cpp)
// and independently of the network that plans it (networks/blockwise_qft.cpp).

#include <vector>

namespace qftplan {

/// An in-place transform (the textbook circuit without its final swaps) of bits [low, low + size), or its
/// inverse.
struct BlockStep {
  int low;
  int size;
  bool inverse;
};

/// The forward construction on n bits, blocks of m cut from bit 0: A, the transform of each block pair
/// (2i+1, 2i); B, each block of those pairs back by its inverse (the high block first); C, block 0, each
/// pair (2i+2, 2i+1), and the top block when A paired it.
std::vector<BlockStep> block_construction_steps(int n, int m);

}  // namespace qftplan
