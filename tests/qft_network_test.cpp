// Tests of the chain networks: sizes and depths against the published constructions.

#include <gtest/gtest.h>

#include <set>

#include "qftplan/device/lattices.hpp"
#include "qftplan/networks/chain_qft.hpp"
#include "qftplan/networks/qft_network.hpp"
#include "qftplan/planners/chain_search.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/sinks/circuit_metrics.hpp"

namespace qftplan {
namespace {

using Kind = NetworkOp::Kind;

// Every pair of wires at distance <= d meets exactly once with a rotation; no other pair gets one.
void expect_each_kept_pair_once(const QftNetwork& net) {
  const int n = net.wires(), d = net.max_distance();
  std::set<std::pair<int, int>> seen;
  std::vector<NetworkOp> ops;
  for (int c = 0; c < net.chunk_count(); ++c) {
    net.chunk(c, ops);
    for (const auto& op : ops)
      if (op.kind == Kind::cp || op.kind == Kind::cp_swap) {
        ASSERT_LT(op.i, op.j);
        ASSERT_LE(op.j - op.i, d);
        ASSERT_TRUE(seen.insert({op.i, op.j}).second) << "pair met twice with a rotation";
      }
  }
  long long expected = 0;
  for (int dist = 1; dist <= d; ++dist) expected += n - dist;
  EXPECT_EQ(static_cast<long long>(seen.size()), expected);
}

TEST(ReversalNetwork, BlocksAndDepthMatchTheLinearNearestNeighbourQft) {
  // Fowler, Devitt and Hollenberg, Quantum Inf. Comput. 4, 237 (2004), and Takahashi, Kunihiro and
  // Ohta, Quantum Inf. Comput. 7, 383 (2007): on a chain the QFT takes n(n-1)/2 fused
  // controlled-phase+SWAP blocks in two-qubit depth 2n-3.
  for (int n = 2; n <= 64; ++n) {
    const auto net = make_reversal_network(n, n - 1);
    std::vector<int> chain(n);
    for (int i = 0; i < n; ++i) chain[i] = i;
    MetricsSink m(n);
    emit_chain_qft(QftSpec{n, std::nullopt, false}, *net, chain, m);
    EXPECT_EQ(m.two_qubit_count(), static_cast<long long>(n) * (n - 1) / 2) << n;
    EXPECT_EQ(m.count(GateKind::cp_swap), static_cast<long long>(n) * (n - 1) / 2) << n;
    EXPECT_EQ(m.depth_2q(), 2 * n - 3) << n;
    // Nielsen & Chuang (2000) section 5.1: n Hadamards.
    EXPECT_EQ(m.count(GateKind::h), n);
    expect_each_kept_pair_once(*net);
  }
}

TEST(ReversalNetwork, ReversesTheChainSoOutputBitsLandWhereInputBitsStarted) {
  // The textbook circuit ends with a reversal of qubit order (Nielsen & Chuang 2000, Fig. 5.1); the
  // SWAP network reverses the register too, so the two cancel: output bit k ends where input bit k began.
  for (int n : {1, 2, 3, 7, 16}) {
    const auto net = make_reversal_network(n, n - 1);
    std::vector<int> chain(n);
    for (int i = 0; i < n; ++i) chain[i] = 100 + i;
    for (bool inverse : {false, true}) {
      const auto maps = chain_maps(QftSpec{n, std::nullopt, inverse}, *net, chain);
      EXPECT_EQ(maps.placement, maps.final_placement);
    }
  }
}

TEST(LeapfrogNetwork, KeepsOnlyRotationsWithinTheDegreeAndGrowsLinearly) {
  // Approximate QFT of degree M keeps R_k for k <= M (Barenco, Ekert, Suominen and Torma, PRA 54,
  // 139, 1996): n-1 + n-2 + ... + n-(M-1) controlled phases.
  for (int n : {5, 9, 16, 33}) {
    for (int M : {3, 4, 6}) {
      if (M - 1 >= n - 1) continue;
      const auto net = make_leapfrog_network(n, M - 1);
      expect_each_kept_pair_once(*net);
    }
  }
  // O(n M) blocks: at most 2d per wire (d fused, at most d plain SWAPs), so linear in n at fixed M.
  for (int n : {64, 512, 1024})
    for (int d : {2, 5, 8}) {
      const auto net = make_leapfrog_network(n, d);
      EXPECT_LE(net->block_count(), 2LL * n * d) << n << " " << d;
      EXPECT_GE(net->block_count(), static_cast<long long>(n - d) * d) << "at least one block per kept rotation";
    }
  // Linear depth: doubling n at fixed d at most doubles the two-qubit depth (plus a constant).
  auto depth = [](int n, int d) {
    const auto net = make_leapfrog_network(n, d);
    std::vector<int> chain(n);
    for (int i = 0; i < n; ++i) chain[i] = i;
    MetricsSink m(n);
    emit_chain_qft(QftSpec{n, d + 1, false}, *net, chain, m);
    return m.depth_2q();
  };
  EXPECT_LE(depth(1024, 6), 2 * depth(512, 6) + 16);
  EXPECT_LE(depth(1024, 6), 4 * 1024);
}

TEST(InsertionNetwork, KeepsOnlyRotationsWithinTheDegree) {
  // Barenco, Ekert, Suominen and Torma, PRA 54, 139 (1996): the approximate QFT of degree M keeps the
  // controlled phases of distance 1 .. M-1, each once.
  for (int n : {3, 5, 9, 16, 33, 64})
    for (int M = 3; M <= 9; ++M) {
      if (M - 1 > n - 1) continue;
      expect_each_kept_pair_once(*make_insertion_network(n, M - 1));
      expect_each_kept_pair_once(*make_parity_insertion_network(n, M - 1));
    }
}

// Every two-wire step is between neighbours on the chain and every wire's Hadamard comes after its
// rotations with earlier wires and before those with later wires: the order of the textbook circuit
// (Nielsen and Chuang 2000, Fig. 5.1) up to commuting controlled phases.
TEST(InsertionNetwork, StepsAreBetweenNeighboursAndInTextbookOrder) {
  for (int n : {4, 7, 20, 50})
    for (int d = 2; d < n; d += 3) {
     for (const auto& net : {make_insertion_network(n, d), make_parity_insertion_network(n, d)}) {
      std::vector<int> pos = net->initial_positions();
      std::vector<bool> done(n, false);
      std::vector<NetworkOp> ops;
      for (int c = 0; c < net->chunk_count(); ++c) {
        net->chunk(c, ops);
        for (const auto& op : ops) {
          if (op.kind == Kind::h) {
            ASSERT_FALSE(done[op.i]);
            done[op.i] = true;
            continue;
          }
          ASSERT_EQ(std::abs(pos[op.i] - pos[op.j]), 1) << "n=" << n << " d=" << d;
          if (op.kind != Kind::swap) {
            ASSERT_TRUE(done[op.i]) << "rotation before the earlier wire's Hadamard";
            ASSERT_FALSE(done[op.j]) << "rotation after the later wire's Hadamard";
          }
          if (op.kind == Kind::swap || op.kind == Kind::cp_swap) std::swap(pos[op.i], pos[op.j]);
        }
      }
      EXPECT_EQ(pos, net->final_positions());
     }
    }
}

// The insertion networks against the leapfrog network in native CX (3 per fused block or SWAP, 2 per
// controlled phase: Vidal and Dawson, PRA 69, 010301, 2004; the parity form as window_parity_qft.cpp
// derives). Issue 19's target: at least 30% fewer CX than the leapfrog network for every degree up to
// 12 from n = 64 on. Measured (ours): the fused form half at degree 3, 37% fewer at degree 4; the
// parity form a third fewer from degree 5 on (4d CX a wire against 6d).
TEST(InsertionNetwork, FewerCxThanLeapfrogAtEveryDegree) {
  for (int n : {64, 256, 1024}) {
    for (int M = 3; M <= 12; ++M) {
      const QftSpec spec{n, M, false};
      const long long ins = network_native_cost(*choose_network(spec, NetworkChoice::insertion));
      const long long leap = network_native_cost(*choose_network(spec, NetworkChoice::leapfrog));
      const long long par = network_native_cost(*choose_network(spec, NetworkChoice::parity_insertion));
      EXPECT_LT(ins, leap) << n << " " << M;
      if (M == 3) EXPECT_LE(ins, 0.55 * leap) << n;
      EXPECT_LE(std::min(ins, par), 0.7 * leap) << n << " " << M;
      EXPECT_LE(par, 4LL * (M - 1) * n + n) << "about 4d CX a wire";
      EXPECT_LE(network_native_cost(*choose_network(spec)), std::min(ins, par)) << "the automatic choice is at least as cheap";
    }
    const auto net = make_insertion_network(n, 2);
    std::vector<int> chain(n);
    for (int i = 0; i < n; ++i) chain[i] = i;
    MetricsSink m(n);
    emit_chain_qft(QftSpec{n, 3, false}, *net, chain, m);
    EXPECT_LE(m.depth_2q(), 2 * n + 8 * 3) << n;
  }
}

// The parity form's CX count, worked out from its steps without writing gates (the degree choice asks
// it for every degree of big registers), equals the CX it writes, forward and inverse.
TEST(InsertionNetwork, ParityFormCountEqualsTheGatesWritten) {
  for (int n : {3, 4, 7, 20, 65})
    for (int d = 2; d < n; d += 2)
      for (bool inverse : {false, true}) {
        const auto net = make_parity_insertion_network(n, d);
        std::vector<int> chain(n);
        for (int i = 0; i < n; ++i) chain[i] = i;
        MetricsSink m(n);
        emit_chain_qft(QftSpec{n, d + 1, inverse}, *net, chain, m);
        EXPECT_EQ(m.count(GateKind::cx), network_native_cost(*net)) << n << " " << d << " " << inverse;
      }
}

// Costs in native two-qubit gates (Vidal and Dawson, PRA 69, 010301, 2004: 3 CX per fused block, 2
// per controlled phase; ours: 2 per parity step): anchored 3 (n-1)(n-2)/2 + 2 (n-1), parity n^2 - 1.
// They tie at n = 4 (15 CX; the anchored network wins the tie); parity is cheaper from n = 5 on.
TEST(ChooseNetwork, PicksTheCheaperNetworkForTheDegree) {
  EXPECT_EQ(choose_network(QftSpec{3, std::nullopt, false})->name(), "anchored");  // 7 against 8 CX
  EXPECT_EQ(choose_network(QftSpec{4, std::nullopt, false})->name(), "anchored");  // 15 against 15
  EXPECT_EQ(choose_network(QftSpec{5, std::nullopt, false})->name(), "parity");    // 26 against 24
  EXPECT_EQ(choose_network(QftSpec{20, std::nullopt, false})->name(), "parity");
  EXPECT_EQ(network_native_cost(*choose_network(QftSpec{20, std::nullopt, false})), 20 * 20 - 1);
  EXPECT_EQ(choose_network(QftSpec{20, 1, false})->name(), "hadamard-only");
  EXPECT_EQ(choose_network(QftSpec{20, 2, false})->name(), "adjacent");
  EXPECT_EQ(choose_network(QftSpec{200, 4, false})->name(), "insertion");
  EXPECT_EQ(choose_network(QftSpec{20, 15, false})->name(), "parity");
  EXPECT_EQ(choose_network(QftSpec{20, 40, false})->name(), "parity");
  // Whatever it picks costs no more than any network that applies.
  for (int n : {3, 6, 12, 40, 200})
    for (std::optional<int> M : {std::optional<int>{}, std::optional<int>{3}, std::optional<int>{5}, std::optional<int>{9}}) {
      const QftSpec spec{n, M, false};
      const long long chosen = network_native_cost(*choose_network(spec));
      for (NetworkChoice c : {NetworkChoice::reversal, NetworkChoice::anchored, NetworkChoice::parity})
        EXPECT_LE(chosen, network_native_cost(*choose_network(spec, c))) << n;
      if (M && *M >= 3 && *M < n)
        for (NetworkChoice c : {NetworkChoice::leapfrog, NetworkChoice::insertion})
          EXPECT_LE(chosen, network_native_cost(*choose_network(spec, c))) << n;
    }
  EXPECT_EQ(choose_network(QftSpec{20, std::nullopt, false}, NetworkChoice::reversal)->name(), "reversal");
}

// Chain metrics on lines, snakes in grids and rings, through the whole planner (common practice:
// a simple path in any of these lattices carries the same network).
TEST(ChainPlanner, MetricsOnLinesGridsAndRings) {
  const std::vector<std::string> specs{"line:64", "grid:8x8", "ring:64", "grid:5x13"};
  for (const auto& spec : specs) {
    const Device dev = make_lattice(spec);
    for (int n = 2; n <= 64 && n <= dev.qubit_count(); n += (n < 12 ? 1 : 7)) {
      for (NetworkChoice network : {NetworkChoice::reversal, NetworkChoice::anchored}) {
        PlanOptions opt;
        opt.spec.qubits = n;
        opt.strategy = "chain";
        opt.network = network;
        const auto r = plan_qft(dev, opt);
        // Fowler, Devitt and Hollenberg (2004): n(n-1)/2 fused blocks in 2n-3 layers; the anchored
        // network (ours, the default) keeps both and plain controlled phases for the first wire.
        EXPECT_EQ(r.two_qubit_blocks, static_cast<long long>(n) * (n - 1) / 2) << spec << " n=" << n;
        EXPECT_EQ(r.depth_2q, 2 * n - 3) << spec << " n=" << n;
        // Vidal and Dawson, PRA 69, 010301 (2004): 3 CX per fused block, 2 per controlled phase.
        const long long fused = network == NetworkChoice::reversal ? static_cast<long long>(n) * (n - 1) / 2
                                                                    : static_cast<long long>(n - 1) * (n - 2) / 2;
        EXPECT_EQ(r.network, network_choice_name(network));
        EXPECT_EQ(r.swaps, fused) << spec << " n=" << n;
        EXPECT_EQ(r.cx_count, 3 * fused + 2 * (r.two_qubit_blocks - fused)) << spec << " n=" << n;
        EXPECT_TRUE(is_chain(dev, r.chain));
      }
    }
  }
}

}  // namespace
}  // namespace qftplan
