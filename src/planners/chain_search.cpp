#include "qftplan/planners/chain_search.hpp"

#include <algorithm>
#include <cmath>
#include <optional>
#include <random>

#include "qftplan/core/run_budget.hpp"
#include "complete_chain_search.hpp"
#include "path_bound.hpp"
#include "path_stretch.hpp"

namespace qftplan {

bool is_chain(const Device& device, const std::vector<int>& chain) {
  std::vector<bool> seen(device.qubit_count(), false);
  for (std::size_t i = 0; i < chain.size(); ++i) {
    const int q = chain[i];
    if (q < 0 || q >= device.qubit_count() || seen[q] || !device.usable(q)) return false;
    seen[q] = true;
    if (i > 0 && !device.coupled(chain[i - 1], q)) return false;
  }
  return true;
}

namespace {

class Searcher {
 public:
  Searcher(const Device& d, int n, const ChainSearchOptions& o)
      : dev_(d), n_(n), opt_(o), rng_(o.seed), on_path_(d.qubit_count(), false), index_(d.qubit_count(), -1) {}

  ChainSearchResult run() {
    ChainSearchResult r;
    if (n_ <= 0 || n_ > dev_.usable_qubit_count()) {
      r.proved_none = n_ > dev_.usable_qubit_count();  // more qubits than the device has in service
      return r;
    }
    const std::vector<int> first = starts();
    for (int start : first) {
      if (out_of_budget()) break;
      greedy(start);
      if (static_cast<int>(path_.size()) >= n_) break;
    }
    // Still short: again from the best starts, each step now guided by how far a path could still
    // go (PathBound), which keeps the walk from cutting off the part of the chip it has not reached.
    if (static_cast<int>(best_.size()) < n_ && !out_of_budget()) {
      bound_.emplace(dev_, two_colouring(dev_));
      // One guided walk costs a bound (O(qubits)) per branching step: on large chips the pass may go
      // past the work budget by about that much, so that at least one walk can run to its end.
      limit_ = std::max(limit_, work_ + 3LL * dev_.qubit_count() * n_);
      free_.assign(static_cast<std::size_t>(dev_.qubit_count()), 1);
      for (std::size_t i = 0; i < first.size() && i < kGuidedStarts && !out_of_budget(); ++i) {
        greedy(first[i]);
        if (static_cast<int>(best_.size()) >= n_) break;
      }
    }
    // Still short: where the complete search applies, a short run of it first settles the easy
    // cases (a chain near the greedy one, or a register the reach bound rules out at once).
    // (Counting the searchable qubits walks the components: only when the chain is still short.)
    const bool complete = static_cast<int>(best_.size()) < n_ && searchable_qubits() <= opt_.complete_limit;
    auto run_complete = [&](long long budget) {
      const auto c = complete_chain_search(dev_, n_, budget, poll_);
      work_ += c.work;
      if (c.longest.size() > best_.size()) best_ = c.longest;
      r.proved_none = c.proved_none;
    };
    if (static_cast<int>(best_.size()) < n_ && complete && !out_of_budget())
      run_complete(std::min(kQuickComplete, opt_.work_budget - work_));
    // Then re-route stretches of the longest path through the qubits it missed; where the complete
    // search follows, with a quarter of what is left (its proofs need the rest).
    if (static_cast<int>(best_.size()) < n_ && !r.proved_none && best_.size() >= 2 && !out_of_budget()) {
      std::vector<int> p = best_;
      const long long left = std::max(0LL, limit_ - work_);
      stretch_path(dev_, p, n_, complete ? left / 4 : left, work_, poll_);
      if (p.size() > best_.size()) best_ = std::move(p);
    }
    // (The guided pass may have spent the whole budget on a large chip: then this stops at once.)
    if (static_cast<int>(best_.size()) < n_ && !r.proved_none && complete && !out_of_budget())
      run_complete(opt_.work_budget - work_);
    if (static_cast<int>(best_.size()) >= n_) r.chain.assign(best_.begin(), best_.begin() + n_);
    r.longest = best_;
    r.work = work_;
    r.budget_exhausted = work_ > limit_;
    r.time_out = poll_.stopped();
    return r;
  }

