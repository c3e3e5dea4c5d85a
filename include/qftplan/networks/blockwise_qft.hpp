#pragma once
/// \file blockwise_qft.hpp
/// The block construction of the approximate QFT of Kahanamoku-Meyer, Blue, Bergamaschi, Gidney and
/// Chuang, "A log-depth in-place quantum Fourier transform that rarely needs ancillas", arXiv:2505.00701,
/// 2025, laid out on a chain. The register is cut into blocks of m bits (block b holds bits
/// [b m, b m + m), the top block may be shorter). Three layers of block transforms, each a chain QFT on
/// at most 2m neighbouring qubits, so the depth depends on m and not on n:
///   A. the exact QFT of every block pair (2i+1, 2i) as one 2m-bit register;
///   B. the inverse QFT of each block of those pairs on its own ("reading the block back");
///   C. the exact QFT of every block pair (2i+2, 2i+1), of block 0 alone, and of the top block alone
///      when it was the high block of a pair in A.
/// Which unitary this is (our reading of the paper, checked by simulation in blockwise_qft_test.cpp):
/// after A, block 2i holds the QFT of its own bits, which B undoes exactly; block 2i+1 holds the exact
/// output factors of its bits truncated to the bits of the pair, and B turns them into a phase-estimation
/// state of the value B_{2i+1} + B_{2i} / 2^m. In C, the block transform of a pair's low block restores
/// its output factors exactly, while the controlled phases it sends to the high block see that
/// phase-estimation state in place of the low block's bits: accurate unless the estimate wraps around
/// (B_{2i+1} near 2^m - 1), the rare bad inputs of the paper. With two blocks or fewer it is exact.

#include <span>
#include <vector>

#include "qftplan/core/gate.hpp"

namespace qftplan {

/// The construction on a chain of n positions (chain[p] = physical qubit at position p, consecutive
/// ones coupled), processing index p (input bit n-1-p) at position p at the start. Gates go to `sink`
/// (the inverse transform: the forward gates backwards with negated angles). Returns the chain position
/// of every processing index at the end of the forward transform (its start for the inverse).
std::vector<int> emit_blockwise_qft(int n, int m, bool inverse, std::span<const int> chain, GateSink& sink);

/// Two-qubit layers of the forward construction on a chain (blocks meet on neighbours only), counted
/// by a dry run of its gates: 2 (2m) - 3 for layer A, the same for B and C, at most.
int blockwise_two_qubit_depth(int n, int m);

}  // namespace qftplan
