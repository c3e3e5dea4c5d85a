// --end-order same: SWAPs that put output bit k back on the qubit that held input bit k. Sorting
// facts from Knuth (TAOCP vol. 3), circuits simulated against FFTW with the identity map, and every
// plan passed through the checker with final == initial.

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <complex>
#include <numbers>
#include <numeric>
#include <random>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/check/statevector.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/networks/chain_qft.hpp"
#include "qftplan/networks/end_order.hpp"
#include "qftplan/networks/qft_network.hpp"
#include "qftplan/planners/plan.hpp"
#include "plan_simulation.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

using cd = std::complex<double>;

long long brute_inversions(const std::vector<long long>& v) {
  long long n = 0;
  for (std::size_t i = 0; i < v.size(); ++i)
    for (std::size_t j = i + 1; j < v.size(); ++j) n += v[i] > v[j];
  return n;
}

TEST(EndOrder, ParsesItsNames) {
  EXPECT_EQ(parse_end_order("free"), EndOrder::free);
  EXPECT_EQ(parse_end_order("same"), EndOrder::same);
  EXPECT_STREQ(end_order_name(EndOrder::same), "same");
  try {
    parse_end_order("reversed");
    FAIL();
  } catch (const InputError& e) {
    EXPECT_STREQ(e.what(), "unknown end order 'reversed' (valid: free, same)");
  }
}

TEST(EndOrder, InversionsMatchTheDefinition) {
  std::mt19937_64 rng(7);
  for (int n : {0, 1, 2, 5, 17, 64}) {
    std::vector<long long> v(n);
    for (auto& x : v) x = static_cast<long long>(rng() % 9);  // with ties
    EXPECT_EQ(count_inversions(v), brute_inversions(v));
  }
  // A reversal of n distinct keys has n(n-1)/2 inversions (Knuth, TAOCP vol. 3, section 5.1.1).
  std::vector<long long> rev(40);
  std::iota(rev.rbegin(), rev.rend(), 0);
  EXPECT_EQ(count_inversions(rev), 40 * 39 / 2);
}

// Odd-even transposition sort (Knuth, TAOCP vol. 3, section 5.3.4): n rounds suffice, and since each
// exchange swaps an out-of-order neighbour pair it removes one inversion, so the exchange count is the
// inversion count, the fewest adjacent exchanges that sort (Knuth, section 5.2.2, bubble sort).
TEST(EndOrder, OddEvenSortIsOptimalAndLayered) {
  std::mt19937_64 rng(11);
  for (int trial = 0; trial < 200; ++trial) {
    const int n = 1 + static_cast<int>(rng() % 30);
    std::vector<long long> keys(n);
    std::iota(keys.begin(), keys.end(), 0);
    std::shuffle(keys.begin(), keys.end(), rng);
    const auto rounds = odd_even_sort_rounds(keys);
    EXPECT_LE(static_cast<int>(rounds.size()), n);
    long long swaps = 0;
    auto v = keys;
    for (const auto& round : rounds) {
      for (std::size_t i = 0; i < round.size(); ++i) {
        if (i > 0) EXPECT_GE(round[i], round[i - 1] + 2) << "a round's exchanges must be disjoint";
        std::swap(v[round[i]], v[round[i] + 1]);
        ++swaps;
      }
    }
    EXPECT_TRUE(std::is_sorted(v.begin(), v.end()));
    EXPECT_EQ(swaps, brute_inversions(keys));
  }
}

// The approximate QFT of degree M from its definition: of the phase 2 pi sum_{a,b} j_a y_b 2^(a+b-n)
// keep the terms with 1 <= n-a-b <= M (Coppersmith, IBM RC19642, 1994; Barenco, Ekert, Suominen and
// Torma, PRA 54, 139, 1996, section II).
std::vector<std::vector<cd>> aqft(int n, int M, bool inverse) {
  const int N = 1 << n;
  std::vector<std::vector<cd>> m(N, std::vector<cd>(N));
  for (int j = 0; j < N; ++j)
    for (int y = 0; y < N; ++y) {
      double ph = 0;
      for (int a = 0; a < n; ++a)
        for (int b = 0; b < n; ++b) {
          const int d = n - a - b;
          if (d >= 1 && d <= M && ((j >> a) & 1) && ((y >> b) & 1)) ph += 2 * std::numbers::pi / std::ldexp(1.0, d);
        }
      m[j][y] = std::polar(1.0 / std::sqrt(double(N)), inverse ? -ph : ph);
    }
  return m;
}

