// Issue 17, "every qubit in the register": CX / (N^2 - 1) of `--strategy auto` over a seeded spread of
// defective, position-free heavy-hexagon and grid chips, random trees and random connected graphs, with
// the plan time (median of three, wall clock). Not a test: it prints one row per chip and a summary per
// family (min, median, max of the ratio; the largest median time). In a build tree BUILD configured
// with -DQFTPLAN_BUILD_BENCH=ON (./tools/bench makes BUILD = build/bench):
//   BUILD/bench/qftplan_spread                    (the whole spread)
//   BUILD/bench/qftplan_spread --quick            (one time per chip instead of the median of three)
//   BUILD/bench/qftplan_spread --strategy spine   (one strategy instead of auto)
//   BUILD/bench/qftplan_spread --detours          (also the spine layout's detours per chip)

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstring>
#include <map>
#include <random>
#include <string>
#include <vector>

#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/planners/spine_layout.hpp"

namespace {

using namespace qftplan;

Device graph_device(const std::string& name, int n, const std::vector<std::pair<int, int>>& edges) {
  DeviceDescription d;
  d.name = name;
  d.qubits = n;
  for (auto [a, b] : edges) d.couplers.push_back(Coupler{std::min(a, b), std::max(a, b)});
  return Device(d);
}

// A random labelled tree: qubit i > 0 hangs from a uniformly random earlier one, degree capped at 4
// (a chip's qubit has few couplers), then relabelled at random.
Device random_tree(int n, std::uint64_t seed) {
  std::mt19937_64 rng(seed);
  std::vector<int> degree(n, 0), label(n);
  for (int i = 0; i < n; ++i) label[i] = i;
  std::shuffle(label.begin(), label.end(), rng);
  std::vector<std::pair<int, int>> e;
  for (int i = 1; i < n; ++i) {
    int p;
    do p = std::uniform_int_distribution<int>(0, i - 1)(rng);
    while (degree[p] >= 4);
    ++degree[p], ++degree[i];
    e.push_back({label[p], label[i]});
  }
  return graph_device("tree-" + std::to_string(n) + "-" + std::to_string(seed), n, e);
}

// A random connected graph: a random tree (as above) plus `extra` random couplers between qubits of
// degree below 4.
Device random_graph(int n, int extra, std::uint64_t seed) {
  const Device tree = random_tree(n, seed);
  std::mt19937_64 rng(seed * 7919 + 1);
  std::vector<std::pair<int, int>> e;
  std::vector<int> degree(n, 0);
  for (const auto& c : tree.couplers()) e.push_back({c.a, c.b}), ++degree[c.a], ++degree[c.b];
  for (int k = 0; k < extra; ++k) {
    const int a = std::uniform_int_distribution<int>(0, n - 1)(rng), b = std::uniform_int_distribution<int>(0, n - 1)(rng);
    if (a == b || degree[a] >= 4 || degree[b] >= 4 || tree.coupled(a, b)) continue;
    bool dup = false;
    for (auto [x, y] : e) dup |= (x == a && y == b) || (x == b && y == a);
    if (!dup) e.push_back({a, b}), ++degree[a], ++degree[b];
  }
  return graph_device("graph-" + std::to_string(n) + "-" + std::to_string(seed), n, e);
}

struct Row {
  std::string family, name;
  int n;
  long long cx;
  double ratio, seconds;
  std::string strategy;
};

std::string g_strategy = "auto";
bool g_detours = false;

// The spine layout's shape: spine length and the detours (qubits between their ends) by line position.
void print_layout(const Device& dev) {
  try {
    const SpineLayout l = make_spine_layout(dev, dev.qubit_count(), 1);
    std::vector<int> pos(dev.qubit_count(), -1);
    for (std::size_t p = 0; p < l.line.size(); ++p) pos[l.line[p]] = static_cast<int>(p);
    std::printf("    spine %zu of %d; detours (position:via):", l.spine.size(), dev.qubit_count());
    for (const Detour& d : l.detours) std::printf(" %d:%zu", std::min(pos[d.a], pos[d.b]), d.via.size());
    std::printf("\n");
  } catch (const std::exception& e) {
    std::printf("    no spine layout: %s\n", e.what());
  }
}

Row measure(const std::string& family, const Device& dev, int repeats) {
  PlanOptions opt;
  opt.spec.qubits = dev.qubit_count();
  opt.strategy = g_strategy;
  std::vector<double> times;
  PlanReport r;
  for (int i = 0; i < repeats; ++i) {
    const auto t0 = std::chrono::steady_clock::now();
    r = plan_qft(dev, opt);
    times.push_back(std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count());
  }
  std::sort(times.begin(), times.end());
  const double N = dev.qubit_count();
  return {family, dev.name(), dev.qubit_count(), r.cx_count, static_cast<double>(r.cx_count) / (N * N - 1),
          times[times.size() / 2], r.strategy};
}

}  // namespace

