// Local moves on the spine strategy's virtual line (src/planners/line_polish.cpp): against an
// independent brute force over every order of small registers, and the detours it writes checked as
// paths of the device.

#include <gtest/gtest.h>

#include <algorithm>
#include <numeric>
#include <random>

#include "../src/planners/line_polish.hpp"
#include "qftplan/core/run_budget.hpp"
#include "qftplan/device/device.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

// A random tree on n qubits, with `extra` couplers more (seeded).
Device random_piece(int n, int extra, std::uint64_t seed) {
  std::mt19937_64 rng(seed);
  std::vector<std::pair<int, int>> edges;
  for (int i = 1; i < n; ++i) edges.emplace_back(std::uniform_int_distribution<int>(0, i - 1)(rng), i);
  for (int k = 0; k < extra; ++k) {
    const int a = std::uniform_int_distribution<int>(0, n - 1)(rng), b = std::uniform_int_distribution<int>(0, n - 1)(rng);
    const auto e = std::pair{std::min(a, b), std::max(a, b)};
    if (a != b && std::find(edges.begin(), edges.end(), e) == edges.end()) edges.push_back(e);
  }
  return testing::device_from_edges("piece", n, edges);
}

// The qubits 0 .. n-1 in a seeded random order.
std::vector<int> shuffled_line(int n, std::uint64_t seed) {
  std::vector<int> line(static_cast<std::size_t>(n));
  std::iota(line.begin(), line.end(), 0);
  std::shuffle(line.begin(), line.end(), std::mt19937_64(seed));
  return line;
}

// Hop distances by breadth-first search, written here (independent of LineDistances).
std::vector<std::vector<int>> hops(const Device& d) {
  const int n = d.qubit_count();
  std::vector<std::vector<int>> out(n, std::vector<int>(n, -1));
  for (int s = 0; s < n; ++s) {
    std::vector<int> queue{s};
    out[s][s] = 0;
    for (std::size_t h = 0; h < queue.size(); ++h)
      for (int w : d.neighbours(queue[h]))
        if (out[s][w] < 0) out[s][w] = out[s][queue[h]] + 1, queue.push_back(w);
  }
  return out;
}

// The weighted detour cost written out from its definition (the spine strategy's: a gate on line pair
// p, of which there are about n - p, costs two SWAPs per qubit between its ends, out and back, that is
// 6 CX each (a SWAP is three CX, common practice), and 4 CX less when one end's first SWAP is onto its
// other line neighbour along a shortest path, where it fuses with the parity step of that pair).
long long cost_by_definition(const Device& d, const std::vector<std::vector<int>>& h, const std::vector<int>& line) {
  const auto n = static_cast<long long>(line.size());
  long long total = 0;
  for (std::size_t p = 0; p + 1 < line.size(); ++p) {
    const int a = line[p], b = line[p + 1], k = h[a][b] - 1;
    if (k == 0) continue;
    const bool left = p >= 1 && d.coupled(line[p - 1], a) && h[line[p - 1]][b] == k;
    const bool right = p + 2 < line.size() && d.coupled(line[p + 2], b) && h[a][line[p + 2]] == k;
    total += (6LL * k - (left || right ? 4 : 0)) * (n - static_cast<long long>(p));
  }
  return total;
}

TEST(LinePolish, CostMatchesItsDefinition) {
  for (std::uint64_t seed = 1; seed <= 20; ++seed) {
    const Device d = random_piece(12, static_cast<int>(seed % 4), seed);
    const auto h = hops(d);
    const std::vector<int> line = shuffled_line(12, seed);
    const LineDistances dist(d, line);
    EXPECT_EQ(line_cost(d, dist, line, true), cost_by_definition(d, h, line)) << "seed " << seed;
  }
}

TEST(LinePolish, ReachesTheBestOrderOfSmallTreesMostOfTheTime) {
  // Every order of 8 qubits (40,320) by brute force against the local moves started from a random
  // order: the moves always return a permutation, win nearly all that can be won, and on most of these
  // pieces (trees and trees with a coupler or two more) reach the best order. Measured: 21 of 30 (a
  // local search stops at local optima: the other nine end 2 to 10 above the best, from 110 to 462).
  int optimal = 0;
  const int pieces = 30;
  for (int seed = 1; seed <= pieces; ++seed) {
    const Device d = random_piece(8, seed % 3, static_cast<std::uint64_t>(seed));
    const auto h = hops(d);
    std::vector<int> order(8);
    std::iota(order.begin(), order.end(), 0);
    long long best = -1;
    do {
      const long long c = cost_by_definition(d, h, order);
      if (best < 0 || c < best) best = c;
    } while (std::next_permutation(order.begin(), order.end()));
    const std::vector<int> start = shuffled_line(8, static_cast<std::uint64_t>(seed));
    const LineDistances dist(d, start);
    BudgetPoll poll(nullptr);
    const std::vector<int> polished = polish_line(d, dist, start, true, poll);
    std::vector<int> sorted = polished;
    std::sort(sorted.begin(), sorted.end());
    ASSERT_EQ(sorted, (std::vector<int>{0, 1, 2, 3, 4, 5, 6, 7})) << "seed " << seed;
    const long long c = cost_by_definition(d, h, polished), initial = cost_by_definition(d, h, start);
    EXPECT_GE(c, best);
    // At least 90% of the possible improvement (measured: 95% and more).
    EXPECT_LE(10 * (c - best), initial - best) << "seed " << seed << ": " << c << " against the best " << best;
    optimal += c == best;
  }
  EXPECT_GE(optimal, pieces * 2 / 3);
}

TEST(LinePolish, DetoursArePathsOfTheDeviceAndCostWhatTheLineCosts) {
  for (std::uint64_t seed = 1; seed <= 20; ++seed) {
    const Device d = random_piece(16, static_cast<int>(seed % 5), seed);
    const auto h = hops(d);
    const std::vector<int> line = shuffled_line(16, seed);
    const LineDistances dist(d, line);
    const auto detours = line_detours_by_distance(d, dist, line, true);
    std::vector<int> position(16);
    for (int p = 0; p < 16; ++p) position[line[p]] = p;
    long long total = 0;
    for (const Detour& dt : detours) {
      ASSERT_FALSE(dt.via.empty());
      // a, via..., b is a shortest path of coupled qubits.
      EXPECT_TRUE(d.coupled(dt.a, dt.via.front())) << "seed " << seed;
      for (std::size_t i = 1; i < dt.via.size(); ++i) EXPECT_TRUE(d.coupled(dt.via[i - 1], dt.via[i]));
      EXPECT_TRUE(d.coupled(dt.via.back(), dt.b));
      EXPECT_EQ(static_cast<int>(dt.via.size()), h[dt.a][dt.b] - 1);
      const int p = std::min(position[dt.a], position[dt.b]);
      EXPECT_EQ(std::abs(position[dt.a] - position[dt.b]), 1);
      const bool fused = std::abs(position[dt.a] - position[dt.via.front()]) == 1;
      total += (6LL * static_cast<long long>(dt.via.size()) - (fused ? 4 : 0)) * (16 - p);
    }
    EXPECT_EQ(total, cost_by_definition(d, h, line)) << "seed " << seed;
  }
}

}  // namespace
}  // namespace qftplan
