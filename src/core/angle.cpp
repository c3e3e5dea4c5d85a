#include "qftplan/core/angle.hpp"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <mutex>
#include <numbers>
#include <stdexcept>
#include <string_view>
#include <unordered_map>
#include <vector>

#include "qftplan/core/decimal_digits.hpp"

namespace qftplan {

Angle::Angle(std::int64_t num, std::uint32_t log2_den) : num_(num), log2_den_(log2_den) {
  if (num_ == 0) {
    log2_den_ = 0;
    return;
  }
  while (log2_den_ > 0 && (num_ % 2) == 0) {
    num_ /= 2;
    --log2_den_;
  }
  // Reduce into (-pi, pi]: a full turn is 2^(k+1) in units of pi/2^k. Only possible (and only
  // needed) while 2^(k+1) fits; larger denominators come with small numerators.
  if (log2_den_ < 62) {
    const std::int64_t turn = std::int64_t{1} << (log2_den_ + 1);
    const std::int64_t half_turn = turn / 2;
    if (num_ <= -half_turn || num_ > half_turn) {  // the division only when needed (hot path)
      num_ %= turn;
      if (num_ <= -half_turn) num_ += turn;
      if (num_ > half_turn) num_ -= turn;
    }
    if (num_ == 0) log2_den_ = 0;
  }
}

double Angle::radians() const {
  return std::ldexp(static_cast<double>(num_) * std::numbers::pi, -static_cast<int>(log2_den_));
}

Angle Angle::operator+(const Angle& o) const {
  if (num_ == 0) return o;
  if (o.num_ == 0) return *this;
  const std::uint32_t k = std::max(log2_den_, o.log2_den_);
  const std::uint32_t sa = k - log2_den_, sb = k - o.log2_den_;
  std::int64_t a = 0, b = 0, sum = 0;
  if (sa > 62 || sb > 62 || __builtin_mul_overflow(num_, std::int64_t{1} << sa, &a) ||
      __builtin_mul_overflow(o.num_, std::int64_t{1} << sb, &b) || __builtin_add_overflow(a, b, &sum))
    throw std::overflow_error("angle sum does not fit: denominators too far apart");
  return Angle(sum, k);
}

namespace {

void append_int(std::string& out, std::int64_t v) {
  char buf[24];
  auto [p, ec] = std::to_chars(buf, buf + sizeof buf, v);
  out.append(buf, p);
}

// num*pi written as "pi", "-pi", "3*pi".
void append_numerator(std::string& out, std::int64_t num) {
  if (num == -1) {
    out += "-pi";
  } else if (num == 1) {
    out += "pi";
  } else {
    append_int(out, num);
    out += "*pi";
  }
}

}  // namespace

char* Angle::write_qasm3(char* out) const {
  // Longest: "-9223372036854775807*pi/2**4294967295" (37 characters).
  auto put = [&out](std::string_view s) { out = std::copy(s.begin(), s.end(), out); };
  if (num_ == 0) {
    *out++ = '0';
    return out;
  }
  if (num_ == -1) put("-pi");
  else if (num_ == 1) put("pi");
  else {
    out = std::to_chars(out, out + 24, num_).ptr;
    put("*pi");
  }
  if (log2_den_ == 0) return out;
  if (log2_den_ == 1) {
    put("/2");
    return out;
  }
  put("/2**");
  return write_decimal(out, log2_den_);
}

void Angle::append_qasm2(std::string& out) const {
  if (num_ == 0) {
    out += '0';
    return;
  }
  append_numerator(out, num_);
  if (log2_den_ == 0) return;
  out += '/';
  out += pow2_decimal(log2_den_);
}

std::string Angle::qasm3() const {
  char buf[kMaxQasm3Chars];
  return std::string(buf, write_qasm3(buf));
}

std::string Angle::qasm2() const {
  std::string s;
  append_qasm2(s);
  return s;
}

const std::string& pow2_decimal(std::uint32_t k) {
  static std::mutex mu;
  static std::unordered_map<std::uint32_t, std::string> cache;
  std::lock_guard lock(mu);
  auto it = cache.find(k);
  if (it != cache.end()) return it->second;
  // Little-endian base-10^9 limbs, doubled k times.
  std::vector<std::uint32_t> limbs{1};
  for (std::uint32_t i = 0; i < k; ++i) {
    std::uint32_t carry = 0;
    for (auto& l : limbs) {
      const std::uint64_t v = std::uint64_t{l} * 2 + carry;
      l = static_cast<std::uint32_t>(v % 1000000000u);
      carry = static_cast<std::uint32_t>(v / 1000000000u);
    }
    if (carry) limbs.push_back(carry);
  }
  std::string s = std::to_string(limbs.back());
  for (auto i = limbs.size() - 1; i-- > 0;) {
    const std::string part = std::to_string(limbs[i]);
    s += std::string(9 - part.size(), '0') + part;
  }
  return cache.emplace(k, std::move(s)).first->second;
}

}  // namespace qftplan
