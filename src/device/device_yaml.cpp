#include "qftplan/device/device_yaml.hpp"

#include <algorithm>
#include <cctype>
#include <cerrno>
#include <charconv>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <functional>
#include <istream>
#include <optional>
#include <streambuf>
#include <string_view>
#include <unordered_map>
#include <utility>
#include <vector>

#include <fmt/format.h>
#include <yaml-cpp/depthguard.h>
#include <yaml-cpp/eventhandler.h>
#include <yaml-cpp/exceptions.h>
#include <yaml-cpp/mark.h>
#include <yaml-cpp/parser.h>

#include "qftplan/core/input_error.hpp"

namespace qftplan {
namespace {

/// Device files larger than this are refused before they are read or parsed. Large enough for what
/// device_to_yaml writes for the biggest built-in lattices (grid:1000x1000 is about 71 MiB, ring:1000000
/// about 66 MiB), so that every lattice round-trips; memory stays near 1 GB thanks to the compact Tree.
constexpr std::uintmax_t kMaxDeviceFileMiB = 128;
constexpr std::uintmax_t kMaxDeviceFileBytes = kMaxDeviceFileMiB << 20;
/// Upper bound on YAML nodes (and alias uses) in one file: bounds memory and work whatever the text.
constexpr long long kMaxVisitedNodes = 20'000'000;
/// Deepest nesting of flow collections ([ and {) accepted. yaml-cpp scans a whole run of open brackets
/// before its own depth check fires (2,000,000 of them cost about 470 MB and seconds), so the raw text is
/// checked first. Device files need 3 levels (positions: [{id: 0, at: [0, 0]}]).
constexpr int kMaxFlowDepth = 64;

const std::vector<std::string> kTopKeys = {"name",      "qubits",   "couplers", "calibration", "qubit_calibration",
                                           "positions", "native_2q"};
const std::vector<std::string> kCalibrationKeys = {"error_1q",       "error_2q", "error_readout", "duration_1q_ns",
                                                   "duration_2q_ns", "t1_us",    "t2_us"};
const std::vector<std::string> kOverrideKeys = {"id", "error_1q", "error_readout", "duration_1q_ns", "t1_us", "t2_us"};
const std::vector<std::string> kCouplerKeys = {"pair", "error", "duration_ns"};
const std::vector<std::string> kPositionKeys = {"id", "at"};

/// The member of CalibrationValues a key of `calibration` sets (keys are checked against kCalibrationKeys).
std::optional<double> CalibrationValues::*calibration_field(const std::string& key) {
  if (key == "error_1q") return &CalibrationValues::error_1q;
  if (key == "error_2q") return &CalibrationValues::error_2q;
  if (key == "error_readout") return &CalibrationValues::error_readout;
  if (key == "duration_1q_ns") return &CalibrationValues::duration_1q_ns;
  if (key == "duration_2q_ns") return &CalibrationValues::duration_2q_ns;
  if (key == "t1_us") return &CalibrationValues::t1_us;
  return &CalibrationValues::t2_us;
}

/// The member of QubitOverride a key of a qubit_calibration entry sets (other than "id").
std::optional<double> QubitOverride::*override_field(const std::string& key) {
  if (key == "error_1q") return &QubitOverride::error_1q;
  if (key == "error_readout") return &QubitOverride::error_readout;
  if (key == "duration_1q_ns") return &QubitOverride::duration_1q_ns;
  if (key == "t1_us") return &QubitOverride::t1_us;
  return &QubitOverride::t2_us;
}

/// Optimal-string-alignment distance (edits: insert, delete, substitute, swap neighbours), ignoring case.
int edit_distance(std::string_view a, std::string_view b) {
  const auto lower = [](char c) { return static_cast<char>(std::tolower(static_cast<unsigned char>(c))); };
  const std::size_t n = a.size(), m = b.size();
  std::vector<std::vector<int>> d(n + 1, std::vector<int>(m + 1, 0));
  for (std::size_t i = 0; i <= n; ++i) d[i][0] = static_cast<int>(i);
  for (std::size_t j = 0; j <= m; ++j) d[0][j] = static_cast<int>(j);
  for (std::size_t i = 1; i <= n; ++i)
    for (std::size_t j = 1; j <= m; ++j) {
      const int cost = lower(a[i - 1]) == lower(b[j - 1]) ? 0 : 1;
      d[i][j] = std::min({d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + cost});
      if (i > 1 && j > 1 && lower(a[i - 1]) == lower(b[j - 2]) && lower(a[i - 2]) == lower(b[j - 1]))
        d[i][j] = std::min(d[i][j], d[i - 2][j - 2] + 1);
    }
  return d[n][m];
}

/// User text quoted back in a one-line message: control characters blanked, long text cut.
std::string printable(std::string_view s, std::size_t limit) {
  std::string out;
  for (char c : s.substr(0, limit)) out += (static_cast<unsigned char>(c) < 0x20) ? ' ' : c;
  if (s.size() > limit) out += "...";
  return out;
}

std::string quote_text(std::string_view s) { return "'" + printable(s, 40) + "'"; }

/// "unknown key 'qbits'; did you mean 'qubits'?" — or the list of known keys when nothing is close.
std::string unknown_key_message(const std::string& key, const std::vector<std::string>& known,
                                const std::string& context) {
  const std::string where = context.empty() ? "" : " in " + context;
  const std::string shown = printable(key, 64);
  // Very long keys are certainly not typos of ours; skip the quadratic distance table for them.
  if (key.size() <= 64) {
    // A started word ("calib") means the key it begins.
    for (const auto& k : known)
      if (key.size() >= 3 && k.size() > key.size() && k.compare(0, key.size(), key) == 0)
        return fmt::format("unknown key '{}'{}; did you mean '{}'?", shown, where, k);
    int best = 1 << 30;
    const std::string* nearest = nullptr;
    for (const auto& k : known) {
      const int dist = edit_distance(key, k);
      if (dist < best) {
        best = dist;
        nearest = &k;
      }
    }
    // Only suggest a key that is plausibly what was meant: one or two edits, fewer for short keys.
    const int len = static_cast<int>(key.size());
    if (nearest && (best <= (len <= 3 ? 1 : 2) || best * 3 <= len))
      return fmt::format("unknown key '{}'{}; did you mean '{}'?", shown, where, *nearest);
  }
  std::string list;
  for (const auto& k : known) list += (list.empty() ? "" : ", ") + k;
  return fmt::format("unknown key '{}'{}; known keys: {}", shown, where, list);
}

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

/// A 1-based source position (0 = unknown).
struct Pos {
  int line = 0;
  int column = 0;
};

/// The text as yaml-cpp should see it, or nullopt when it needs no change: every line break YAML 1.2
/// knows (section 5.4: CRLF, CR, LF) becomes LF, which keeps line numbers and columns (yaml-cpp itself
/// reads a lone CR as part of the line), and a leading UTF-8 byte order mark is dropped (yaml-cpp counts
/// it neither in columns nor in offsets, so offsets into the text stay right).
std::optional<std::string> normalized_text(std::string_view text) {
  const bool bom = text.starts_with("\xEF\xBB\xBF");
  if (!bom && text.find('\r') == std::string::npos) return std::nullopt;
  std::string out;
  out.reserve(text.size());
  for (std::size_t i = bom ? 3 : 0; i < text.size(); ++i) {
    if (text[i] != '\r') {
      out += text[i];
    } else {
      out += '\n';
      if (i + 1 < text.size() && text[i + 1] == '\n') ++i;
    }
  }
  return out;
}

/// One pass over the raw text before yaml-cpp parses it, in O(size) without allocation: the text must be
/// UTF-8 (RFC 3629), hold only characters YAML 1.2 allows (section 5.1: no C0 control but tab and line
/// break anywhere; outside quoted scalars, where the JSON-compatible set applies, also no DEL, C1 control
/// but NEL, U+FFFE or U+FFFF), and nest flow collections at most kMaxFlowDepth deep. Quoted scalars,
/// comments, block scalars and plain scalars are told apart from structure by a light reading of the
/// syntax; where it could misread a file, it errs towards not counting a bracket.
class RawTextCheck {
 public:
  RawTextCheck(std::string_view text, const std::string& source) : s_(text), source_(source) {}