 private:
  // The work budget bounds effort; the RunBudget (polled every 1024 calls) bounds wall time.
  bool out_of_budget() { return work_ > limit_ || poll_.stop(); }

  // Starting qubits: both ends of a double sweep in every component, then the lowest-degree qubits,
  // then a few seeded random ones.
  std::vector<int> starts() {
    const int N = dev_.qubit_count();
    std::vector<int> out;
    auto add = [&](int q) {
      if (std::find(out.begin(), out.end(), q) == out.end()) out.push_back(q);
    };
    auto [comp, count] = dev_.components();
    std::vector<int> comp_size(count, 0);
    // A qubit out of service is a component of its own with nothing to offer: size 0, never a start.
    for (int q = 0; q < N; ++q) comp_size[comp[q]] += dev_.usable(q);
    std::vector<int> first_of(count, -1);
    for (int q = 0; q < N; ++q)
      if (first_of[comp[q]] < 0) first_of[comp[q]] = q;
    // Components able to hold the chain, largest first.
    std::vector<int> order(count);
    for (int c = 0; c < count; ++c) order[c] = c;
    std::stable_sort(order.begin(), order.end(), [&](int a, int b) { return comp_size[a] > comp_size[b]; });
    for (int c : order) {
      if (comp_size[c] < n_) continue;
      const auto d0 = dev_.distances_from(first_of[c]);
      const int a = static_cast<int>(std::max_element(d0.begin(), d0.end()) - d0.begin());
      const auto d1 = dev_.distances_from(a);
      const int b = static_cast<int>(std::max_element(d1.begin(), d1.end()) - d1.begin());
      work_ += 2LL * N;
      add(a);
      add(b);
    }
    std::vector<int> by_degree;
    for (int q = 0; q < N; ++q)
      if (dev_.usable(q) && comp_size[comp[q]] >= n_) by_degree.push_back(q);
    std::stable_sort(by_degree.begin(), by_degree.end(), [&](int x, int y) { return dev_.degree(x) < dev_.degree(y); });
    for (std::size_t i = 0; i < by_degree.size() && i < 4; ++i) add(by_degree[i]);
    if (!by_degree.empty())
      for (int i = 0; i < 8; ++i) add(by_degree[std::uniform_int_distribution<std::size_t>(0, by_degree.size() - 1)(rng_)]);
    return out;
  }

  int free_degree(int q) const {
    int f = 0;
    for (int nb : dev_.neighbours(q)) f += !on_path_[nb];
    return f;
  }

  // Score of stepping from the path's end to `nb` (lower is better).
  double score(int nb) {
    work_ += dev_.degree(nb);
    double s = free_degree(nb);
    if (bound_) {
      // Guided: the farthest a path could still reach after stepping to nb comes first.
      free_[static_cast<std::size_t>(nb)] = 0;
      const int reach = bound_->from(nb, free_, work_);
      free_[static_cast<std::size_t>(nb)] = 1;
      s -= 16.0 * reach;
    }
    if (path_.size() >= 2 && dev_.has_positions()) {
      const auto p0 = dev_.position(path_[path_.size() - 2]), p1 = dev_.position(path_.back()), p2 = dev_.position(nb);
      if (p0 && p1 && p2) {
        // Prefer keeping direction: cos of the turn angle in [-1, 1]; weigh it above Warnsdorff.
        const double ax = p1->x - p0->x, ay = p1->y - p0->y, bx = p2->x - p1->x, by = p2->y - p1->y;
        const double na = std::hypot(ax, ay), nb2 = std::hypot(bx, by);
        if (na > 0 && nb2 > 0) s -= 4.0 * (ax * bx + ay * by) / (na * nb2);
      }
    }
    return s + tie_(rng_) * 1e-3;
  }

  void push(int q) {
    if (!free_.empty()) free_[static_cast<std::size_t>(q)] = 0;
    on_path_[q] = true;
    index_[q] = static_cast<int>(path_.size());
    path_.push_back(q);
  }

  void reindex(std::size_t from) {
    for (std::size_t i = from; i < path_.size(); ++i) index_[path_[i]] = static_cast<int>(i);
  }

