#pragma once
/// \file yaml_scalars.hpp
/// Private to the device layer: numbers in the YAML 1.2 core schema (section 10.3.2), read from plain scalars.

#include <optional>
#include <string_view>

namespace qftplan::yaml_detail {

/// Parses YAML core-schema decimal integers ("7", "+7", "-7"). Sets `overflow` when too large for 64 bits.
std::optional<long long> parse_integer(std::string_view s, bool& overflow);

/// Parses a YAML core-schema number (integers, decimals, exponents, .inf, .nan) to the nearest double:
/// a value too small for a double becomes 0 (keeping its sign), one too large becomes infinite.
std::optional<double> parse_number(std::string_view s);

}  // namespace qftplan::yaml_detail