  void run() {
    check_encoding();
    while (i_ < s_.size()) {
      const auto c = static_cast<unsigned char>(s_[i_]);
      std::size_t len = 1;
      char32_t cp = c;
      if (c >= 0x80) cp = decode(len);
      check_character(cp);
      if (c == '\n') {
        new_line();
      } else if (line_begin_ && c == ' ') {
        ++indent_;
      } else if (line_begin_ && begin_content()) {
        len = 3;  // a document marker, read as a blank
      } else if (c < 0x80 || st_ == State::token || st_ == State::done || st_ == State::double_quoted) {
        step(c);  // (begin_content has cleared line_begin_ when it returned false)
      }
      i_ += len;
    }
  }

 private:
  enum class State : std::uint8_t { token, plain, done, property, single_quoted, double_quoted, comment, block };

  [[noreturn]] void fail(std::size_t at, const std::string& message) const {
    throw InputError(source_, line_, static_cast<int>(at - line_start_ + 1), message);
  }

  /// UTF-16 and UTF-32 (YAML 1.2, section 5.2) are told by their byte order marks or by zero bytes
  /// among the first ones; yaml-cpp would read them, but device files are UTF-8.
  void check_encoding() const {
    const auto b = [&](std::size_t k) { return k < s_.size() ? static_cast<unsigned char>(s_[k]) : 0x100u; };
    if ((b(0) == 0xFF && b(1) == 0xFE) || (b(0) == 0xFE && b(1) == 0xFF) || (b(0) == 0 && b(1) != 0x100u) ||
        (b(0) != 0x100u && b(0) != 0 && b(1) == 0))
      fail(0, "the file is UTF-16 or UTF-32 text; device files must be UTF-8");
  }

  /// Decodes the character at i_ (a byte of 0x80 or more), refusing what RFC 3629 (section 3) forbids.
  char32_t decode(std::size_t& len) const {
    const auto at = [&](std::size_t k) { return static_cast<unsigned char>(s_[i_ + k]); };
    const unsigned lead = at(0);
    const std::string_view bad = "the file is not valid UTF-8: ";  // no allocation unless it fails
    if (lead < 0xC0) fail(i_, fmt::format("{}byte 0x{:02x} continues a character that never started", bad, lead));
    if (lead > 0xF7) fail(i_, fmt::format("{}byte 0x{:02x} never occurs in UTF-8", bad, lead));
    len = lead < 0xE0 ? 2 : lead < 0xF0 ? 3 : 4;
    char32_t cp = lead & (lead < 0xE0 ? 0x1F : lead < 0xF0 ? 0x0F : 0x07);
    for (std::size_t k = 1; k < len; ++k) {
      if (i_ + k >= s_.size() || (at(k) & 0xC0) != 0x80)
        fail(i_, fmt::format("{}the character starting with byte 0x{:02x} is cut short", bad, lead));
      cp = (cp << 6) | (at(k) & 0x3F);
    }
    static constexpr char32_t kLeast[] = {0, 0, 0x80, 0x800, 0x10000};
    if (cp < kLeast[len]) fail(i_, fmt::format("{}an overlong encoding of U+{:04X}", bad, static_cast<unsigned>(cp)));
    if (cp >= 0xD800 && cp <= 0xDFFF)
      fail(i_,
           fmt::format("{}an encoded surrogate U+{:04X}, which is not a character", bad, static_cast<unsigned>(cp)));
    if (cp > 0x10FFFF) fail(i_, fmt::format("{}a code point above U+10FFFF", bad));
    return cp;
  }

  void check_character(char32_t cp) const {
    if (cp == 0) fail(i_, "a NUL byte is not allowed in a YAML file");
    if (cp < 0x20 && cp != '\t' && cp != '\n')
      fail(i_, fmt::format("control character U+{:04X} is not allowed in a YAML file (write \\x{:02x} inside double "
                           "quotes)",
                           static_cast<unsigned>(cp), static_cast<unsigned>(cp)));
    if (st_ == State::single_quoted || st_ == State::double_quoted) return;
    if (cp == 0x7F || (cp >= 0x80 && cp <= 0x9F && cp != 0x85) || cp == 0xFFFE || cp == 0xFFFF)
      fail(i_, fmt::format("character U+{:04X} is not allowed outside quoted text in YAML (write {} inside double "
                           "quotes)",
                           static_cast<unsigned>(cp),
                           cp <= 0xFF ? fmt::format("\\x{:02x}", static_cast<unsigned>(cp))
                                      : fmt::format("\\u{:04x}", static_cast<unsigned>(cp))));
  }

