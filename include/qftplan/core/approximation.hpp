#pragma once
/// \file approximation.hpp
/// How far the approximate QFT is from the exact one: the operator-norm distance, its bound, the
/// average-gate infidelity and the readout success of phase estimation (README "What the numbers mean").
///
/// Degree M keeps the controlled rotations R_k (angle 2 pi/2^k, processing distance k-1) with k <= M and
/// drops the rest (Coppersmith, IBM RC19642, 1994; Barenco, Ekert, Suominen, Toerma, PRA 54, 139, 1996).
/// A degree M >= n drops nothing: every function here treats it as the exact transform.

#include <complex>
#include <cstdint>
#include <optional>

#include "qftplan/core/blockwise_error.hpp"
#include "qftplan/core/qft_spec.hpp"

namespace qftplan {

/// Largest register whose operator-norm distance approx_distance computes exactly.
inline constexpr int kMaxExactDistanceQubits = 12;
/// Readout success and infidelity are summed over every input when at most this many input bits
/// matter (the n - M low bits), else evaluated by the transfer operator (approx_figures).
inline constexpr int kMaxEnumeratedBits = 20;

/// The degree as it acts on n qubits: absent (exact) when `degree` is absent or keeps every rotation (M >= n).
std::optional<int> effective_degree(int n, std::optional<int> degree);

/// Valid upper bound on the operator-norm distance ||AQFT_M - QFT|| (no global phase removed), never
/// above 2; 0 when exact. Derivation in approximation.cpp: the dropped rotations of each qubit form one
/// diagonal factor whose phases lie in [0, theta_i]; a product of unitaries with eigenphases in
/// [0, theta_i] has eigenphases in [0, sum theta_i], so the distance is at most 2 sin(min(pi, sum)/2).
double approx_error_bound(int n, std::optional<int> degree);

/// Work (sum of dim^3 over the dense blocks) above which approx_figures leaves the distance out (at
/// most about 0.1 s of eigenvalues): it leaves out n = 11, 12 at degree 1 and n = 12 at degree 2, whose
/// distances are 2 to within 1e-5.
inline constexpr double kMaxDistanceWork = 1 << 26;

/// The exact operator-norm distance ||AQFT_M - QFT|| (no global phase removed) for n <=
/// kMaxExactDistanceQubits (absent above, or when its dense blocks would cost more than `max_work`);
/// 0 when exact. Block-diagonalised as in approximation.cpp, then the remaining blocks by dense
/// Hermitian eigenvalues (Eigen).
std::optional<double> approx_distance(int n, std::optional<int> degree, double max_work = 1e300);

/// Lower bound on the fidelity |<QFT psi|AQFT psi>|^2 for every state psi, from an operator-norm
/// distance or bound e: Re<U psi|V psi> >= 1 - e^2/2, so fidelity >= (1 - e^2/2)^2 (0 when e^2 >= 2).
double approx_fidelity_lower_bound(double error_bound);

/// How readout_success and approx_infidelity were evaluated.
enum class ReadoutMethod {
  exact,        ///< nothing dropped: 1 and 0
  enumeration,  ///< summed over every input (the n - M bits that matter), exact up to rounding
  transfer,     ///< the bit-chain transfer operator on a Chebyshev grid (approximation.cpp), error ~1e-13
  sampled,      ///< a seeded sample of inputs (the block construction above 16 qubits), with a standard error
};
/// "exact", "enumeration", "transfer" or "sampled" (the report's `readout_method`).
const char* readout_method_name(ReadoutMethod m);

/// The figures of one degree.
struct ApproxFigures {
  std::optional<int> degree;       ///< effective degree: absent when exact
  double error_bound = 0;          ///< approx_error_bound
  std::optional<double> distance;  ///< approx_distance (n <= kMaxExactDistanceQubits; 0 when exact)
  /// Probability that phase estimation with this degree returns the exact n-bit phase, averaged over
  /// the 2^n basis-state phases.
  double readout_success = 1;
  double log_readout_success = 0;  ///< its natural log (finite when readout_success underflows)
  /// Average-gate infidelity 1 - F_avg of AQFT_M against the QFT:
  /// F_avg = (d |Tr(QFT^dag AQFT)/d|^2 + 1)/(d + 1), d = 2^n.
  double infidelity = 0;
  ReadoutMethod method = ReadoutMethod::exact;
  double readout_standard_error = 0;  ///< of a sampled readout_success; 0 otherwise
  /// The block construction's own figures (spec.block_length), absent for the textbook transform.
  std::optional<BlockwiseFigures> blockwise;
};

/// Every figure of degree `degree` on n qubits (the distance only for n <= kMaxExactDistanceQubits, and
/// only `with_distance`).
ApproxFigures approx_figures(int n, std::optional<int> degree, bool with_distance = true);

/// Column distance beyond which an input counts as badly served by the block construction, unless the
/// plan names one (--approx-error).
inline constexpr double kDefaultColumnThreshold = 0.1;

/// The figures of the transform `spec` asks for: approx_figures of its degree, or for the block
/// construction (spec.block_length) blockwise_figures with its columns counted beyond `threshold`: the
/// readout success and infidelity from them, the bound 2 (no better one holds for every input: the
/// construction's worst columns are about sqrt 2 from the QFT's) and no operator-norm distance. A
/// construction of at most two blocks is the exact QFT and reported as such.
/// `work` bounds the sampling (blockwise_figures).
ApproxFigures spec_figures(const QftSpec& spec, bool with_distance = true, double threshold = kDefaultColumnThreshold,
                           double work = 1e7);

/// The input average of the per-input products over `bits` = n - M bits, both by one method:
/// readout = E_x prod_b cos^2(pi delta_b(x)) and overlap = E_x prod_b (1 + e^{-2 pi i delta_b(x)})/2
/// (approximation.cpp). Exposed for the tests.
struct InputAverages {
  double readout = 1;
  double log_readout = 0;
  std::complex<double> overlap{1, 0};
};
/// By enumeration of the 2^bits inputs that matter (bits <= 30).
InputAverages input_averages_enumerated(int bits, int degree);
/// By the transfer operator (any bits).
InputAverages input_averages_transfer(int bits, int degree);

/// A seeded Monte-Carlo estimate of the readout success (mean and standard error over `samples`
/// random inputs): the tests' independent check of the transfer operator where enumeration is out of reach.
struct SampledReadout {
  double mean = 0;
  double standard_error = 0;
};
SampledReadout sample_readout_success(int n, int degree, int samples, std::uint64_t seed);

}  // namespace qftplan
