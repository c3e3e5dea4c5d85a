#include "qftplan/planners/spine_layout.hpp"

#include <algorithm>
#include <random>

#include <fmt/format.h>

#include "qftplan/core/run_budget.hpp"
#include "qftplan/planners/chain_search.hpp"
#include "qftplan/planners/plan.hpp"

namespace qftplan {

namespace {

// Qubits within one hop of `path` (the path's closed neighbourhood).
int coverage(const Device& device, const std::vector<int>& path) {
  std::vector<char> covered(device.qubit_count(), 0);
  int count = 0;
  auto cover = [&](int q) {
    if (!covered[q]) covered[q] = 1, ++count;
  };
  for (int q : path) {
    cover(q);
    for (int t : device.neighbours(q)) cover(t);
  }
  return count;
}

// Looks for a path whose closed neighbourhood is the whole component of `start` (a spanning
// caterpillar: every other qubit hangs one hop off the path), by depth-first extension from `start`
// with neighbours in Warnsdorff order (fewest free neighbours first, ties in a seeded random order).
// A branch is cut when the rest cannot be covered (still_possible below). Stops after `budget` extensions; returns the best path seen (by coverage, then length).
// Ours; it serves devices whose longest chain leaves qubits two hops away (the chain search prefers
// length, and without positions its snakes wander). The search is exponential in the worst case:
// measured on shuffled heavy-hexagon lattices without positions, it covers every qubit up to 7x7
// (300 qubits) within its budget, and falls short (the strategy then says so) from 8x8 on.
std::vector<int> covering_path(const Device& device, int start, int component_size, long long budget,
                               long long& visits, const RunBudget* run_budget, std::uint64_t seed) {
  std::mt19937_64 rng(seed);
  const int N = device.qubit_count();
  std::vector<char> on_path(N, 0);
  std::vector<int> cover_count(N, 0);  // path qubits within one hop (itself included)
  int covered = 0;
  std::vector<int> path, best;
  int best_covered = -1;
  auto add = [&](int q) {
    on_path[q] = 1;
    path.push_back(q);
    if (cover_count[q]++ == 0) ++covered;
    for (int t : device.neighbours(q))
      if (cover_count[t]++ == 0) ++covered;
  };
  auto remove_last = [&] {
    const int q = path.back();
    path.pop_back();
    on_path[q] = 0;
    if (--cover_count[q] == 0) --covered;
    for (int t : device.neighbours(q))
      if (--cover_count[t] == 0) --covered;
  };
  // Two necessary conditions for covering the rest from the path's end e, both from one depth-first
  // search of the free qubits from e (Tarjan's low points: Tarjan, "Depth-first search and linear
  // graph algorithms", SIAM J. Comput. 1, 1972). (1) Every uncovered qubit is reachable. (2) A
  // "pocket" is the subtree of a search child c whose low point does not reach above c's parent: a
  // path from e that enters it cannot come out. An uncovered qubit whose candidates (itself and its
  // free neighbours) all lie in one pocket forces the path to end there; two such pockets that are
  // disjoint cannot both be served, so the branch is cut. (Pockets nest or are disjoint.)
  std::vector<int> seen(N, 0), disc(N, 0), low(N, 0), parent(N, -1), fin(N, 0), pocket_of(N, -1), next_edge(N, 0);
  std::vector<int> order, stack;
  int stamp = 0;
  auto inside = [&](int x, int root) { return disc[root] <= disc[x] && fin[x] <= fin[root]; };
  auto still_possible = [&]() {
    if (covered == component_size) return true;
    ++stamp;
    order.clear();
    stack.clear();
    const int e = path.back();
    int clock = 0;
    seen[e] = stamp, disc[e] = low[e] = clock++, parent[e] = -1, next_edge[e] = 0;
    stack.push_back(e);
    int reached_uncovered = 0;
    while (!stack.empty()) {
      const int x = stack.back();
      const auto nb = device.neighbours(x);
      if (next_edge[x] < static_cast<int>(nb.size())) {
        const int t = nb[next_edge[x]++];
        if (on_path[t]) continue;
        if (seen[t] == stamp) {
          if (t != parent[x]) low[x] = std::min(low[x], disc[t]);
          continue;
        }
        ++visits;
        seen[t] = stamp, disc[t] = low[t] = clock++, parent[t] = x, next_edge[t] = 0;
        if (cover_count[t] == 0) ++reached_uncovered;
        order.push_back(t);
        stack.push_back(t);
        continue;
      }
      fin[x] = clock++;
      stack.pop_back();
      if (parent[x] >= 0) low[parent[x]] = std::min(low[parent[x]], low[x]);
    }
    if (reached_uncovered != component_size - covered) return false;
    for (int x : order) {
      const bool pocket = low[x] >= disc[parent[x]];
      pocket_of[x] = pocket ? x : (parent[x] == e ? -1 : pocket_of[parent[x]]);
    }
    auto pocket_parent = [&](int c) { return parent[c] == e ? -1 : pocket_of[parent[c]]; };
    int deepest = -1;
    for (int u : order) {
      if (cover_count[u] != 0) continue;
      int P = pocket_of[u];
      for (int t : device.neighbours(u)) {
        if (on_path[t]) continue;
        while (P != -1 && !inside(t, P)) P = pocket_parent(P);
      }
      if (P == -1) continue;
      if (deepest == -1 || inside(P, deepest)) deepest = P;
      else if (!inside(deepest, P)) return false;
    }
    return true;
  };
  auto free_degree = [&](int q) {
    int d = 0;
    for (int t : device.neighbours(q)) d += !on_path[t];
    return d;
  };
  // Explicit stack: the candidates of each path position, in the order they are tried.
  std::vector<std::vector<int>> options;
  auto push_options = [&]() {
    std::vector<int> next;
    for (int t : device.neighbours(path.back()))
      if (!on_path[t]) next.push_back(t);
    std::shuffle(next.begin(), next.end(), rng);  // ties in random order: restarts differ (seeded)
    std::stable_sort(next.begin(), next.end(), [&](int a, int b) { return free_degree(a) < free_degree(b); });
    std::reverse(next.begin(), next.end());  // popped from the back: fewest free neighbours first
    options.push_back(std::move(next));
  };
  add(start);
  push_options();
  BudgetPoll poll(run_budget, 1024);
  long long work = 0;
  while (!options.empty() && work < budget) {
    if (covered > best_covered || (covered == best_covered && path.size() > best.size())) {
      best = path;
      best_covered = covered;
      if (covered == component_size) break;
    }
    if (poll.stop()) break;
    if (options.back().empty()) {
      options.pop_back();
      remove_last();
      continue;
    }
    const int v = options.back().back();
    options.back().pop_back();
    ++work;
    add(v);
    if (!still_possible()) {
      remove_last();
      continue;
    }
    push_options();
  }
  if (covered > best_covered) best = path;
  return best;
}

}  // namespace

SpineLayout make_spine_layout(const Device& device, int n, std::uint64_t seed, const RunBudget* budget) {
  SpineLayout out;
  ChainSearchOptions cso;
  cso.seed = seed;
  cso.budget = budget;
  // Ask for a chain through the whole largest component: the search returns the longest it finds.
  auto [comp, count] = device.components();
  std::vector<int> size(count, 0);
  for (int c : comp) ++size[c];
  const int big = static_cast<int>(std::max_element(size.begin(), size.end()) - size.begin());
  const int largest = size[big];
  out.spine = find_chain(device, largest, cso).longest;
  if (out.spine.empty()) out.spine.push_back(0);
  // When the longest chain leaves qubits two hops away, look for a path that covers them all. Where
  // the path starts decides whether the search succeeds quickly (on heavy-hexagon lattices a fair
  // share of the qubits do, within a few hundred extensions), so every qubit of the component is
  // tried in turn, least degree first, each with a small budget, within a total budget of qubit
  // visits (each extension checks reachability by a search over the free qubits).
  if (coverage(device, out.spine) < std::min(n, largest)) {
    std::vector<int> starts;
    for (int q = 0; q < device.qubit_count(); ++q)
      if (comp[q] == big) starts.push_back(q);
    std::stable_sort(starts.begin(), starts.end(), [&](int a, int b) { return device.degree(a) < device.degree(b); });
    const long long per_start = std::max<long long>(2000, 4LL * largest);
    long long visits = 0;
    constexpr long long kMaxVisits = 200'000'000;
    for (int s : starts) {
      if (visits > kMaxVisits || (budget && budget->exhausted())) break;
      // Ties broken at random, seeded per start: a search that went wrong early is not repeated.
      auto path = covering_path(device, s, largest, per_start, visits, budget, seed * 1000003u + static_cast<std::uint64_t>(s));
      const int c = coverage(device, path), have = coverage(device, out.spine);
      if (c > have || (c == have && path.size() > out.spine.size())) out.spine = std::move(path);
      if (coverage(device, out.spine) >= std::min(n, largest)) break;
    }
  }
  std::vector<bool> used(device.qubit_count(), false);
  for (int q : out.spine) used[q] = true;
  for (std::size_t a = 0; a < out.spine.size(); ++a) {
    const int c = out.spine[a];
    out.line.push_back(c);
    for (int t : device.neighbours(c)) {
      if (used[t]) continue;
      used[t] = true;
      out.line.push_back(t);
    }
  }
  if (static_cast<int>(out.line.size()) < n)
    throw PlanningError(fmt::format(
        "the spine strategy reaches {} qubits of {} (a chain of {} and the qubits one hop off it), fewer than {}",
        out.line.size(), device.name(), out.spine.size(), n));
  out.line.resize(n);
  // Consecutive line entries that are not coupled: a dangling qubit and whatever follows it, both
  // neighbours of the spine qubit they hang from (the nearest spine qubit before them on the line).
  int last_spine = -1;
  std::vector<bool> on_spine(device.qubit_count(), false);
  for (int q : out.spine) on_spine[q] = true;
  for (std::size_t p = 0; p + 1 < out.line.size(); ++p) {
    if (on_spine[out.line[p]]) last_spine = out.line[p];
    const int a = out.line[p], b = out.line[p + 1];
    if (!device.coupled(a, b)) out.detours.push_back({a, b, last_spine});
  }
  return out;
}

}  // namespace qftplan
