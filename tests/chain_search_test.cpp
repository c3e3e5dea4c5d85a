// The chain search (issue 17): a simple path of n qubits is found whenever one exists, and "none" is
// proved when none does. Checked against an independent brute force written here (every simple path
// from every start, no pruning) on small graphs of every kind the tool meets: trees, sparse random
// graphs, defective grids and heavy-hexagon pieces, relabelled and without positions.

#include <gtest/gtest.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <functional>
#include <random>

#include "../src/planners/complete_chain_search.hpp"
#include "qftplan/core/run_budget.hpp"
#include "qftplan/device/device.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/chain_search.hpp"
#include "qftplan/planners/placement_search.hpp"
#include "qftplan/planners/plan.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

using testing::brute_force_longest;
using testing::make_defective_chip;

Device graph(int n, const std::vector<std::pair<int, int>>& edges, const std::string& name) {
  DeviceDescription d;
  d.name = name;
  d.qubits = n;
  for (auto [a, b] : edges) d.couplers.push_back({std::min(a, b), std::max(a, b), {}, {}});
  return Device(std::move(d));
}

// A random labelled tree on n qubits (each new qubit joins a random earlier one, then relabelled).
Device random_tree(int n, std::mt19937_64& rng) {
  std::vector<int> label(static_cast<std::size_t>(n));
  for (int i = 0; i < n; ++i) label[static_cast<std::size_t>(i)] = i;
  std::shuffle(label.begin(), label.end(), rng);
  std::vector<std::pair<int, int>> e;
  for (int i = 1; i < n; ++i)
    e.emplace_back(label[static_cast<std::size_t>(i)],
                   label[static_cast<std::size_t>(std::uniform_int_distribution<int>(0, i - 1)(rng))]);
  return graph(n, e, "tree");
}

// A random graph with about `edges` couplers (not necessarily connected).
Device random_graph(int n, int edges, std::mt19937_64& rng) {
  std::vector<std::pair<int, int>> e;
  std::uniform_int_distribution<int> pick(0, n - 1);
  for (int t = 0; t < 4 * edges && static_cast<int>(e.size()) < edges; ++t) {
    int a = pick(rng), b = pick(rng);
    if (a == b) continue;
    if (a > b) std::swap(a, b);
    if (std::find(e.begin(), e.end(), std::pair(a, b)) == e.end()) e.emplace_back(a, b);
  }
  return graph(n, e, "random");
}

// For every register size: a chain of n exactly when the brute force says the longest has >= n
// qubits, and otherwise a proof (the complete search ran to its end).
void expect_matches_brute_force(const Device& d, const std::string& what) {
  const int longest = brute_force_longest(d);
  for (int n = 1; n <= d.qubit_count(); ++n) {
    const ChainSearchResult r = find_chain(d, n);
    if (n <= longest) {
      ASSERT_EQ(static_cast<int>(r.chain.size()), n) << what << " n=" << n << " longest " << longest;
      EXPECT_TRUE(is_chain(d, r.chain)) << what << " n=" << n;
    } else {
      EXPECT_TRUE(r.chain.empty()) << what << " n=" << n;
      EXPECT_TRUE(r.proved_none) << what << " n=" << n << ": no chain, but not proved";
      EXPECT_LE(static_cast<int>(r.longest.size()), longest) << what;
    }
  }
}

TEST(ChainSearch, RandomTreesMatchTheBruteForce) {
  std::mt19937_64 rng(17);
  for (int i = 0; i < 40; ++i) {
    const Device t = random_tree(6 + i % 12, rng);
    expect_matches_brute_force(t, "tree " + std::to_string(i));
  }
}

TEST(ChainSearch, RandomSparseGraphsMatchTheBruteForce) {
  std::mt19937_64 rng(18);
  for (int i = 0; i < 40; ++i) {
    const int n = 8 + i % 10;
    const Device g = random_graph(n, n + i % 7, rng);
    expect_matches_brute_force(g, "graph " + std::to_string(i));
  }
}