  void new_line() {
    // A plain scalar, comment or property ends at the line break; quoted text goes on.
    if (st_ != State::single_quoted && st_ != State::double_quoted && st_ != State::block) st_ = State::token;
    if (block_header_) {
      block_header_ = false;
      st_ = State::block;
    }
    escaped_ = false;
    ++line_;
    line_start_ = i_ + 1;
    line_begin_ = true;
    indent_ = 0;
  }

  /// The first character of a line after its indentation; true for a document marker (--- or ...).
  bool begin_content() {
    line_begin_ = false;
    const std::string_view rest = s_.substr(i_);
    const bool marker = indent_ == 0 && (rest.starts_with("---") || rest.starts_with("...")) &&
                        (rest.size() == 3 || space(rest[3]) || rest[3] == '\n');
    if (st_ == State::block && !marker) {
      // Block scalar content is every more indented line; a line of blanks stays inside.
      if (indent_ > block_indent_) return false;
      std::size_t k = i_;
      while (k < s_.size() && space(s_[k])) ++k;
      if (k == s_.size() || s_[k] == '\n') return false;
    }
    if (st_ == State::block) st_ = State::token;
    if (st_ != State::token || indent_ != 0 || depth_ != 0) return false;
    if (marker) {
      marker_line_ = line_;
      return true;
    }
    if (rest[0] == '%') st_ = State::comment;  // a directive
    return false;
  }

  static bool space(char c) { return c == ' ' || c == '\t'; }
  static bool flow_indicator(char c) { return c == ',' || c == '[' || c == ']' || c == '{' || c == '}'; }
  char next() const { return i_ + 1 < s_.size() ? s_[i_ + 1] : '\n'; }
  bool after_space() const { return i_ == line_start_ || space(s_[i_ - 1]); }

  void step(unsigned char uc) {
    const char c = static_cast<char>(uc);
    switch (st_) {
      case State::comment:
      case State::block:
        return;
      case State::single_quoted:
        if (c == '\'') {
          if (next() == '\'')
            ++i_;  // '' stands for one quote
          else
            st_ = State::done;
        }
        return;
      case State::double_quoted:
        if (escaped_)
          escaped_ = false;
        else if (c == '\\')
          escaped_ = true;
        else if (c == '"')
          st_ = State::done;
        return;
      case State::property:
        if (verbatim_) {
          if (c == '>') verbatim_ = false;
          return;
        }
        if (space(c)) {
          st_ = State::token;
          return;
        }
        // Anchor and tag names never hold flow indicators (YAML 1.2, sections 6.9.1 and 6.9.2): one ends
        // the property and is read as structure.
        if (!flow_indicator(c)) return;
        st_ = State::token;
        break;
      default:
        break;
    }
    if (space(c)) return;
    if (c == '#' && after_space()) {
      st_ = State::comment;
      return;
    }
    switch (c) {
      case '[':
      case '{':
        // In block context a bracket inside a plain scalar is text; in flow context it always opens.
        if (st_ == State::token || depth_ > 0) {
          if (++depth_ > kMaxFlowDepth)
            fail(i_, fmt::format("flow sequences and mappings are nested more than {} deep", kMaxFlowDepth));
          st_ = State::token;
          return;
        }
        break;
      case ']':
      case '}':
        if (depth_ > 0) {
          --depth_;
          st_ = State::done;
          return;
        }
        break;
      case ',':
        if (depth_ > 0) {
          st_ = State::token;
          return;
        }
        break;
      case ':':
        // A value indicator: followed by a blank, or in flow context by an indicator or after a quoted key.
        if (space(next()) || next() == '\n' || st_ == State::done || (depth_ > 0 && flow_indicator(next()))) {
          st_ = State::token;
          return;
        }
        break;
      default:
        break;
    }
    if (st_ != State::token) {
      if (st_ == State::done) st_ = State::plain;
      return;
    }
    switch (c) {
      case '\'':
        st_ = State::single_quoted;
        return;
      case '"':
        st_ = State::double_quoted;
        escaped_ = false;
        return;
      case '-':
      case '?':
        if (space(next()) || next() == '\n') return;  // a block entry or a mapping key
        break;
      case '!':
      case '&':
      case '*':
        st_ = State::property;
        verbatim_ = c == '!' && next() == '<';
        return;
      case '|':
      case '>':
        if (depth_ == 0) {
          // A block scalar: its content is the following lines indented more than this one (or any
          // line, after a document marker, where the scalar is the document itself).
          block_header_ = true;
          block_indent_ = marker_line_ == line_ ? -1 : indent_;
          st_ = State::comment;
          return;
        }
        break;
      default:
        break;
    }
    st_ = State::plain;
  }

