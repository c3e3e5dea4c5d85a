// The block construction's overlap with the exact QFT, per basis input, in closed form.
//
// Notation (ours). In-place QFT of an s-bit register (the textbook circuit without its final swaps,
// Nielsen & Chuang 2000, eq. 5.4 and fig. 5.1): qubit t of the register ends in
// (|0> + e^{2 pi i v / 2^(t+1)} |1>)/sqrt2 for the input value v. For a real theta write
// |F_s(theta)> for the product state with those phases for v = theta; then
//     <F_s(a)|F_s(b)> = prod_t (1 + e^{2 pi i (b-a)/2^(t+1)})/2 = D_s(b - a),
//     D_s(delta) = 2^-s sum_{w < 2^s} e^{2 pi i w delta / 2^s}           (the Dirichlet kernel),
// and the inverse in-place QFT of |F_s(theta)> has amplitude D_s(theta - u) on |u> (phase estimation,
// Nielsen & Chuang, section 5.2: exact when theta is whole, spread round it otherwise).
//
// The construction (arXiv:2505.00701; blocks b of s_b bits from bit b m, s_b = m except the top one):
//   A. the in-place QFT of each block pair (2i+1, 2i); B. the inverse in-place QFT of each block of those
//   pairs; C. the in-place QFT of block 0, of each pair (2i+2, 2i+1), and of the top block when A paired it.
// On the input x with block values z_b:
//   after A, the low block's qubit t holds v/2^(t+1) = z_2i/2^(t+1) (whole turns drop), the high block's
//   qubit t holds (z_2i+1 + z_2i/2^m)/2^(t+1). B therefore returns block 2i to |z_2i> exactly and leaves
//   block 2i+1 in the phase-estimation state sum_u D(theta_i - u)|u>, theta_i = z_2i+1 + z_2i / 2^m. A
//   top block A did not pair keeps |z_top>.
//   The exact QFT leaves qubit g of the register in F(x/2^(g+1)): for block b that is F_{s_b}(theta*_b),
//   theta*_b = z_b + r_b, r_b = (x mod 2^(b m)) / 2^(b m) in [0, 1).
//   C on block 0 (|z_0>) gives F(z_0) = the exact factor. C on the pair (2i+2, 2i+1) with the low block in
//   sum_u D_m(theta_i - u)|u> and the high block in |z_h> gives sum_u D_m(theta_i - u) F_m(u) (x)
//   F_{s_h}(z_h + u/2^m); its overlap with the exact factors F_m(theta*) (x) F_{s_h}(z_h + theta*/2^m),
//   theta* = theta*_{2i+1}, is
//       G = sum_{u < 2^m} D_m(theta_i - u) D_m(u - theta*) D_{s_h}((u - theta*) / 2^m).
//   C on the top block alone (A paired it: it holds the estimate of theta_top) gives F(theta_top), overlap
//   D_s(theta_top - theta*_top).
// So <QFT x|U x> is the product of the G of every pair of C and the top block's factor. theta* - theta_i
// = r_2i / 2^m < 2^-m: the low block of each pair is exact to that, and the high block sees the estimate's
// spread through D_{s_h}((u - theta*)/2^m), which is small unless u wraps round (theta* near 2^m): the
// rare inputs with large error. With at most two blocks every factor is 1 (theta_top = theta*_top).
// The same derivation with the output bits reversed once more gives the QFT of eq. 5.2; the test
// (tests/blockwise_qft_test.cpp) checks every overlap against the emitted gates and FFTW.

#include "qftplan/core/blockwise_error.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>
#include <random>
#include <stdexcept>
#include <vector>