// Every register size with the complete search alone: a chain up to the longest, a proof above it.
void expect_complete_search_matches_brute_force(const Device& d) {
  const int longest = brute_force_longest(d);
  BudgetPoll poll(nullptr);
  for (int n = 2; n <= longest + 1; ++n) {
    const CompleteSearchResult r = complete_chain_search(d, n, 1'000'000'000, poll);
    if (n <= longest) {
      ASSERT_EQ(static_cast<int>(r.chain.size()), n) << d.name() << " n=" << n;
      EXPECT_TRUE(is_chain(d, r.chain)) << d.name();
    } else {
      EXPECT_TRUE(r.chain.empty()) << d.name();
      EXPECT_TRUE(r.proved_none) << d.name();
    }
  }
}

TEST(ChainSearch, TheCompleteSearchAloneMatchesTheBruteForce) {
  // The complete search without the greedy passes in front of it (which find most chains first). Its
  // transposition table cuts a branch whose (end, reachable free qubits) was searched before; a wrong
  // cut would show here as a miss (a wrongly keyed table rarely cuts a branch that holds the chain on
  // chips this small: the next test checks the keys themselves).
  // Sanitizers: half the seeds, a third of the random graphs.
  for (std::uint64_t seed = 1; seed <= 6; ++seed) {
    if (!testing::sampled(static_cast<int>(seed) - 1, 2)) continue;
    for (const Device& d : {make_defective_chip("grid:5x5", 1, 1 + seed % 3, seed),
                            make_defective_chip("heavy-hex:3x3", 1, 2, seed)})
      expect_complete_search_matches_brute_force(d);
  }
  for (std::uint64_t seed = 1; seed <= 4; ++seed) {
    if (!testing::sampled(static_cast<int>(seed) - 1, 2)) continue;
    // Chips of 108 to 110 qubits at their longest chain, where the search backtracks (13k to 180k
    // inspections) before it finds one.
    for (const Device& d : {make_defective_chip("heavy-hex:4x4", 2, 4, seed),
                            make_defective_chip("heavy-hex:4x4", 1, 2, seed + 10)}) {
      const int longest = brute_force_longest(d);
      BudgetPoll poll(nullptr);
      const CompleteSearchResult r = complete_chain_search(d, longest, 1'000'000'000, poll);
      ASSERT_EQ(static_cast<int>(r.chain.size()), longest) << d.name();
      EXPECT_TRUE(is_chain(d, r.chain)) << d.name();
    }
  }
  std::mt19937_64 rng(19);
  for (int i = 0; i < 60; ++i) {
    const int n = 8 + i % 10;
    const Device g = random_graph(n, n + i % 5, rng);  // drawn in Release and sanitizer runs alike
    if (testing::sampled(i, 3)) expect_complete_search_matches_brute_force(g);
  }
}

TEST(ChainSearch, TheTranspositionTableKeysTheEndAndTheReachableSet) {
  // The state of a path is its end and the set of free qubits its end can reach: the key must not
  // depend on the order the set is listed in, and must tell apart another end or another set.
  FailureTable table(10);
  const auto k = table.key({3, 5, 7, 9});
  const auto same = table.key({3, 9, 7, 5});
  const auto other_end = table.key({5, 3, 7, 9});
  const auto other_set = table.key({3, 5, 7, 8});
  const auto moved_end = table.key({4, 5, 7, 9});  // the same free set, another end
  EXPECT_TRUE(k.a == same.a && k.b == same.b);
  EXPECT_FALSE(k.a == other_end.a && k.b == other_end.b);
  EXPECT_FALSE(k.a == moved_end.a && k.b == moved_end.b);
  EXPECT_FALSE(k.a == other_set.a && k.b == other_set.b);
  // A failure to find 4 more qubits also rules out 5 more, not 3.
  EXPECT_FALSE(table.failed(k, 4));
  table.record(k, 4);
  EXPECT_TRUE(table.failed(k, 4));
  EXPECT_TRUE(table.failed(same, 5));
  EXPECT_FALSE(table.failed(k, 3));
  EXPECT_FALSE(table.failed(other_end, 4));
  EXPECT_FALSE(table.failed(other_set, 4));
  EXPECT_FALSE(table.failed(moved_end, 4));
  table.record(k, 2);
  EXPECT_TRUE(table.failed(k, 3));
}

TEST(ChainSearch, DefectiveLatticesMatchTheBruteForce) {
  for (std::uint64_t seed = 1; seed <= 12; ++seed) {
    expect_matches_brute_force(make_defective_chip("grid:4x4", 1 + seed % 3, 2 + seed % 4, seed, false),
                               "grid:4x4 seed " + std::to_string(seed));
    expect_matches_brute_force(make_defective_chip("heavy-hex:1x1", seed % 2, 1 + seed % 3, seed, false),
                               "heavy-hex:1x1 seed " + std::to_string(seed));
  }
}

// The two cases of the issue: a 25-qubit tree whose longest path has 24 qubits, and a short path
// hidden in a larger file (0-1-2-3 and 1-4-5 hold the 5-qubit path 3-2-1-4-5).
TEST(ChainSearch, IssueExamples) {
  std::vector<std::pair<int, int>> e;
  for (int i = 0; i + 1 < 24; ++i) e.emplace_back(i, i + 1);
  e.emplace_back(11, 24);  // one leaf off the middle
  const Device tree = graph(25, e, "tree25");
  EXPECT_EQ(find_chain(tree, 24).chain.size(), 24u);
  EXPECT_TRUE(find_chain(tree, 25).proved_none);
  std::vector<std::pair<int, int>> f{{0, 1}, {1, 2}, {2, 3}, {1, 4}, {4, 5}};
  for (int q = 6; q < 25; ++q) f.emplace_back(q, q == 24 ? 6 : q + 1);  // a separate ring elsewhere
  const Device file = graph(25, f, "file25");
  const auto r = find_chain(file, 5);
  ASSERT_EQ(r.chain.size(), 5u);
  EXPECT_TRUE(is_chain(file, r.chain));
}

// Issue 17 asks the complete search to settle chips of a few hundred qubits within the default effort.
// On this 162-qubit chip the longest chain has 131 qubits (the climb in DISABLED_SurveyOfDefectiveChips
// finds it); proving that 132 do not exist took about 50 million inspections, twice what the default
// leaves the complete search, until forced steps (one free neighbour) skipped the bound: 23 million.
TEST(ChainSearch, ForcedStepsLetTheDefaultEffortProveA162QubitChip) {
  const Device d = make_defective_chip("heavy-hex:5x5", 2, 4, 3);
  ASSERT_EQ(d.usable_qubit_count(), 162);
  EXPECT_EQ(find_chain(d, 131).chain.size(), 131u);
  const ChainSearchResult r = find_chain(d, 132);
  EXPECT_TRUE(r.chain.empty());
  EXPECT_TRUE(r.proved_none) << "work " << r.work;
}

// A chip where one deep search from the first start spends the whole default effort without finding
// the longest chain (103 of 104 qubits; 104 is proved impossible): restarts with growing caps (Gomes,
// Selman, Kautz, "Boosting combinatorial search through randomization", AAAI 1998) find it within the
// default effort. Found on a rehearsal of the issue's check (before the restarts: 102 found, 103
// neither found nor proved).
TEST(ChainSearch, RestartsFindTheChainOneDeepSearchMisses) {
  const Device d = with_defects(make_lattice("grid:9x12"), 4, 5, 1305);
  ASSERT_EQ(d.usable_qubit_count(), 104);
  const ChainSearchResult r = find_chain(d, 103);
  ASSERT_EQ(r.chain.size(), 103u);
  EXPECT_TRUE(is_chain(d, r.chain));
  EXPECT_TRUE(find_chain(d, 104).proved_none);
}

// Measurements for the README (run by hand: --gtest_also_run_disabled_tests --gtest_filter='*Survey*').
TEST(ChainSearch, DISABLED_SurveyOfDefectiveChips) {
  for (const std::string spec : {"heavy-hex:2x2", "heavy-hex:3x3", "heavy-hex:4x4", "heavy-hex:5x5", "heavy-hex:7x7",
                                 "grid:8x8", "grid:12x12"}) {
    for (std::uint64_t seed = 1; seed <= 3; ++seed) {
      const Device d = make_defective_chip(spec, 2, 4, seed);
      const auto t0 = std::chrono::steady_clock::now();
      // Largest n found, then the next one: proved or not.
      int lo = 1;
      const int N = d.qubit_count();
      ChainSearchResult top;
      for (int n = N; n >= 1; --n) {
        top = find_chain(d, n);
        if (!top.chain.empty()) {
          lo = n;
          break;
        }
      }
      const auto next = find_chain(d, lo + 1);
      const double s = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
      std::printf("%-14s seed %llu: N=%d longest %d, n+1 proved none: %s (work %lld), %.2f s\n", spec.c_str(),
                  static_cast<unsigned long long>(seed), N, lo, next.proved_none ? "yes" : "no", next.work, s);
    }
  }
}

TEST(ChainSearch, DISABLED_LongestChainsOfHeavilyDefectiveChips) {
  // The sizes of issue 17's catalogue with more defects (4 dead qubits, 8 broken couplers): the
  // longest chain found by climbing one qubit at a time, whether one more was proved impossible, and
  // whether asking for the longest directly finds it (README "Finding a chain").
  for (const std::string spec : {"heavy-hex:3x3", "heavy-hex:4x4", "heavy-hex:5x5", "grid:10x10", "grid:12x12"})
    for (std::uint64_t seed = 1; seed <= 5; ++seed) {
      const Device d = make_defective_chip(spec, 4, 8, seed);
      int longest = static_cast<int>(find_chain(d, d.qubit_count()).longest.size());
      ChainSearchResult next;
      while (true) {
        next = find_chain(d, longest + 1);
        if (next.chain.empty() && static_cast<int>(next.longest.size()) <= longest) break;
        longest = std::max(longest + 1, static_cast<int>(next.longest.size()));
      }
      const bool direct = !find_chain(d, longest).chain.empty();
      std::printf("%-14s seed %llu: N=%d longest %d, n+1 proved none: %s, found when asked: %s\n", spec.c_str(),
                  static_cast<unsigned long long>(seed), d.qubit_count(), longest, next.proved_none ? "yes" : "no",
                  direct ? "yes" : "no");
    }
}

}  // namespace
}  // namespace qftplan