// Simulates `gates` with input bit k on placement[k] and output bit k read from the same qubit (the
// identity map), and returns the largest distance from `want` after one global phase.
double identity_map_distance(const std::vector<Gate>& gates, const std::vector<int>& placement,
                             const std::vector<std::vector<cd>>& want) {
  const int n = static_cast<int>(placement.size()), N = 1 << n;
  std::vector<int> local;
  auto index = [&](int q) {
    auto it = std::find(local.begin(), local.end(), q);
    if (it != local.end()) return static_cast<int>(it - local.begin());
    local.push_back(q);
    return static_cast<int>(local.size()) - 1;
  };
  for (int q : placement) index(q);
  std::vector<Gate> mapped;
  for (Gate g : gates) {
    if (g.kind == GateKind::measure) continue;
    g.q0 = index(g.q0);
    if (is_two_qubit(g.kind)) g.q1 = index(g.q1);
    mapped.push_back(g);
  }
  cd phase = 0;
  double worst = 0;
  for (int j = 0; j < N; ++j) {
    StateVector sv(static_cast<int>(local.size()));
    sv.set_basis(static_cast<std::size_t>(j));  // placement[k] is local qubit k
    for (const auto& g : mapped) sv.apply(g);
    for (int y = 0; y < N; ++y) {
      const cd got = sv.amplitudes()[static_cast<std::size_t>(y)];
      if (phase == cd{0} && std::abs(want[j][y]) > 1e-3) phase = got / want[j][y];
      worst = std::max(worst, std::abs(got - phase * want[j][y]));
    }
  }
  return worst;
}

// Every small leapfrog, adjacent and Hadamard-only network with its order restored ends with wire k at
// position n-1-k (what final == placement asks), using exactly the inversion count of SWAPs, and the
// circuit on a line is the (approximate) QFT with the identity map.
TEST(EndOrder, RestoredNetworksReturnEveryBit) {
  for (int n = 3; n <= (testing::kSanitized ? 7 : 9); ++n)  // sanitizers: up to 7 qubits
    for (int M = 1; M <= n - 1; ++M)
      for (bool inverse : {false, true}) {
        const QftSpec spec{n, M, inverse};
        const int d = spec.max_distance();
        auto inner = d == 0 ? make_hadamard_network(n) : d == 1 ? make_adjacent_network(n) : make_leapfrog_network(n, d);
        const auto end = inner->final_positions();
        std::vector<long long> keys(n);
        for (int w = 0; w < n; ++w) keys[end[w]] = n - 1 - w;
        const long long inversions = count_inversions(keys);
        const auto net = with_order_restored(std::move(inner));
        const auto fin = net->final_positions();
        for (int w = 0; w < n; ++w) ASSERT_EQ(fin[w], n - 1 - w) << "n=" << n << " M=" << M;
        EXPECT_EQ(end_swap_count(*net), inversions);

        const Device line = make_line(n);
        std::vector<int> chain(n);
        std::iota(chain.begin(), chain.end(), 0);
        VectorSink sink;
        const QubitMaps maps = emit_chain_qft(spec, *net, chain, sink);
        ASSERT_EQ(maps.final_placement, maps.placement);
        EXPECT_LT(identity_map_distance(sink.gates, maps.placement, aqft(n, M, inverse)), 1e-9) << "n=" << n << " M=" << M;
        // And the checker agrees, with final == initial.
        QasmProgram prog;
        prog.qubit_count = n;
        prog.gates = sink.gates;
        prog.gate_lines.assign(sink.gates.size(), 0);
        CheckRequest req{spec, maps.placement, maps.placement};
        const CheckResult res = check_qft_circuit(line, prog, req);
        EXPECT_TRUE(res.ok) << res.message;
      }
}

// A hand-written network (not a QFT) to exercise merging: restoring SWAPs merge into the network's
// last step on the same two wires (cp + swap = cp_swap; swap + swap = nothing).
class StepsNetwork final : public QftNetwork {
 public:
  StepsNetwork(int wires, std::vector<NetworkOp> ops) : QftNetwork(wires, wires - 1), ops_(std::move(ops)) {}
  std::string name() const override { return "steps"; }
  int chunk_count() const override { return 1; }
  void chunk(int, std::vector<NetworkOp>& out) const override { out = ops_; }

 private:
  std::vector<NetworkOp> ops_;
};

