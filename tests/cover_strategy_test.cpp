// The cover strategy (src/planners/cover_walk.cpp) on trees, random connected graphs and defective
// chips: every plan proved by the structural checker, every two-qubit gate on a coupler, the CX count
// within our proved bound, the published bound and 2(N^2 - 1), small plans simulated against FFTW.

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <random>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/plan.hpp"
#include "../src/planners/cover_walk.hpp"
#include "plan_simulation.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

Device graph_device(int n, const std::vector<std::pair<int, int>>& edges) {
  DeviceDescription d;
  d.name = "graph";
  d.qubits = n;
  for (auto [a, b] : edges) d.couplers.push_back(Coupler{a, b});
  return Device(d);
}

// A random labelled tree: each qubit i > 0 hangs from a uniformly random earlier one (seeded).
Device random_tree(int n, std::uint64_t seed) {
  std::mt19937_64 rng(seed);
  std::vector<std::pair<int, int>> e;
  for (int i = 1; i < n; ++i) e.push_back({std::uniform_int_distribution<int>(0, i - 1)(rng), i});
  return graph_device(n, e);
}

// A random connected graph: a random tree plus `extra` random couplers.
Device random_graph(int n, int extra, std::uint64_t seed) {
  std::mt19937_64 rng(seed);
  std::vector<std::pair<int, int>> e;
  for (int i = 1; i < n; ++i) e.push_back({std::uniform_int_distribution<int>(0, i - 1)(rng), i});
  for (int k = 0; k < extra; ++k) {
    const int a = std::uniform_int_distribution<int>(0, n - 1)(rng), b = std::uniform_int_distribution<int>(0, n - 1)(rng);
    if (a == b) continue;
    bool dup = false;
    for (auto [x, y] : e) dup |= (x == a && y == b) || (x == b && y == a);
    if (!dup) e.push_back({a, b});
  }
  return graph_device(n, e);
}

// Largest deviation of the planned circuit from the QFT (FFTW's, plan_simulation.cpp) over every basis
// input, up to one global phase.
double distance_to_fftw(const Device& dev, const PreparedPlan& plan, const std::vector<Gate>& gates) {
  return testing::distance_up_to_phase(testing::plan_unitary(dev, plan, gates),
                                       testing::fftw_qft_matrix(plan.spec.qubits, plan.spec.inverse));
}

// Plans n qubits on dev with the cover strategy and checks everything the strategy promises.
void check_cover(const Device& dev, int n, bool inverse = false, std::optional<int> approx = {},
                 EndOrder end = EndOrder::free) {
  SCOPED_TRACE(dev.name() + " n=" + std::to_string(n));
  PlanOptions opt;
  opt.strategy = "cover";
  opt.spec = QftSpec{n, approx, inverse};
  opt.end_order = end;
  opt.gates = GateSet::logical;
  const PreparedPlan plan = prepare_plan(dev, opt);
  VectorSink out;
  const PlanReport r = execute_plan(dev, opt, plan, &out);
  StructuralChecker checker(dev, plan.spec, plan.maps.placement);
  for (const auto& g : out.gates) {
    if (is_two_qubit(g.kind)) ASSERT_TRUE(dev.coupled(g.q0, g.q1)) << g.q0 << "," << g.q1;
    checker.gate(g);
  }
  const CheckResult verdict = checker.finish(plan.maps.final_placement);
  // Every kept rotation once, those inside exchanges included (found by the plan fuzzer).
  EXPECT_EQ(r.rotations, plan.spec.kept_rotations());
  EXPECT_TRUE(verdict.ok) << verdict.message;
  if (end == EndOrder::same) EXPECT_EQ(plan.maps.placement, plan.maps.final_placement);
  if (end == EndOrder::free) {
    ASSERT_TRUE(r.cx_bound.has_value());
    EXPECT_LE(r.cx_count, *r.cx_bound);  // our bound, proved in cover_walk.cpp
    // Khadiev, Khadieva, Sagitov, Khasanov, arXiv:2510.09824, 2025, abstract: CNOT cost at most
    // 2n^2 - 2n - 2 for their construction; ours is measured against it on these graphs.
    if (n >= 2) EXPECT_LE(r.cx_count, 2LL * n * n - 2 * n - 2);
  }
  // The approximate transform is checked by the structural proof above; FFTW gives the exact one.
  if (n <= 8 && plan.spec.effectively_exact()) EXPECT_LT(distance_to_fftw(dev, plan, out.gates), 1e-9);
}

TEST(CoverStrategy, EveryRegisterOnSmallTreesAndGraphs) {
  for (std::uint64_t seed : {1, 2, 3}) {
    const Device tree = random_tree(12, seed), graph = random_graph(12, 6, seed);
    for (int n = 2; n <= 12; ++n) {
      check_cover(tree, n);
      check_cover(graph, n);
    }
  }
}

