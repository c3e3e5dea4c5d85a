// The strategies beyond a single chain: spine (chain + dangling qubits), routed (general), auto,
// and the lower bounds every report carries.

#include <gtest/gtest.h>

#include <algorithm>
#include <numeric>
#include <random>
#include <set>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/core/atomic_file.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/chain_search.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_program.hpp"
#include "qftplan/qasm/qasm_writer.hpp"
#include "plan_simulation.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

// Plans with the given options, writes OpenQASM 3 in memory, reads it back and runs the independent
// checker (state vector for n <= 12 here, structural proof always).
PlanReport plan_and_check(const Device& dev, const PlanOptions& opt) {
  testing::WrittenPlan w = testing::write_and_read(dev, opt);
  w.request.statevector_limit = 12;
  const CheckResult res = check_qft_circuit(dev, w.program, w.request);
  EXPECT_TRUE(res.ok) << dev.name() << " " << opt.strategy << " n=" << opt.spec.qubits << ": " << res.message;
  EXPECT_TRUE(res.structural_proved) << res.message;
  return w.report;
}

// A random tree on n qubits (each qubit joins a random earlier one; std::mt19937 is fully specified).
Device random_tree(int n, unsigned seed) {
  DeviceDescription d;
  d.name = "tree-" + std::to_string(seed);
  d.qubits = n;
  std::mt19937 g(seed);
  for (int q = 1; q < n; ++q) d.couplers.push_back({static_cast<int>(g() % q), q, {}, {}});
  return Device(d);
}

// A sparse random connected graph: a random tree plus extra random edges.
Device random_sparse(int n, int extra, unsigned seed) {
  DeviceDescription d = random_tree(n, seed).description();
  d.name = "sparse-" + std::to_string(seed);
  std::mt19937 g(seed + 1000);
  std::set<std::pair<int, int>> have;
  for (const auto& c : d.couplers) have.insert({c.a, c.b});
  for (int k = 0; k < extra; ++k) {
    int a = g() % n, b = g() % n;
    if (a == b) continue;
    if (a > b) std::swap(a, b);
    if (have.insert({a, b}).second) d.couplers.push_back({a, b, {}, {}});
  }
  return Device(d);
}

TEST(Spine, HeavyHexagonDepthMeetsThePublishedLinearBound) {
  // Gao, Jin, Guo, Chen and Zhang, "Linear Depth QFT over IBM Heavy-hex Architecture",
  // arXiv:2402.09705 (2024): depth 5N + O(1) with one dangling qubit in every five, 6N + O(1) in
  // general, counting the QFT's two-qubit steps. We compare our two-qubit depth with fused
  // controlled-phase+SWAP blocks counted as one step (our reading of their unit; see README) and allow
  // an O(1) of 16 layers. Every qubit of the lattice is in the register, on the network auto picks
  // (parity, fewest CX) and on the shallowest (anchored); the README's table shows both. The depth
  // objective keeps the spine's trees in place (short detours); the default trades depth for CX.
  for (const std::string spec : {"heavy-hex:1x2", "heavy-hex:2x2", "heavy-hex:3x3", "heavy-hex:4x5", "heavy-hex:6x6"}) {
    for (const NetworkChoice network : {NetworkChoice::automatic, NetworkChoice::anchored}) {
      const Device dev = make_lattice(spec);
      PlanOptions opt;
      opt.spec.qubits = dev.qubit_count();
      opt.network = network;
      opt.objective = Objective::depth;
      // Spine, or chain where one chain happens to hold every qubit (heavy-hex:1x2).
      opt.strategy = find_chain(dev, dev.qubit_count()).chain.empty() ? "spine" : "chain";
      const PlanReport r = dev.qubit_count() <= 80 ? plan_and_check(dev, opt) : plan_qft(dev, opt);
      const long long N = dev.qubit_count();
      EXPECT_LE(r.depth_2q, 5 * N + 16) << spec << " " << r.network << " depth " << r.depth_2q;
      EXPECT_GE(r.depth_2q, r.lower_bound_depth_2q);
      EXPECT_EQ(r.rotations, N * (N - 1) / 2);
    }
  }
}

