#pragma once
// Exact arithmetic on the numbers of OpenQASM angle expressions (private to the reader).

#include <cstdint>
#include <optional>
#include <string_view>

#include "qftplan/core/angle.hpp"

namespace qftplan::qasm_detail {

/// 2^e is kept exact while |e| stays below this.
inline constexpr std::int64_t kMaxExponent = 1 << 24;

/// A number of an expression: exact n/d * 2^e * pi^pip (n odd or zero, d odd and positive), or an
/// approximate double. Exactness survives + - * / ** while the numbers fit in 64 bits, which
/// covers every angle a QFT needs (pi/2**4095 has n = d = 1).
struct Value {
  bool exact = true;     ///< false: only `approx` holds
  std::int64_t n = 0;    ///< numerator (odd, or zero)
  std::int64_t d = 1;    ///< denominator (odd, positive)
  std::int64_t e = 0;    ///< exponent of 2
  int pip = 0;           ///< exponent of pi
  double approx = 0;     ///< the value when not exact
};

/// An approximate value.
Value inexact(double x);
/// The value as a double (exact values are rounded).
double to_double(const Value& v);
/// Brings an exact value to its canonical form; one out of the exact range becomes approximate.
Value normalized(Value v);
/// The integer k.
Value integer(std::int64_t k);
/// -v.
Value negate(Value v);
/// a * b, exact when the products fit in 64 bits.
Value mul(const Value& a, const Value& b);
/// 1 / a; the caller guarantees a != 0.
Value reciprocal(const Value& a);
/// True for zero (exact or approximate).
bool is_zero(const Value& v);
/// a + b, exact when both have the same power of pi and the sums fit in 64 bits.
Value add(const Value& a, const Value& b);
/// The decimal int_digits.frac_digits * 10^exp10, exact when it is n/5^k * 2^e with a 64-bit n;
/// nullopt when it is not (the caller rounds the spelling to a double).
std::optional<Value> exact_decimal(std::string_view int_digits, std::string_view frac_digits, std::int64_t exp10);
/// a ** b, exact for small integer exponents; nullopt when it divides by zero (0 ** -k).
std::optional<Value> power(const Value& a, const Value& b);
/// The angle v as an exact multiple of pi/2^k, also when a decimal is within 1e-12 (relative) of
/// one; nullopt for any other number.
std::optional<Angle> as_angle(const Value& v);

}  // namespace qftplan::qasm_detail