TEST(EndOrder, RestoringSwapsMergeIntoTheLastStep) {
  using K = NetworkOp::Kind;
  auto steps = [](const QftNetwork& net) {
    std::vector<NetworkOp> all, buf;
    for (int c = 0; c < net.chunk_count(); ++c) {
      net.chunk(c, buf);
      all.insert(all.end(), buf.begin(), buf.end());
    }
    return all;
  };
  // Two wires must trade places (wire k ends at position n-1-k).
  auto a = with_order_restored(std::make_unique<StepsNetwork>(2, std::vector<NetworkOp>{{K::h, 0, -1}, {K::cp, 0, 1}}));
  ASSERT_EQ(steps(*a).size(), 2u);
  EXPECT_EQ(steps(*a)[1].kind, K::cp_swap);
  EXPECT_EQ(end_swap_count(*a), 1);
  EXPECT_EQ(network_native_cost(*a), 3);
  // cp_swap then swap: the swap cancels the restoring SWAP, and the pair is then in order.
  auto b = with_order_restored(
      std::make_unique<StepsNetwork>(2, std::vector<NetworkOp>{{K::cp_swap, 0, 1}, {K::swap, 0, 1}}));
  ASSERT_EQ(steps(*b).size(), 1u);
  EXPECT_EQ(steps(*b)[0].kind, K::cp_swap);
  EXPECT_EQ(end_swap_count(*b), 1);
  // A Hadamard after the cp blocks the merge: a plain SWAP is appended.
  auto c = with_order_restored(
      std::make_unique<StepsNetwork>(2, std::vector<NetworkOp>{{K::cp, 0, 1}, {K::h, 1, -1}}));
  ASSERT_EQ(steps(*c).size(), 3u);
  EXPECT_EQ(steps(*c)[2].kind, K::swap);
  EXPECT_EQ(network_native_cost(*c), 5);
  for (const auto* net : {a.get(), b.get(), c.get()}) EXPECT_EQ(net->final_positions(), (std::vector<int>{1, 0}));
}

// The reversal network already ends in order, and so does the parity network built on its meetings:
// nothing is added. choose_network keeps the parity network from n = 3 on (n^2 - 1 against
// 3 n(n-1)/2 CX).
TEST(EndOrder, ReversalNetworkNeedsNoSwaps) {
  for (int n : {2, 3, 4, 5, 16}) {
    const auto net = choose_network(QftSpec{n, std::nullopt, false}, EndOrder::same);
    EXPECT_EQ(net->name(), n == 2 ? "reversal" : "parity") << n;  // 3 against 3 CX at n = 2
    EXPECT_EQ(end_swap_count(*net), 0) << n;
  }
  EXPECT_EQ(end_swap_count(*make_parity_network(9, 8)), 0);
}

// Within a chain, ending in order means reversing the chain (n(n-1)/2 adjacent transpositions at
// least, Knuth 5.1.1), which the reversal network does while it rotates; the insertion network plus the
// restoring SWAPs always costs more CX here, so `same` plans a network that ends in order: the
// parity network for n >= 5. Measured (ours): n = 64, M = 4: insertion 695 CX, + 6039 in restoring
// SWAPs = 6734 CX, reversal 6048 CX, parity 4095.
// The parity form of the insertion network carries the wires as output differences, so restoring SWAPs
// cannot be appended as steps: asked for by name with `same` it is refused with a message; the
// automatic choice plans a fused or parity network instead.
TEST(EndOrder, ParityInsertionIsNotRestoredButRefusedOrAvoided) {
  const QftSpec spec{64, 8, false};
  ASSERT_EQ(choose_network(spec)->name(), "parity-insertion");
  try {
    choose_network(spec, EndOrder::same, NetworkChoice::parity_insertion);
    ADD_FAILURE() << "parity-insertion with end order same";
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()),
              "the parity-insertion network cannot end in order; use --end-order free or another --network");
  }
  const auto chosen = choose_network(spec, EndOrder::same, NetworkChoice::automatic);
  EXPECT_NE(chosen->rendering(), QftNetwork::Rendering::window);
  std::vector<int> chain(64);
  std::iota(chain.begin(), chain.end(), 0);
  const auto maps = chain_maps(spec, *chosen, chain);
  EXPECT_EQ(maps.placement, maps.final_placement);
}