// Trees whose forests are deep: spiders (k legs of length L from one hub) and combs (a path of t
// qubits, each with a pendant tooth of length L). With a cp_swap into every inner forest qubit and a
// swap back, these cost up to 1.2 x the published 2n^2 - 2n - 2 (spider 10 x 20: 97,883 CX; measured
// before the exchanges); with exchanges they stay within our bound 2n^2 - 3n and the published one.
Device spider(int legs, int length) {
  std::vector<std::pair<int, int>> e;
  int n = 1;
  for (int l = 0; l < legs; ++l)
    for (int k = 0, prev = 0; k < length; ++k, prev = n - 1) e.push_back({prev, n++});
  return graph_device(n, e);
}

Device comb(int teeth, int length) {
  std::vector<std::pair<int, int>> e;
  for (int i = 0; i + 1 < teeth; ++i) e.push_back({i, i + 1});
  int n = teeth;
  for (int i = 0; i < teeth; ++i)
    for (int k = 0, prev = i; k < length; ++k, prev = n - 1) e.push_back({prev, n++});
  return graph_device(n, e);
}

TEST(CoverStrategy, DeepForestsStayWithinTheBounds) {
  for (const Device& d : {spider(3, 2), spider(2, 3), comb(2, 3), spider(3, 3), comb(3, 3)}) {
    check_cover(d, d.qubit_count());        // exact: FFTW up to 8 qubits, the structural proof always
    check_cover(d, d.qubit_count(), true);  // inverse
  }
  for (const Device& d : {spider(10, 6), spider(6, 12), comb(20, 4), comb(10, 6)}) {
    check_cover(d, d.qubit_count());
    check_cover(d, d.qubit_count(), true, 4);
  }
}

// The cascade with a chain tail (build_cover_qft with tail_chain): walks park off the region's chain
// until only the chain is alive, then a chain network finishes. Forced here on every region, from
// both chain ends, forwards and inverse, exact and approximate: each circuit on couplers, proved by
// the structural checker, within our bound, and equal to FFTW's transform up to 8 qubits.
void check_chain_tail(const Device& dev, int n, bool inverse, std::optional<int> approx) {
  SCOPED_TRACE(dev.name() + " n=" + std::to_string(n) + (inverse ? " inverse" : "") +
               (approx ? " degree " + std::to_string(*approx) : ""));
  const CoverRegion region = cover_region(dev, n, 1, nullptr);
  std::vector<int> chain(region.qubits.begin(), region.qubits.begin() + region.chain_length);
  ASSERT_GE(chain.size(), 3u);
  for (int end = 0; end < 2; ++end) {
    if (end == 1) std::reverse(chain.begin(), chain.end());
    PreparedPlan plan;
    plan.spec = QftSpec{n, approx, inverse};
    long long cx = 0;
    const RoutedCircuit c = build_cover_qft(dev, plan.spec, region.qubits, chain.front(), 1, nullptr, &cx, chain);
    plan.maps = c.maps;
    EXPECT_LE(cx, cover_cx_bound(n));
    StructuralChecker checker(dev, plan.spec, plan.maps.placement);
    long long two_qubit = 0;
    for (const auto& g : c.gates) {
      if (is_two_qubit(g.kind)) {
        ASSERT_TRUE(dev.coupled(g.q0, g.q1)) << g.q0 << "," << g.q1;
        ++two_qubit;
      }
      checker.gate(g);
    }
    const CheckResult verdict = checker.finish(plan.maps.final_placement);
    EXPECT_TRUE(verdict.ok) << verdict.message;
    if (n <= 8 && plan.spec.effectively_exact())
      EXPECT_LT(distance_to_fftw(dev, plan, c.gates), 1e-9);
  }
}

TEST(CoverStrategy, ChainTailIsTheQft) {
  int regions = 0;
  for (const Device& d : {comb(3, 2), spider(3, 2), comb(4, 3), spider(4, 5), random_tree(14, 2), random_graph(14, 5, 3),
                          testing::make_defective_chip("heavy-hex:1x1", 1, 1, 7),
                          testing::make_defective_chip("heavy-hex:2x2", 2, 2, 3)}) {
    const int N = d.qubit_count();
    for (int n : {std::min(N, 6), std::min(N, 8), N}) {
      const CoverRegion region = cover_region(d, n, 1, nullptr);
      if (region.chain_length < 3 || region.chain_length == n) continue;  // nothing off the chain
      check_chain_tail(d, n, false, std::nullopt);
      check_chain_tail(d, n, true, std::nullopt);
      check_chain_tail(d, n, false, 3);
      check_chain_tail(d, n, true, 2);
      ++regions;
    }
  }
  EXPECT_GE(regions, 8);  // 10 of the 24 regions hold qubits off their chain
}

