// Planned circuits simulated and compared with FFTW, a general-purpose FFT library (the FFTW matrix, its
// source and the simulation of a plan: plan_simulation.cpp).

#include <gtest/gtest.h>

#include <cmath>
#include <complex>
#include <numbers>

#include "qftplan/device/device_source.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/sinks/native_gates.hpp"
#include "plan_simulation.hpp"

namespace qftplan {
namespace {

using cd = std::complex<double>;
using Matrix = testing::QftMatrix;  // [column][row]
using testing::distance_up_to_phase;
using testing::plan_unitary;

// Approximate QFT of degree M from its definition: the phase 2 pi j y / 2^n written as the sum over
// bit pairs pi/2^m j_a y_l with m = n-1-a-l, keeping the terms with m+1 <= M (R_{m+1} is kept when
// m+1 <= M; Barenco, Ekert, Suominen and Torma, PRA 54, 139, 1996, section II; Coppersmith 1994).
Matrix aqft_matrix(int n, int M, bool inverse) {
  const int N = 1 << n;
  Matrix m(N, std::vector<cd>(N));
  for (int j = 0; j < N; ++j)
    for (int y = 0; y < N; ++y) {
      double ph = 0;
      for (int a = 0; a < n; ++a)
        for (int l = 0; l < n; ++l) {
          const int mm = n - 1 - a - l;
          if (mm < 0 || mm + 1 > M) continue;
          if (((j >> a) & 1) && ((y >> l) & 1)) ph += std::numbers::pi / std::ldexp(1.0, mm);
        }
      m[j][y] = std::polar(1.0 / std::sqrt(double(N)), inverse ? -ph : ph);
    }
  return m;
}

struct Case {
  std::string device;
  int n;
  std::optional<int> approx;
  bool inverse;
  GateSet gates;
  NetworkChoice network = NetworkChoice::automatic;
  std::string strategy;  ///< empty: auto (or chain for a named network)
};

class PlanAgainstFftw : public ::testing::TestWithParam<Case> {};

TEST_P(PlanAgainstFftw, UnitaryMatchesTheReference) {
  const Case c = GetParam();
  const Device dev = load_device(c.device);
  PlanOptions opt;
  opt.spec = QftSpec{c.n, c.approx, c.inverse};
  opt.gates = c.gates;
  opt.network = c.network;
  // A named network is the chain strategy's: plan with it, so that the network itself is tested.
  if (c.network != NetworkChoice::automatic) opt.strategy = "chain";
  if (!c.strategy.empty()) opt.strategy = c.strategy;
  const auto plan = prepare_plan(dev, opt);
  // Parity and reversal are built as named at every degree (they end in order); the others give way
  // to the hadamard-only and adjacent networks at degrees 1 and 2.
  if ((c.network == NetworkChoice::parity || c.network == NetworkChoice::reversal) && c.n >= 2)
    EXPECT_EQ(plan.circuit->network_name(), network_choice_name(c.network));
  VectorSink out;
  execute_plan(dev, opt, plan, &out);
  const Matrix got = plan_unitary(dev, plan, out.gates);
  const Matrix want = opt.spec.effectively_exact() ? testing::fftw_qft_matrix(c.n, c.inverse) : aqft_matrix(c.n, *c.approx, c.inverse);
  EXPECT_LT(distance_up_to_phase(got, want), 1e-9);
}

std::vector<Case> cases() {
  std::vector<Case> v;
  const std::vector<std::string> devices{"line:9", "grid:3x3", "ring:8", "heavy-hex:1x1"};
  for (const auto& d : devices)
    for (int n : {1, 2, 3, 5, 8})
      for (bool inv : {false, true})
        for (GateSet g : {GateSet::logical, GateSet::cx, GateSet::cz}) v.push_back({d, n, std::nullopt, inv, g});
  for (int n : {4, 6, 8})
    for (int M : {1, 2, 3, 4})
      for (bool inv : {false, true}) v.push_back({"line:8", n, M, inv, GateSet::cx});
  // The parity network (ours, parity_qft.hpp), exact and approximate, both directions, every gate set.
  for (const auto& d : {"line:9", "grid:3x3", "heavy-hex:1x1"})
    for (int n : {2, 3, 5, 8})
      for (bool inv : {false, true})
        for (GateSet g : {GateSet::logical, GateSet::cx, GateSet::cz})
          v.push_back({d, n, std::nullopt, inv, g, NetworkChoice::parity});
  // Every degree, 1 and 2 included (a fuzzed plan found degree 1 wrong: the Hadamard's phase on
  // neighbours is there whether the distance-1 rotation is kept or not).
  for (int n : {2, 5, 8})
    for (int M : {1, 2, 3, 4, 6})
      for (bool inv : {false, true}) v.push_back({"line:8", n, M, inv, GateSet::cx, NetworkChoice::parity});
  // The fused networks asked for by name.
  for (bool inv : {false, true}) {
    for (int M : {1, 2, 4}) v.push_back({"line:8", 8, M, inv, GateSet::cx, NetworkChoice::reversal});
    v.push_back({"line:8", 8, 4, inv, GateSet::logical, NetworkChoice::leapfrog});
    for (int M : {3, 5}) v.push_back({"line:8", 8, M, inv, GateSet::logical, NetworkChoice::insertion});
    for (int M : {3, 4, 7}) v.push_back({"line:8", 8, M, inv, GateSet::logical, NetworkChoice::parity_insertion});
    v.push_back({"line:8", 8, std::nullopt, inv, GateSet::cx, NetworkChoice::anchored});
    v.push_back({"line:8", 8, 3, inv, GateSet::logical, NetworkChoice::anchored});
  }
  // Native output goes through the peephole pass by default (issue 18): every chain network and the
  // routed and cover strategies in both native gate sets, so that what the pass leaves is simulated
  // (the spine strategy: peephole_plan_test.cpp).
  for (GateSet g : {GateSet::cx, GateSet::cz})
    for (bool inv : {false, true}) {
      for (NetworkChoice net : {NetworkChoice::anchored, NetworkChoice::parity, NetworkChoice::reversal})
        for (int n : {3, 6}) v.push_back({"grid:3x3", n, std::nullopt, inv, g, net});
      for (int M : {2, 3}) v.push_back({"line:7", 7, M, inv, g, NetworkChoice::leapfrog});
      v.push_back({"line:7", 7, 4, inv, g, NetworkChoice::insertion});
      v.push_back({"line:7", 7, 4, inv, g, NetworkChoice::parity_insertion});
      for (const char* s : {"routed", "cover"})
        for (int n : {4, 7}) v.push_back({"heavy-hex:1x1", n, std::nullopt, inv, g, NetworkChoice::automatic, s});
    }
  return v;
}

INSTANTIATE_TEST_SUITE_P(Devices, PlanAgainstFftw, ::testing::ValuesIn(cases()));

TEST(ProductForm, ThreeQubitsInputFiveGivesTheTextbookPhases) {
  // Nielsen & Chuang (2000) eq. 5.4: for n = 3, j = 5 the output is the product of
  // (|0> + e^{2 pi i 5/8}|1>), (|0> + e^{2 pi i 5/4}|1>), (|0> + e^{2 pi i 5/2}|1>) on the output
  // bits of weight 1, 2 and 4 (relative phases 2 pi 5 / 2^(3-l) for output bit l).
  const Device dev = make_line(3);
  PlanOptions opt;
  opt.spec = QftSpec{3, std::nullopt, false};
  opt.gates = GateSet::logical;
  const auto plan = prepare_plan(dev, opt);
  VectorSink out;
  execute_plan(dev, opt, plan, &out);
  const Matrix m = plan_unitary(dev, plan, out.gates);
  for (int l = 0; l < 3; ++l) {
    // Amplitude ratio between y = 2^l and y = 0 is the relative phase of output bit l.
    const cd ratio = m[5][1 << l] / m[5][0];
    const double want = 2 * std::numbers::pi * 5 / std::ldexp(1.0, 3 - l);
    EXPECT_NEAR(std::abs(ratio - std::polar(1.0, want)), 0.0, 1e-12) << "output bit " << l;
  }
}

}  // namespace
}  // namespace qftplan
