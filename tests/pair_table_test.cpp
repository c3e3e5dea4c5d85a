// The structural proof's table of degree-2 terms (src/check/pair_table.hpp, open addressing with
// deletion by backward shift) against std::map, the C++ standard library's ordered map, under long
// random sequences of the proof's own operations: add an angle to a term (inserting it), erase a
// term whose angle returns to zero or that a Hadamard clears, look terms up, list them all.

#include <gtest/gtest.h>

#include <cstdint>
#include <map>
#include <random>
#include <utility>

#include "../src/check/pair_table.hpp"

namespace qftplan {
namespace {

using proof::PairTable;
using proof::Term;

std::uint64_t key_of(int a, int b) {
  if (a > b) std::swap(a, b);
  return (static_cast<std::uint64_t>(a) << 32) | static_cast<std::uint32_t>(b);
}

// Every term of the table is in the map with the same fields, and the sizes agree.
void expect_same(const PairTable& table, const std::map<std::uint64_t, Term>& ref) {
  ASSERT_EQ(table.size(), ref.size());
  std::size_t seen = 0;
  table.for_each([&](std::uint64_t key, const Term& t) {
    ++seen;
    const auto it = ref.find(key);
    ASSERT_NE(it, ref.end()) << "key " << key;
    EXPECT_EQ(t.num, it->second.num);
    EXPECT_EQ(t.log2_den, it->second.log2_den);
    EXPECT_EQ(t.line, it->second.line);
  });
  EXPECT_EQ(seen, ref.size());
}

// Few variables, so that keys recur, collide in their home slots and the table grows and empties
// again many times (the deletions then shift entries back across the end of the array too).
TEST(PairTable, AgreesWithStdMapUnderRandomAddsAndErases) {
  for (const int vars : {6, 40, 700}) {
    std::mt19937_64 rng(0x5eed + vars);
    PairTable table;
    std::map<std::uint64_t, Term> ref;
    for (int step = 0; step < 200000; ++step) {
      const int a = static_cast<int>(rng() % vars), b = static_cast<int>(rng() % vars);
      if (a == b) continue;
      const std::uint64_t key = key_of(a, b);
      const int op = static_cast<int>(rng() % 8);
      if (op < 5) {  // add: insert, or change the term
        auto [t, fresh] = table.try_emplace(key);
        const bool absent = ref.find(key) == ref.end();
        ASSERT_EQ(fresh, absent) << "step " << step;
        const Angle add(static_cast<std::int64_t>(rng() % 7) + 1, static_cast<std::uint32_t>(rng() % 5));
        const Angle now = fresh ? add : t->angle() + add;
        t->set(now, step);
        ref[key].set(now, step);
      } else if (op < 7) {  // erase when present
        Term* t = table.find(key);
        const auto it = ref.find(key);
        ASSERT_EQ(t == nullptr, it == ref.end()) << "step " << step;
        if (t) {
          table.erase(t);
          ref.erase(it);
        }
      } else {  // clear a variable's terms, as a Hadamard does
        for (int u = 0; u < vars; ++u) {
          if (u == a) continue;
          if (Term* t = table.find(key_of(a, u))) table.erase(t);
          ref.erase(key_of(a, u));
        }
      }
      if (step % 997 == 0) expect_same(table, ref);
    }
    expect_same(table, ref);
    for (const auto& [key, t] : ref) {
      const Term* got = table.find(key);
      ASSERT_NE(got, nullptr);
      EXPECT_EQ(got->line, t.line);
    }
  }
}

// The angle survives the round trip through the slot's two fields.
TEST(PairTable, KeepsAnglesExactly) {
  PairTable table;
  const Angle a(-3, 61);  // -3 pi / 2^61
  table.try_emplace(key_of(1, 2)).first->set(a, 7);
  const Term* t = table.find(key_of(2, 1));
  ASSERT_NE(t, nullptr);
  EXPECT_TRUE(t->angle() == a);
  EXPECT_EQ(t->line, 7);
  EXPECT_EQ(table.find(key_of(1, 3)), nullptr);
}

}  // namespace
}  // namespace qftplan