  std::string_view s_;
  const std::string& source_;
  std::size_t i_ = 0;
  std::size_t line_start_ = 0;
  int line_ = 1;
  int indent_ = 0;          // leading spaces of the current line
  bool line_begin_ = true;  // still reading the indentation
  State st_ = State::token;
  int depth_ = 0;
  bool escaped_ = false;       // in double quotes, after a backslash
  bool verbatim_ = false;      // in a tag of the form !<...>
  bool block_header_ = false;  // a block scalar header was read on this line
  int block_indent_ = 0;
  int marker_line_ = 0;  // line of the last document marker
};

/// A parsed YAML document in compact form. yaml-cpp's own node objects cost several hundred bytes
/// each (about 5 GB for a million-qubit file); these records cost about 30. An alias shares the
/// record of its anchored node, so aliases never copy anything.
struct Tree {
  enum class Kind : std::uint8_t { null, scalar, sequence, map };
  enum class Style : std::uint8_t { plain, quoted };
  struct Record {
    Kind kind = Kind::null;
    Style style = Style::plain;
    int line = -1, column = -1, pos = -1;  // yaml-cpp mark, 0-based
    std::uint32_t begin = 0, count = 0;    // scalar: span of `chars`; container: span of `children`
  };
  std::vector<Record> records;
  std::vector<std::uint32_t> children;  // a map's children alternate key, value
  std::string chars;
  std::uint32_t root = 0;
};

/// A read-only view of one record of a Tree.
class NodeRef {
 public:
  NodeRef(const Tree& t, std::uint32_t i) : t_(&t), i_(i) {}
  bool null() const { return rec().kind == Tree::Kind::null; }
  bool scalar() const { return rec().kind == Tree::Kind::scalar; }
  bool sequence() const { return rec().kind == Tree::Kind::sequence; }
  bool map() const { return rec().kind == Tree::Kind::map; }
  Tree::Style style() const { return rec().style; }
  std::string_view text() const {
    return scalar() ? std::string_view(t_->chars).substr(rec().begin, rec().count) : std::string_view();
  }
  /// Items of a sequence, or key/value pairs of a map.
  std::size_t size() const { return map() ? rec().count / 2 : sequence() ? rec().count : 0; }
  NodeRef operator[](std::size_t k) const { return {*t_, t_->children[rec().begin + k]}; }
  NodeRef key(std::size_t k) const { return {*t_, t_->children[rec().begin + 2 * k]}; }
  NodeRef value(std::size_t k) const { return {*t_, t_->children[rec().begin + 2 * k + 1]}; }
  const Tree::Record& rec() const { return t_->records[i_]; }

 private:
  const Tree* t_;
  std::uint32_t i_;
};

/// Read-only input stream over text that lives elsewhere (no copy of a file of up to 128 MiB).
class TextBuf : public std::streambuf {
 public:
  explicit TextBuf(std::string_view text) {
    char* p = const_cast<char*>(text.data());  // never written: get area only
    setg(p, p, p + text.size());
  }
};

/// Receives yaml-cpp's parse events and fills a Tree, counting nodes against the cap.
class TreeBuilder : public YAML::EventHandler {
 public:
  using Fail = std::function<void(const YAML::Mark&, const std::string&)>;
  TreeBuilder(Tree& tree, std::string_view text, Fail fail) : t_(tree), text_(text), fail_(std::move(fail)) {}

  int documents() const { return documents_; }

  void OnDocumentStart(const YAML::Mark& mark) override {
    if (documents_ == 1) fail_(mark, "a device file holds one YAML document, but a second one starts here");
    ++documents_;
  }
  void OnDocumentEnd() override {}
  void OnNull(const YAML::Mark& mark, YAML::anchor_t anchor) override {
    check_tag(mark, "?");  // "key: !tag" at the end of the text is reported as a null
    finish(add(mark, Tree::Kind::null, Tree::Style::plain), anchor);
  }
  void OnAlias(const YAML::Mark& mark, YAML::anchor_t anchor) override {
    count(mark);
    const auto it = anchors_.find(anchor);
    // The anchor exists (yaml-cpp checks) but its node is still open: a node containing itself.
    if (it == anchors_.end()) fail_(mark, "an alias refers to a node that contains it");
    attach(it->second);
  }
  void OnScalar(const YAML::Mark& mark, const std::string& tag, YAML::anchor_t anchor,
                const std::string& value) override {
    check_tag(mark, tag);
    if (value.find('\0') != std::string::npos) fail_(mark, nul_message());
    const auto style = tag == "?" ? Tree::Style::plain : Tree::Style::quoted;
    const std::uint32_t i = add(mark, Tree::Kind::scalar, style);
    t_.records[i].begin = static_cast<std::uint32_t>(t_.chars.size());
    t_.records[i].count = static_cast<std::uint32_t>(value.size());
    t_.chars += value;
    finish(i, anchor);
  }
  void OnSequenceStart(const YAML::Mark& mark, const std::string& tag, YAML::anchor_t anchor,
                       YAML::EmitterStyle::value) override {
    check_tag(mark, tag);
    open(add(mark, Tree::Kind::sequence, Tree::Style::plain), anchor);
  }
  void OnSequenceEnd() override { close(); }
  void OnMapStart(const YAML::Mark& mark, const std::string& tag, YAML::anchor_t anchor,
                  YAML::EmitterStyle::value) override {
    check_tag(mark, tag);
    open(add(mark, Tree::Kind::map, Tree::Style::plain), anchor);
  }
  void OnMapEnd() override { close(); }

 private:
  struct Open {
    std::uint32_t record;
    std::size_t first_pending;
    YAML::anchor_t anchor;
  };

  /// Refuses a node with an explicit tag (anything but yaml-cpp's untagged "?" and "!"): the schema
  /// gives every value its type, so a tag could only be ignored or contradict it. "!" also stands for a
  /// quoted scalar, so an explicit "!" is found in the text, after an anchor if there is one.
  void check_tag(const YAML::Mark& mark, const std::string& tag) {
    const auto blank = [](char c) { return c == ' ' || c == '\t' || c == '\n'; };
    std::size_t at = mark.pos < 0 ? text_.size() : static_cast<std::size_t>(mark.pos);
    if (at < text_.size() && text_[at] == '&') {  // an anchor may come first
      while (at < text_.size() && !blank(text_[at])) ++at;
      while (at < text_.size() && blank(text_[at])) ++at;
    }
    const bool written = at < text_.size() && text_[at] == '!';
    if (!written && (tag == "?" || tag == "!")) return;
    std::string shown = tag;
    if (written) {
      // The tag as written ("!!set", not yaml-cpp's expansion of it).
      std::size_t end = at + 1;
      if (end < text_.size() && text_[end] == '<') {
        while (end < text_.size() && end - at < 64 && text_[end] != '>') ++end;
        if (end < text_.size() && text_[end] == '>') ++end;
      } else {
        while (end < text_.size() && end - at < 64 && !blank(text_[end]) && !std::strchr(",[]{}", text_[end])) ++end;
      }
      shown = std::string(text_.substr(at, end - at));
    }
    fail_(mark, fmt::format("YAML tag '{}' is not allowed in a device file; write the value without it",
                            printable(shown, 40)));
  }

