#include "spine_growth.hpp"

#include <algorithm>
#include <random>

#include "qftplan/core/run_budget.hpp"

namespace qftplan {

std::vector<int> deepest_branch(const Device& device, const std::vector<char>& inside, int start, std::uint64_t seed) {
  std::mt19937_64 rng(seed);
  const int N = device.qubit_count();
  std::vector<int> parent(N, -1), depth(N, -1);
  auto free_degree = [&](int q) {
    int d = 0;
    for (int t : device.neighbours(q)) d += inside[t] && depth[t] < 0;
    return d;
  };
  // Explicit stack of (qubit, its untried neighbours in the order they are tried, popped from the back).
  std::vector<std::pair<int, std::vector<int>>> stack;
  auto enter = [&](int q, int from) {
    parent[q] = from;
    depth[q] = from < 0 ? 0 : depth[from] + 1;
    std::vector<int> next;
    for (int t : device.neighbours(q))
      if (inside[t] && depth[t] < 0) next.push_back(t);
    // Warnsdorff's rule (fewest free neighbours first): a qubit with no way on is visited at once and
    // left as a branch of one, so the deepest branch runs on through the qubits that lead somewhere.
    std::shuffle(next.begin(), next.end(), rng);
    std::stable_sort(next.begin(), next.end(), [&](int a, int b) { return free_degree(a) > free_degree(b); });
    stack.emplace_back(q, std::move(next));
  };
  enter(start, -1);
  int deepest = start;
  while (!stack.empty()) {
    auto& [q, next] = stack.back();
    if (next.empty()) {
      stack.pop_back();
      continue;
    }
    const int t = next.back();
    next.pop_back();
    if (depth[t] >= 0) continue;
    const int from = q;  // `enter` may reallocate the stack
    enter(t, from);
    if (depth[t] > depth[deepest]) deepest = t;
  }
  std::vector<int> path;
  for (int q = deepest; q >= 0; q = parent[q]) path.push_back(q);
  return path;  // from the deepest qubit back to the start
}

namespace {

// The qubits of the spine and a breadth-first search over the free ones, shared by the moves.
struct Grower {
  const Device& device;
  const std::vector<char>& inside;
  std::vector<int>& spine;
  std::vector<char> on_spine;
  std::vector<int> seen, from;
  int stamp = 0;

  Grower(const Device& d, const std::vector<char>& in, std::vector<int>& s)
      : device(d), inside(in), spine(s), on_spine(d.qubit_count(), 0), seen(d.qubit_count(), 0), from(d.qubit_count(), -1) {
    for (int q : spine) on_spine[q] = 1;
  }
  bool is_free(int q) const { return inside[q] && !on_spine[q]; }

  // A shortest path of free qubits x1..xk with x1 coupled to u and xk coupled to w (u, w consecutive
  // on the spine), within `max_depth` qubits and `max_visits` visits; empty when none is found. Short
  // detours keep the search local; what they leave, later passes insert between the new neighbours.
  std::vector<int> ear(int u, int w, int max_depth, int max_visits) {
    ++stamp;
    std::vector<int> frontier, next;
    for (int x : device.neighbours(u))
      if (is_free(x)) seen[x] = stamp, from[x] = -1, frontier.push_back(x);
    int visits = 0;
    for (int level = 1; level <= max_depth && !frontier.empty(); ++level) {
      next.clear();
      for (int x : frontier) {
        if (device.coupled(x, w)) {
          std::vector<int> path;
          for (int y = x; y >= 0; y = from[y]) path.push_back(y);
          std::reverse(path.begin(), path.end());
          return path;
        }
        for (int y : device.neighbours(x)) {
          if (!is_free(y) || seen[y] == stamp) continue;
          seen[y] = stamp, from[y] = x, next.push_back(y);
          if (++visits > max_visits) return {};
        }
      }
      std::swap(frontier, next);
    }
    return {};
  }

  // One pass over the spine's couplers, replacing each by an ear where one exists; the qubits added.
  int insert_ears(BudgetPoll& poll) {
    std::vector<int> out;
    out.reserve(spine.size());
    int added = 0;
    for (std::size_t i = 0; i < spine.size(); ++i) {
      out.push_back(spine[i]);
      if (i + 1 == spine.size() || poll.stop()) continue;
      for (int x : ear(spine[i], spine[i + 1], 12, 400)) {
        on_spine[x] = 1;
        out.push_back(x);
        ++added;
      }
    }
    spine.swap(out);
    return added;
  }

  // Grows the spine's last qubit into the free qubits beyond it (the deepest branch among them).
  int extend_tail(std::uint64_t seed) {
    const int e = spine.back();
    std::vector<char> region(inside.size(), 0);
    bool any = false;
    for (int t : device.neighbours(e)) any = any || is_free(t);
    if (!any) return 0;
    // The region is the free qubits plus the end itself, so the branch starts at the end.
    for (std::size_t q = 0; q < inside.size(); ++q) region[q] = is_free(static_cast<int>(q));
    region[e] = 1;
    std::vector<int> branch = deepest_branch(device, region, e, seed);
    branch.pop_back();  // the end itself
    for (auto it = branch.rbegin(); it != branch.rend(); ++it) on_spine[*it] = 1, spine.push_back(*it);
    return static_cast<int>(branch.size());
  }

  // Pósa's rotation at the last qubit: when it is coupled to spine[i] (not its predecessor),
  // reversing spine[i+1 ..] keeps a simple path and makes spine[i+1] the end; done only when that
  // qubit has a free neighbour, so the next extension adds qubits. True when rotated.
  bool rotate_tail() {
    const int e = spine.back();
    const int len = static_cast<int>(spine.size());
    if (len < 3) return false;
    std::vector<int> index_of;
    for (int x : device.neighbours(e)) {
      if (!on_spine[x] || x == spine[len - 2]) continue;
      const int i = static_cast<int>(std::find(spine.begin(), spine.end(), x) - spine.begin());
      if (i + 1 >= len) continue;
      for (int t : device.neighbours(spine[i + 1]))
        if (is_free(t)) {
          std::reverse(spine.begin() + i + 1, spine.end());
          return true;
        }
    }
    return false;
  }
};

}  // namespace

void lengthen_spine(const Device& device, const std::vector<char>& inside, std::vector<int>& spine,
                    std::uint64_t seed, BudgetPoll& poll) {
  if (spine.empty()) return;
  Grower g(device, inside, spine);
  // Each round adds at least one qubit or ends the loop, so it ends; the poll bounds its time.
  for (int round = 0; !poll.stop(); ++round) {
    int added = g.insert_ears(poll);
    for (int side = 0; side < 2; ++side) {
      added += g.extend_tail(seed + static_cast<std::uint64_t>(round) * 2 + static_cast<std::uint64_t>(side));
      if (g.rotate_tail()) added += g.extend_tail(seed + 7919u * static_cast<std::uint64_t>(round + 1));
      std::reverse(spine.begin(), spine.end());
    }
    if (added == 0) break;
  }
}

}  // namespace qftplan
