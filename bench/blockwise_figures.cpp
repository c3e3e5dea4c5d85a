// Issue 19 item 4: figures of the block construction of the approximate QFT (blockwise_qft.hpp;
// Kahanamoku-Meyer, Blue, Bergamaschi, Gidney, Chuang, arXiv:2505.00701, 2025). Not a test: prints
//   1. two-qubit depth and two-qubit gate count on a chain for n = 64 .. 4096 at fixed block length m
//      (a dry run of the emitted gates, no timing);
//   2. for small n, by simulation of every basis input: the normalised Frobenius distance
//      ||V - F||_F / sqrt(2^n) between the construction V and the exact QFT F (Nielsen & Chuang,
//      "Quantum Computation and Quantum Information", 2000, eq. 5.2), the largest column distance, and
//      the fraction of basis inputs whose column distance exceeds 0.1.
// In a build tree BUILD configured with -DQFTPLAN_BUILD_BENCH=ON: BUILD/bench/qftplan_blockwise_figures

#include <algorithm>
#include <cmath>
#include <complex>
#include <cstdio>
#include <numbers>
#include <vector>

#include "qftplan/networks/blockwise_qft.hpp"

using namespace qftplan;
using cd = std::complex<double>;

namespace {

struct Collect final : GateSink {
  std::vector<Gate> gates;
  long long two_qubit = 0;
  void gate(const Gate& g) override {
    gates.push_back(g);
    if (is_two_qubit(g.kind)) ++two_qubit;
  }
};

void apply(std::vector<cd>& s, const Gate& g) {
  const std::size_t N = s.size(), a = std::size_t{1} << g.q0;
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
  if (g.kind == GateKind::cp_swap) {
    const cd ph = std::polar(1.0, g.angle.radians());
    for (std::size_t i = 0; i < N; ++i)
      if ((i & a) && (i & b)) s[i] *= ph;
  }
  for (std::size_t i = 0; i < N; ++i)
    if ((i & a) && !(i & b)) std::swap(s[i], s[(i & ~a) | b]);
}

}  // namespace

int main() {
  std::printf("two-qubit depth and gates (cp_swap and swap) on a chain, forward transform\n");
  std::printf("%6s %4s %16s %16s\n", "n", "m", "two-qubit depth", "two-qubit gates");
  for (int m : {4, 8, 12})
    for (int n : {64, 256, 1024, 4096}) {
      std::vector<int> chain(n);
      for (int p = 0; p < n; ++p) chain[p] = p;
      Collect sink;
      emit_blockwise_qft(n, m, false, chain, sink);
      std::printf("%6d %4d %16d %16lld\n", n, m, blockwise_two_qubit_depth(n, m), sink.two_qubit);
    }

  std::printf("\nerror against the exact QFT, every basis input simulated\n");
  std::printf("%4s %4s %12s %12s %16s\n", "n", "m", "frobenius/vN", "max column", "inputs > 0.1");
  for (int n : {8, 10, 12})
    for (int m = 1; 2 * m < n; ++m) {
      const int N = 1 << n;
      std::vector<int> chain(n);
      for (int p = 0; p < n; ++p) chain[p] = p;
      Collect sink;
      const auto pos = emit_blockwise_qft(n, m, false, chain, sink);
      double sum = 0, worst = 0;
      int bad = 0;
      std::vector<cd> s(N);
      for (int x = 0; x < N; ++x) {
        std::fill(s.begin(), s.end(), cd{});
        int start = 0;
        for (int k = 0; k < n; ++k)
          if ((x >> k) & 1) start |= 1 << (n - 1 - k);
        s[start] = 1;
        for (const Gate& g : sink.gates) apply(s, g);
        double d = 0;
        for (int i = 0; i < N; ++i) {
          long long y = 0;
          for (int k = 0; k < n; ++k)
            if ((i >> pos[k]) & 1) y |= 1LL << k;
          const cd exact = std::polar(1 / std::sqrt(double(N)), 2 * std::numbers::pi * double((x * y) % N) / N);
          d += std::norm(s[i] - exact);
        }
        sum += d;
        worst = std::max(worst, std::sqrt(d));
        bad += std::sqrt(d) > 0.1;
      }
      std::printf("%4d %4d %12.4f %12.4f %16.4f\n", n, m, std::sqrt(sum / N), worst, double(bad) / N);
    }
  return 0;
}
