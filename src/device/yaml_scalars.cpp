#include "yaml_scalars.hpp"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <system_error>
#include <utility>

namespace qftplan::yaml_detail {
namespace {

/// Whether `s` is a number in the YAML 1.2 core schema's float syntax (YAML 1.2.2, section 10.3.2:
/// [-+]? ( \. [0-9]+ | [0-9]+ ( \. [0-9]* )? ) ( [eE] [-+]? [0-9]+ )?). Words such as "nan" or "inf"
/// are text there, unlike in std::from_chars.
bool core_number_syntax(std::string_view s) {
  std::size_t i = 0;
  const auto digits = [&] {
    const std::size_t start = i;
    while (i < s.size() && s[i] >= '0' && s[i] <= '9') ++i;
    return i > start;
  };
  if (i < s.size() && (s[i] == '+' || s[i] == '-')) ++i;
  if (i < s.size() && s[i] == '.') {
    ++i;
    if (!digits()) return false;
  } else {
    if (!digits()) return false;
    if (i < s.size() && s[i] == '.') {
      ++i;
      digits();
    }
  }
  if (i < s.size() && (s[i] == 'e' || s[i] == 'E')) {
    ++i;
    if (i < s.size() && (s[i] == '+' || s[i] == '-')) ++i;
    if (!digits()) return false;
  }
  return i == s.size();
}

/// For a number in core syntax too large or too small for a double: true when its magnitude is
/// above 1 (it overflows), false when below (it underflows). Exponents saturate, so any length works.
bool overflows(std::string_view s) {
  std::size_t i = (s[0] == '+' || s[0] == '-') ? 1 : 0;
  bool seen = false, point = false;
  long long int_digits = 0, frac_zeros = 0;
  for (; i < s.size() && s[i] != 'e' && s[i] != 'E'; ++i) {
    if (s[i] == '.') {
      point = true;
    } else if (!seen && s[i] == '0') {
      if (point) ++frac_zeros;
    } else {
      seen = true;
      if (!point) ++int_digits;
    }
  }
  const long long order = int_digits > 0 ? int_digits - 1 : -(frac_zeros + 1);  // of the first non-zero digit
  long long exponent = 0;
  if (i < s.size()) {
    ++i;
    const bool negative = s[i] == '-';
    if (s[i] == '+' || s[i] == '-') ++i;
    for (; i < s.size(); ++i) exponent = std::min<long long>(exponent * 10 + (s[i] - '0'), 1'000'000'000);
    if (negative) exponent = -exponent;
  }
  return order + exponent > 0;
}

}  // namespace

/// Parses YAML core-schema decimal integers ("7", "+7", "-7"). Sets `overflow` when too large for 64 bits.
std::optional<long long> parse_integer(std::string_view s, bool& overflow) {
  overflow = false;
  if (s.size() > 1 && s[0] == '+' && s[1] != '-' && s[1] != '+') s.remove_prefix(1);
  long long v = 0;
  const auto [p, ec] = std::from_chars(s.data(), s.data() + s.size(), v);
  if (ec == std::errc::result_out_of_range && p == s.data() + s.size()) {
    overflow = true;
    return std::nullopt;
  }
  if (ec != std::errc{} || p != s.data() + s.size() || s.empty()) return std::nullopt;
  return v;
}

/// Parses a YAML core-schema number (integers, decimals, exponents, .inf, .nan) to the nearest double:
/// a value too small for a double becomes 0 (keeping its sign), one too large becomes infinite.
std::optional<double> parse_number(std::string_view s) {
  static const std::pair<std::string_view, double> special[] = {
      {".inf", HUGE_VAL},   {".Inf", HUGE_VAL},  {".INF", HUGE_VAL},   {"+.inf", HUGE_VAL},
      {"+.Inf", HUGE_VAL},  {"+.INF", HUGE_VAL}, {"-.inf", -HUGE_VAL}, {"-.Inf", -HUGE_VAL},
      {"-.INF", -HUGE_VAL}, {".nan", NAN},       {".NaN", NAN},        {".NAN", NAN}};
  for (const auto& [text, value] : special)
    if (s == text) return value;
  if (!core_number_syntax(s)) return std::nullopt;
  const bool negative = s[0] == '-';
  const std::string_view body = (s[0] == '+') ? s.substr(1) : s;
  double v = 0;
  const auto [p, ec] = std::from_chars(body.data(), body.data() + body.size(), v, std::chars_format::general);
  if (ec == std::errc::result_out_of_range) {
    const double magnitude = overflows(s) ? HUGE_VAL : 0.0;
    return negative ? -magnitude : magnitude;
  }
  if (ec != std::errc{} || p != body.data() + body.size()) return std::nullopt;
  return v;
}

}  // namespace qftplan::yaml_detail
