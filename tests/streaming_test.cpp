// Tests of the streaming machinery the speed of issue 7 rests on: runs of gates (GateSink::batch,
// GateRun), networks streamed without being kept, chain loads counted from network steps, depths
// read from final levels, and a report-only plan streamed once. Each fast path is compared with
// the plain one it replaces, which the other test files check against outside references.

#include <gtest/gtest.h>

#include <cmath>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/device/device_yaml.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/networks/chain_qft.hpp"
#include "qftplan/networks/end_order.hpp"
#include "qftplan/networks/qft_network.hpp"
#include "qftplan/planners/chain_search.hpp"
#include "qftplan/planners/placement_search.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/sinks/circuit_metrics.hpp"
#include "qftplan/sinks/native_gates.hpp"
#include "qftplan/sinks/noise_model.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

// A sink that sees only gate(), never batch(): what the rewriting sinks must send is the same
// gates in the same order whichever way they receive them.
class OneByOne final : public GateSink {
 public:
  explicit OneByOne(GateSink& out) : out_(out) {}
  void gate(const Gate& g) override { out_.gate(g); }

 private:
  GateSink& out_;
};

std::vector<Gate> chain_qft_gates(const QftSpec& spec, std::vector<int> chain) {
  VectorSink v;
  emit_chain_qft(spec, *choose_network(spec), chain, v);
  return v.gates;
}

TEST(Streaming, RewritingSinksGiveTheSameGatesInRunsAsOneByOne) {
  QftSpec spec;
  spec.qubits = 40;  // big enough for several runs of a thousand gates
  std::vector<int> chain(40);
  for (int i = 0; i < 40; ++i) chain[i] = i;
  const auto logical = chain_qft_gates(spec, chain);
  ASSERT_GT(logical.size(), 780u);
  for (TwoQubitGate native : {TwoQubitGate::cx, TwoQubitGate::cz}) {
    VectorSink batched, single;
    NativeDecomposer a(native, batched);
    a.batch(logical);
    NativeDecomposer b(native, single);
    OneByOne feed(b);
    for (const Gate& g : logical) feed.gate(g);
    EXPECT_EQ(batched.gates, single.gates);
    EXPECT_GT(batched.gates.size(), 3 * logical.size() / 2);
  }
  VectorSink split_batched, split_single;
  FusedBlockSplitter s1(split_batched);
  s1.batch(logical);
  FusedBlockSplitter s2(split_single);
  for (const Gate& g : logical) s2.gate(g);
  EXPECT_EQ(split_batched.gates, split_single.gates);
}

TEST(Streaming, SimulatedNetworksStreamedEqualKept) {
  for (int n : {5, 17, 64}) {
    for (int d : {1, 2, 5}) {
      if (d >= n - 1) continue;
      for (const auto& net : {make_leapfrog_network(n, d), d >= 2 ? make_insertion_network(n, d) : make_leapfrog_network(n, d),
                              d >= 2 ? make_parity_insertion_network(n, d) : make_leapfrog_network(n, d)}) {
      std::vector<NetworkOp> streamed;
      std::vector<int> sizes;
      net->for_each_chunk([&](std::span<const NetworkOp> ops) {
        streamed.insert(streamed.end(), ops.begin(), ops.end());
        sizes.push_back(static_cast<int>(ops.size()));
      });
      std::vector<NetworkOp> kept, chunk;
      for (int c = 0; c < net->chunk_count(); ++c) {
        net->chunk(c, chunk);
        EXPECT_EQ(static_cast<int>(chunk.size()), sizes[c]) << "n=" << n << " d=" << d << " chunk " << c;
        kept.insert(kept.end(), chunk.begin(), chunk.end());
      }
      ASSERT_EQ(streamed.size(), kept.size());
      for (std::size_t k = 0; k < kept.size(); ++k) {
        EXPECT_EQ(streamed[k].kind, kept[k].kind);
        EXPECT_EQ(streamed[k].i, kept[k].i);
        EXPECT_EQ(streamed[k].j, kept[k].j);
      }
      long long blocks = 0;
      for (const auto& op : kept) blocks += op.kind != NetworkOp::Kind::h;
      EXPECT_EQ(net->block_count(), blocks);
      }
    }
  }
}