namespace qftplan {

namespace {

using cd = std::complex<double>;
constexpr double kPi = std::numbers::pi;

// D_s(delta) = 2^-s sum_{w < 2^s} e^{2 pi i w delta/2^s}
//            = e^{i pi f} sin(pi f) (cot(pi delta/2^s) - i) / 2^s,   f = delta - floor(delta),
// (the geometric sum; the factor (-1)^floor(delta) of e^{i pi delta} and of sin(pi delta) cancels, and the
// expression is 2^s-periodic in delta as D is). At delta = 0 mod 2^s it is 1.
cd dirichlet(int s, double delta) {
  const double size = std::ldexp(1.0, s);
  const double wraps = std::round(delta / size);
  const double near = delta - wraps * size;  // delta reduced to [-2^(s-1), 2^(s-1)]
  if (std::abs(near) < 1e-12) return std::polar(1.0, kPi * near * (size - 1) / size);
  const double f = delta - std::floor(delta);
  if (f == 0) return 0.0;  // a whole delta that is not a multiple of 2^s
  const double angle = kPi * near / size;
  return std::polar(std::sin(kPi * f), kPi * f) * cd(std::cos(angle) / std::sin(angle), -1.0) / size;
}

// G = sum_{u < 2^m} D_m(theta - u) D_m(u - exact) D_s((u - exact)/2^m) (see the top of this file). With
// D_s(delta) = (e^{2 pi i delta} - 1)(cot(pi delta/2^s) - i)/(2i 2^s), the first two factors' first terms
// do not depend on u, and the cotangents' angles move by fixed steps: the loop turns three phasors
// instead of calling trigonometric functions (set again exactly every 64 steps; a term near a pole of a
// cotangent is taken by the direct formula).
cd pair_factor(int m, int s, double theta, double exact) {
  const double M = std::ldexp(1.0, m), S = std::ldexp(1.0, s);
  const int count = 1 << m;
  const auto direct = [&](int u) { return dirichlet(m, theta - u) * dirichlet(m, u - exact) * dirichlet(s, (u - exact) / M); };
  const double fa = theta - std::floor(theta), fb = -exact - std::floor(-exact);
  cd g = 0.0;
  if (fa == 0 || fb == 0) {  // a whole estimate: one of the first two kernels is a single spike
    for (int u = 0; u < count; ++u) g += direct(u);
    return g;
  }
  // (e^{2 pi i f} - 1)/(2i) = e^{i pi f} sin(pi f), exact for the fractional part f.
  const cd k0 = std::polar(std::sin(kPi * fa), kPi * fa) * std::polar(std::sin(kPi * fb), kPi * fb) / (M * M);
  const cd step_a = std::polar(1.0, -kPi / M), step_b = std::polar(1.0, kPi / M), step_c = std::polar(1.0, kPi / (M * S));
  const cd i2(0.0, 2.0);
  cd qa, qb, qc;
  for (int u = 0; u < count; ++u) {
    if (u % 64 == 0) {
      qa = std::polar(1.0, kPi * (theta - u) / M);
      qb = std::polar(1.0, kPi * (u - exact) / M);
      qc = std::polar(1.0, kPi * (u - exact) / (M * S));
    }
    if (std::abs(qa.imag()) < 1e-6 || std::abs(qb.imag()) < 1e-6 || std::abs(qc.imag()) < 1e-6) {
      g += direct(u);
    } else {
      const cd c = (qb * qb - 1.0) * cd(qc.real() / qc.imag(), -1.0) / (i2 * S);
      g += k0 * cd(qa.real() / qa.imag(), -1.0) * cd(qb.real() / qb.imag(), -1.0) * c;
    }
    qa *= step_a;
    qb *= step_b;
    qc *= step_c;
  }
  return g;
}

struct Blocks {
  int m = 0;
  int k = 0;
  std::vector<int> size;
  std::vector<double> z;  // block values
  std::vector<double> r;  // r_b: the bits below block b as a fraction in [0, 1)
};

Blocks read_blocks(int m, std::span<const std::uint8_t> bits) {
  const int n = static_cast<int>(bits.size());
  Blocks b;
  b.m = m;
  b.k = blockwise_blocks(n, m);
  b.size.resize(b.k);
  b.z.assign(b.k, 0.0);
  b.r.assign(b.k, 0.0);
  for (int j = 0; j < b.k; ++j) {
    b.size[j] = std::min(m, n - j * m);
    std::uint64_t v = 0;
    for (int t = b.size[j] - 1; t >= 0; --t) v = (v << 1) | (bits[j * m + t] & 1u);
    b.z[j] = static_cast<double>(v);
    if (j > 0) b.r[j] = (b.z[j - 1] + b.r[j - 1]) / std::ldexp(1.0, b.size[j - 1]);
  }
  return b;
}

}  // namespace

int blockwise_blocks(int n, int m) {
  if (n < 1 || m < 1) throw std::invalid_argument("blockwise: need n >= 1 and m >= 1");
  return (n + m - 1) / m;
}

cd blockwise_overlap(int m, std::span<const std::uint8_t> bits) {
  if (m < 1 || m > 30) throw std::invalid_argument("blockwise_overlap: block length outside 1..30");
  const Blocks b = read_blocks(m, bits);
  const double size = std::ldexp(1.0, m);
  cd overlap = 1.0;
  for (int lo = 1; lo + 1 < b.k; lo += 2) {  // C's pair (lo + 1, lo), lo = 2i+1
    const double theta = b.z[lo] + b.z[lo - 1] / size;
    const double exact = b.z[lo] + b.r[lo];
    overlap *= pair_factor(m, b.size[lo + 1], theta, exact);
  }
  if (b.k % 2 == 0 && b.k > 1) {  // the top block, paired in A, transformed alone in C
    const int top = b.k - 1;
    const double theta = b.z[top] + b.z[top - 1] / size;
    overlap *= dirichlet(b.size[top], theta - (b.z[top] + b.r[top]));
  }
  return overlap;
}

BlockwiseFigures blockwise_figures(int n, int m, double threshold, std::uint64_t seed, double work,
                                   int enumerate_up_to) {
  BlockwiseFigures f;
  f.block_length = m;
  f.blocks = blockwise_blocks(n, m);
  f.threshold = threshold;
  f.exact = blockwise_exact(n, m);
  if (f.exact) return f;
  if (m > kMaxBlockwiseFigureLength)
    throw std::invalid_argument("blockwise_figures: block length above " + std::to_string(kMaxBlockwiseFigureLength));
  f.sampled = n > enumerate_up_to;
  const double per_input = std::max(1.0, f.blocks / 2.0 * std::ldexp(1.0, m));
  const long long count =
      f.sampled ? std::clamp(static_cast<long long>(work / per_input), 8LL, 4096LL) : (1LL << n);
  std::vector<std::uint8_t> bits(n);
  std::mt19937_64 rng(seed);
  double sum_r = 0, sum_r2 = 0, sum_c = 0, sum_c2 = 0, above = 0;
  cd sum_ov = 0;
  for (long long t = 0; t < count; ++t) {
    if (f.sampled) {
      std::uint64_t word = 0;
      for (int k = 0; k < n; ++k) {
        if (k % 64 == 0) word = rng();
        bits[k] = static_cast<std::uint8_t>((word >> (k % 64)) & 1);
      }
    } else {
      for (int k = 0; k < n; ++k) bits[k] = static_cast<std::uint8_t>((t >> k) & 1);
    }
    const cd ov = blockwise_overlap(m, bits);
    const double r = std::norm(ov);
    const double c = std::max(0.0, 2 - 2 * ov.real());  // ||U x - QFT x||^2 for unit columns
    sum_r += r;
    sum_r2 += r * r;
    sum_c += c;
    sum_c2 += c * c;
    sum_ov += ov;
    if (std::sqrt(c) > threshold) above += 1;
    f.worst_column = std::max(f.worst_column, std::sqrt(c));
  }
  const double N = static_cast<double>(count);
  f.inputs = count;
  f.readout_success = sum_r / N;
  const double mean_c = sum_c / N;
  f.frobenius = std::sqrt(mean_c);
  f.fraction_above = above / N;
  const double dim = std::ldexp(1.0, n);
  const double overlap2 = std::norm(sum_ov / N);
  f.infidelity = std::max(0.0, 1 - (dim * overlap2 + 1) / (dim + 1));
  if (f.sampled) {
    const auto standard_error = [N](double sum, double sum2) {
      const double mean = sum / N;
      return std::sqrt(std::max(0.0, (sum2 - N * mean * mean) / (N - 1)) / N);
    };
    f.readout_standard_error = standard_error(sum_r, sum_r2);
    const double se_c = standard_error(sum_c, sum_c2);
    f.frobenius_standard_error = f.frobenius > 0 ? se_c / (2 * f.frobenius) : std::sqrt(se_c);
    f.fraction_above_standard_error = std::sqrt(f.fraction_above * (1 - f.fraction_above) / N);
  }
  return f;
}

}  // namespace qftplan