  /// A NUL in a scalar (written "\0" in double quotes) would cut the name short in C strings.
  std::string nul_message() const {
    if (!open_.empty() && t_.records[open_.back().record].kind == Tree::Kind::map) {
      if ((pending_.size() - open_.back().first_pending) % 2 == 0)
        return "a key must not contain a NUL character (\\0)";
      const Tree::Record& key = t_.records[pending_.back()];
      if (key.kind == Tree::Kind::scalar)
        return fmt::format("'{}' must not contain a NUL character (\\0)",
                           printable(std::string_view(t_.chars).substr(key.begin, key.count), 40));
    }
    return "text must not contain a NUL character (\\0)";
  }

  void count(const YAML::Mark& mark) {
    if (++nodes_ > kMaxVisitedNodes)
      fail_(mark, fmt::format("the file has more than {} YAML nodes; refusing to process it", kMaxVisitedNodes));
  }
  std::uint32_t add(const YAML::Mark& mark, Tree::Kind kind, Tree::Style style) {
    count(mark);
    Tree::Record r;
    r.kind = kind;
    r.style = style;
    r.line = mark.line;
    r.column = mark.column;
    r.pos = mark.pos;
    t_.records.push_back(r);
    return static_cast<std::uint32_t>(t_.records.size() - 1);
  }
  void attach(std::uint32_t i) {
    if (open_.empty())
      t_.root = i;
    else
      pending_.push_back(i);
  }
  void finish(std::uint32_t i, YAML::anchor_t anchor) {
    if (anchor != YAML::NullAnchor) anchors_[anchor] = i;
    attach(i);
  }
  void open(std::uint32_t i, YAML::anchor_t anchor) { open_.push_back({i, pending_.size(), anchor}); }
  void close() {
    const Open o = open_.back();
    open_.pop_back();
    // A container's children are contiguous once it is complete.
    Tree::Record& r = t_.records[o.record];
    r.begin = static_cast<std::uint32_t>(t_.children.size());
    r.count = static_cast<std::uint32_t>(pending_.size() - o.first_pending);
    t_.children.insert(t_.children.end(), pending_.begin() + static_cast<std::ptrdiff_t>(o.first_pending),
                       pending_.end());
    pending_.resize(o.first_pending);
    finish(o.record, o.anchor);
  }

  Tree& t_;
  std::string_view text_;
  Fail fail_;
  int documents_ = 0;
  long long nodes_ = 0;
  std::vector<Open> open_;
  std::vector<std::uint32_t> pending_;
  std::unordered_map<YAML::anchor_t, std::uint32_t> anchors_;
};

/// Walks a parsed document along the schema, validating with positions, and fills a description.
class Reader {
 public:
  Reader(const std::string& text, const std::string& source) : text_(text), source_(source) {}

  Device read() {
    if (text_.size() > kMaxDeviceFileBytes)
      throw InputError(
          source_, 0, 0,
          fmt::format("the device text is {} bytes, more than the limit of {} MiB", text_.size(), kMaxDeviceFileMiB));
    if ((normalized_ = normalized_text(text_))) text_ = *normalized_;
    RawTextCheck(text_, source_).run();
    TreeBuilder builder(tree_, text_, [this](const YAML::Mark& m, const std::string& msg) { fail(pos_of(m), msg); });
    try {
      TextBuf buf(text_);
      std::istream in(&buf);
      YAML::Parser parser(in);
      while (parser.HandleNextDocument(builder)) {
      }
    } catch (const YAML::DeepRecursion& e) {
      // yaml-cpp's own message here is unhelpful ("bad file").
      fail(pos_of(e.mark), "YAML syntax error: nesting is too deep");
    } catch (const YAML::ParserException& e) {
      unsigned long code = 0;
      if (std::sscanf(e.msg.c_str(), "invalid unicode: %lu", &code) == 1)
        fail(pos_of(e.mark), fmt::format("YAML syntax error: the escape for U+{:04X} is not a character (a surrogate "
                                         "or above U+10FFFF)",
                                         code));
      fail(pos_of(e.mark), "YAML syntax error: " + e.msg);
    }
    if (builder.documents() == 0)
      throw InputError(source_, 0, 0,
                       "the file is empty; expected a device description with name, qubits and couplers");
    const NodeRef root(tree_, tree_.root);
    if (root.null())
      fail(node_pos(root), "the YAML document is empty; expected a device description with name, qubits and couplers");
    if (!root.map())
      fail(node_pos(root),
           fmt::format("expected a device description (a mapping with name, qubits and couplers), found {}",
                       describe(root)));
    return read_root(root);
  }

 private:
  struct Entry {
    std::string key;
    Pos key_pos;
    NodeRef value;
  };

  [[noreturn]] void fail(Pos p, const std::string& message) const {
    throw InputError(source_, p.line, p.column, message);
  }

  Pos pos_of(const YAML::Mark& m) const {
    if (m.is_null() || m.line < 0) return {};
    if (m.pos < 0 || static_cast<std::size_t>(m.pos) < text_.size() || text_.empty()) return {m.line + 1, m.column + 1};
    // yaml-cpp reports what is missing at the end of the text ("end of sequence flow not found") just
    // past the last line break, on a line the file does not have: point at the end of its last line.
    const std::size_t end = text_.back() == '\n' ? text_.size() - 1 : text_.size();
    const std::size_t nl = end == 0 ? std::string_view::npos : text_.rfind('\n', end - 1);
    const std::size_t start = nl == std::string_view::npos ? 0 : nl + 1;
    const int line =
        1 + static_cast<int>(std::count(text_.begin(), text_.begin() + static_cast<std::ptrdiff_t>(start), '\n'));
    return {line, static_cast<int>(end - start) + 1};
  }