// The leapfrog network's step counts come from a formula (qft_network.cpp): it must equal a count
// of the steps it streams, for every register below 200 qubits and every kept distance.
TEST(Streaming, LeapfrogCountsEqualItsSteps) {
  for (int n = 3; n < 200; ++n)
    for (int d = 1; d < n - 1; ++d) {
      const auto net = make_leapfrog_network(n, d);
      std::array<long long, 4> streamed{};
      net->for_each_chunk([&](std::span<const NetworkOp> ops) {
        for (const auto& op : ops) ++streamed[static_cast<int>(op.kind)];
      });
      ASSERT_EQ(net->step_counts(), streamed) << "n=" << n << " d=" << d;
    }
}

// The parity form of the insertion network counts its steps in closed form (qft_network.cpp): equal to
// a count of the steps it streams, for every register below 150 qubits and every kept distance.
TEST(Streaming, InsertionCountsEqualItsSteps) {
  for (int n = 3; n < 150; ++n)
    for (int d = 2; d < n; ++d) {
      const auto net = make_parity_insertion_network(n, d);
      std::array<long long, 4> streamed{};
      net->for_each_chunk([&](std::span<const NetworkOp> ops) {
        for (const auto& op : ops) ++streamed[static_cast<int>(op.kind)];
      });
      ASSERT_EQ(net->step_counts(), streamed) << "n=" << n << " d=" << d;
    }
}

// What the reversal network knows of itself equals a dry run of its steps (the base class's way).
TEST(Streaming, ReversalShortcutsEqualADryRun) {
  for (int n : {1, 2, 3, 8, 31})
    for (int d : {1, 3, 64}) {
      const auto net = make_reversal_network(n, std::min(d, std::max(n - 1, 0)));
      std::vector<int> pos = net->initial_positions();
      long long blocks = 0;
      net->for_each_chunk([&](std::span<const NetworkOp> ops) {
        for (const auto& op : ops) {
          blocks += op.kind != NetworkOp::Kind::h;
          if (op.kind == NetworkOp::Kind::swap || op.kind == NetworkOp::Kind::cp_swap) std::swap(pos[op.i], pos[op.j]);
        }
      });
      EXPECT_EQ(net->final_positions(), pos) << "n=" << n << " d=" << d;
      EXPECT_EQ(net->block_count(), blocks) << "n=" << n << " d=" << d;
    }
}