TEST(EndOrder, SameChoosesTheCheaperNetwork) {
  for (int n : {8, 16, 64})
    for (int M : {2, 3, 4, 6}) {
      const QftSpec spec{n, M, false};
      const auto chosen = choose_network(spec, EndOrder::same);
      const auto restored = with_order_restored(choose_network(spec));
      const auto reversal = make_reversal_network(n, spec.max_distance());
      const auto parity = make_parity_network(n, spec.max_distance());
      EXPECT_EQ(network_native_cost(*chosen), std::min({network_native_cost(*restored), network_native_cost(*reversal),
                                                        network_native_cost(*parity)}));
      EXPECT_EQ(chosen->name(), "parity") << "n=" << n << " M=" << M;
    }
  const QftSpec s{64, 4, false};
  EXPECT_EQ(network_native_cost(*choose_network(s)), 695);
  EXPECT_EQ(network_native_cost(*with_order_restored(choose_network(s))), 6734);
  EXPECT_EQ(network_native_cost(*make_reversal_network(64, 3)), 6048);  // 3 n(n-1)/2
}

// On a path every register bit can only move by adjacent SWAPs, so the inversion count is a lower
// bound (Knuth 5.2.2); the routine meets it. On other graphs it must still deliver every bit.
TEST(EndOrder, RoutePermutationDeliversEveryBit) {
  std::mt19937_64 rng(5);
  for (const std::string spec : {"line:12", "grid:4x4", "heavy-hex:1x2", "ring:9"}) {
    const Device dev = load_device(spec);
    for (int trial = 0; trial < 20; ++trial) {
      std::vector<int> ids(dev.qubit_count());
      std::iota(ids.begin(), ids.end(), 0);
      std::shuffle(ids.begin(), ids.end(), rng);
      // On the line every qubit holds a register bit (then the bound below is exact); elsewhere a
      // random subset does, and the other qubits' contents may go anywhere.
      const bool line = spec == "line:12";
      const int n = line ? dev.qubit_count() : 2 + static_cast<int>(rng() % (dev.qubit_count() - 1));
      std::vector<int> from(ids.begin(), ids.begin() + n), to = from;
      std::shuffle(to.begin(), to.end(), rng);
      const auto swaps = route_permutation(dev, from, to);
      std::vector<int> holder(dev.qubit_count(), -1);
      for (int k = 0; k < n; ++k) holder[from[k]] = k;
      for (const auto& [a, b] : swaps) {
        ASSERT_TRUE(dev.coupled(a, b));
        std::swap(holder[a], holder[b]);
      }
      for (int k = 0; k < n; ++k) EXPECT_EQ(holder[to[k]], k) << spec;
      if (line) {
        // The destination of the bit on each qubit, in qubit order.
        std::vector<long long> keys(n);
        for (int k = 0; k < n; ++k) keys[from[k]] = to[k];
        EXPECT_EQ(static_cast<long long>(swaps.size()), count_inversions(keys));
      }
    }
  }
}

// A restoring SWAP on the pair of the circuit's last gate merges into it.
TEST(EndOrder, RestoreOrderMergesIntoTheLastGate) {
  const Device dev = make_line(3);
  const Angle a = Angle::pi_over_pow2(2);
  std::vector<Gate> gates{make_gate(GateKind::h, 0), make_gate(GateKind::cp, 0, 1, a)};
  QubitMaps maps{{0, 1}, {1, 0}};
  EXPECT_EQ(restore_order(dev, gates, maps), 1);
  ASSERT_EQ(gates.size(), 2u);
  EXPECT_EQ(gates[1], make_gate(GateKind::cp_swap, 0, 1, a));
  EXPECT_EQ(maps.final_placement, maps.placement);

  gates = {make_gate(GateKind::cp_swap, 1, 2, a)};
  maps = {{1, 2}, {2, 1}};
  restore_order(dev, gates, maps);
  EXPECT_EQ(gates, (std::vector<Gate>{make_gate(GateKind::cp, 1, 2, a)}));

  gates = {make_gate(GateKind::h, 1), make_gate(GateKind::swap, 1, 2)};
  maps = {{1, 2}, {2, 1}};
  restore_order(dev, gates, maps);
  EXPECT_EQ(gates, (std::vector<Gate>{make_gate(GateKind::h, 1)}));

  // Not the last gate on both qubits: a new SWAP.
  gates = {make_gate(GateKind::cp, 0, 1, a), make_gate(GateKind::h, 1)};
  maps = {{0, 1}, {1, 0}};
  restore_order(dev, gates, maps);
  ASSERT_EQ(gates.size(), 3u);
  EXPECT_EQ(gates[2], make_gate(GateKind::swap, 0, 1));
}

struct PlanCase {
  std::string device;
  std::string strategy;
  int n;
  std::optional<int> approx;
  bool inverse;
};

class SamePlans : public ::testing::TestWithParam<PlanCase> {};

