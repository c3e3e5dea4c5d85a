// Exact angle arithmetic for the structural proof, with overflow detection, and the readable
// angle text of the checker's messages.
//
// The one-bit phases of the output variables need WideAngle: in the parity network they gather
// pi/2 and pi/2^300 alike and cancel only at the end, so no partial sum fits one 64-bit numerator.

#include "exact_angles.hpp"

#include <algorithm>
#include <bit>
#include <cstdint>

#include "qftplan/check/qft_checker.hpp"

namespace qftplan {

std::string angle_text(const Angle& a) {
  if (a.log2_den() <= 20) return a.qasm2();
  return a.qasm3();
}

namespace proof {

namespace {

__extension__ typedef __int128 i128;  // GCC/Clang 128-bit integer, for overflow-free products

std::optional<Angle> reduce128(i128 num, std::uint32_t k) {
  if (num == 0) return Angle{};
  while (k > 0 && (num & 1) == 0) {
    num /= 2;
    --k;
  }
  if (k < 62) {
    const i128 turn = static_cast<i128>(1) << (k + 1);
    num %= turn;  // keeps the sign; Angle reduces into (-pi, pi]
    return Angle(static_cast<std::int64_t>(num), k);
  }
  if (num > INT64_MAX || num < -INT64_MAX) return std::nullopt;
  return Angle(static_cast<std::int64_t>(num), k);
}

}  // namespace

std::optional<Angle> add_angles(const Angle& a, const Angle& b) {
  if (a.is_zero()) return b;
  if (b.is_zero()) return a;
  const std::uint32_t k = std::max(a.log2_den(), b.log2_den());
  const std::uint32_t sa = k - a.log2_den(), sb = k - b.log2_den();
  if (sa > 62 || sb > 62) return std::nullopt;
  const i128 x = static_cast<i128>(a.num()) * (static_cast<i128>(1) << sa);
  const i128 y = static_cast<i128>(b.num()) * (static_cast<i128>(1) << sb);
  return reduce128(x + y, k);
}

std::optional<Angle> scale_angle(const Angle& a, std::int64_t c) {
  if (c == 0 || a.is_zero()) return Angle{};
  std::uint32_t k = a.log2_den();
  // Powers of two in c shrink the denominator; 2 pi multiples vanish.
  while (c % 2 == 0) {
    if (k == 0) return Angle{};
    c /= 2;
    --k;
  }
  return reduce128(static_cast<i128>(a.num()) * c, k);
}

// ---------------------------------------------------------------------------------------------
// WideAngle

void WideAngle::add(const Angle& a) {
  // While the sum fits one exact Angle it stays one (the common case, no allocation).
  if (!wide_) {
    if (const auto s = add_angles(small_, a)) {
      small_ = *s;
      return;
    }
    wide_ = true;
    add_wide(small_);
  }
  add_wide(a);
}

bool WideAngle::is_zero() const {
  if (!wide_) return small_.is_zero();
  return std::all_of(w_.begin(), w_.end(), [](std::uint64_t x) { return x == 0; });
}

std::optional<Angle> WideAngle::narrow() const {
  if (!wide_) return small_;
  return narrow_wide();
}

void WideAngle::add_wide(const Angle& a) {
  if (a.is_zero()) return;
  // a = num / 2^(k+1) turns: make room for k+1 bits, then add num * 2^(K-k-1) mod 2^K.
  const std::uint64_t bits = std::uint64_t{a.log2_den()} + 1;
  const std::size_t need = static_cast<std::size_t>((bits + 63) / 64);
  if (need > w_.size()) w_.insert(w_.begin(), need - w_.size(), 0);
  const std::uint64_t p = 64 * static_cast<std::uint64_t>(w_.size()) - bits;
  const bool negative = a.num() < 0;
  const std::uint64_t mag = negative ? 0 - static_cast<std::uint64_t>(a.num()) : static_cast<std::uint64_t>(a.num());
  const std::size_t i = static_cast<std::size_t>(p / 64);
  const unsigned s = static_cast<unsigned>(p % 64);
  const std::uint64_t lo = mag << s, hi = s ? mag >> (64 - s) : 0;
  if (!negative) {
    std::uint64_t carry = 0;
    for (std::size_t j = i; j < w_.size() && (j <= i + 1 || carry); ++j) {
      const std::uint64_t add = (j == i ? lo : j == i + 1 ? hi : 0);
      const std::uint64_t sum = w_[j] + add;
      const std::uint64_t out = sum + carry;
      carry = (sum < add || out < sum) ? 1 : 0;
      w_[j] = out;
    }
  } else {
    std::uint64_t borrow = 0;
    for (std::size_t j = i; j < w_.size() && (j <= i + 1 || borrow); ++j) {
      const std::uint64_t sub = (j == i ? lo : j == i + 1 ? hi : 0);
      const std::uint64_t before = w_[j];
      w_[j] = before - sub - borrow;
      borrow = (before < sub || (before == sub && borrow)) ? 1 : 0;
    }
  }
}

std::optional<Angle> WideAngle::narrow_wide() const {
  if (is_zero()) return Angle{};
  for (int sign : {1, -1}) {
    std::vector<std::uint64_t> v = w_;
    if (sign < 0) {  // two's complement: 2^K - N
      bool carry = true;
      for (auto& x : v) {
        x = ~x + (carry ? 1 : 0);
        carry = carry && x == 0;
      }
    }
    // Drop trailing zero bits, then the value must sit in the low 63 bits.
    std::size_t first = 0;
    while (v[first] == 0) ++first;  // v is not zero
    const std::size_t low = 64 * first + static_cast<std::size_t>(std::countr_zero(v[first]));
    const std::size_t total = 64 * v.size();
    std::uint64_t num = 0;
    bool fits = true;
    for (std::size_t b = low; b < total; ++b)
      if ((v[b / 64] >> (b % 64)) & 1) {
        if (b - low >= 63) {
          fits = false;
          break;
        }
        num |= std::uint64_t{1} << (b - low);
      }
    if (!fits) continue;
    // N / 2^K turns = N pi / 2^(K-1); after dropping `low` bits the exponent is K-1-low.
    const auto k = static_cast<std::int64_t>(total) - 1 - static_cast<std::int64_t>(low);
    if (k < 0 || k > static_cast<std::int64_t>(UINT32_MAX)) continue;
    return Angle(sign * static_cast<std::int64_t>(num), static_cast<std::uint32_t>(k));
  }
  return std::nullopt;
}

}  // namespace proof

}  // namespace qftplan