// Replaying each gate's native program gives the figures of the decomposed stream (counts and depths
// exactly, noise figures to rounding): on
// a chip with uneven calibration, both native gates, exact, approximate and inverse QFTs, with
// stray gates of every kind, a gate off the couplers and measurements at the end.
TEST(Streaming, NativeReplayEqualsTheDecomposedStream) {
  const Device dev = load_device((testing::source_dir() / "topologies/harbor-noisy-20.yaml").string());
  for (TwoQubitGate native : {TwoQubitGate::cx, TwoQubitGate::cz})
    for (bool inverse : {false, true})
      for (std::optional<int> degree : {std::optional<int>{}, std::optional<int>{3}}) {
        QftSpec spec;
        spec.qubits = 12;
        spec.inverse = inverse;
        spec.approx_degree = degree;
        const auto chain = find_chain(dev, 12).chain;
        ASSERT_EQ(chain.size(), 12u);
        VectorSink logical;
        const QubitMaps maps = emit_chain_qft(spec, *choose_network(spec), chain, logical);
        // Stray gates: one-qubit kinds, native two-qubit kinds, a plain swap, a pair that is not
        // coupled (0 and 19), a qubit outside the register, then measurements.
        for (GateKind k : {GateKind::x, GateKind::sx, GateKind::p, GateKind::rz})
          logical.gates.push_back(make_gate(k, 7, -1, Angle(1, 3)));
        logical.gates.push_back(make_gate(GateKind::cx, 0, 1));
        logical.gates.push_back(make_gate(GateKind::cz, 1, 2));
        logical.gates.push_back(make_gate(GateKind::swap, 2, 3));
        // Parity steps with and without an angle (the rewrite leaves out an rz of angle 0).
        logical.gates.push_back(make_gate(GateKind::parity_step, 3, 4));
        logical.gates.push_back(make_gate(GateKind::parity_step, 8, 9, Angle(1, 3)));
        logical.gates.push_back(make_gate(GateKind::cp, 0, 19, Angle(1, 2)));
        for (int k = 0; k < 12; ++k) logical.gates.push_back(make_gate(GateKind::measure, maps.final_placement[k], k));

        MetricsSink m1(dev.qubit_count()), m2(dev.qubit_count());
        NoiseSink n1(dev, maps.placement), n2(dev, maps.placement);
        TeeSink tee({&m1, &n1});
        NativeDecomposer dec(native, tee);
        dec.batch(logical.gates);
        dec.finish();
        NativeReplay replay(native, m2, n2);
        replay.batch(logical.gates);
        replay.finish();
        const std::string what = std::string(native == TwoQubitGate::cz ? "cz" : "cx") + (inverse ? " inverse" : "") +
                                 (degree ? " M=3" : " exact");
        EXPECT_EQ(m1.counts_by_name(), m2.counts_by_name()) << what;
        EXPECT_EQ(m1.depth(), m2.depth()) << what;
        EXPECT_EQ(m1.depth_2q(), m2.depth_2q()) << what;
        EXPECT_EQ(m1.used_qubits(), m2.used_qubits()) << what;
        const NoiseFigures f1 = n1.figures(), f2 = n2.figures();
        EXPECT_TRUE(std::isinf(f1.log_esp)) << what;  // the gate off the couplers fails for certain
        EXPECT_EQ(f1.log_esp, f2.log_esp) << what;
        // Equal to rounding: the replay adds each term as a multiple, not once per gate.
        EXPECT_NEAR(f1.duration_ns, f2.duration_ns, 1e-12 * f1.duration_ns) << what;
        EXPECT_NEAR(f1.esp_readout, f2.esp_readout, 1e-15) << what;
        EXPECT_GT(f1.duration_ns, 0) << what;
        // Without the stray gate off the couplers, the ESP and idling are finite and comparable.
        MetricsSink m3(dev.qubit_count()), m4(dev.qubit_count());
        NoiseSink n3(dev, maps.placement), n4(dev, maps.placement);
        std::vector<Gate> on_couplers;
        for (const Gate& g : logical.gates)
          if (!(g.kind == GateKind::cp && g.q1 == 19)) on_couplers.push_back(g);
        TeeSink tee2({&m3, &n3});
        NativeDecomposer dec2(native, tee2);
        dec2.batch(on_couplers);
        NativeReplay replay2(native, m4, n4);
        replay2.batch(on_couplers);
        const NoiseFigures f3 = n3.figures(), f4 = n4.figures();
        EXPECT_LT(f3.log_esp, -0.1) << what;
        EXPECT_NEAR(f3.log_esp, f4.log_esp, 1e-12 * std::abs(f3.log_esp)) << what;
        EXPECT_NEAR(f3.esp_idle / f4.esp_idle, 1.0, 1e-12) << what;
        EXPECT_NEAR(f3.idle_ns, f4.idle_ns, 1e-9 * f3.idle_ns) << what;
        EXPECT_LT(f3.esp_idle, 1.0) << what;
        EXPECT_LT(f3.esp_total, f3.esp) << what;
        EXPECT_NEAR(f3.duration_ns, f4.duration_ns, 1e-12 * f3.duration_ns) << what;
      }
}

// The same figures on the plan path: a report-only plan and a plan written out in native gates agree
// exactly, on the noisy chip where ESP and idling are not trivial.
TEST(Streaming, ReportOnlyPlanEqualsAWrittenPlan) {
  const Device dev = load_device((testing::source_dir() / "topologies/harbor-noisy-20.yaml").string());
  for (bool inverse : {false, true}) {
    PlanOptions opt;
    opt.spec.qubits = 14;
    opt.spec.inverse = inverse;
    opt.measure = true;
    const PreparedPlan plan = prepare_plan(dev, opt);
    const PlanReport quiet = execute_plan(dev, opt, plan, nullptr);
    VectorSink out;
    const PlanReport written = execute_plan(dev, opt, plan, &out);
    EXPECT_FALSE(out.gates.empty());
    EXPECT_EQ(quiet.gate_counts, written.gate_counts);
    EXPECT_EQ(quiet.cx_count, written.cx_count);
    EXPECT_EQ(quiet.cx_depth, written.cx_depth);
    EXPECT_EQ(quiet.depth, written.depth);
    EXPECT_EQ(quiet.noise.log_esp, written.noise.log_esp);
    EXPECT_EQ(quiet.noise.esp_idle, written.noise.esp_idle);
    EXPECT_EQ(quiet.noise.esp_readout, written.noise.esp_readout);
    EXPECT_EQ(quiet.noise.esp_total, written.noise.esp_total);
    EXPECT_EQ(quiet.noise.duration_ns, written.noise.duration_ns);
  }
}