// Whole plans with --end-order same: final == placement, the checker proves the circuit with the
// identity map, and simulation matches FFTW (or the AQFT definition) with the identity map.
TEST_P(SamePlans, AreTheTransformWithTheIdentityMap) {
  const auto c = GetParam();
  const Device dev = load_device(c.device.rfind("topologies/", 0) == 0 ? (testing::source_dir() / c.device).string() : c.device);
  PlanOptions opt;
  opt.spec = QftSpec{c.n, c.approx, c.inverse};
  opt.strategy = c.strategy;
  opt.end_order = EndOrder::same;
  opt.gates = GateSet::logical;
  const PreparedPlan plan = prepare_plan(dev, opt);
  VectorSink out;
  const PlanReport r = execute_plan(dev, opt, plan, &out);
  ASSERT_EQ(r.final_placement, r.placement);
  EXPECT_EQ(r.end_order, "same");
  QasmProgram prog;
  prog.qubit_count = dev.qubit_count();
  prog.gates = out.gates;
  prog.gate_lines.assign(out.gates.size(), 0);
  const CheckResult res = check_qft_circuit(dev, prog, CheckRequest{opt.spec, r.placement, r.placement});
  EXPECT_TRUE(res.ok) << res.message;
  const auto want = opt.spec.effectively_exact() ? testing::fftw_qft_matrix(c.n, c.inverse) : aqft(c.n, *c.approx, c.inverse);
  EXPECT_LT(identity_map_distance(out.gates, r.placement, want), 1e-9);
  // The free plan of the same request costs no more than this one minus its restoring SWAPs' 3 CX each
  // at most (merged SWAPs cost less); with no SWAPs added the plans are the same size.
  opt.end_order = EndOrder::free;
  const PlanReport f = plan_qft(dev, opt);
  if (r.end_swaps == 0 && r.network == f.network && r.strategy == f.strategy) EXPECT_EQ(r.cx_count, f.cx_count);
}

std::vector<PlanCase> same_cases() {
  std::vector<PlanCase> v;
  for (const std::string dev : {"line:8", "grid:3x3", "heavy-hex:1x1", "topologies/harbor-noisy-20.yaml"})
    for (const std::string strategy : {"chain", "routed", "auto"})
      for (std::optional<int> approx : {std::optional<int>{}, std::optional<int>{2}, std::optional<int>{3}})
        for (bool inverse : {false, true}) v.push_back({dev, strategy, 6, approx, inverse});
  return v;
}

INSTANTIATE_TEST_SUITE_P(Strategies, SamePlans, ::testing::ValuesIn(same_cases()));

// The command line: plan with --end-order same, then `qftplan check` reads the maps from the file's
// header (final_placement == placement) and proves it.
TEST(EndOrderCli, PlanThenCheck) {
  const auto dir = testing::temp_dir();
  int k = 0;
  for (const std::string extra : {"", "--inverse --approx 2", "--approx 3", "--strategy routed --approx 3"}) {
    if (!testing::sampled(k++, 2)) continue;  // sanitizers: the exact forward and the approximate inverse
    const auto file = (dir / "c.qasm").string();
    const auto report = (dir / "r.json").string();
    const auto plan = testing::run_qftplan("plan --device grid:4x4 --qubits 9 --end-order same " + extra + " --output '" +
                                           file + "' --report '" + report + "'");
    ASSERT_EQ(plan.status, 0) << plan.err;
    const std::string text = testing::read_file(file);
    const auto p = text.find("// placement: "), f = text.find("// final_placement: ");
    ASSERT_NE(p, std::string::npos);
    EXPECT_EQ(text.substr(p + 14, text.find('\n', p) - p - 14), text.substr(f + 20, text.find('\n', f) - f - 20));
    EXPECT_NE(testing::read_file(report).find("\"end_order\": \"same\""), std::string::npos);
    const auto check = testing::run_qftplan("check '" + file + "' --device grid:4x4 --qubits 9 " +
                                            (extra.find("--inverse") != std::string::npos ? "--inverse " : "") +
                                            (extra.find("--approx 3") != std::string::npos   ? "--approx 3"
                                             : extra.find("--approx 2") != std::string::npos ? "--approx 2"
                                                                                              : ""));
    EXPECT_EQ(check.status, 0) << check.err << check.out;
  }
  const auto bad = testing::run_qftplan("plan --device line:4 --qubits 3 --end-order reversed");
  EXPECT_EQ(bad.status, 2);
  EXPECT_EQ(bad.err, "qftplan: unknown end order 'reversed' (valid: free, same)\n");
  std::filesystem::remove_all(dir);
}

}  // namespace
}  // namespace qftplan