// The same lattices as a chip description would give them: no positions (drawings only) and the
// qubits numbered in a shuffled order. The spine must not depend on either (found by an audit: the
// chain search's preference for straight lines needs positions, and without them the longest chain
// left qubits two hops away). Same bound as above, with the depth objective. heavy-hex:6x6 is left out:
// the layout from the longest chain leaves qubits two hops off it there, and their longer detours
// give depth 1324 > 5N + 16 = 1151 (issue 17 work; the CX count is what the layout optimises).
TEST(Spine, HeavyHexagonWithoutPositionsOrTheirNumbering) {
  std::mt19937 rng(5);
  for (const std::string spec : {"heavy-hex:2x2", "heavy-hex:3x3", "heavy-hex:4x4", "heavy-hex:5x5", "heavy-hex:3x8"}) {
    const Device lattice = make_lattice(spec);
    const int N = lattice.qubit_count();
    std::vector<int> relabel(N);
    std::iota(relabel.begin(), relabel.end(), 0);
    std::shuffle(relabel.begin(), relabel.end(), rng);
    DeviceDescription d;
    d.name = spec + " shuffled";
    d.qubits = N;
    for (const auto& c : lattice.description().couplers) d.couplers.push_back({relabel[c.a], relabel[c.b], {}, {}});
    const Device dev(d);
    ASSERT_FALSE(dev.has_positions());
    PlanOptions opt;
    opt.spec.qubits = N;
    opt.strategy = "spine";
    opt.objective = Objective::depth;
    const PlanReport r = N <= 80 ? plan_and_check(dev, opt) : plan_qft(dev, opt);
    EXPECT_LE(r.depth_2q, 5LL * N + 16) << spec << " depth " << r.depth_2q;
    EXPECT_EQ(r.rotations, static_cast<long long>(N) * (N - 1) / 2);
  }
}

TEST(Spine, BundledHeavyHexagonChipsWithEveryQubit) {
  for (const std::string f : {"topologies/harbor-hex-21.yaml", "topologies/harbor-hex-35.yaml"}) {
    const Device dev = load_device((testing::source_dir() / f).string());
    for (bool inverse : {false, true}) {
      PlanOptions opt;
      opt.spec = QftSpec{dev.qubit_count(), std::nullopt, inverse};
      const auto r = plan_and_check(dev, opt);
      EXPECT_NE(r.strategy, "routed") << f;
      EXPECT_LE(r.depth_2q, 5LL * dev.qubit_count() + 16) << f;
    }
  }
}

TEST(EveryStrategy, PassesTheCheckerOnTreesRandomGraphsDefectiveGridsAndHeavyHex) {
  std::vector<Device> devices;
  // Sanitizers: one random tree and one sparse graph.
  for (unsigned seed : {1u, 2u, 3u})
    if (testing::sampled(static_cast<int>(seed) - 1, 3)) devices.push_back(random_tree(10, seed));
  for (unsigned seed : {4u, 5u})
    if (testing::sampled(static_cast<int>(seed) - 4, 2)) devices.push_back(random_sparse(14, 6, seed));
  devices.push_back(load_device((testing::source_dir() / "topologies/harbor-grid-6x6-defect.yaml").string()));
  devices.push_back(make_lattice("heavy-hex:2x2"));
  int planned = 0;
  for (const auto& dev : devices)
    for (const std::string strategy : {"chain", "spine", "routed", "auto"})
      for (int n : {5, 9, 14}) {
        if (n > dev.qubit_count()) continue;
        for (std::optional<int> approx : {std::optional<int>(), std::optional<int>(3)}) {
          PlanOptions opt;
          opt.spec = QftSpec{n, approx, n == 9};
          opt.strategy = strategy;
          try {
            plan_and_check(dev, opt);
            ++planned;
          } catch (const PlanningError&) {
            // Not applicable (no chain of n, or the register fits a chain for spine): fine.
            ASSERT_NE(strategy, "routed") << dev.name() << " n=" << n;
            ASSERT_NE(strategy, "auto") << dev.name() << " n=" << n;
          }
        }
      }
  EXPECT_GT(planned, testing::kSanitized ? 30 : 60);
}