// Issue 17 target: every qubit of a defective heavy-hexagon or grid chip in the register within
// 1.5 (N^2 - 1) CX. The chain tail is what brings the near-tree heavy-hexagon chips under it (without
// it the cover cascade measured 1.53 on two of the spread's chips, bench/every_qubit_spread.cpp).
TEST(CoverStrategy, DefectiveChipsEveryQubitWithinOneAndAHalfNSquared) {
  struct Chip { const char* spec; int dead, broken; };
  for (const Chip c : {Chip{"heavy-hex:2x2", 2, 4}, Chip{"heavy-hex:3x3", 3, 8}, Chip{"heavy-hex:3x3", 2, 12},
                       Chip{"grid:6x6", 2, 6}}) {
    for (std::uint64_t seed : {21, 22}) {
      const Device dev = testing::make_defective_chip(c.spec, c.dead, c.broken, seed);
      const int N = dev.qubit_count();
      PlanOptions opt;
      opt.spec = QftSpec{N, std::nullopt, false};
      opt.objective = Objective::cx;
      const PlanReport r = plan_qft(dev, opt);
      EXPECT_LE(r.cx_count, 3 * (1LL * N * N - 1) / 2) << c.spec << " seed " << seed << " via " << r.strategy;
      std::printf("%s -%d -%d seed %llu: N=%d cx=%lld ratio=%.3f %s\n", c.spec, c.dead, c.broken,
                  static_cast<unsigned long long>(seed), N, r.cx_count, double(r.cx_count) / (double(N) * N - 1),
                  r.strategy.c_str());
    }
  }
}

TEST(CoverStrategy, TheReportedBoundIsAtOrBelowThePublishedOne) {
  // Khadiev, Khadieva, Sagitov, Khasanov, arXiv:2510.09824, 2025, abstract: 2n^2 - 2n - 2 CNOT. The
  // report states our bound (2n^2 - 3n, cover_walk.cpp); it must not be weaker than theirs.
  const Device d = spider(4, 10);
  for (int n : {2, 3, 4, 7, 16, 41}) {
    PlanOptions opt;
    opt.strategy = "cover";
    opt.spec.qubits = n;
    const PlanReport r = plan_qft(d, opt);
    ASSERT_TRUE(r.cx_bound.has_value()) << n;
    EXPECT_LE(*r.cx_bound, 2LL * n * n - 2LL * n - 2) << n;
    EXPECT_LE(r.cx_count, *r.cx_bound) << n;
  }
}

TEST(CoverStrategy, InverseApproximateAndSameEndOrder) {
  const Device dev = testing::make_defective_chip("heavy-hex:1x1", 1, 1, 7);
  const int N = dev.qubit_count();
  for (int n : {3, 6, N}) {
    check_cover(dev, n, true);
    check_cover(dev, n, false, 2);
    check_cover(dev, n, true, 3);
    check_cover(dev, n, false, {}, EndOrder::same);
  }
}

TEST(CoverStrategy, DefectiveChipsEveryQubitWithinTwiceNSquared) {
  // Issue 17 target: with every qubit in the register, CX <= 2 (N^2 - 1) on any connected graph.
  struct Chip { const char* spec; int dead, broken; };
  for (const Chip c : {Chip{"heavy-hex:2x2", 2, 2}, Chip{"heavy-hex:3x3", 3, 3}, Chip{"grid:6x6", 2, 3}}) {
    const Device dev = testing::make_defective_chip(c.spec, c.dead, c.broken, 11);
    const int N = dev.qubit_count();
    for (int n : {N / 3, N - 1, N}) check_cover(dev, n);
    PlanOptions opt;
    opt.strategy = "cover";
    opt.spec = QftSpec{N, std::nullopt, false};
    const PlanReport r = plan_qft(dev, opt);
    EXPECT_LE(r.cx_count, 2LL * (1LL * N * N - 1)) << c.spec;
    std::printf("%s N=%d cx=%lld ratio=%.3f\n", c.spec, N, r.cx_count, double(r.cx_count) / (double(N) * N - 1));
  }
}

TEST(CoverStrategy, AutoPrefersItOverRoutedWhenCheaper) {
  // On a tree no chain holds the register; auto must keep the cheaper of cover and routed by CX.
  const Device dev = random_tree(30, 5);
  PlanOptions opt;
  opt.spec = QftSpec{30, std::nullopt, false};
  opt.objective = Objective::cx;
  const PlanReport r = plan_qft(dev, opt);
  long long cover = -1, routed = -1;
  for (const auto& a : r.alternatives) {
    if (a.strategy == "cover" && a.ok) cover = a.cx_count;
    if (a.strategy == "routed" && a.ok) routed = a.cx_count;
  }
  ASSERT_GT(cover, 0);
  ASSERT_GT(routed, 0);
  EXPECT_EQ(r.cx_count, std::min(cover, routed));
  if (cover < routed) EXPECT_EQ(r.strategy, "cover");
}

}  // namespace
}  // namespace qftplan