namespace qftplan {
namespace {

// A chip with uneven calibration: coupler errors 0.002 .. 0.06 and one-qubit errors 0.0002 .. 0.004
// drawn from a seeded generator (the spread of published superconducting chips, common practice).
Device uneven(const Device& d, std::uint64_t seed) {
  DeviceDescription dd = d.description();
  std::mt19937_64 rng(seed);
  std::uniform_real_distribution<double> e2(0.002, 0.06), e1(0.0002, 0.004);
  for (auto& c : dd.couplers) c.error = e2(rng);
  dd.calibration.error_1q = 0.001;
  for (int q = 0; q < dd.qubits; ++q) {
    QubitOverride o;
    o.id = q;
    o.error_1q = e1(rng);
    dd.qubit_calibration.push_back(o);
  }
  return Device(std::move(dd));
}

// The best ln ESP over every simple path of n qubits (both directions), by plain enumeration.
double best_by_enumeration(const Device& d, const ChainLoads& loads, int n) {
  std::vector<int> path;
  std::vector<char> on(static_cast<std::size_t>(d.qubit_count()), 0);
  double best = -1e300;
  std::function<void()> walk = [&] {
    if (static_cast<int>(path.size()) == n) {
      best = std::max(best, chain_log_esp(d, loads, path));
      return;
    }
    for (int w : d.neighbours(path.back()))
      if (!on[static_cast<std::size_t>(w)]) {
        on[static_cast<std::size_t>(w)] = 1;
        path.push_back(w);
        walk();
        path.pop_back();
        on[static_cast<std::size_t>(w)] = 0;
      }
  };
  for (int s = 0; s < d.qubit_count(); ++s) {
    on[static_cast<std::size_t>(s)] = 1;
    path.assign(1, s);
    walk();
    on[static_cast<std::size_t>(s)] = 0;
  }
  return best;
}

// Issue 17, item 4: the chain the planner picks is within 1% of the best ESP found by enumerating
// every chain, on defective calibrated chips of up to 40 qubits.
TEST(Placement, WithinOnePercentOfEnumerationOnSmallChips) {
  struct Case {
    const char* spec;
    int n;
  };
  for (const Case c : {Case{"grid:6x6", 10}, Case{"heavy-hex:2x2", 14}, Case{"grid:5x8", 9}})
    for (std::uint64_t seed = 1; seed <= 3; ++seed) {
      const Device d = uneven(make_defective_chip(c.spec, 2, 3, seed), seed);
      PlanOptions opt;
      opt.spec.qubits = c.n;
      opt.strategy = "chain";
      const PreparedPlan plan = prepare_plan(d, opt);
      const auto net = choose_network(plan.spec, opt.end_order, opt.network);
      const ChainLoads loads = chain_loads(plan.spec, *net, d.native_2q());
      const double picked = chain_log_esp(d, loads, plan.circuit->region());
      const double best = best_by_enumeration(d, loads, c.n);
      EXPECT_GE(std::exp(picked - best), 0.99) << c.spec << " seed " << seed << " n=" << c.n;
    }
}

}  // namespace
}  // namespace qftplan