  /// Position of a node. yaml-cpp marks an implicit empty value ("- " with nothing after it) at the
  /// next token, which may be lines further on, so for those we point back at the last character
  /// before it instead (the '-' or ':' that introduced the missing value).
  Pos node_pos(const NodeRef& n) const {
    const auto& r = n.rec();
    if (r.line < 0) return {};
    const Pos marked{r.line + 1, r.column + 1};
    if (!n.null() || r.pos < 0) return marked;
    const std::string_view rest = std::string_view(text_).substr(std::min<std::size_t>(r.pos, text_.size()));
    for (std::string_view word : {"~", "null", "Null", "NULL"})
      if (rest.substr(0, word.size()) == word) return marked;
    std::size_t end = std::min<std::size_t>(r.pos, text_.size());
    while (end > 0) {
      const std::size_t nl = text_.rfind('\n', end - 1);
      const std::size_t start = nl == std::string::npos ? 0 : nl + 1;
      std::string_view line = std::string_view(text_).substr(start, end - start);
      // Drop a comment: '#' at the start of the line or after a blank.
      for (std::size_t i = 0; i < line.size(); ++i)
        if (line[i] == '#' && (i == 0 || line[i - 1] == ' ' || line[i - 1] == '\t')) {
          line = line.substr(0, i);
          break;
        }
      while (!line.empty() && (line.back() == ' ' || line.back() == '\t' || line.back() == '\r' || line.back() == '\n'))
        line.remove_suffix(1);
      if (!line.empty()) {
        const int lineno = 1 + static_cast<int>(std::count(text_.begin(), text_.begin() + start, '\n'));
        return {lineno, static_cast<int>(line.size())};
      }
      if (start == 0) break;
      end = start - 1;
    }
    return marked;
  }

  static std::string describe(const NodeRef& n) {
    if (n.null()) return "nothing";
    if (n.sequence()) return "a sequence";
    if (n.map()) return "a mapping";
    return (n.style() == Tree::Style::quoted ? "the quoted text " : "") + quote_text(n.text());
  }

  /// The keys of a mapping, in file order: each must be a known plain word and appear once.
  std::vector<Entry> entries(const NodeRef& map, const std::vector<std::string>& known, const std::string& context) {
    std::vector<Entry> out;
    for (std::size_t i = 0; i < map.size(); ++i) {
      const NodeRef k = map.key(i);
      const Pos kp = node_pos(k);
      if (!k.scalar()) fail(kp, fmt::format("expected a key name{}, found {}", in(context), describe(k)));
      const std::string key(k.text());
      if (std::find(known.begin(), known.end(), key) == known.end()) fail(kp, unknown_key_message(key, known, context));
      for (const auto& e : out)
        if (e.key == key)
          fail(kp, fmt::format("key '{}' appears twice{} (first on line {})", key, in(context), e.key_pos.line));
      out.push_back({key, kp, map.value(i)});
    }
    return out;
  }

  static std::string in(const std::string& context) { return context.empty() ? "" : " in " + context; }

  /// Where to report a problem with a mapping value: an implicit empty value has no useful mark of
  /// its own, so use its key's.
  Pos value_pos(const Entry& e) const { return e.value.null() ? e.key_pos : node_pos(e.value); }

  long long read_integer(const NodeRef& n, Pos p, const std::string& what) {
    if (!n.scalar() || n.style() != Tree::Style::plain)
      fail(p, fmt::format("{} must be a whole number, got {}", what, describe(n)));
    bool overflow = false;
    const auto v = parse_integer(n.text(), overflow);
    if (overflow) fail(p, fmt::format("{} is too large: {}", what, quote_text(n.text())));
    if (!v) fail(p, fmt::format("{} must be a whole number, got {}", what, describe(n)));
    return *v;
  }

  /// A number (never NaN: every range check below relies on that).
  double read_number(const NodeRef& n, Pos p, const std::string& what) {
    if (!n.scalar() || n.style() != Tree::Style::plain)
      fail(p, fmt::format("{} must be a number, got {}", what, describe(n)));
    const auto v = parse_number(n.text());
    if (!v) {
      // "inf" and "nan" are text in YAML 1.2 (section 10.3.2 writes .inf and .nan).
      std::string lower(n.text().substr(0, 16));
      std::transform(lower.begin(), lower.end(), lower.begin(), [](unsigned char c) { return std::tolower(c); });
      if (lower == "inf" || lower == "+inf" || lower == "infinity" || lower == "+infinity")
        fail(p, fmt::format("{} must be a number, got {} (YAML writes infinity as .inf)", what, describe(n)));
      fail(p, fmt::format("{} must be a number, got {}", what, describe(n)));
    }
    if (std::isnan(*v)) fail(p, fmt::format("{} must be a number, not NaN (got {})", what, n.text()));
    return *v;
  }

  double read_rate(const Entry& e) {
    const Pos p = value_pos(e);
    const double v = read_number(e.value, p, "'" + e.key + "'");
    if (!(v >= 0.0 && v <= 1.0))
      fail(p, fmt::format("'{}' must be a probability in [0, 1], got {}", e.key, e.value.text()));
    return v;
  }

  /// A gate time in ns: positive and at most kMaxGateDurationNs.
  double read_duration(const Entry& e) {
    const Pos p = value_pos(e);
    const double v = read_number(e.value, p, "'" + e.key + "'");
    if (!(v > 0.0 && v <= kMaxGateDurationNs))
      fail(p, fmt::format("'{}' must be a positive number of ns, at most 1e9 (one second), got {}", e.key,
                          e.value.text()));
    return v;
  }

  /// A T1 or T2 time in microseconds: positive, or .inf for a qubit that does not decay.
  double read_lifetime(const Entry& e) {
    const Pos p = value_pos(e);
    const double v = read_number(e.value, p, "'" + e.key + "'");
    if (!(v > 0.0))
      fail(p, fmt::format("'{}' must be a positive number (or .inf for no decay), got {}", e.key, e.value.text()));
    return v;
  }

  /// A calibration value: error rates are probabilities, durations gate times, t1/t2 lifetimes.
  double read_value(const Entry& e) {
    if (e.key.starts_with("error")) return read_rate(e);
    if (e.key.starts_with("duration")) return read_duration(e);
    return read_lifetime(e);
  }

  /// A qubit id, the value of 'id' in an entry of `list`, that must name one of the device's qubits.
  int read_qubit_id(const NodeRef& n, Pos p, const std::string& list) {
    const long long id = read_integer(n, p, "'id' in " + list);
    if (id < 0 || id >= qubits_)
      fail(p, fmt::format("{} names qubit {}, but the device's qubits are 0..{}", list, id, qubits_ - 1));
    return static_cast<int>(id);
  }

  static const Entry* find(const std::vector<Entry>& es, const std::string& key) {
    for (const auto& e : es)
      if (e.key == key) return &e;
    return nullptr;
  }