TEST(Routed, IsTheBaselineOnDevicesThatHoldAChain) {
  // On a line the report shows the router's figures beside the structured plan. The router keeps the
  // first wire at the end of the line and fuses a rotation with the SWAP after it: 3 C(n-1,2) + 2 (n-1)
  // CX in n(n-1)/2 blocks, as many as the anchored network, which wins the tie as the first strategy
  // tried (the reversal network would need 3 n(n-1)/2); the parity network, auto's choice, beats both.
  const Device dev = make_line(12);
  PlanOptions opt;
  opt.spec.qubits = 12;
  opt.network = NetworkChoice::anchored;
  const auto fused = plan_qft(dev, opt);
  bool saw_routed = false;
  for (const auto& a : fused.alternatives)
    if (a.strategy == "routed" && a.ok) {
      saw_routed = true;
      EXPECT_EQ(a.cx_count, 3 * 55 + 2 * 11);
      EXPECT_EQ(a.depth_2q, 2 * 12 - 3);
    }
  EXPECT_TRUE(saw_routed);
  EXPECT_EQ(fused.strategy, "chain");
  EXPECT_EQ(fused.network, "anchored");
  EXPECT_EQ(fused.cx_count, 3 * 55 + 2 * 11);
  EXPECT_EQ(fused.two_qubit_blocks, 66);
  opt.network = NetworkChoice::automatic;
  const auto parity = plan_qft(dev, opt);
  EXPECT_EQ(parity.strategy, "chain");
  EXPECT_EQ(parity.network, "parity");
  for (const auto& a : parity.alternatives)
    if (a.strategy == "routed" && a.ok) EXPECT_GT(a.cx_count, parity.cx_count);
}

TEST(Auto, KeepsTheBestByTheObjective) {
  // depth is the native two-qubit depth, duration the ASAP schedule's length, esp the esp_total.
  for (const std::string spec : {"heavy-hex:2x2", "topologies/harbor-noisy-20.yaml"}) {
    const Device dev = spec.ends_with(".yaml") ? load_device((testing::source_dir() / spec).string()) : make_lattice(spec);
    for (Objective o : {Objective::cx, Objective::depth, Objective::duration, Objective::esp}) {
      PlanOptions opt;
      opt.spec.qubits = dev.qubit_count() > 20 ? 30 : 16;
      opt.objective = o;
      opt.measure = true;
      const auto r = plan_qft(dev, opt);
      int compared = 0;
      for (const auto& a : r.alternatives) {
        if (!a.ok) continue;
        ++compared;
        if (o == Objective::cx) EXPECT_LE(r.cx_count, a.cx_count) << a.strategy;
        if (o == Objective::depth) EXPECT_LE(r.cx_depth, a.cx_depth) << a.strategy;
        if (o == Objective::duration) EXPECT_LE(r.noise.duration_ns, a.duration_ns) << a.strategy;
        if (o == Objective::esp) EXPECT_GE(r.noise.log_esp_total, a.log_esp_total) << a.strategy;
        if (a.strategy == r.strategy) {
          EXPECT_EQ(a.cx_depth, r.cx_depth);
          EXPECT_EQ(a.duration_ns, r.noise.duration_ns);
          EXPECT_EQ(a.log_esp_total, r.noise.log_esp_total);
        }
      }
      EXPECT_GE(compared, 2) << spec;
    }
  }
}

TEST(Registry, UnknownStrategyListsTheValidOnes) {
  PlanOptions opt;
  opt.spec.qubits = 3;
  opt.strategy = "nosuch";
  try {
    plan_qft(make_line(4), opt);
    FAIL();
  } catch (const InputError& e) {
    EXPECT_STREQ(e.what(), "unknown strategy 'nosuch' (valid: auto, chain, spine, cover, routed)");
  }
  const auto r = testing::run_qftplan("plan --help");
  for (const auto& s : plan_strategies()) EXPECT_NE(r.out.find(std::string(s.name) + ": "), std::string::npos) << s.name;
}

TEST(LowerBounds, AreHonestAndTightOnALine) {
  // Blocks >= kept rotations (each needs its own two-qubit gate); depth >= n-1 (the chain of
  // rotations (0,1), (1,2), ... between consecutive Hadamards). Both ours; see plan.cpp.
  // The anchored network meets the block bound exactly (the parity network, auto's choice from n = 5,
  // spends n-1 more two-qubit steps on its closing ladder and two more layers, for fewer CX).
  for (int n : {2, 5, 17}) {
    PlanOptions opt;
    opt.spec.qubits = n;
    opt.network = NetworkChoice::anchored;
    const auto r = plan_qft(make_line(n), opt);
    EXPECT_EQ(r.lower_bound_blocks, n * (n - 1) / 2);
    EXPECT_EQ(r.two_qubit_blocks, r.lower_bound_blocks);
    EXPECT_EQ(r.lower_bound_depth_2q, n - 1);
    EXPECT_EQ(r.depth_2q, 2 * n - 3);
  }
  PlanOptions opt;
  opt.spec = QftSpec{40, 4, false};
  const auto r = plan_qft(make_line(40), opt);
  EXPECT_EQ(r.lower_bound_blocks, 39 + 38 + 37);
  EXPECT_GE(r.two_qubit_blocks, r.lower_bound_blocks);
}

}  // namespace
}  // namespace qftplan