namespace qftplan {
namespace {

// Issue 17's target where a chain exists: on defective, renumbered, position-free chips the automatic
// plan at the longest chain, one below it and at 70% of it is a chain plan of at most n^2 - 1 CX (the
// parity network's count; at most the n^2 + n - 4 of Park and Ahn, Scientific Reports 13, 8638, 2023,
// abstract), and the longest chain is proved longest (one more qubit: no chain exists).
TEST(ChainSearch, DefectiveChipsGetChainPlansUpToTheLongestChain) {
  for (const std::string spec : {"heavy-hex:3x3", "heavy-hex:4x4", "grid:7x7"})
    for (std::uint64_t seed = 1; seed <= 2; ++seed) {
      const Device d = with_defects(make_lattice(spec), 2, 4, seed);
      int longest = 0;
      for (int n = d.qubit_count(); n >= 1 && longest == 0; --n)
        if (!find_chain(d, n).chain.empty()) longest = n;
      if (longest < d.qubit_count()) {
        EXPECT_TRUE(find_chain(d, longest + 1).proved_none) << spec << " seed " << seed << " longest " << longest;
      }
      for (const int n : {longest, longest - 1, longest * 7 / 10}) {
        PlanOptions opt;
        opt.spec.qubits = n;
        const PlanReport r = plan_qft(d, opt);
        EXPECT_EQ(r.strategy, "chain") << spec << " seed " << seed << " n=" << n;
        EXPECT_LE(r.cx_count, static_cast<long long>(n) * n - 1) << spec << " seed " << seed << " n=" << n;
      }
    }
}

}  // namespace
}  // namespace qftplan