  Device read_root(const NodeRef& root) {
    const auto top = entries(root, kTopKeys, "");
    const Pos root_pos = node_pos(root);
    DeviceDescription d;

    const Entry* name = find(top, "name");
    if (!name) fail(root_pos, "missing required key 'name'");
    if (!name->value.scalar())
      fail(value_pos(*name), fmt::format("'name' must be text, got {}", describe(name->value)));
    d.name = name->value.text();
    if (d.name.empty()) fail(value_pos(*name), "'name' must not be empty");

    const Entry* qubits = find(top, "qubits");
    if (!qubits) fail(root_pos, "missing required key 'qubits'");
    const Pos qp = value_pos(*qubits);
    const long long n = read_integer(qubits->value, qp, "'qubits'");
    if (n < 1) fail(qp, fmt::format("'qubits' must be at least 1, got {}", n));
    // Refuse before anything is sized by the qubit count.
    if (n > kMaxDeviceQubits) fail(qp, fmt::format("'qubits' is {}, more than the limit of {}", n, kMaxDeviceQubits));
    qubits_ = static_cast<int>(n);
    d.qubits = qubits_;

    const Entry* couplers = find(top, "couplers");
    if (!couplers) fail(root_pos, "missing required key 'couplers' (write 'couplers: []' for a chip without any)");
    read_couplers(*couplers, d);

    if (const Entry* e = find(top, "calibration")) read_calibration(*e, d.calibration);
    if (const Entry* e = find(top, "qubit_calibration")) read_overrides(*e, d);
    if (const Entry* e = find(top, "positions")) read_positions(*e, d);
    if (const Entry* e = find(top, "native_2q")) {
      const Pos p = value_pos(*e);
      if (!e->value.scalar() || (e->value.text() != "cx" && e->value.text() != "cz"))
        fail(p, fmt::format("unknown native_2q {}; expected cx or cz", describe(e->value)));
      d.native_2q = e->value.text() == "cz" ? TwoQubitGate::cz : TwoQubitGate::cx;
    }

    try {
      return Device(std::move(d));
    } catch (const InputError& err) {
      // The checks above should have caught everything with a position; this is the backstop.
      throw InputError(source_, 0, 0, err.message());
    }
  }

  void read_couplers(const Entry& e, DeviceDescription& d) {
    if (!e.value.sequence())
      fail(value_pos(e), fmt::format("'couplers' must be a sequence of qubit pairs such as [0, 1] (use [] for none), "
                                     "got {}",
                                     describe(e.value)));
    const std::size_t count = e.value.size();
    d.couplers.reserve(count);
    std::vector<int> line_of;  // line of each accepted coupler, for duplicate messages
    line_of.reserve(count);
    std::unordered_map<std::uint64_t, int> seen;
    seen.reserve(count);
    for (std::size_t i = 0; i < count; ++i) {
      const NodeRef item = e.value[i];
      const Pos ip = node_pos(item);
      NodeRef pair = item;
      Pos pair_pos = ip;
      Coupler c;
      if (item.map()) {
        const auto fields = entries(item, kCouplerKeys, "coupler");
        const Entry* p = find(fields, "pair");
        if (!p) fail(ip, "a coupler mapping needs 'pair: [a, b]'");
        pair = p->value;
        pair_pos = value_pos(*p);
        if (const Entry* f = find(fields, "error")) c.error = read_rate(*f);
        if (const Entry* f = find(fields, "duration_ns")) c.duration_ns = read_duration(*f);
      } else if (!item.sequence()) {
        fail(ip, fmt::format("a coupler must be a pair such as [0, 1] or a mapping such as "
                             "{{pair: [0, 1], error: 0.01}}, got {}",
                             describe(item)));
      }
      if (!pair.sequence())
        fail(pair_pos, fmt::format("a coupler's pair must be a sequence of two qubit ids, got {}", describe(pair)));
      if (pair.size() != 2) fail(pair_pos, fmt::format("a coupler must name exactly two qubits, got {}", pair.size()));
      const NodeRef na = pair[0], nb = pair[1];
      const long long a = read_integer(na, node_pos(na), "qubit id");
      const long long b = read_integer(nb, node_pos(nb), "qubit id");
      for (const auto& [id, node] : {std::pair{a, na}, std::pair{b, nb}})
        if (id < 0 || id >= qubits_)
          fail(node_pos(node), fmt::format("coupler [{}, {}] names qubit {}, but the device's qubits are 0..{}", a, b,
                                           id, qubits_ - 1));
      if (a == b) fail(pair_pos, fmt::format("coupler [{}, {}] joins qubit {} to itself", a, b, a));
      const auto lo = static_cast<std::uint64_t>(std::min(a, b)), hi = static_cast<std::uint64_t>(std::max(a, b));
      const auto [it, fresh] =
          seen.emplace(lo * static_cast<std::uint64_t>(qubits_) + hi, static_cast<int>(d.couplers.size()));
      if (!fresh) {
        const Coupler& first = d.couplers[it->second];
        const int first_line = line_of[it->second];
        if (first.a == a)
          fail(pair_pos, fmt::format("coupler [{}, {}] is listed twice (first on line {})", a, b, first_line));
        fail(pair_pos, fmt::format("coupler [{}, {}] repeats [{}, {}] from line {} (couplers are undirected)", a, b,
                                   first.a, first.b, first_line));
      }
      c.a = static_cast<int>(a);
      c.b = static_cast<int>(b);
      d.couplers.push_back(c);
      line_of.push_back(pair_pos.line);
    }
  }

  void read_calibration(const Entry& e, CalibrationValues& cal) {
    if (!e.value.map())
      fail(value_pos(e),
           fmt::format("'calibration' must be a mapping such as {{error_2q: 0.008}}, got {}", describe(e.value)));
    for (const auto& f : entries(e.value, kCalibrationKeys, "calibration")) {
      // An infinite T1 or T2 (.inf) is a qubit that does not decay: kept as written.
      cal.*calibration_field(f.key) = read_value(f);
    }
  }

