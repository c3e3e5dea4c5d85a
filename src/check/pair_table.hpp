#pragma once
// Private to the checker: the table of the phase polynomial's degree-2 terms. The streamed proof
// of a long file keeps millions of them alive at once (about 11 million at the peak of the
// 8192-qubit chain plan), and a node-based map spends a heap block, a bucket pointer and a
// rehash walk on each: here the terms sit in one flat array of 24-byte slots.
//
// Open addressing with linear probing and deletion by backward shift (no tombstones): Knuth,
// The Art of Computer Programming vol. 3, 2nd ed., 1998, section 6.4, Algorithm L (insertion and
// search) and Algorithm R (deletion). The slot index is the top bits of a Fibonacci
// (multiplicative) hash, also from section 6.4 (multiplicative hashing with the golden ratio),
// applied after a xor-shift so that the low-order half of the key (the second variable) mixes in.

#include <bit>
#include <cstddef>
#include <cstdint>
#include <utility>
#include <vector>

#include "qftplan/core/angle.hpp"

namespace qftplan::proof {

/// A degree-2 term: its angle (kept as Angle's two fields, so that a slot is 24 bytes) and the
/// last gate that changed it.
struct Term {
  std::int64_t num = 0;
  std::uint32_t log2_den = 0;
  int line = 0;
  Angle angle() const { return Angle(num, log2_den); }
  void set(const Angle& a, int l) {
    num = a.num();
    log2_den = a.log2_den();
    line = l;
  }
};

/// Map from pair_key (never kEmpty) to Term. Pointers returned stay valid until the next
/// insertion or erase.
class PairTable {
 public:
  static constexpr std::uint64_t kEmpty = ~std::uint64_t{0};

  PairTable() { rehash(16); }

  std::size_t size() const { return size_; }

  void reserve(std::size_t n) {
    std::size_t cap = slots_.size();
    while (n > max_load(cap)) cap *= 2;
    if (cap != slots_.size()) rehash(cap);
  }

  Term* find(std::uint64_t key) {
    for (std::size_t i = home(key);; i = (i + 1) & mask_) {
      if (slots_[i].key == key) return &slots_[i].term;
      if (slots_[i].key == kEmpty) return nullptr;
    }
  }

  /// The term of `key`, inserted with a zero angle when absent (second: true when inserted).
  std::pair<Term*, bool> try_emplace(std::uint64_t key) {
    if (size_ + 1 > max_load(slots_.size())) rehash(slots_.size() * 2);
    std::size_t i = home(key);
    for (; slots_[i].key != kEmpty; i = (i + 1) & mask_)
      if (slots_[i].key == key) return {&slots_[i].term, false};
    slots_[i].key = key;
    slots_[i].term = Term{};
    ++size_;
    return {&slots_[i].term, true};
  }

  /// Removes the term `t` points to (from find or try_emplace).
  void erase(Term* t) {
    std::size_t i = static_cast<std::size_t>(reinterpret_cast<Slot*>(reinterpret_cast<char*>(t) - offsetof(Slot, term)) -
                                              slots_.data());
    // Algorithm R: move back each later entry of the run whose home is not cyclically in (i, j].
    for (std::size_t j = (i + 1) & mask_; slots_[j].key != kEmpty; j = (j + 1) & mask_) {
      const std::size_t h = home(slots_[j].key);
      const bool stays = i <= j ? (i < h && h <= j) : (i < h || h <= j);
      if (stays) continue;
      slots_[i] = slots_[j];
      i = j;
    }
    slots_[i].key = kEmpty;
    --size_;
  }

  /// Calls f(key, term) for every term, in no particular order.
  template <class F>
  void for_each(F&& f) const {
    for (const Slot& s : slots_)
      if (s.key != kEmpty) f(s.key, s.term);
  }

 private:
  struct Slot {
    std::uint64_t key;
    Term term;
  };
  static_assert(sizeof(Slot) == 24);

  static std::size_t max_load(std::size_t cap) { return cap / 5 * 4; }  // 80 %

  std::size_t home(std::uint64_t key) const {
    key ^= key >> 29;
    return static_cast<std::size_t>((key * 0x9E3779B97F4A7C15ull) >> shift_);
  }

  void rehash(std::size_t cap) {
    std::vector<Slot> old(cap, Slot{kEmpty, Term{}});
    old.swap(slots_);
    mask_ = cap - 1;
    shift_ = 64 - std::countr_zero(cap);
    for (const Slot& s : old)
      if (s.key != kEmpty) {
        std::size_t i = home(s.key);
        while (slots_[i].key != kEmpty) i = (i + 1) & mask_;
        slots_[i] = s;
      }
  }

  std::vector<Slot> slots_;
  std::size_t mask_ = 0;
  int shift_ = 64;
  std::size_t size_ = 0;
};

}  // namespace qftplan::proof
