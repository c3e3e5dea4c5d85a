// Lengthening a path by re-routing its stretches: a large-neighbourhood search in the sense of Shaw,
// "Using constraint programming and local search methods to solve vehicle routing problems", CP 1998
// (destroy a part of the solution, rebuild it exactly); the neighbourhood here (a stretch of the path
// and every qubit off it) and the caps are ours.

#include "path_stretch.hpp"

#include <algorithm>

namespace qftplan {

namespace {

class Stretcher {
 public:
  Stretcher(const Device& d, std::vector<int>& path, long long budget, BudgetPoll& poll)
      : dev_(d), path_(path), budget_(budget), poll_(poll), free_(static_cast<std::size_t>(d.qubit_count()), 0) {
    for (int q = 0; q < d.qubit_count(); ++q) free_[static_cast<std::size_t>(q)] = d.usable(q);
    for (int q : path_) free_[static_cast<std::size_t>(q)] = 0;
  }

  // Sweeps both orientations until a sweep gains nothing.
  bool run(int target) {
    bool grew = false;
    bool gained = true;
    while (gained && static_cast<int>(path_.size()) < target && !spent()) {
      gained = false;
      for (int side = 0; side < 2 && static_cast<int>(path_.size()) < target && !spent(); ++side) {
        gained |= sweep(target);
        std::reverse(path_.begin(), path_.end());
      }
      grew |= gained;
    }
    return grew;
  }

  long long work() const { return work_; }

 private:
  static constexpr long long kWindowCap = 50000;  // inspections per window's search

  bool spent() { return work_ > budget_ || poll_.stop(); }

  // One pass over the path's windows; true when some window gained.
  bool sweep(int target) {
    bool gained = false;
    for (std::size_t i = 0; i + 1 < path_.size() && static_cast<int>(path_.size()) < target && !spent(); ++i) {
      for (const std::size_t w : {std::size_t{4}, std::size_t{8}, std::size_t{16}, std::size_t{32}, std::size_t{64}}) {
        const bool open_end = i + w >= path_.size();
        const std::size_t j = open_end ? path_.size() - 1 : i + w;
        if (window(i, j, open_end)) {
          gained = true;
          break;
        }
        if (open_end) break;
      }
    }
    return gained;
  }

  // Searches for a longer route from path[i] to path[j] (to anywhere when open_end) through the
  // stretch's inner qubits and the free qubits; splices in the longest found. True when it gained.
  bool window(std::size_t i, std::size_t j, bool open_end) {
    // The stretch's qubits after path[i] are free for the search (path[j] too at an open end).
    const std::size_t last_inner = open_end ? j : j - 1;
    for (std::size_t k = i + 1; k <= last_inner; ++k) free_[static_cast<std::size_t>(path_[k])] = 1;
    goal_ = open_end ? -1 : path_[j];
    have_ = static_cast<int>(last_inner - i);  // qubits after path[i] the stretch holds now (goal excluded)
    best_.clear();
    route_.assign(1, path_[i]);
    cap_ = work_ + kWindowCap;
    dfs();
    for (std::size_t k = i + 1; k <= last_inner; ++k) free_[static_cast<std::size_t>(path_[k])] = 0;
    if (best_.empty()) return false;
    // Splice: path[0..i] + best_[1..] + path[j..] (open end: nothing after).
    std::vector<int> next(path_.begin(), path_.begin() + static_cast<std::ptrdiff_t>(i) + 1);
    next.insert(next.end(), best_.begin() + 1, best_.end());
    if (!open_end) next.insert(next.end(), path_.begin() + static_cast<std::ptrdiff_t>(j), path_.end());
    for (int q : path_) free_[static_cast<std::size_t>(q)] = dev_.usable(q);
    for (int q : next) free_[static_cast<std::size_t>(q)] = 0;
    path_ = std::move(next);
    return true;
  }

  int free_degree(int q) {
    int f = 0;
    for (int w : dev_.neighbours(q)) f += free_[static_cast<std::size_t>(w)];
    work_ += dev_.degree(q);
    return f;
  }

  // Extends route_ (starting at path[i]); records a route longer than the stretch's that can close
  // at the goal (or, at an open end, any longer route).
  void dfs() {
    if (work_ > cap_ || spent()) return;
    const int end = route_.back();
    const int inner = static_cast<int>(route_.size()) - 1;
    // (inner > have_ >= 0: the route has left path[i], so its end is not path[i] itself.)
    if (inner > have_ && inner > static_cast<int>(best_.size()) - 1 && (goal_ < 0 || dev_.coupled(end, goal_)))
      best_ = route_;
    std::vector<std::pair<int, int>> next;
    for (int w : dev_.neighbours(end))
      if (free_[static_cast<std::size_t>(w)]) next.emplace_back(free_degree(w), w);
    std::sort(next.begin(), next.end());
    for (const auto& [deg, w] : next) {
      free_[static_cast<std::size_t>(w)] = 0;
      route_.push_back(w);
      dfs();
      route_.pop_back();
      free_[static_cast<std::size_t>(w)] = 1;
      if (work_ > cap_ || spent()) return;
    }
  }

  const Device& dev_;
  std::vector<int>& path_;
  long long budget_;
  BudgetPoll& poll_;
  std::vector<char> free_;
  std::vector<int> route_, best_;
  int goal_ = -1, have_ = 0;
  long long cap_ = 0, work_ = 0;
};

}  // namespace

bool stretch_path(const Device& device, std::vector<int>& path, int target, long long work_budget, long long& work,
                  BudgetPoll& poll) {
  if (path.size() < 2) return false;
  Stretcher s(device, path, work_budget, poll);
  const bool grew = s.run(target);
  work += s.work();
  return grew;
}

}  // namespace qftplan