  void read_overrides(const Entry& e, DeviceDescription& d) {
    if (!e.value.sequence())
      fail(value_pos(e), fmt::format("'qubit_calibration' must be a sequence of mappings such as "
                                     "{{id: 3, t1_us: 40}}, got {}",
                                     describe(e.value)));
    std::unordered_map<int, int> line_of;  // qubit id -> line of its entry
    for (std::size_t i = 0; i < e.value.size(); ++i) {
      const NodeRef item = e.value[i];
      const Pos ip = node_pos(item);
      if (!item.map())
        fail(ip, fmt::format("a qubit_calibration entry must be a mapping such as {{id: 3, t1_us: 40}}, got {}",
                             describe(item)));
      const auto fields = entries(item, kOverrideKeys, "qubit_calibration");
      const Entry* id = find(fields, "id");
      if (!id) fail(ip, "a qubit_calibration entry needs 'id'");
      QubitOverride o;
      o.id = read_qubit_id(id->value, value_pos(*id), "qubit_calibration");
      if (const auto [it, fresh] = line_of.emplace(o.id, value_pos(*id).line); !fresh)
        fail(value_pos(*id),
             fmt::format("qubit_calibration lists qubit {} twice (first on line {})", o.id, it->second));
      for (const auto& f : fields) {
        if (f.key == "id") continue;
        o.*override_field(f.key) = read_value(f);
      }
      d.qubit_calibration.push_back(o);
    }
  }

  void read_positions(const Entry& e, DeviceDescription& d) {
    if (!e.value.sequence())
      fail(value_pos(e), fmt::format("'positions' must be a sequence of mappings such as {{id: 0, at: [0.0, 0.0]}}, "
                                     "got {}",
                                     describe(e.value)));
    // The key's presence alone gives one (possibly empty) slot per qubit, so that writing back
    // "positions: []" reproduces the same description.
    d.positions.assign(qubits_, std::nullopt);
    std::vector<int> line_of(qubits_, 0);
    for (std::size_t i = 0; i < e.value.size(); ++i) {
      const NodeRef item = e.value[i];
      const Pos ip = node_pos(item);
      if (!item.map())
        fail(ip, fmt::format("a positions entry must be a mapping such as {{id: 0, at: [0.0, 0.0]}}, got {}",
                             describe(item)));
      const auto fields = entries(item, kPositionKeys, "positions");
      const Entry* id = find(fields, "id");
      const Entry* at = find(fields, "at");
      if (!id) fail(ip, "a positions entry needs 'id'");
      if (!at) fail(ip, "a positions entry needs 'at: [x, y]'");
      const int q = read_qubit_id(id->value, value_pos(*id), "positions");
      if (line_of[q] > 0)
        fail(value_pos(*id), fmt::format("positions lists qubit {} twice (first on line {})", q, line_of[q]));
      line_of[q] = value_pos(*id).line;
      const Pos ap = value_pos(*at);
      if (!at->value.sequence())
        fail(ap, fmt::format("'at' must be a pair of coordinates [x, y], got {}", describe(at->value)));
      if (at->value.size() != 2)
        fail(ap, fmt::format("'at' must be a pair of coordinates [x, y], got a list of {}", at->value.size()));
      Point pt;
      const NodeRef nx = at->value[0], ny = at->value[1];
      pt.x = read_number(nx, node_pos(nx), "a coordinate");
      pt.y = read_number(ny, node_pos(ny), "a coordinate");
      if (!std::isfinite(pt.x) || !std::isfinite(pt.y))
        fail(ap, fmt::format("coordinates must be finite numbers, got [{}, {}]", nx.text(), ny.text()));
      d.positions[q] = pt;
    }
  }

  std::string_view text_;                  // the text as parsed (normalized_ when that was needed)
  std::optional<std::string> normalized_;  // line breaks made LF, byte order mark dropped
  const std::string& source_;
  Tree tree_;
  int qubits_ = 0;
};

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

Device parse_device_yaml(const std::string& text, const std::string& source) { return Reader(text, source).read(); }

Device load_device_file(const std::string& path) {
  namespace fs = std::filesystem;
  if (path.empty()) throw InputError("no device file given (the path is empty)");
  std::error_code ec;
  const auto status = fs::status(path, ec);
  if (!fs::exists(status)) {
    if (ec && ec != std::errc::no_such_file_or_directory) throw InputError(path, 0, 0, "cannot open: " + ec.message());
    throw InputError(path, 0, 0, "no such file");
  }
  if (fs::is_directory(status)) throw InputError(path, 0, 0, "is a directory, not a device file");
  if (!fs::is_regular_file(status)) throw InputError(path, 0, 0, "is not a regular file");
  const auto size = fs::file_size(path, ec);
  if (!ec && size > kMaxDeviceFileBytes)
    throw InputError(path, 0, 0,
                     fmt::format("the file is {} bytes, more than the limit of {} MiB", size, kMaxDeviceFileMiB));
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path, 0, 0, std::string("cannot open: ") + std::strerror(errno));
  // Read at most one byte past the limit, in case the file grew since it was measured.
  std::string text(static_cast<std::size_t>(std::min<std::uintmax_t>(ec ? 0 : size, kMaxDeviceFileBytes)), '\0');
  in.read(text.data(), static_cast<std::streamsize>(text.size()));
  text.resize(static_cast<std::size_t>(in.gcount()));
  char buf[65536];
  while (in && text.size() <= kMaxDeviceFileBytes) {
    in.read(buf, sizeof buf);
    text.append(buf, static_cast<std::size_t>(in.gcount()));
  }
  if (in.bad()) throw InputError(path, 0, 0, "cannot read the file");
  if (text.size() > kMaxDeviceFileBytes)
    throw InputError(path, 0, 0, fmt::format("the file is more than the limit of {} MiB", kMaxDeviceFileMiB));
  return parse_device_yaml(text, path);
}

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
                                                                           {"t2_us", &c.t2_us}};
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
                                                                             {"t2_us", &o.t2_us}};
      for (const auto& [key, value] : fields)
        if (*value) out += fmt::format(", {}: {}", key, num(**value));
      out += "}\n";
    }
  }

  if (d.couplers.empty()) {
    out += "couplers: []\n";
  } else {
    out += "couplers:\n";
    for (const auto& cp : d.couplers) {
      if (!cp.error && !cp.duration_ns) {
        out += fmt::format("  - [{}, {}]\n", cp.a, cp.b);
        continue;
      }
      out += fmt::format("  - {{pair: [{}, {}]", cp.a, cp.b);
      if (cp.error) out += ", error: " + num(*cp.error);
      if (cp.duration_ns) out += ", duration_ns: " + num(*cp.duration_ns);
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
