#include "complete_chain_search.hpp"

#include <algorithm>
#include <cstdint>

#include "path_bound.hpp"

namespace qftplan {

namespace {

// SplitMix64 (Steele, Lea, Flood, "Fast splittable pseudorandom number generators", OOPSLA 2014): fixed
// keys, so the search stays deterministic.
std::uint64_t mix(std::uint64_t x) {
  x += 0x9E3779B97F4A7C15ULL;
  x = (x ^ (x >> 30)) * 0xBF58476D1CE4E5B9ULL;
  x = (x ^ (x >> 27)) * 0x94D049BB133111EBULL;
  return x ^ (x >> 31);
}

// A transposition table of searched states. How far a path can still go depends only on its end and
// on the free qubits reachable from that end, not on the order in which the path covered the rest, so
// two prefixes that leave the same (end, reachable set) share one subtree: once it is searched to the
// end without reaching the goal, the second prefix is cut at once. A state is keyed by two 64-bit
// Zobrist hashes of the reachable set (Zobrist, "A new hashing method with application for game
// playing", 1970), one of them folded with the end; 128 bits make a false match (which could cut a
// branch that holds a chain) negligible next to the proof's other assumptions (about 2^-88 at a
// million states). The table has a fixed size; a new state overwrites the slot it hashes to.
class FailureTable {
 public:
  explicit FailureTable(int qubits) {
    keys_a_.resize(static_cast<std::size_t>(qubits));
    keys_b_.resize(static_cast<std::size_t>(qubits));
    for (int q = 0; q < qubits; ++q) {
      keys_a_[static_cast<std::size_t>(q)] = mix(3 * static_cast<std::uint64_t>(q));
      keys_b_[static_cast<std::size_t>(q)] = mix(3 * static_cast<std::uint64_t>(q) + 1);
    }
  }
  struct Key {
    std::uint64_t a = 0, b = 0;
  };
  /// The state of a path ending at `reached[0]` whose end can still reach the rest of `reached`.
  Key key(const std::vector<int>& reached) const {
    Key k;
    for (std::size_t i = 1; i < reached.size(); ++i) {
      k.a ^= keys_a_[static_cast<std::size_t>(reached[i])];
      k.b ^= keys_b_[static_cast<std::size_t>(reached[i])];
    }
    k.b ^= mix(3 * static_cast<std::uint64_t>(reached[0]) + 2);
    return k;
  }
  /// True when this state was searched without finding `need` more qubits or a number below it.
  bool failed(const Key& k, int need) const {
    if (slots_.empty()) return false;
    const Slot& s = slots_[k.a & kMask];
    return s.need > 0 && s.a == k.a && s.b == k.b && need >= s.need;
  }
  /// Records that `need` more qubits cannot be found from this state.
  void record(const Key& k, int need) {
    if (slots_.empty()) slots_.resize(kMask + 1);
    Slot& s = slots_[k.a & kMask];
    if (s.need > 0 && s.a == k.a && s.b == k.b) {
      s.need = std::min(s.need, need);
    } else {
      s = Slot{k.a, k.b, need};
    }
  }

 private:
  struct Slot {
    std::uint64_t a = 0, b = 0;
    int need = 0;  // 0: empty
  };
  static constexpr std::size_t kMask = (std::size_t{1} << 20) - 1;  // 24 MiB once the search needs it
  std::vector<std::uint64_t> keys_a_, keys_b_;
  std::vector<Slot> slots_;
};

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
    bool stopped = false;
    for (int s : starts) {
      push(s);
      const bool found = extend();
      if (found) {
        r.chain = path_;
        break;
      }
      pop();
      if (out_of_budget()) {
        stopped = true;
        break;
      }
    }
    r.longest = longest_;
    r.work = work_;
    r.proved_none = r.chain.empty() && !stopped && !out_of_budget();
    return r;
  }

 private:
  bool out_of_budget() { return work_ > budget_ || poll_.stop(); }

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
    // The end is on the path already: the bound counts it once.
    if (static_cast<int>(path_.size()) - 1 + bound_.from(end, free_, work_) < n_) return false;
    const int need = n_ - static_cast<int>(path_.size());
    const auto state = seen_.key(bound_.reached());
    if (seen_.failed(state, need)) return false;
    std::vector<std::pair<int, int>> next;  // (free degree, qubit)
    for (int w : dev_.neighbours(end))
      if (free_[static_cast<std::size_t>(w)]) next.emplace_back(free_degree(w), w);
    std::sort(next.begin(), next.end());
    for (const auto& [deg, w] : next) {
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
};

}  // namespace

CompleteSearchResult complete_chain_search(const Device& device, int n, long long work_budget, BudgetPoll& poll) {
  return CompleteSearch(device, n, work_budget, poll).run();
}

}  // namespace qftplan