  // Extends the end of path_ greedily; returns false when stuck.
  bool extend_end() {
    bool moved = false;
    while (static_cast<int>(path_.size()) < n_ && !out_of_budget()) {
      int best = -1;
      double best_s = 0;
      int choices = 0;
      if (bound_) {
        // Guided: a forced step needs no bound.
        for (int nb : dev_.neighbours(path_.back())) choices += !on_path_[nb];
        if (choices == 1)
          for (int nb : dev_.neighbours(path_.back()))
            if (!on_path_[nb]) best = nb;
      }
      for (int nb : dev_.neighbours(path_.back())) {
        if (on_path_[nb] || choices == 1) continue;
        const double s = score(nb);
        if (best < 0 || s < best_s) best = nb, best_s = s;
      }
      if (best < 0) break;
      push(best);
      moved = true;
    }
    return moved;
  }

  void record() {
    if (path_.size() > best_.size()) best_ = path_;
  }

  void greedy(int start) {
    for (int q : path_) on_path_[q] = false, index_[q] = -1;
    if (!free_.empty())
      for (int q : path_) free_[static_cast<std::size_t>(q)] = 1;
    path_.clear();
    push(start);
    int rotations_left = 8 * n_ + 64;
    bool reversed_once = false;
    while (static_cast<int>(path_.size()) < n_ && !out_of_budget()) {
      extend_end();
      record();
      if (static_cast<int>(path_.size()) >= n_) break;
      // Try the other end once per stall.
      if (!reversed_once) {
        std::reverse(path_.begin(), path_.end());
        reindex(0);
        reversed_once = true;
        continue;
      }
      // Pósa rotation: pick a path neighbour u = path[i] of the end; reverse path[i+1..]. The new
      // end path[i+1] may have free neighbours.
      if (rotations_left-- <= 0) break;
      std::vector<int> cand;
      const int end = path_.back();
      for (int nb : dev_.neighbours(end)) {
        const int i = on_path_[nb] ? index_[nb] : -1;
        if (i >= 0 && i + 1 < static_cast<int>(path_.size()) - 1) cand.push_back(i);
      }
      work_ += dev_.degree(end);
      if (cand.empty()) break;
      // Prefer rotations whose new end has free neighbours.
      int pick = cand[std::uniform_int_distribution<std::size_t>(0, cand.size() - 1)(rng_)];
      for (int i : cand)
        if (free_degree(path_[i + 1]) > 0) {
          pick = i;
          break;
        }
      std::reverse(path_.begin() + pick + 1, path_.end());
      reindex(pick + 1);
      reversed_once = false;
    }
    record();
  }

  // Qubits in components large enough to hold the chain (what the complete search would cover).
  int searchable_qubits() const {
    const auto [comp, count] = dev_.components();
    std::vector<int> size(static_cast<std::size_t>(count), 0);
    for (int q = 0; q < dev_.qubit_count(); ++q) size[static_cast<std::size_t>(comp[q])] += dev_.usable(q);
    int total = 0;
    for (int c = 0; c < count; ++c)
      if (size[static_cast<std::size_t>(c)] >= n_) total += size[static_cast<std::size_t>(c)];
    return total;
  }

  // Work of the short complete search run before the stretch.
  static constexpr long long kQuickComplete = 2'000'000;
  // Starts of the guided pass (each costs a bound per step and candidate).
  static constexpr std::size_t kGuidedStarts = 3;

  const Device& dev_;
  std::optional<PathBound> bound_;  // set for the guided pass
  std::vector<char> free_;          // scratch for the bound: 1 where a qubit is off the path
  int n_;
  ChainSearchOptions opt_;
  std::mt19937_64 rng_;
  std::uniform_real_distribution<double> tie_{0.0, 1.0};
  std::vector<bool> on_path_;
  std::vector<int> index_;
  std::vector<int> path_, best_;
  long long work_ = 0;
  long long limit_ = opt_.work_budget;  // work allowed before giving up (see the guided pass)
  BudgetPoll poll_{opt_.budget};
};

}  // namespace

ChainSearchResult find_chain(const Device& device, int n, const ChainSearchOptions& options) {
  return Searcher(device, n, options).run();
}

}  // namespace qftplan
