#pragma once
// The complete search for a simple path of n qubits (private to src/planners; find_chain runs it
// after its greedy phase).

#include <algorithm>
#include <cstdint>
#include <vector>

#include "qftplan/core/run_budget.hpp"
#include "qftplan/device/device.hpp"

namespace qftplan {

/// SplitMix64 (Steele, Lea, Flood, "Fast splittable pseudorandom number generators", OOPSLA 2014): the
/// table's fixed keys, so the search stays deterministic.
inline std::uint64_t splitmix64(std::uint64_t x) {
  x += 0x9E3779B97F4A7C15ULL;
  x = (x ^ (x >> 30)) * 0xBF58476D1CE4E5B9ULL;
  x = (x ^ (x >> 27)) * 0x94D049BB133111EBULL;
  return x ^ (x >> 31);
}

/// A transposition table of searched states (the complete search's; in this header for its tests).
/// How far a path can still go depends only on its end and on the free qubits reachable from that
/// end, not on the order in which the path covered the rest, so two prefixes that leave the same
/// (end, reachable set) share one subtree: once it is searched to the end without reaching the goal,
/// the second prefix is cut at once. A state is keyed by two 64-bit Zobrist hashes of the reachable
/// set (Zobrist, "A new hashing method with application for game playing", 1970), one of them folded
/// with the end; a false match (which could cut a branch that holds a chain) has a chance of about
/// 2^-128 per lookup. The table has a fixed size; a new state overwrites the slot it hashes to.
class FailureTable {
 public:
  explicit FailureTable(int qubits) {
    keys_a_.resize(static_cast<std::size_t>(qubits));
    keys_b_.resize(static_cast<std::size_t>(qubits));
    for (int q = 0; q < qubits; ++q) {
      keys_a_[static_cast<std::size_t>(q)] = splitmix64(3 * static_cast<std::uint64_t>(q));
      keys_b_[static_cast<std::size_t>(q)] = splitmix64(3 * static_cast<std::uint64_t>(q) + 1);
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
    k.b ^= splitmix64(3 * static_cast<std::uint64_t>(reached[0]) + 2);
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

/// Outcome of the complete search.
struct CompleteSearchResult {
  std::vector<int> chain;     ///< n qubits when found
  std::vector<int> longest;   ///< the longest path seen
  bool proved_none = false;   ///< every start was searched to the end: no chain of n qubits exists
  long long work = 0;         ///< neighbour inspections spent
};

/// Depth-first search from every start qubit, extending one end in order of fewest free neighbours
/// (Warnsdorff's rule) and cutting a branch when PathBound shows that the qubits still reachable from
/// the path's end cannot make up n: half the budget one start after another, the rest in rounds of
/// restarts with growing caps (complete_chain_search.cpp). Stops after `work_budget` inspections or
/// when `poll` says so; `proved_none` only when every start was searched to its end. Deterministic.
CompleteSearchResult complete_chain_search(const Device& device, int n, long long work_budget, BudgetPoll& poll);

}  // namespace qftplan