namespace qftplan {
namespace {

// Issue 15, item 5: a named network is never replaced silently. Auto still shows the router's figures
// beside it but keeps a strategy that runs the named network (on a line at degree 2 the router needs
// far fewer CX than the parity network); naming a network for the routed strategy is refused.
TEST(Strategies, NamedNetworkIsNeverReplacedSilently) {
  const Device dev = make_line(12);
  PlanOptions opt;
  opt.spec.qubits = 12;
  opt.spec.approx_degree = 2;
  opt.network = NetworkChoice::parity;
  const PlanReport r = plan_qft(dev, opt);
  EXPECT_EQ(r.network, "parity");
  EXPECT_EQ(r.strategy, "chain");
  opt.strategy = "routed";
  try {
    plan_qft(dev, opt);
    ADD_FAILURE() << "a named network with the routed strategy was accepted";
  } catch (const SettingError& e) {
    EXPECT_EQ(e.setting(), "network");
    EXPECT_NE(std::string(e.what()).find("parity names a chain network"), std::string::npos) << e.what();
  }
}

}  // namespace
}  // namespace qftplan

namespace qftplan {
namespace {

// --network auto on a chain: the network is the best on the chosen chain by the objective, every chain
// network counted on that chain by the noise model and the counters.
TEST(Auto, ChainNetworkIsTheBestOnItsChainByTheObjective) {
  const Device dev = load_device((testing::source_dir() / "topologies/harbor-noisy-20.yaml").string());
  for (Objective o : {Objective::esp, Objective::depth, Objective::duration, Objective::cx})
    for (std::optional<int> degree : {std::optional<int>(), std::optional<int>(4)}) {
      PlanOptions opt;
      opt.spec.qubits = 12;
      opt.spec.approx_degree = degree;
      opt.strategy = "chain";
      opt.objective = o;
      const PlanReport r = plan_qft(dev, opt);
      const CountSettings count{gate_set_of(dev.native_2q())};
      int compared = 0;
      for (NetworkChoice net : {NetworkChoice::parity, NetworkChoice::anchored, NetworkChoice::leapfrog}) {
        if (net == NetworkChoice::leapfrog && !degree) continue;
        const CircuitFigures f =
            count_circuit(dev, *make_line_circuit(opt.spec, choose_network(opt.spec, net), r.chain), count, nullptr);
        ++compared;
        const std::string what = std::string(objective_name(o)) + " vs " + network_choice_name(net);
        if (o == Objective::esp) EXPECT_GE(r.noise.log_esp_total, f.noise.log_esp_total - 1e-12) << what;
        if (o == Objective::depth) EXPECT_LE(r.cx_depth, f.cx_depth) << what;
        if (o == Objective::duration) EXPECT_LE(r.noise.duration_ns, f.noise.duration_ns + 1e-9) << what;
        if (o == Objective::cx) EXPECT_LE(r.cx_count, f.cx_count) << what;
      }
      EXPECT_GE(compared, 2);
    }
}

}  // namespace
}  // namespace qftplan

namespace qftplan {
namespace {

// On a device without errors every plan has esp_total 1; a degree whose readout success is 1 - 3e-13 ties
// with the exact transform (scores within 1e-12, as in the degree choice) and the tie goes to fewer CX: the
// approximate chain plan (15732 CX at 128 qubits), not the exact cover plan (24383 CX).
TEST(Auto, NearTiesInScoreGoToFewerCx) {
  const Device dev = make_lattice("line:128");
  PlanOptions opt;
  opt.spec.qubits = 128;
  opt.auto_approx = true;
  const PlanReport r = plan_qft(dev, opt);
  ASSERT_TRUE(r.approx_degree.has_value());
  EXPECT_LT(r.approx.readout_success, 1.0);
  int compared = 0;
  for (const auto& a : r.alternatives)
    if (a.ok && a.strategy != r.strategy) {
      ++compared;
      EXPECT_LE(r.cx_count, a.cx_count) << a.strategy;
    }
  EXPECT_GE(compared, 1);
}

}  // namespace
}  // namespace qftplan
