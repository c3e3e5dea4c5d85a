#include "qftplan/device/device_yaml.hpp"

// Writing device files: device_to_yaml, which parse_device_yaml (device_yaml.cpp) reads back to an equal device.

#include <algorithm>
#include <cctype>
#include <cmath>
#include <cstring>
#include <optional>
#include <string_view>
#include <utility>

#include <fmt/format.h>

namespace qftplan {
namespace {

/// Whether a reader could take the plain word for something other than text: the booleans and null of the
/// YAML 1.2 core schema (section 10.3.2), and YAML 1.1's y/n/yes/no/on/off for older readers (common
/// practice), in any letter case.
bool reads_as_non_text(std::string_view s) {
  if (s.size() > 5) return false;
  std::string lower(s);
  std::transform(lower.begin(), lower.end(), lower.begin(), [](unsigned char c) { return std::tolower(c); });
  for (const char* word : {"true", "false", "null", "yes", "no", "on", "off", "y", "n"})
    if (lower == word) return true;
  return false;
}

/// A YAML scalar for free text: plain when unambiguous, else double-quoted with escapes. Control
/// characters (C0, DEL, C1) are escaped so that the text stays printable (YAML 1.2, section 5.1); the
/// text itself is UTF-8, as every loaded name is.
std::string yaml_text(const std::string& s) {
  const bool plain =
      !s.empty() && std::isalpha(static_cast<unsigned char>(s[0])) && s.back() != ':' &&
      std::all_of(
          s.begin(), s.end(),
          [](char c) { return std::isalnum(static_cast<unsigned char>(c)) || (c != 0 && std::strchr("_.:+-", c)); }) &&
      !reads_as_non_text(s);
  if (plain) return s;
  std::string out = "\"";
  for (std::size_t i = 0; i < s.size(); ++i) {
    const char c = s[i];
    const auto u = static_cast<unsigned char>(c);
    if (c == '"')
      out += "\\\"";
    else if (c == '\\')
      out += "\\\\";
    else if (u < 0x20 || u == 0x7f)
      out += fmt::format("\\x{:02x}", u);
    else if (u == 0xC2 && i + 1 < s.size() && static_cast<unsigned char>(s[i + 1]) <= 0x9F &&
             static_cast<unsigned char>(s[i + 1]) >= 0x80)
      out += fmt::format("\\x{:02x}", static_cast<unsigned char>(s[++i]));  // U+0080..U+009F
    else
      out += c;
  }
  return out + "\"";
}

/// Shortest text that parses back to the identical double (YAML's .inf and .nan for the special values).
std::string num(double v) {
  if (std::isnan(v)) return ".nan";
  if (std::isinf(v)) return v > 0 ? ".inf" : "-.inf";
  return fmt::format("{}", v);
}

}  // namespace

std::string device_to_yaml(const Device& device) {
  const DeviceDescription& d = device.description();
  std::string out;
  out += "name: " + yaml_text(d.name) + "\n";
  out += fmt::format("qubits: {}\n", d.qubits);
  if (d.native_2q) out += fmt::format("native_2q: {}\n", two_qubit_gate_name(*d.native_2q));

  const auto& c = d.calibration;
  if (!c.empty()) {
    out += "calibration:\n";
    const std::pair<const char*, const std::optional<double>*> fields[] = {{"error_1q", &c.error_1q},
                                                                           {"error_2q", &c.error_2q},
                                                                           {"error_readout", &c.error_readout},
                                                                           {"duration_1q_ns", &c.duration_1q_ns},
                                                                           {"duration_2q_ns", &c.duration_2q_ns},
                                                                           {"t1_us", &c.t1_us},
                                                                           {"t2_us", &c.t2_us},
                                                                           {"duration_readout_ns", &c.duration_readout_ns},
                                                                           {"feed_forward_ns", &c.feed_forward_ns}};
    for (const auto& [key, value] : fields)
      if (*value) out += fmt::format("  {}: {}\n", key, num(**value));
  }

  if (!d.qubit_calibration.empty()) {
    out += "qubit_calibration:\n";
    for (const auto& o : d.qubit_calibration) {
      out += fmt::format("  - {{id: {}", o.id);
      const std::pair<const char*, const std::optional<double>*> fields[] = {{"error_1q", &o.error_1q},
                                                                             {"error_readout", &o.error_readout},
                                                                             {"duration_1q_ns", &o.duration_1q_ns},
                                                                             {"t1_us", &o.t1_us},
                                                                             {"t2_us", &o.t2_us},
                                                                             {"duration_readout_ns", &o.duration_readout_ns},
                                                                             {"feed_forward_ns", &o.feed_forward_ns}};
      for (const auto& [key, value] : fields)
        if (*value) out += fmt::format(", {}: {}", key, num(**value));
      if (o.disabled) out += ", disabled: true";
      out += "}\n";
    }
  }

  if (d.couplers.empty()) {
    out += "couplers: []\n";
  } else {
    out += "couplers:\n";
    for (const auto& cp : d.couplers) {
      if (!cp.error && !cp.duration_ns && !cp.disabled) {
        out += fmt::format("  - [{}, {}]\n", cp.a, cp.b);
        continue;
      }
      out += fmt::format("  - {{pair: [{}, {}]", cp.a, cp.b);
      if (cp.error) out += ", error: " + num(*cp.error);
      if (cp.duration_ns) out += ", duration_ns: " + num(*cp.duration_ns);
      if (cp.disabled) out += ", disabled: true";
      out += "}\n";
    }
  }

  if (!d.positions.empty()) {
    std::string entries;
    for (std::size_t q = 0; q < d.positions.size(); ++q)
      if (const auto& p = d.positions[q])
        entries += fmt::format("  - {{id: {}, at: [{}, {}]}}\n", q, num(p->x), num(p->y));
    out += entries.empty() ? "positions: []\n" : "positions:\n" + entries;
  }
  return out;
}

}  // namespace qftplan
