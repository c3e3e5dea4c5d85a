// The expression evaluator of the OpenQASM reader: a recursive descent over the OpenQASM 3
// precedence table, evaluating as it goes.

#include "qasm_expression.hpp"

#include <charconv>
#include <cctype>
#include <cmath>
#include <cstdio>
#include <iterator>
#include <numbers>
#include <string>

namespace qftplan::qasm_detail {

namespace {

constexpr std::uint32_t kMaxPow2Literal = 20000;  // longest power-of-two integer literal kept exact

// pi * 2^e: pi (e = 0) or tau (e = 1).
Value pi_times_pow2(std::int64_t e) {
  Value v;
  v.n = 1;
  v.pip = 1;
  v.e = e;
  return v;
}

}  // namespace

Value ExpressionReader::expression(const Scope& sc) {
  Value v = term(sc);
  for (;;) {
    if (accept('+')) {
      Value r = term(sc);
      v = sc.eval ? add(v, r) : Value{};
    } else if (peek('-')) {
      ++p_;
      Value r = term(sc);
      v = sc.eval ? add(v, negate(r)) : Value{};
    } else {
      return v;
    }
  }
}

Value ExpressionReader::term(const Scope& sc) {
  Value v = unary(sc);
  for (;;) {
    skip_ws();
    if (p_ < end_ && *p_ == '*' && !(p_ + 1 < end_ && p_[1] == '*')) {
      ++p_;
      Value r = unary(sc);
      v = sc.eval ? mul(v, r) : Value{};
    } else if (p_ < end_ && *p_ == '/' && !(p_ + 1 < end_ && (p_[1] == '/' || p_[1] == '*'))) {
      const Pos at = here();
      ++p_;
      Value r = unary(sc);
      if (sc.eval) {
        if (is_zero(r)) fail(at, "division by zero");
        v = mul(v, reciprocal(r));
      }
    } else {
      return v;
    }
  }
}

// Unary minus binds looser than the power operator: -2**2 is -4 (OpenQASM 3 precedence table).
Value ExpressionReader::unary(const Scope& sc) {
  struct Depth {
    int& d;
    explicit Depth(int& x) : d(++x) {}
    ~Depth() { --d; }
  } depth(expr_depth_);
  if (expr_depth_ > kMaxNesting) fail_here("expression nested too deeply");
  if (accept('-')) return negate(unary(sc));
  if (accept('+')) return unary(sc);
  return power_expression(sc);
}

Value ExpressionReader::power_expression(const Scope& sc) {
  Value base = primary(sc);
  skip_ws();
  const Pos at = here();
  bool pow_op = false;
  if (p_ + 1 < end_ && p_[0] == '*' && p_[1] == '*') {
    p_ += 2;
    pow_op = true;
  } else if (p_ < end_ && *p_ == '^') {
    // OpenQASM 2 writes powers with '^'; in OpenQASM 3 it is bitwise xor.
    if (version_ == 3) fail_here("'^' is not an arithmetic operator in OpenQASM 3 (use '**')");
    ++p_;
    pow_op = true;
  }
  if (!pow_op) return base;
  Value ex = unary(sc);  // right-associative, and 2**-3 is allowed
  if (!sc.eval) return Value{};
  const std::optional<Value> r = power(base, ex);
  if (!r) fail(at, "division by zero");
  return *r;
}

Value ExpressionReader::primary(const Scope& sc) {
  skip_ws();
  const Pos at = here();
  if (p_ >= end_) fail_here("expected an expression but found end of file");
  const unsigned char c = static_cast<unsigned char>(*p_);
  if (c == '(') {
    ++p_;
    Value v = expression(sc);
    expect(')');
    return v;
  }
  if (is_digit(c) || (c == '.' && p_ + 1 < end_ && is_digit(static_cast<unsigned char>(p_[1]))))
    return number();
  // pi and tau as UTF-8 letters.
  if (c == 0xCF && p_ + 1 < end_ && (static_cast<unsigned char>(p_[1]) == 0x80 || static_cast<unsigned char>(p_[1]) == 0x84) &&
      !(p_ + 2 < end_ && ident_char(static_cast<unsigned char>(p_[2])))) {
    const bool tau = static_cast<unsigned char>(p_[1]) == 0x84;
    p_ += 2;
    return pi_times_pow2(tau ? 1 : 0);
  }
  if (ident_start(c)) return named_value(ident(), at, sc);
  fail_here("expected an expression but found " + found());
}

Value ExpressionReader::named_value(std::string_view w, const Pos& at, const Scope& sc) {
  if (w == "pi" || w == "tau") return pi_times_pow2(w == "tau" ? 1 : 0);
  if (w == "euler") return inexact(std::numbers::e);
  if (sc.gate) {
    for (std::size_t i = 0; i < sc.gate->params.size(); ++i)
      if (sc.gate->params[i] == w) return sc.eval ? (*sc.params)[i] : Value{};
  }
  static const std::string_view functions[] = {"sin", "cos", "tan", "exp", "ln", "sqrt"};
  for (std::size_t f = 0; f < std::size(functions); ++f) {
    if (w != functions[f]) continue;
    if (!peek('(')) fail_here("expected '(' after " + std::string(w));
    const Value arg = primary(sc);
    if (!sc.eval) return Value{};
    const double x = to_double(arg);
    switch (f) {
      case 0: return inexact(std::sin(x));
      case 1: return inexact(std::cos(x));
      case 2: return inexact(std::tan(x));
      case 3: return inexact(std::exp(x));
      case 4:
        if (!(x > 0)) fail(at, "ln of a non-positive number");
        return inexact(std::log(x));
      default:
        if (x < 0) fail(at, "sqrt of a negative number");
        return inexact(std::sqrt(x));
    }
  }
  fail(at, "unknown identifier '" + std::string(w) + "' in an expression");
}

// Integer or decimal literal (inline: read from primary only, for every angle).
inline Value ExpressionReader::number() {
  const Pos at = here();
  const char* s = p_;
  while (p_ < end_ && is_digit(static_cast<unsigned char>(*p_))) ++p_;
  const char* int_end = p_;
  const char* frac_begin = p_;
  const char* frac_end = p_;
  bool decimal = false;
  if (p_ < end_ && *p_ == '.') {
    decimal = true;
    ++p_;
    frac_begin = p_;
    while (p_ < end_ && is_digit(static_cast<unsigned char>(*p_))) ++p_;
    frac_end = p_;
  }
  std::int64_t exp10 = 0;
  if (p_ < end_ && (*p_ == 'e' || *p_ == 'E')) {
    const char* q = p_ + 1;
    bool neg = false;
    if (q < end_ && (*q == '+' || *q == '-')) neg = *q++ == '-';
    if (q >= end_ || !is_digit(static_cast<unsigned char>(*q))) fail(at, "bad number");
    decimal = true;
    while (q < end_ && is_digit(static_cast<unsigned char>(*q))) {
      if (exp10 < 100000) exp10 = exp10 * 10 + (*q - '0');
      ++q;
    }
    if (neg) exp10 = -exp10;
    p_ = q;
  }
  if (p_ < end_ && ident_char(static_cast<unsigned char>(*p_))) fail(at, "bad number");
  const char* tok_end = p_;

  const std::string_view int_digits(s, static_cast<std::size_t>(int_end - s));
  if (!decimal) return integer_literal(int_digits);
  const std::string_view frac_digits(frac_begin, static_cast<std::size_t>(frac_end - frac_begin));
  if (const std::optional<Value> v = exact_decimal(int_digits, frac_digits, exp10)) return *v;
  double x = 0;
  auto [q, ec] = std::from_chars(s, tok_end, x);
  if (ec == std::errc::result_out_of_range) x = HUGE_VAL;
  else if (ec != std::errc() || q != tok_end) fail(at, "bad number");
  return inexact(x);
}

inline Value ExpressionReader::integer_literal(std::string_view digits) {
  std::size_t lead = 0;
  while (lead + 1 < digits.size() && digits[lead] == '0') ++lead;
  digits.remove_prefix(lead);
  // Every integer that fits 64 bits is exact (19 digits: the parity network writes numerators
  // such as 2^60 - 1, which a double would round).
  if (digits.size() <= 19) {
    std::int64_t m = 0;
    bool fits = true;
    for (char ch : digits)
      fits = fits && !__builtin_mul_overflow(m, std::int64_t{10}, &m) && !__builtin_add_overflow(m, ch - '0', &m);
    if (fits) return integer(m);
  }
  // Long integers are powers of two in practice (our OpenQASM 2 writer spells pi/2^k with the
  // decimal 2^k): recognise them exactly, caching by spelling.
  auto it = pow2_cache_.find(digits);
  if (it == pow2_cache_.end()) {
    int k = -1;
    double lead17 = 0;
    for (std::size_t i = 0; i < 17; ++i) lead17 = lead17 * 10 + (digits[i] - '0');
    const double est = std::log2(lead17) + static_cast<double>(digits.size() - 17) * std::log2(10.0);
    const long long guess = std::llround(est);
    for (long long cand = guess - 1; cand <= guess + 1 && k < 0; ++cand)
      if (cand >= 0 && cand <= kMaxPow2Literal && pow2_decimal(static_cast<std::uint32_t>(cand)) == digits)
        k = static_cast<int>(cand);
    it = pow2_cache_.emplace(digits, k).first;
  }
  if (it->second >= 0) {
    Value v;
    v.n = 1;
    v.e = it->second;
    return v;
  }
  double x = 0;
  auto [q, ec] = std::from_chars(digits.data(), digits.data() + digits.size(), x);
  if (ec != std::errc()) x = HUGE_VAL;
  return inexact(x);
}

Angle ExpressionReader::to_angle(const Value& v, const Pos& at, const char* text_end) {
  if (const std::optional<Angle> a = as_angle(v)) return *a;
  const double x = to_double(v);
  const char* b = at.at;
  const char* e = text_end;
  while (e > b && std::isspace(static_cast<unsigned char>(e[-1]))) --e;
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.17g", x);
  // Readable, but not an angle of the QFT: record the first one and read it as 0.
  if (!inexact_angle_)
    inexact_angle_ = QasmProgram::InexactAngle{
        at.line, "angle " + std::string(b, e) + " (= " + buf + ") on line " + std::to_string(at.line) +
                     " is not a multiple of pi/2^k, as every angle of the QFT is"};
  return Angle{};
}

}  // namespace qftplan::qasm_detail
