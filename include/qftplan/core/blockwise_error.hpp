#pragma once
/// \file blockwise_error.hpp
/// How far the block construction of the QFT (Kahanamoku-Meyer, Blue, Bergamaschi, Gidney, Chuang,
/// "A log-depth in-place quantum Fourier transform that rarely needs ancillas", arXiv:2505.00701, 2025;
/// the circuit: networks/blockwise_qft.hpp) is from the exact QFT, per input and on average.
///
/// The construction is not the textbook approximate QFT: its error is small on most basis inputs and
/// large on a few (the paper's "optimistic" circuit). Its figures are therefore averages over inputs:
/// the normalised Frobenius distance, the fraction of inputs whose column is farther than a threshold,
/// and the readout success of phase estimation. Every one follows from the overlap <QFT x|U x> of each
/// basis input x, which blockwise_overlap computes in closed form (derivation in blockwise_error.cpp) in
/// O((n/m) 2^m) operations, so inputs can be enumerated (n <= kMaxEnumeratedBlockwiseQubits) or sampled
/// at any n.

#include <complex>
#include <cstdint>
#include <span>

namespace qftplan {

/// Registers whose 2^n basis inputs are all evaluated; above, a seeded sample.
inline constexpr int kMaxEnumeratedBlockwiseQubits = 16;
/// Largest block length whose figures are computed (the overlap costs 2^m per block pair).
inline constexpr int kMaxBlockwiseFigureLength = 24;

/// Blocks of the construction: ceil(n / m).
int blockwise_blocks(int n, int m);

/// True when the construction is the exact QFT (at most two blocks).
inline bool blockwise_exact(int n, int m) { return blockwise_blocks(n, m) <= 2; }

/// <QFT x | U x> for the basis input x given by its bits (bits[k] = bit of weight 2^k, n = bits.size()),
/// QFT of Nielsen & Chuang (2000), eq. 5.2, U the construction with blocks of m bits (m <= 30).
std::complex<double> blockwise_overlap(int m, std::span<const std::uint8_t> bits);

/// The construction's figures on n qubits with blocks of m.
struct BlockwiseFigures {
  int block_length = 0;
  int blocks = 0;
  bool exact = false;       ///< at most two blocks: U is the QFT
  bool sampled = false;     ///< false: every basis input was evaluated
  long long inputs = 0;     ///< basis inputs evaluated
  /// Probability that phase estimation run with the inverse construction returns the exact n-bit phase,
  /// averaged over the 2^n basis phases: E_x |<QFT x|U x>|^2.
  double readout_success = 1;
  double readout_standard_error = 0;  ///< 0 unless sampled
  /// ||U - QFT||_F / sqrt(2^n) = sqrt(E_x ||U x - QFT x||^2), in [0, 2].
  double frobenius = 0;
  double frobenius_standard_error = 0;  ///< delta method on the sampled mean; 0 unless sampled
  /// Fraction of basis inputs whose column distance ||U x - QFT x|| exceeds `threshold`.
  double threshold = 0;
  double fraction_above = 0;
  double fraction_above_standard_error = 0;
  double worst_column = 0;  ///< largest column distance among the inputs evaluated
  /// Average-gate infidelity 1 - (d |E_x <QFT x|U x>|^2 + 1)/(d + 1), d = 2^n (Nielsen, Phys. Lett. A
  /// 303, 249, 2002); from the sampled mean when sampled.
  double infidelity = 0;
};

/// Figures by enumeration (n <= `enumerate_up_to`) or by a seeded sample of about `work` / ((n/m) 2^m)
/// inputs (at least 8, at most 4096). m must be at most kMaxBlockwiseFigureLength.
BlockwiseFigures blockwise_figures(int n, int m, double threshold, std::uint64_t seed = 1, double work = 1e7,
                                   int enumerate_up_to = kMaxEnumeratedBlockwiseQubits);

}  // namespace qftplan