int main(int argc, char** argv) {
  int repeats = 3;
  for (int i = 1; i < argc; ++i) {
    if (std::strcmp(argv[i], "--quick") == 0) repeats = 1;
    if (std::strcmp(argv[i], "--detours") == 0) g_detours = true;
    if (std::strcmp(argv[i], "--strategy") == 0 && i + 1 < argc) g_strategy = argv[++i];
  }
  std::vector<Row> rows;
  auto run = [&](const std::string& family, const Device& dev) {
    try {
      rows.push_back(measure(family, dev, repeats));
    } catch (const std::exception& e) {
      std::printf("%-10s %-36s %s\n", family.c_str(), dev.name().c_str(), e.what());
      return;
    }
    const Row& r = rows.back();
    std::printf("%-10s %-36s N=%4d cx=%7lld ratio=%.3f %-7s %.3fs\n", r.family.c_str(), r.name.c_str(), r.n, r.cx, r.ratio,
                r.strategy.c_str(), r.seconds);
    if (g_detours) print_layout(dev);
    std::fflush(stdout);
  };
  // Defective heavy-hexagon chips: a few dead qubits and broken couplers, renumbered, no positions.
  for (int k = 2; k <= 5; ++k)
    for (std::uint64_t seed = 1; seed <= 4; ++seed)
      run("heavy-hex", with_defects(make_lattice("heavy-hex:" + std::to_string(k) + "x" + std::to_string(k)), k - 1 + static_cast<int>(seed % 2),
                                    k + static_cast<int>(seed % 3), seed));
  // Near the 200 qubits of issue 17's time target: heavy-hex:5x6 (193 qubits before defects).
  for (std::uint64_t seed = 1; seed <= 2; ++seed)
    run("heavy-hex", with_defects(make_lattice("heavy-hex:5x6"), 3, 4, seed));
  for (int k : {6, 8, 10, 12})
    for (std::uint64_t seed = 1; seed <= 2; ++seed)
      run("grid", with_defects(make_lattice("grid:" + std::to_string(k) + "x" + std::to_string(k)), k / 3, k / 2 + static_cast<int>(seed), seed));
  for (int n : {30, 60, 100})
    for (std::uint64_t seed = 1; seed <= 3; ++seed) run("tree", random_tree(n, seed));
  for (int n : {30, 60, 100})
    for (std::uint64_t seed = 1; seed <= 3; ++seed) run("graph", random_graph(n, n / 4, seed));
  std::map<std::string, std::vector<const Row*>> by_family;
  for (const Row& r : rows) by_family[r.family].push_back(&r);
  std::printf("\n%-10s %5s %6s %6s %6s %9s\n", "family", "chips", "min", "median", "max", "max time");
  for (auto& [family, list] : by_family) {
    std::vector<double> ratios;
    double slowest = 0;
    for (const Row* r : list) ratios.push_back(r->ratio), slowest = std::max(slowest, r->seconds);
    std::sort(ratios.begin(), ratios.end());
    std::printf("%-10s %5zu %6.3f %6.3f %6.3f %8.3fs\n", family.c_str(), ratios.size(), ratios.front(),
                ratios[ratios.size() / 2], ratios.back(), slowest);
  }
  return 0;
}
