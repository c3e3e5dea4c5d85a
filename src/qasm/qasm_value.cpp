// Exact arithmetic on the numbers of OpenQASM angle expressions.

#include "qasm_value.hpp"

#include <algorithm>
#include <bit>
#include <cmath>
#include <numbers>
#include <numeric>
#include <string>

namespace qftplan::qasm_detail {

Value inexact(double x) {
  Value v;
  v.exact = false;
  v.approx = x;
  return v;
}

double to_double(const Value& v) {
  if (!v.exact) return v.approx;
  if (v.n == 0) return 0.0;
  double x = static_cast<double>(v.n) / static_cast<double>(v.d);
  x = std::ldexp(x, static_cast<int>(std::clamp<std::int64_t>(v.e, -100000, 100000)));
  for (int i = 0; i < v.pip; ++i) x *= std::numbers::pi;
  for (int i = 0; i > v.pip; --i) x /= std::numbers::pi;
  return x;
}

Value normalized(Value v) {
  if (!v.exact) return v;
  if (v.n == 0) {
    v.d = 1;
    v.e = 0;
    v.pip = 0;
    return v;
  }
  const int tz = std::countr_zero(static_cast<std::uint64_t>(v.n));
  v.n >>= tz;  // exact: the low bits are zero
  v.e += tz;
  if (v.d != 1) {
    const std::int64_t g = std::gcd(v.n, v.d);
    if (g > 1) {
      v.n /= g;
      v.d /= g;
    }
  }
  if (v.e > kMaxExponent || v.e < -kMaxExponent || v.pip > 8 || v.pip < -8) return inexact(to_double(v));
  return v;
}

Value integer(std::int64_t k) {
  Value v;
  v.n = k;
  return normalized(v);
}

Value negate(Value v) {
  if (v.exact)
    v.n = -v.n;  // n is odd or zero, never INT64_MIN
  else
    v.approx = -v.approx;
  return v;
}

Value mul(const Value& a, const Value& b) {
  if (a.exact && b.exact) {
    if (a.n == 0 || b.n == 0) return Value{};
    // Cross-reduce first so the products stay small.
    const std::int64_t g1 = b.d == 1 ? 1 : std::gcd(a.n, b.d), g2 = a.d == 1 ? 1 : std::gcd(b.n, a.d);
    Value r;
    if (!__builtin_mul_overflow(a.n / g1, b.n / g2, &r.n) && !__builtin_mul_overflow(a.d / g2, b.d / g1, &r.d)) {
      r.e = a.e + b.e;
      r.pip = a.pip + b.pip;
      return normalized(r);
    }
  }
  return inexact(to_double(a) * to_double(b));
}

Value reciprocal(const Value& a) {
  if (!a.exact) return inexact(1.0 / a.approx);
  Value r;
  r.n = a.n < 0 ? -a.d : a.d;
  r.d = a.n < 0 ? -a.n : a.n;
  r.e = -a.e;
  r.pip = -a.pip;
  return r;
}

bool is_zero(const Value& v) { return v.exact ? v.n == 0 : v.approx == 0.0; }

Value add(const Value& a, const Value& b) {
  if (a.exact && a.n == 0) return b;
  if (b.exact && b.n == 0) return a;
  if (a.exact && b.exact && a.pip == b.pip) {
    const std::int64_t em = std::min(a.e, b.e);
    const std::int64_t sa = a.e - em, sb = b.e - em;
    if (sa < 62 && sb < 62) {
      std::int64_t na, nb, x, y, s, d;
      if (!__builtin_mul_overflow(a.n, std::int64_t{1} << sa, &na) &&
          !__builtin_mul_overflow(b.n, std::int64_t{1} << sb, &nb) && !__builtin_mul_overflow(na, b.d, &x) &&
          !__builtin_mul_overflow(nb, a.d, &y) && !__builtin_add_overflow(x, y, &s) &&
          !__builtin_mul_overflow(a.d, b.d, &d)) {
        Value r;
        r.n = s;
        r.d = d;
        r.e = em;
        r.pip = a.pip;
        return normalized(r);
      }
    }
  }
  return inexact(to_double(a) + to_double(b));
}

std::optional<Value> exact_decimal(std::string_view int_digits, std::string_view frac_digits, std::int64_t exp10) {
  // Digits of the mantissa without leading zeros and without trailing fraction zeros.
  while (!frac_digits.empty() && frac_digits.back() == '0') frac_digits.remove_suffix(1);
  std::string digits(int_digits);
  digits.append(frac_digits);
  const std::int64_t scale = exp10 - static_cast<std::int64_t>(frac_digits.size());
  std::size_t lead = 0;
  while (lead < digits.size() && digits[lead] == '0') ++lead;
  digits.erase(0, lead);
  if (digits.empty()) return Value{};
  if (digits.size() <= 18 && scale >= -27 && scale <= 27) {
    std::int64_t m = 0;
    for (char ch : digits) m = m * 10 + (ch - '0');
    std::int64_t five = 1;
    for (std::int64_t i = 0; i < (scale < 0 ? -scale : scale); ++i) five *= 5;
    Value v;
    if (scale >= 0) {
      if (!__builtin_mul_overflow(m, five, &v.n)) {
        v.e = scale;
        return normalized(v);
      }
    } else {
      v.n = m;
      v.d = five;
      v.e = scale;
      return normalized(v);
    }
  }
  return std::nullopt;
}

std::optional<Value> power(const Value& a, const Value& b) {
  if (b.exact && b.n == 0) return integer(1);
  if (b.exact && b.pip == 0 && b.d == 1 && b.e >= 0 && b.e < 21 && b.n > -(1 << 21) && b.n < (1 << 21)) {
    const std::int64_t k = b.n * (std::int64_t{1} << b.e);
    if (k >= -(1 << 20) && k <= (1 << 20) && a.exact) {
      if (a.n == 0) {
        if (k < 0) return std::nullopt;
        return Value{};
      }
      const Value base = k < 0 ? reciprocal(a) : a;
      const std::int64_t m = k < 0 ? -k : k;
      if ((base.n == 1 || base.n == -1) && base.d == 1) {
        // A signed power of two (times a power of pi): exact for any exponent.
        Value r;
        r.n = (m % 2 == 1) ? base.n : 1;
        r.e = base.e * m;
        r.pip = static_cast<int>(std::clamp<std::int64_t>(base.pip * m, -1000, 1000));
        return normalized(r);
      }
      if (m <= 64) {
        Value r = integer(1);
        for (std::int64_t i = 0; i < m; ++i) r = mul(r, base);
        return r;
      }
    }
  }
  return inexact(std::pow(to_double(a), to_double(b)));
}

std::optional<Angle> as_angle(const Value& v) {
  if (v.exact) {
    if (v.n == 0) return Angle{};
    if (v.pip == 1 && v.d == 1) {
      if (v.e >= 1) return Angle{};  // an even multiple of pi
      return Angle(v.n, static_cast<std::uint32_t>(-v.e));
    }
  }
  const double x = to_double(v);
  if (std::isfinite(x)) {
    if (x == 0.0) return Angle{};
    // Small numerators only: with a 2^-40 relative tolerance, any real number is close to
    // some multiple of pi/2^60 with a huge numerator, which would prove nothing.
    for (int k = 0; k <= 60; ++k) {
      const double t = std::ldexp(x / std::numbers::pi, k);
      if (std::abs(t) > 16777216.0) break;
      const double r = std::nearbyint(t);
      if (r != 0.0 && std::abs(r - t) <= 1e-12 * std::abs(t)) return Angle(static_cast<std::int64_t>(r), k);
    }
  }
  return std::nullopt;
}

}  // namespace qftplan::qasm_detail
