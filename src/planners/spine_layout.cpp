#include "qftplan/planners/spine_layout.hpp"

#include <algorithm>
#include <random>
#include <cstdlib>


#include <fmt/format.h>

#include "qftplan/core/run_budget.hpp"
#include "qftplan/planners/chain_search.hpp"
#include "qftplan/planners/plan.hpp"
#include "line_polish.hpp"
#include "spine_growth.hpp"

namespace qftplan {

// Why trees: with the chain networks every line position carries about the same number of two-qubit
// gates, and a gate between line neighbours joined by a path of k+1 couplers costs 2k SWAPs more.
// When every qubit off the spine hangs in a tree from the spine and each tree is read depth first
// right after its spine qubit, the paths between line neighbours add up to exactly one extra step per
// qubit off the spine (a depth-first walk of a tree of m qubits and back is 2m steps, over m + 1 line
// pairs). So the cost depends only on the spine's length, and qubits two or more hops away cost no
// more than dangling ones: the work goes into a long spine.

namespace {

// Seeded random starts of spines besides the three above, on pieces of at most kSpineStartsLimit qubits.
constexpr int kSpineStarts = 12;
constexpr int kSpineStartsLimit = 2000;
// Searches for a chain one qubit longer than the longest so far (grow_spines).
constexpr int kLongerChainSteps = 64;

// Breadth-first distances from `from` inside the piece; the farthest qubit (lowest number on ties).
int farthest(const Device& device, const std::vector<char>& inside, int from) {
  std::vector<int> dist(device.qubit_count(), -1), queue{from};
  dist[from] = 0;
  int far = from;
  for (std::size_t h = 0; h < queue.size(); ++h) {
    const int q = queue[h];
    if (dist[q] > dist[far] || (dist[q] == dist[far] && q < far)) far = q;
    for (int t : device.neighbours(q))
      if (inside[t] && dist[t] < 0) dist[t] = dist[q] + 1, queue.push_back(t);
  }
  return far;
}

// Candidate spines, the first three as before: chains, each lengthened (spine_growth.cpp): the deepest branches of
// depth-first trees from both ends of a long shortest path (found by two breadth-first sweeps), and
// the longest chain the chain search reports (measured on defective position-free heavy-hexagon
// chips of 100 to 10,000 qubits, the last is the longest by far; seeded random starts never won).
std::vector<std::vector<int>> grow_spines(const Device& device, const std::vector<char>& inside, int size,
                                          std::uint64_t seed, const RunBudget* budget) {
  std::vector<int> members;
  for (int q = 0; q < device.qubit_count(); ++q)
    if (inside[q]) members.push_back(q);
  BudgetPoll poll(budget, 64);
  std::vector<std::vector<int>> spines;
  auto consider = [&](std::vector<int> path, std::uint64_t s) {
    lengthen_spine(device, inside, path, s, poll);
    if (std::find(spines.begin(), spines.end(), path) == spines.end()) spines.push_back(std::move(path));
  };
  const int f1 = farthest(device, inside, members.front());
  const int f2 = farthest(device, inside, f1);
  consider(deepest_branch(device, inside, f1, seed), seed);
  if (static_cast<int>(spines.front().size()) == size) return spines;
  consider(deepest_branch(device, inside, f2, seed + 1), seed + 1);
  ChainSearchOptions cso;
  cso.seed = seed;
  cso.budget = budget;
  // Bounded so that a large device costs the search a few passes over its couplers, not more.
  cso.work_budget = std::min<long long>(cso.work_budget, 200LL * device.coupler_count() + 100'000);
  std::vector<int> chain = find_chain(device, size, cso).longest;
  // Asking for the whole piece leaves the complete search little to prune with; asking for one qubit
  // more than the longest so far lets its reach bound cut (measured on the defective heavy-hex:4x4 of
  // qftplan_spread: 64 -> 69 qubits, the longest there is). Each step has the same bounded budget; on
  // pieces of up to kSpineStartsLimit qubits.
  for (int step = 0; step < kLongerChainSteps && size <= kSpineStartsLimit && !chain.empty() &&
                     static_cast<int>(chain.size()) < size && !poll.stop();
       ++step) {
    ChainSearchResult more = find_chain(device, static_cast<int>(chain.size()) + 1, cso);
    if (more.chain.empty()) break;
    chain = more.longest.size() > more.chain.size() ? std::move(more.longest) : std::move(more.chain);
  }
  const bool usable = !chain.empty() && std::all_of(chain.begin(), chain.end(), [&](int q) { return inside[q] != 0; });
  if (usable) consider(std::move(chain), seed + 2);
  // The longest spine is not always the cheapest: what hangs off it matters too (a long branch left
  // hanging costs long detours). On chips of up to a few thousand qubits, spines grown from seeded
  // random starts join the candidates; the layout keeps the cheapest line over all of them.
  if (size <= kSpineStartsLimit) {
    std::mt19937_64 rng(seed ^ 0x5ee0);
    for (int k = 0; k < kSpineStarts && !poll.stop(); ++k) {
      const int start = members[std::uniform_int_distribution<std::size_t>(0, members.size() - 1)(rng)];
      consider(deepest_branch(device, inside, start, seed + 3 + k), seed + 3 + k);
    }
  }
  return spines;
}

// The qubits off the spine in trees hanging from it: breadth-first from the spine, so each hangs
// from a nearest spine qubit.
struct Forest {
  std::vector<int> parent;                  // tree parent; -1 on the spine
  std::vector<int> root;                    // the spine qubit a tree qubit hangs from (itself on the spine)
  std::vector<int> spine_index;             // position on the spine; -1 off it
  std::vector<std::vector<int>> children;
  std::vector<int> height;                  // edges from a qubit down to its deepest descendant
  int deepest = -1;                         // the off-spine child of a spine qubit with the highest subtree
};

Forest hang_trees(const Device& device, const std::vector<char>& inside, const std::vector<int>& spine) {
  const int N = device.qubit_count();
  Forest f{std::vector<int>(N, -1), std::vector<int>(N, -1), std::vector<int>(N, -1), std::vector<std::vector<int>>(N),
           std::vector<int>(N, 0)};
  std::vector<int> queue = spine;
  for (std::size_t i = 0; i < spine.size(); ++i) f.root[spine[i]] = spine[i], f.spine_index[spine[i]] = static_cast<int>(i);
  for (std::size_t h = 0; h < queue.size(); ++h)
    for (int t : device.neighbours(queue[h]))
      if (inside[t] && f.root[t] < 0) {
        f.parent[t] = queue[h], f.root[t] = f.root[queue[h]];
        f.children[queue[h]].push_back(t);
        queue.push_back(t);
      }
  for (std::size_t h = queue.size(); h-- > spine.size();) {
    const int q = queue[h], p = f.parent[q];
    f.height[p] = std::max(f.height[p], f.height[q] + 1);
    if (f.spine_index[p] >= 0 && (f.deepest < 0 || f.height[q] > f.height[f.deepest])) f.deepest = q;
  }
  return f;
}

// The line for a split point j: spine qubits 0 .. j-1 each followed by its trees read depth first,
// then spine qubits j .. end, then the trees of those, walking back from the end to j. A line pair at
// position p carries about n - 1 - p two-qubit gates in the chain networks (each wire meets every
// later one once, next to it), so detours are cheapest late in the line: the walk back gathers the
// trees of the spine's second part where a long detour costs least. j = spine length reads every
// tree in place.
std::vector<int> line_for_split(const Forest& f, const std::vector<int>& spine, std::size_t j, bool deep_last,
                                bool deepest_end) {
  std::vector<int> line, stack;
  const int held_back = deepest_end ? f.deepest : -1;
  // The subtrees of spine qubit s's children, depth first: all of them, only the leaves (kind 1) or
  // only the others (kind 2); the held-back subtree is skipped.
  auto trees = [&](int s, int kind) {
    for (auto c = f.children[s].rbegin(); c != f.children[s].rend(); ++c)
      if (*c != held_back && (kind == 0 || f.children[*c].empty() == (kind == 1))) stack.push_back(*c);
    while (!stack.empty()) {
      const int q = stack.back();
      stack.pop_back();
      line.push_back(q);
      stack.insert(stack.end(), f.children[q].rbegin(), f.children[q].rend());
    }
  };
  for (std::size_t i = 0; i < j; ++i) {
    line.push_back(spine[i]);
    trees(spine[i], deep_last ? 1 : 0);
  }
  for (std::size_t i = j; i < spine.size(); ++i) line.push_back(spine[i]);
  for (std::size_t i = spine.size(); i-- > j;) trees(spine[i], 0);
  // Deep trees kept back from the first part follow, still walking back towards the start.
  if (deep_last)
    for (std::size_t i = j; i-- > 0;) trees(spine[i], 2);
  // The highest subtree last, its highest branch last of all: the line ends inside it, so its
  // longest way back is never walked.
  if (held_back >= 0) {
    stack.push_back(held_back);
    std::vector<int> kids;
    while (!stack.empty()) {
      const int q = stack.back();
      stack.pop_back();
      line.push_back(q);
      kids = f.children[q];
      std::stable_sort(kids.begin(), kids.end(), [&](int a, int b) { return f.height[a] > f.height[b]; });
      stack.insert(stack.end(), kids.begin(), kids.end());
    }
  }
  return line;
}

// A shortest path from a to b through qubits of the line with fewer than `limit` qubits between them,
// within `max_visits` visits; the qubits between, or empty when none is found.
std::vector<int> shorter_path(const Device& device, const std::vector<int>& position, std::vector<int>& from, int a,
                              int b, std::size_t limit, int max_visits) {
  std::vector<int> frontier{a}, next, touched{a};
  from[a] = -1;
  std::vector<int> via;
  for (std::size_t level = 0; level < limit && !frontier.empty() && via.empty(); ++level) {
    next.clear();
    for (int x : frontier)
      for (int y : device.neighbours(x)) {
        if (position[y] < 0 || from[y] != -2 || !via.empty()) continue;
        from[y] = x, touched.push_back(y);
        if (y == b) {
          for (int v = x; v != a; v = from[v]) via.push_back(v);
          std::reverse(via.begin(), via.end());
        }
        next.push_back(y);
      }
    std::swap(frontier, next);
    if (static_cast<int>(touched.size()) > max_visits) break;
  }
  for (int t : touched) from[t] = -2;
  return via.size() < limit ? via : std::vector<int>{};
}

// The qubits between a and b on the path through the forest: up a's tree to its spine qubit, along
// the spine to b's, down b's tree (or up to their lowest common ancestor when both hang from the same
// spine qubit); shortened where a qubit on it is coupled to an end.
std::vector<int> forest_path(const Device& device, const Forest& f, const std::vector<int>& spine, int a, int b,
                             std::vector<int>& mark) {
  std::vector<int> up_a, up_b;
  for (int v = a; v >= 0; v = f.parent[v]) up_a.push_back(v), mark[v] = 1;
  for (int v = b; v >= 0 && !mark[v]; v = f.parent[v]) up_b.push_back(v);
  std::vector<int> walk;
  if (f.root[a] == f.root[b]) {
    // up_b stopped at the lowest common ancestor (marked): a climbs to it, then down to b.
    const int meet = f.parent[up_b.back()] >= 0 ? f.parent[up_b.back()] : up_b.back();
    for (int v : up_a) {
      walk.push_back(v);
      if (v == meet) break;
    }
  } else {
    walk = up_a;
    const int from = f.spine_index[f.root[a]], to = f.spine_index[f.root[b]], step = from < to ? 1 : -1;
    for (int i = from + step; i != to; i += step) walk.push_back(spine[i]);
  }
  for (auto it = up_b.rbegin(); it != up_b.rend(); ++it)
    if (walk.empty() || *it != walk.back()) walk.push_back(*it);
  for (int v : up_a) mark[v] = 0;
  // walk runs a .. b; keep the part after the last qubit coupled to a and before the first coupled to b.
  std::size_t lo = 0, hi = walk.size() - 1;
  for (std::size_t i = 1; i + 1 < walk.size(); ++i)
    if (device.coupled(walk[i], a)) lo = i - 1;
  for (std::size_t i = walk.size() - 1; i-- > lo + 1;)
    if (device.coupled(walk[i], b)) hi = i + 1;
  return std::vector<int>(walk.begin() + static_cast<long>(lo) + 1, walk.begin() + static_cast<long>(hi));
}

// The detours of a line and their cost: the qubits between the ends of each detour, weighted by the
// gates its line pair carries (about n - 1 - p at position p).
struct LineDetours {
  std::vector<Detour> detours;
  long long cost = 0;
};

LineDetours line_detours(const Device& device, const Forest& f, const std::vector<int>& spine,
                         const std::vector<int>& line, bool fused) {
  std::vector<int> position(device.qubit_count(), -1), from(device.qubit_count(), -2), mark(device.qubit_count(), 0);
  for (std::size_t p = 0; p < line.size(); ++p) position[line[p]] = static_cast<int>(p);
  LineDetours out;
  const long long n = static_cast<long long>(line.size());
  for (std::size_t p = 0; p + 1 < line.size(); ++p) {
    const int a = line[p], b = line[p + 1];
    if (device.coupled(a, b)) continue;
    Detour d{a, b, forest_path(device, f, spine, a, b, mark)};
    if (d.via.size() >= 2) {
      std::vector<int> via = shorter_path(device, position, from, a, b, d.via.size(), 4096);
      if (!via.empty()) d.via = std::move(via);
    }
    // The end whose first SWAP is on a line pair steps aside: that SWAP follows the parity step the
    // network ran on that pair just before and fuses with it (sinks/detour_sink.hpp), so each gate
    // of the detour costs 6 |via| - 4 CX instead of 6 |via|.
    auto on_line_pair = [&](int x, int y) { return std::abs(position[x] - position[y]) == 1; };
    if (!on_line_pair(d.a, d.via.front()) && on_line_pair(d.b, d.via.back())) {
      std::swap(d.a, d.b);
      std::reverse(d.via.begin(), d.via.end());
    }
    const long long per_gate =
        6 * static_cast<long long>(d.via.size()) - (fused && on_line_pair(d.a, d.via.front()) ? 4 : 0);
    out.cost += per_gate * (n - static_cast<long long>(p));
    out.detours.push_back(std::move(d));
  }
  return out;
}

}  // namespace

constexpr int kSplits = 32;
// Lines of up to this many qubits are polished by local moves (line_polish.cpp): its distance table
// has n^2 entries and a pass costs O(n) per move tried.
constexpr int kPolishLimit = 1000;

SpineLayout make_spine_layout(const Device& device, int n, std::uint64_t seed, const RunBudget* budget, bool in_place,
                              bool fused_swaps) {
  SpineLayout out;
  if (device.qubit_count() == 0) throw PlanningError(fmt::format("{} has no qubits", device.name()));
  auto [comp, count] = device.components();
  std::vector<int> size(count, 0);
  for (int q = 0; q < device.qubit_count(); ++q) size[comp[q]] += device.usable(q);
  const int big = static_cast<int>(std::max_element(size.begin(), size.end()) - size.begin());
  const int largest = size[big];
  if (largest < n)
    throw PlanningError(fmt::format(
        "the spine strategy needs {} connected qubits; the largest connected piece of {} has {}", n, device.name(), largest));
  std::vector<char> inside(device.qubit_count(), 0);
  for (int q = 0; q < device.qubit_count(); ++q) inside[q] = comp[q] == big && device.usable(q);
  // For each candidate spine, both directions, each with the trees read in place, gathered on a walk
  // back from the end, or split between the two at a few points; the cheapest line by the weighted
  // detour cost.
  long long best = -1;
  std::vector<int> best_spine;
  for (std::vector<int>& spine : grow_spines(device, inside, largest, seed, budget))
    for (int direction = 0; direction < 2; ++direction) {
      const Forest forest = hang_trees(device, inside, spine);
      const std::size_t m = spine.size();
      // The gathered trees' long detours run through the busy spine and lengthen the depth well past
      // the in-place reading's (measured: 1.6 to 2 x on heavy-hex:4x5 to 6x6), so `in_place` skips them.
      for (int k = in_place ? kSplits : 0; k <= kSplits; ++k)
        for (int variant = 0; variant < 4; ++variant) {
          const bool deep_last = variant & 1, deepest_end = variant & 2;
          if (in_place && variant != 0) continue;
          std::vector<int> line =
              line_for_split(forest, spine, m * static_cast<std::size_t>(k) / kSplits, deep_last, deepest_end);
          line.resize(n);
          LineDetours d = line_detours(device, forest, spine, line, fused_swaps);
          if (best < 0 || d.cost < best)
            best = d.cost, out.line = std::move(line), out.detours = std::move(d.detours), best_spine = spine;
        }
      std::reverse(spine.begin(), spine.end());
    }
  // Local moves then shorten what the tree readings left long (not with `in_place`: the moves gather
  // qubits wherever detours are cheapest, as the gathered readings do). The estimate counts a detour
  // that starts beside a parity step as fused, which the gate stream does not always allow (the step
  // beside it may be busy with another detour): measured on random trees, lines polished under it
  // cost up to 15% more CX than the unpolished line, while polishing as if nothing fused never made a
  // line worse but gains less on heavy-hexagon chips. Both are offered; the planner counts them.
  if (!in_place && n <= kPolishLimit && !out.detours.empty()) {
    const LineDistances dist(device, out.line);
    BudgetPoll poll(budget, 16);
    for (const bool fused_estimate : {true, false}) {
      if (fused_estimate && !fused_swaps) continue;
      std::vector<int> polished = polish_line(device, dist, out.line, fused_estimate, poll);
      if (polished == out.line) continue;
      std::vector<Detour> detours = line_detours_by_distance(device, dist, polished, fused_swaps);
      out.alternatives.emplace_back(std::move(polished), std::move(detours));
    }
  }
  out.spine = std::move(best_spine);
  // The spine reported is the one the chosen line runs along.
  if (!out.line.empty() && std::find(out.spine.begin(), out.spine.end(), out.line.front()) != out.spine.begin())
    std::reverse(out.spine.begin(), out.spine.end());
  return out;
}

}  // namespace qftplan
