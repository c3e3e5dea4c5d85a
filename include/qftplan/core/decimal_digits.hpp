#pragma once
/// \file decimal_digits.hpp
/// Fast decimal text of non-negative integers, for the writers' hot paths (qubit ids, exponents).

#include <cstdint>
#include <cstring>

namespace qftplan {

/// Writes `v` in decimal at `out` (room for 10 characters) and returns the end. Two digits at a
/// time from a table: the writer formats one or two of these per gate, billions in a big circuit.
inline char* write_decimal(char* out, std::uint32_t v) {
  static constexpr char kPairs[] =
      "00010203040506070809101112131415161718192021222324252627282930313233343536373839"
      "40414243444546474849505152535455565758596061626364656667686970717273747576777879"
      "8081828384858687888990919293949596979899";
  // Count the digits, then fill them in from the end (fixed-size copies only: no library call).
  int digits = 1;
  for (std::uint32_t t = v; t >= 10; t /= 10) ++digits;
  char* p = out + digits;
  while (v >= 100) {
    p -= 2;
    std::memcpy(p, kPairs + 2 * (v % 100), 2);
    v /= 100;
  }
  if (v >= 10) {
    p -= 2;
    std::memcpy(p, kPairs + 2 * v, 2);
  } else {
    *--p = static_cast<char>('0' + v);
  }
  return out + digits;
}

}  // namespace qftplan
