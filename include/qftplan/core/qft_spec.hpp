#pragma once
/// \file qft_spec.hpp
/// What transform is asked for: register size, approximation degree, direction.

#include <algorithm>
#include <optional>
#include <string>

#include "qftplan/core/angle.hpp"
#include "qftplan/core/blockwise_error.hpp"

namespace qftplan {

/// Largest register planned: the exact QFT of n qubits has n(n-1)/2 two-qubit blocks (1.3e8 at
/// this cap), and OpenQASM 2 writes angles pi/2^k with all decimal digits of 2^k.
inline constexpr int kMaxRegisterQubits = 16'384;

/// The QFT to plan. Logical qubit k holds the input bit of weight 2^k (little-endian).
/// The forward QFT maps |j> to 2^(-n/2) sum_y exp(2 pi i j y / 2^n) |y>
/// (Nielsen & Chuang, Quantum Computation and Quantum Information, 2000, section 5.1, eq. 5.2).
struct QftSpec {
  int qubits = 0;
  /// Approximate QFT of degree M: keep controlled rotations R_k = diag(1, e^{2 pi i/2^k}) with
  /// k <= M and drop the rest (Coppersmith, IBM RC19642, 1994; Barenco et al., PRA 54, 139, 1996).
  /// Absent: exact.
  std::optional<int> approx_degree;
  bool inverse = false;
  /// The block construction of Kahanamoku-Meyer, Blue, Bergamaschi, Gidney and Chuang (arXiv:2505.00701,
  /// 2025) with blocks of this many bits (networks/blockwise_qft.hpp; approx_degree is then absent): a
  /// different unitary from the textbook approximate QFT, exact with at most two blocks.
  std::optional<int> block_length;

  /// Largest distance j - i in processing order whose controlled phase is kept: M - 1, or n - 1
  /// when exact (the rotation between processing indices i < j is R_{j-i+1}, angle pi/2^(j-i)).
  int max_distance() const {
    const int full = qubits - 1;
    // The block construction's rotations span at most a block pair (distance 2m - 1).
    if (block_length) return std::max(0, std::min(full, 2 * *block_length - 1));
    if (!approx_degree) return full;
    return std::max(0, std::min(full, *approx_degree - 1));
  }
  /// True when the degree keeps every rotation (the block construction: at most two blocks).
  bool effectively_exact() const {
    if (block_length) return *block_length >= 1 && blockwise_exact(qubits, *block_length);
    return max_distance() == qubits - 1;
  }
  /// The controlled-phase angle between processing indices at distance `dist` (>= 1):
  /// pi/2^dist, negated for the inverse.
  Angle rotation(int dist) const {
    const Angle a = Angle::pi_over_pow2(static_cast<std::uint32_t>(dist));
    return inverse ? -a : a;
  }
  /// Processing index: the forward QFT treats logical qubit n-1 first (processing index 0), then
  /// n-2, and so on; the wire of processing index i ends holding output bit i (the textbook bit
  /// reversal, which we never emit). The inverse runs the same network backwards.
  /// Processing index whose wire holds input bit `k` at the start.
  int input_wire(int k) const { return inverse ? k : qubits - 1 - k; }
  /// Processing index whose wire holds output bit `k` at the end.
  int output_wire(int k) const { return inverse ? qubits - 1 - k : k; }

  /// Number of controlled phases kept: sum over distances 1..max_distance of (n - dist). The block
  /// construction: every rotation of its block transforms (pairs in layers A and C, single blocks in B and
  /// for block 0 and a top block in C), s(s-1)/2 for a transform of s bits.
  long long kept_rotations() const {
    if (!block_length) {
      const long long n = qubits, d = max_distance();
      return d * n - d * (d + 1) / 2;
    }
    const long long m = std::max(1, *block_length), k = (qubits + m - 1) / m;
    const auto size = [&](long long b) { return std::min(m, qubits - b * m); };
    const auto pairs = [](long long s) { return s * (s - 1) / 2; };
    long long r = pairs(size(0));
    for (long long b = 1; b < k; b += 2)  // A, then B on each of its two blocks
      r += pairs(size(b - 1) + size(b)) + pairs(size(b - 1)) + pairs(size(b));
    for (long long b = 2; b < k; b += 2) r += pairs(size(b - 1) + size(b));
    if (k % 2 == 0 && k > 1) r += pairs(size(k - 1));
    return r;
  }
};

}  // namespace qftplan