// On a device with one error rate for every qubit and one for every coupler, the ESP from step
// counts equals the per-position sum over a dry run, for every network the planner chooses; and the
// counts a network knows of itself equal a count of its streamed steps.
TEST(Streaming, UniformEspFromStepCountsEqualsTheDryRun) {
  std::string yaml = "name: uniform-line-30\nqubits: 30\ncouplers:\n";
  for (int q = 0; q + 1 < 30; ++q) yaml += "  - [" + std::to_string(q) + ", " + std::to_string(q + 1) + "]\n";
  yaml += "calibration: {error_1q: 0.0007, error_2q: 0.011}\n";
  const Device dev = parse_device_yaml(yaml, "uniform.yaml");
  std::vector<int> chain(30);
  for (int i = 0; i < 30; ++i) chain[i] = i;
  for (TwoQubitGate native : {TwoQubitGate::cx, TwoQubitGate::cz})
    for (EndOrder order : {EndOrder::free, EndOrder::same})
      for (std::optional<int> degree : {std::optional<int>{}, std::optional<int>{1}, std::optional<int>{2},
                                        std::optional<int>{4}, std::optional<int>{12}}) {
        QftSpec spec;
        spec.qubits = 30;
        spec.approx_degree = degree;
        const auto net = choose_network(spec, order);
        std::array<long long, 4> streamed{};
        net->for_each_chunk([&](std::span<const NetworkOp> ops) {
          for (const auto& op : ops) ++streamed[static_cast<int>(op.kind)];
        });
        EXPECT_EQ(net->step_counts(), streamed) << net->name();
        const double dry = chain_log_esp(dev, chain_loads(spec, *net, native), chain);
        EXPECT_LT(dry, -0.01) << net->name();
        EXPECT_NEAR(uniform_log_esp(dev, *net, native), dry, 1e-12 * std::abs(dry)) << net->name();
      }
}

// The loads counted from network steps equal a dry run of the emitted native gates on the chain
// 0..n-1, for both native gates, forwards and inverse, exact and approximate.
TEST(Streaming, ChainLoadsEqualADryRunOfTheNativeCircuit) {
  for (TwoQubitGate native : {TwoQubitGate::cx, TwoQubitGate::cz})
    for (bool inverse : {false, true})
      for (std::optional<int> degree : {std::optional<int>{}, std::optional<int>{3}, std::optional<int>{2}}) {
        QftSpec spec;
        spec.qubits = 13;
        spec.inverse = inverse;
        spec.approx_degree = degree;
        const auto net = choose_network(spec);
        std::vector<int> chain(13);
        for (int i = 0; i < 13; ++i) chain[i] = i;
        VectorSink v;
        NativeDecomposer dec(native, v);
        emit_chain_qft(spec, *net, chain, dec);
        std::vector<double> edge(12, 0.0), pos(13, 0.0);
        for (const Gate& g : v.gates) {
          if (is_two_qubit(g.kind)) {
            ASSERT_EQ(std::abs(g.q0 - g.q1), 1);
            edge[std::min(g.q0, g.q1)] += 1;
          } else if (g.kind == GateKind::h || g.kind == GateKind::x || g.kind == GateKind::sx) {
            pos[g.q0] += 1;
          }
        }
        const ChainLoads loads = chain_loads(spec, *net, native);
        EXPECT_EQ(loads.edge_2q, edge) << net->name();
        EXPECT_EQ(loads.pos_1q, pos) << net->name() << (native == TwoQubitGate::cz ? " cz" : " cx") << (inverse ? " inverse" : "");
      }
}

// Depths taken from the final levels equal depths kept as running maxima; the unfused depth equals
// the two-qubit depth of the stream with every block split into cp then swap.
TEST(Streaming, DepthsFromFinalLevelsAndUnfusedDepth) {
  QftSpec spec;
  spec.qubits = 24;
  spec.approx_degree = 4;
  std::vector<int> chain(24);
  for (int i = 0; i < 24; ++i) chain[i] = i;
  const auto gates = chain_qft_gates(spec, chain);
  MetricsSink fused(24, true), unfused(24);
  FusedBlockSplitter split(unfused);
  fused.batch(gates);
  split.batch(gates);
  EXPECT_EQ(fused.depth_2q_unfused(), unfused.depth_2q());
  EXPECT_GT(fused.depth_2q_unfused(), fused.depth_2q());
  // Running maxima, by hand.
  std::vector<long long> level(24, 0), level2(24, 0);
  long long depth = 0, depth2 = 0;
  for (const Gate& g : gates) {
    if (is_two_qubit(g.kind)) {
      const long long l = std::max(level[g.q0], level[g.q1]) + 1, l2 = std::max(level2[g.q0], level2[g.q1]) + 1;
      level[g.q0] = level[g.q1] = l;
      level2[g.q0] = level2[g.q1] = l2;
      depth = std::max(depth, l);
      depth2 = std::max(depth2, l2);
    } else {
      depth = std::max(depth, ++level[g.q0]);
    }
  }
  EXPECT_EQ(fused.depth(), depth);
  EXPECT_EQ(fused.depth_2q(), depth2);
  EXPECT_EQ(fused.total(), static_cast<long long>(gates.size()));
}

