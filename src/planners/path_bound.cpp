#include "path_bound.hpp"

#include <algorithm>

namespace qftplan {

std::vector<signed char> two_colouring(const Device& device) {
  const int N = device.qubit_count();
  std::vector<signed char> colour(N, -1);
  std::vector<int> queue;
  for (int s = 0; s < N; ++s) {
    if (colour[s] >= 0) continue;
    colour[s] = 0;
    queue.assign(1, s);
    for (std::size_t i = 0; i < queue.size(); ++i) {
      const int v = queue[i];
      for (int w : device.neighbours(v)) {
        if (colour[w] < 0) {
          colour[w] = static_cast<signed char>(1 - colour[v]);
          queue.push_back(w);
        } else if (colour[w] == colour[v]) {
          return {};
        }
      }
    }
  }
  return colour;
}

PathBound::PathBound(const Device& device, std::vector<signed char> colour)
    : dev_(device), colour_(std::move(colour)) {
  const auto N = static_cast<std::size_t>(device.qubit_count());
  disc_.assign(N, 0);
  low_.assign(N, 0);
  parent_.assign(N, -1);
  next_child_.assign(N, 0);
  best_size_.assign(N, 0);
  best_a_.assign(N, 0);
  best_b_.assign(N, 0);
}

int PathBound::from(int start, const std::vector<char>& usable, long long& work) {
  const bool bipartite = !colour_.empty();
  const signed char own = bipartite ? colour_[start] : 0;
  touched_.clear();
  stack_.clear();
  clock_ = 0;
  auto visit = [&](int v, int parent) {
    disc_[v] = low_[v] = ++clock_;
    parent_[v] = parent;
    next_child_[v] = 0;
    best_size_[v] = best_a_[v] = best_b_[v] = 0;
    touched_.push_back(v);
    stack_.push_back(v);
  };
  // A block: the vertices popped down to `child`, attached at `at`. Its value along a chain is its
  // own vertices plus the best chain hanging off any of them (blocks popped earlier).
  auto close_block = [&](int at, int child) {
    int size = 0, a = 0, b = 0, below_size = 0, below_a = 0, below_b = 0;
    while (true) {
      const int x = stack_.back();
      stack_.pop_back();
      ++size;
      if (bipartite) (colour_[x] == own ? b : a) += 1;
      below_size = std::max(below_size, best_size_[x]);
      below_a = std::max(below_a, best_a_[x]);
      below_b = std::max(below_b, best_b_[x]);
      if (x == child) break;
    }
    best_size_[at] = std::max(best_size_[at], size + below_size);
    best_a_[at] = std::max(best_a_[at], a + below_a);
    best_b_[at] = std::max(best_b_[at], b + below_b);
  };
  visit(start, -1);
  int v = start;
  while (v >= 0) {
    const auto nbs = dev_.neighbours(v);
    if (next_child_[v] < static_cast<int>(nbs.size())) {
      const int w = nbs[static_cast<std::size_t>(next_child_[v]++)];
      ++work;
      if (w == start || usable[static_cast<std::size_t>(w)]) {
        if (disc_[w] == 0) {
          visit(w, v);
          v = w;
        } else if (w != parent_[v]) {
          low_[v] = std::min(low_[v], disc_[w]);
        }
      }
      continue;
    }
    // v is done: report to its parent.
    const int p = parent_[v];
    if (p >= 0) {
      low_[p] = std::min(low_[p], low_[v]);
      if (low_[v] >= disc_[p]) close_block(p, v);
    }
    v = p;
  }
  for (int x : touched_) disc_[x] = 0;
  int bound = 1 + best_size_[start];
  if (bipartite) bound = std::min({bound, 2 * (1 + best_b_[start]), 2 * best_a_[start] + 1});
  return bound;
}

}  // namespace qftplan
