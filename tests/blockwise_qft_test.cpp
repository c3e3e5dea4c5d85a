// The block construction of the approximate QFT (blockwise_qft.hpp) simulated gate by gate and compared
// with (1) the construction as the paper defines it, written here from dense block matrices, and (2)
// the exact QFT from FFTW (plan_simulation.cpp). Source of the construction: Kahanamoku-Meyer, Blue,
// Bergamaschi, Gidney, Chuang, "A log-depth in-place quantum Fourier transform that rarely needs
// ancillas", arXiv:2505.00701, 2025 (blocks of m qubits; QFT of adjacent block pairs; each block read
// back with its inverse QFT; QFT of the other pairs).

#include <gtest/gtest.h>

#include <cmath>
#include <complex>
#include <numbers>
#include <random>
#include <vector>

#include "qftplan/core/blockwise_error.hpp"
#include "qftplan/networks/blockwise_qft.hpp"
#include "plan_simulation.hpp"

namespace qftplan {
namespace {

using cd = std::complex<double>;
using State = std::vector<cd>;

struct Collect final : GateSink {
  std::vector<Gate> gates;
  void gate(const Gate& g) override { gates.push_back(g); }
};

// Bit q of the index is the qubit at chain position q.
void apply(State& s, const Gate& g) {
  const std::size_t N = s.size();
  const std::size_t a = std::size_t{1} << g.q0;
  if (g.kind == GateKind::h) {
    const double r = 1 / std::sqrt(2.0);
    for (std::size_t i = 0; i < N; ++i)
      if (!(i & a)) {
        const cd u = s[i], v = s[i | a];
        s[i] = r * (u + v);
        s[i | a] = r * (u - v);
      }
    return;
  }
  const std::size_t b = std::size_t{1} << g.q1;
  if (g.kind == GateKind::cp || g.kind == GateKind::cp_swap) {
    const cd ph = std::polar(1.0, g.angle.radians());
    for (std::size_t i = 0; i < N; ++i)
      if ((i & a) && (i & b)) s[i] *= ph;
  }
  if (g.kind == GateKind::swap || g.kind == GateKind::cp_swap) {
    for (std::size_t i = 0; i < N; ++i)
      if ((i & a) && !(i & b)) std::swap(s[i], s[(i & ~a) | b]);
  }
}

// Column x of the planned unitary in output-bit order: input bit k starts at position n-1-k; output
// bit k ends where processing index k ends.
State planned_column(int n, const std::vector<Gate>& gates, const std::vector<int>& final_pos, int x) {
  const int N = 1 << n;
  State s(N);
  int start = 0;
  for (int k = 0; k < n; ++k)
    if ((x >> k) & 1) start |= 1 << (n - 1 - k);
  s[start] = 1;
  for (const Gate& g : gates) apply(s, g);
  State out(N);
  for (int i = 0; i < N; ++i) {
    int y = 0;
    for (int k = 0; k < n; ++k)
      if ((i >> final_pos[k]) & 1) y |= 1 << k;
    out[y] = s[i];
  }
  return out;
}

// The forward construction on the chain 0..n-1: its gates, and where each processing index ends.
struct Emitted {
  std::vector<Gate> gates;
  std::vector<int> pos;
};
Emitted emitted(int n, int m) {
  std::vector<int> chain(n);
  for (int p = 0; p < n; ++p) chain[p] = p;
  Collect sink;
  auto pos = emit_blockwise_qft(n, m, false, chain, sink);
  return {std::move(sink.gates), std::move(pos)};
}

// The QFT of Nielsen & Chuang (2000), eq. 5.2, on bits [low, low+size) of the register as a number of
// its own: |v> -> 2^(-size/2) sum_w exp(2 pi i v w / 2^size) |w>, (inverse: the conjugate).
void block_qft(State& s, int low, int size, bool inverse) {
  const int K = 1 << size;
  const std::size_t mask = std::size_t(K - 1) << low;
  State out(s.size());
  for (std::size_t i = 0; i < s.size(); ++i) {
    if (s[i] == cd{}) continue;
    const long long v = (i & mask) >> low;
    for (long long w = 0; w < K; ++w) {
      const double ph = 2 * std::numbers::pi * double((v * w) % K) / K;
      out[(i & ~mask) | (std::size_t(w) << low)] += s[i] * std::polar(1 / std::sqrt(double(K)), inverse ? -ph : ph);
    }
  }
  s = std::move(out);
}

// The construction from its description (arXiv:2505.00701), in output-bit order, with blocks of m bits
// from bit 0. Written here without the planner's schedule. In Nielsen & Chuang's numbering the QFT of
// a block pair leaves the pair's bits in output order (the bit reversal is part of the transform);
// the block QFTs below act on the value of each bit range, and the reversal of a pair's output is
// undone by taking each block's transform on the bits where that block's output lands.
State defined_column(int n, int m, int x) {
  // Work in the "in-place" numbering of the paper: qubit t keeps the factor of bit t, whose phase is
  // x / 2^(t+1). A QFT of bits [low, low+s) in Nielsen & Chuang's sense, followed by reversing those s
  // bits, is the in-place transform of that range; we write every step as NC-QFT then reversal.
  const int N = 1 << n;
  State s(N);
  s[x] = 1;
  auto reverse_bits = [&](int low, int size) {
    State out(N);
    for (int i = 0; i < N; ++i) {
      int j = i;
      for (int t = 0; t < size; ++t) {
        const int src = (i >> (low + t)) & 1;
        j = (j & ~(1 << (low + size - 1 - t))) | (src << (low + size - 1 - t));
      }
      out[j] = s[i];
    }
    s = std::move(out);
  };
  auto inplace = [&](int low, int size, bool inverse) {
    if (!inverse) {
      block_qft(s, low, size, false);
      reverse_bits(low, size);
    } else {
      reverse_bits(low, size);
      block_qft(s, low, size, true);
    }
  };
  std::vector<std::pair<int, int>> blocks;
  for (int low = 0; low < n; low += m) blocks.push_back({low, std::min(m, n - low)});
  const int k = static_cast<int>(blocks.size());
  for (int b = 1; b < k; b += 2) inplace(blocks[b - 1].first, blocks[b - 1].second + blocks[b].second, false);
  for (int b = 1; b < k; b += 2) {
    inplace(blocks[b].first, blocks[b].second, true);
    inplace(blocks[b - 1].first, blocks[b - 1].second, true);
  }
  inplace(blocks[0].first, blocks[0].second, false);
  for (int b = 2; b < k; b += 2) inplace(blocks[b - 1].first, blocks[b - 1].second + blocks[b].second, false);
  if (k % 2 == 0 && k > 1) inplace(blocks[k - 1].first, blocks[k - 1].second, false);
  // In-place factor t is output bit n-1-t (Nielsen & Chuang, eq. 5.4: the product form).
  reverse_bits(0, n);
  return s;
}

double distance(const State& a, const State& b) {
  double d = 0;
  for (std::size_t i = 0; i < a.size(); ++i) d += std::norm(a[i] - b[i]);
  return std::sqrt(d);
}

TEST(BlockwiseQft, GatesMatchTheConstructionsDefinition) {
  for (int n = 1; n <= 8; ++n)
    for (int m = 1; m <= n; ++m) {
      const auto [gates, pos] = emitted(n, m);
      for (int x = 0; x < (1 << n); ++x)
        ASSERT_LT(distance(planned_column(n, gates, pos, x), defined_column(n, m, x)), 1e-9)
            << "n=" << n << " m=" << m << " x=" << x;
    }
}

// With at most two blocks the construction is the exact QFT: the pair transform is the whole QFT and
// the read-back and last layer cancel (checked against FFTW, plan_simulation.cpp).
TEST(BlockwiseQft, TwoBlocksOrFewerAreExactAgainstFftw) {
  for (int n : {2, 5, 8}) {
    const auto ref = testing::fftw_qft_matrix(n, false);
    for (int m = (n + 1) / 2; m <= n; ++m) {
      const auto [gates, pos] = emitted(n, m);
      for (int x = 0; x < (1 << n); ++x) {
        const State col = planned_column(n, gates, pos, x);
        ASSERT_LT(distance(col, ref[x]), 1e-9) << "n=" << n << " m=" << m << " x=" << x;
      }
    }
  }
}

// The inverse stream undoes the forward one on the same chain (it starts where the forward one ends).
TEST(BlockwiseQft, InverseUndoesForward) {
  const int n = 7, m = 2;
  std::vector<int> chain(n);
  for (int p = 0; p < n; ++p) chain[p] = p;
  Collect fwd, inv;
  emit_blockwise_qft(n, m, false, chain, fwd);
  emit_blockwise_qft(n, m, true, chain, inv);
  for (int x : {0, 5, 77, 127}) {
    State s(1 << n);
    s[x] = 1;
    for (const Gate& g : fwd.gates) apply(s, g);
    for (const Gate& g : inv.gates) apply(s, g);
    EXPECT_NEAR(std::abs(s[x]), 1.0, 1e-9) << x;
  }
}

// The error against the exact QFT (FFTW) shrinks as the blocks grow, and the normalised Frobenius
// distance ||V - F||_F / sqrt(2^n) stays below 2, the largest distance between two unitaries' columns
// (common practice: ||u - v|| <= ||u|| + ||v||). With three or more blocks the construction is not exact.
TEST(BlockwiseQft, ErrorShrinksWithBlockLength) {
  const int n = 10, N = 1 << n;
  const auto ref = testing::fftw_qft_matrix(n, false);
  double previous = 3;
  for (int m = 2; m <= 4; ++m) {
    const auto [gates, pos] = emitted(n, m);
    double sum = 0;
    for (int x = 0; x < N; ++x) sum += std::pow(distance(planned_column(n, gates, pos, x), ref[x]), 2);
    const double frob = std::sqrt(sum / N);
    EXPECT_GT(frob, 1e-3) << m;
    EXPECT_LT(frob, previous) << m;
    EXPECT_LT(frob, 2.0) << m;
    previous = frob;
  }
}

// The depth depends on the block length only: three layers of block transforms, each a reversal
// network of at most 2m wires, whose 2s - 3 layers bound its two-qubit depth (Fowler, Devitt and
// Hollenberg, Quantum Inf. Comput. 4, 237, 2004).
TEST(BlockwiseQft, TwoQubitDepthDoesNotGrowWithN) {
  for (int m : {3, 8}) {
    const int at64 = blockwise_two_qubit_depth(64, m);
    EXPECT_LE(at64, 3 * (2 * (2 * m) - 3));
    for (int n : {256, 1024, 4096}) EXPECT_EQ(blockwise_two_qubit_depth(n, m), at64) << n << " " << m;
  }
}

// The closed-form overlap <QFT x|U x> (blockwise_error.cpp) against the emitted gates simulated here and
// the exact QFT from FFTW (Frigo and Johnson, "The design and implementation of FFTW3", Proc. IEEE 93,
// 216, 2005), for every basis input, every block length, n <= 9.
TEST(BlockwiseError, OverlapMatchesSimulationAgainstFftw) {
  for (int n = 1; n <= 9; ++n) {
    const auto ref = testing::fftw_qft_matrix(n, false);
    for (int m = 1; m <= n; ++m) {
      const auto [gates, pos] = emitted(n, m);
      for (int x = 0; x < (1 << n); ++x) {
        const State col = planned_column(n, gates, pos, x);
        cd want = 0;
        for (int y = 0; y < (1 << n); ++y) want += std::conj(ref[x][y]) * col[y];
        std::vector<std::uint8_t> bits(n);
        for (int k = 0; k < n; ++k) bits[k] = static_cast<std::uint8_t>((x >> k) & 1);
        const cd got = blockwise_overlap(m, bits);
        ASSERT_LT(std::abs(got - want), 1e-9) << "n=" << n << " m=" << m << " x=" << x << " want " << want;
      }
    }
  }
}

// The figures by enumeration against the same simulation: readout success E_x |<QFT x|U x>|^2 (the
// probability that phase estimation returns the exact phase, Nielsen & Chuang 2000, section 5.2.1),
// normalised Frobenius distance, fraction of columns beyond a threshold, average-gate infidelity
// (Nielsen, "A simple formula for the average gate fidelity", Phys. Lett. A 303, 249, 2002).
TEST(BlockwiseError, EnumeratedFiguresMatchSimulation) {
  const int n = 10, N = 1 << n;
  const auto ref = testing::fftw_qft_matrix(n, false);
  for (int m : {2, 3, 4, 5}) {
    const auto [gates, pos] = emitted(n, m);
    double readout = 0, frob2 = 0, above = 0, worst = 0;
    cd trace = 0;
    for (int x = 0; x < N; ++x) {
      const State col = planned_column(n, gates, pos, x);
      cd ov = 0;
      for (int y = 0; y < N; ++y) ov += std::conj(ref[x][y]) * col[y];
      const double d = distance(col, ref[x]);
      readout += std::norm(ov);
      frob2 += d * d;
      above += d > 0.05;
      worst = std::max(worst, d);
      trace += ov;
    }
    const auto f = blockwise_figures(n, m, 0.05);
    EXPECT_EQ(f.exact, m >= 5) << m;
    EXPECT_FALSE(f.sampled);
    EXPECT_NEAR(f.readout_success, readout / N, 1e-9) << m;
    EXPECT_NEAR(f.frobenius, std::sqrt(frob2 / N), 1e-9) << m;
    EXPECT_NEAR(f.worst_column, worst, 1e-9) << m;
    EXPECT_NEAR(f.infidelity, 1 - (N * std::norm(trace / double(N)) + 1) / (N + 1), 1e-9) << m;
    if (!f.exact) EXPECT_DOUBLE_EQ(f.fraction_above, above / N) << m;
  }
}

// A seeded sample agrees with enumeration within four of its standard errors (n = 14, where both run),
// and at large n the distance depends on the block length, not on n: the error of a block pair does not
// grow with the register (arXiv:2505.00701, the construction's locality), only the number of pairs.
TEST(BlockwiseError, SampleAgreesWithEnumeration) {
  for (int m : {3, 5}) {
    const auto all = blockwise_figures(14, m, 0.1);
    const auto some = blockwise_figures(14, m, 0.1, 7, 3e7, /*enumerate_up_to=*/0);
    ASSERT_TRUE(some.sampled);
    EXPECT_GT(some.readout_standard_error, 0);
    EXPECT_NEAR(some.readout_success, all.readout_success, 4 * some.readout_standard_error + 1e-12) << m;
    EXPECT_NEAR(some.frobenius, all.frobenius, 4 * some.frobenius_standard_error + 1e-12) << m;
    EXPECT_NEAR(some.fraction_above, all.fraction_above, 4 * some.fraction_above_standard_error + 1e-12) << m;
  }
}

}  // namespace
}  // namespace qftplan