// A report-only plan under --strategy auto where only the chain strategy plans (n above the
// routed comparison limit): its row in the comparison carries the report's own figures.
TEST(Streaming, SingleStrategyRowCarriesTheReportFigures) {
  const Device dev = make_line(140);
  PlanOptions opt;
  opt.spec.qubits = 140;
  const auto r = plan_qft(dev, opt);
  bool seen = false;
  for (const auto& a : r.alternatives)
    if (a.strategy == "chain") {
      seen = true;
      EXPECT_TRUE(a.ok);
      EXPECT_EQ(a.cx_count, r.cx_count);
      EXPECT_EQ(a.depth_2q, r.depth_2q);
      EXPECT_EQ(a.swaps, r.swaps);
      EXPECT_DOUBLE_EQ(a.log_esp, r.noise.log_esp);
    }
  EXPECT_TRUE(seen);
  EXPECT_EQ(r.network, "parity");
  EXPECT_EQ(r.cx_count, 140LL * 140 - 1);  // the parity network: n^2 - 1 CX (parity_qft.hpp)
}

// Plans stay correct at scale (issue 7): an exact QFT of 2048 qubits on a grid snake, written in
// native CX gates, and an approximate inverse one on a heavy-hexagon lattice, each streamed into the
// structural proof (which tracks every qubit's parity and every controlled phase; see
// qft_checker.hpp), so nothing of the size is skipped. The expected counts are the chain network's
// n(n-1)/2 fused blocks of 3 CX each (Fowler, Devitt and Hollenberg 2004, with the CX count of
// Vidal and Dawson 2004 for a two-qubit gate).
TEST(Scale, TwoThousandQubitPlansPassTheStructuralProof) {
  struct Case {
    std::string device;
    bool inverse;
    std::optional<int> degree;
    NetworkChoice network = NetworkChoice::automatic;
  };
  for (const Case& c : {Case{"grid:46x46", false, std::nullopt, NetworkChoice::anchored}, Case{"heavy-hex:24x24", true, 6},
                        Case{"grid:46x46", true, std::nullopt}}) {
    const Device dev = load_device(c.device);
    PlanOptions opt;
    opt.spec.qubits = 2048;
    opt.spec.inverse = c.inverse;
    opt.spec.approx_degree = c.degree;
    opt.strategy = "chain";
    opt.gates = GateSet::cx;
    opt.network = c.network;
    const PreparedPlan plan = prepare_plan(dev, opt);
    StructuralChecker proof(dev, plan.spec, plan.maps.placement);
    const PlanReport r = execute_plan(dev, opt, plan, &proof);
    const CheckResult res = proof.finish(r.final_placement);
    EXPECT_TRUE(res.ok && res.structural_proved) << c.device << ": " << res.message;
    EXPECT_EQ(proof.gate_count(), r.gate_counts.at("cx") + r.gate_counts.at("rz") + r.gate_counts.at("h")) << c.device;
    if (!c.degree && c.network == NetworkChoice::automatic) {
      EXPECT_EQ(r.network, "parity");
      EXPECT_EQ(r.cx_count, 2048LL * 2048 - 1);  // parity_qft.hpp: n^2 - 1
    } else if (!c.degree) {
      EXPECT_EQ(r.two_qubit_blocks, 2048LL * 2047 / 2);
      EXPECT_EQ(r.cx_count, 3LL * 2047 * 2046 / 2 + 2 * 2047);  // anchored: the first wire's 2047 plain phases
      EXPECT_EQ(r.depth_2q, 2 * 2048 - 3);
    } else {
      EXPECT_EQ(r.rotations, plan.spec.kept_rotations());
      // The cheapest approximate network at degree 6 on a chain: the insertion network's parity form,
      // about 4d CX a wire (d = M - 1; window_parity_qft.cpp).
      EXPECT_EQ(r.network, "parity-insertion");
      EXPECT_LE(r.cx_count, 2048LL * (4 * 5 + 1));
    }
  }
}

}  // namespace
}  // namespace qftplan
