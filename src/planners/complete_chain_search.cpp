#include "complete_chain_search.hpp"

#include <algorithm>
#include <cstdint>
#include <tuple>

#include "path_bound.hpp"

namespace qftplan {

namespace {

class CompleteSearch {
 public:
  CompleteSearch(const Device& device, int n, long long work_budget, BudgetPoll& poll)
      : dev_(device), n_(n), budget_(work_budget), poll_(poll), bound_(device, two_colouring(device)),
        seen_(device.qubit_count()), free_(static_cast<std::size_t>(device.qubit_count()), 1) {}

  CompleteSearchResult run() {
    CompleteSearchResult r;
    const int N = dev_.qubit_count();
    // Components too small to hold the chain are never entered.
    const auto [comp, count] = dev_.components();
    std::vector<int> size(static_cast<std::size_t>(count), 0);
    for (int q = 0; q < N; ++q) size[static_cast<std::size_t>(comp[q])] += dev_.usable(q);
    std::vector<int> starts;
    for (int q = 0; q < N; ++q)
      if (dev_.usable(q) && size[static_cast<std::size_t>(comp[q])] >= n_) starts.push_back(q);
    // Chains tend to end on qubits of few couplers: try those first (finds chains sooner; the
    // order does not matter for the proof).
    std::stable_sort(starts.begin(), starts.end(), [&](int a, int b) { return dev_.degree(a) < dev_.degree(b); });
    // Two halves. First, one deep search per start in turn (the one-by-one order finds most chains
    // at once and settles most proofs). Then rounds of restarts with growing caps: the time a
    // depth-first search takes to find a path is heavy-tailed in its first choices, so one start
    // searched to the end can spend the whole budget while another would find the chain at once
    // (Gomes, Selman, Kautz, "Boosting combinatorial search through randomization", AAAI 1998).
    // Round r gives each start not yet searched to the end kFirstCap * 4^r work and breaks ties
    // between equal Warnsdorff counts by a hash salted with r, so each round walks differently. A
    // start whose search ends within its cap is done for good; the failure table keeps what every
    // round proved, so a later round does not search a failed state again. The proof ("none")
    // needs every start done.
    std::vector<char> done(starts.size(), 0);
    std::size_t left = starts.size();
    // Searches from start i until the work reaches stop_at (or the budget); true when it found the chain.
    auto search = [&](std::size_t i, long long stop_at) {
      stop_at_ = std::min(budget_, stop_at);
      push(starts[i]);
      if (extend()) return true;
      pop();
      if (work_ <= stop_at_ && !poll_.stopped()) done[i] = 1, --left;
      return false;
    };
    bool found = false;
    const long long half = budget_ / 2;
    for (std::size_t i = 0; i < starts.size() && !found && work_ <= half && !spent(); ++i) found = search(i, half);
    round_ = 1;
    for (long long cap = kFirstCap; !found && left > 0 && !spent(); cap *= 4, ++round_)
      for (std::size_t i = 0; i < starts.size() && !found && !spent(); ++i)
        if (!done[i]) found = search(i, work_ + cap);
    if (found) r.chain = path_;
    r.longest = longest_;
    r.work = work_;
    r.proved_none = !found && left == 0;
    return r;
  }

 private:
  // The work each start gets in the first round of restarts.
  static constexpr long long kFirstCap = 20'000;

  // The whole search's budget, and the current start's cap.
  bool spent() { return work_ > budget_ || poll_.stop(); }
  bool out_of_budget() { return work_ > stop_at_ || poll_.stop(); }

  void push(int q) {
    free_[static_cast<std::size_t>(q)] = 0;
    path_.push_back(q);
    if (path_.size() > longest_.size()) longest_ = path_;
  }
  void pop() {
    free_[static_cast<std::size_t>(path_.back())] = 1;
    path_.pop_back();
  }
  int free_degree(int q) {
    int f = 0;
    for (int w : dev_.neighbours(q)) f += free_[static_cast<std::size_t>(w)];
    work_ += dev_.degree(q);
    return f;
  }

  // Extends the path's end; true once it holds n qubits. On false the path is as it was.
  bool extend() {
    if (static_cast<int>(path_.size()) >= n_) return true;
    if (out_of_budget()) return false;
    const int end = path_.back();
    // A forced step (the end has one free neighbour): taken without the bound and the table, each of
    // which costs O(reach), left to the next qubit with a choice (heavy-hexagon chips: most qubits
    // have two couplers, so most steps are forced). Pruning less never cuts a chain: still complete.
    {
      int only = -1, count = 0;
      for (int w : dev_.neighbours(end))
        if (free_[static_cast<std::size_t>(w)]) only = w, ++count;
      work_ += dev_.degree(end);
      if (count == 0) return false;
      if (count == 1) {
        push(only);
        if (extend()) return true;
        pop();
        return false;
      }
    }
    // The end is on the path already: the bound counts it once.
    if (static_cast<int>(path_.size()) - 1 + bound_.from(end, free_, work_) < n_) return false;
    const int need = n_ - static_cast<int>(path_.size());
    const auto state = seen_.key(bound_.reached());
    if (seen_.failed(state, need)) return false;
    std::vector<std::tuple<int, std::uint64_t, int>> next;  // (free degree, tie-break, qubit)
    for (int w : dev_.neighbours(end))
      if (free_[static_cast<std::size_t>(w)])
        next.emplace_back(free_degree(w), round_ == 0 ? 0 : splitmix64(static_cast<std::uint64_t>(w) * 64 + round_), w);
    std::sort(next.begin(), next.end());
    for (const auto& [deg, tie, w] : next) {
      push(w);
      if (extend()) return true;
      pop();
      if (out_of_budget()) return false;
    }
    seen_.record(state, need);
    return false;
  }

  const Device& dev_;
  int n_;
  long long budget_;
  BudgetPoll& poll_;
  PathBound bound_;
  FailureTable seen_;
  std::vector<char> free_;
  std::vector<int> path_, longest_;
  long long work_ = 0;
  long long stop_at_ = 0;  // work at which the current start's search stops (its cap)
  std::uint64_t round_ = 0;
};

}  // namespace

CompleteSearchResult complete_chain_search(const Device& device, int n, long long work_budget, BudgetPoll& poll) {
  return CompleteSearch(device, n, work_budget, poll).run();
}

}  // namespace qftplan
