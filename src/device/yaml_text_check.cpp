#include "yaml_text_check.hpp"

#include <cstdint>

#include <fmt/format.h>

#include "qftplan/core/input_error.hpp"

namespace qftplan::yaml_detail {
namespace {

/// Deepest nesting of flow collections ([ and {) accepted. yaml-cpp scans a whole run of open brackets
/// before its own depth check fires (2,000,000 of them cost about 470 MB and seconds), so the raw text is
/// checked first. Device files need 3 levels (positions: [{id: 0, at: [0, 0]}]).
constexpr int kMaxFlowDepth = 64;

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

  /// Reads one character of the syntax (not the indentation), moving the scanner's state along.
  void step(unsigned char uc) {
    const char c = static_cast<char>(uc);
    if (inside_text(c)) return;
    if (space(c)) return;
    if (c == '#' && after_space()) {
      st_ = State::comment;
      return;
    }
    if (structure(c)) return;
    if (st_ != State::token) {
      if (st_ == State::done) st_ = State::plain;
      return;
    }
    start_token(c);
  }

  /// Inside a comment, block scalar, quoted scalar or property: true when `c` belongs to it; false when
  /// `c` is to be read as structure (a property just ended).
  bool inside_text(char c) {
    switch (st_) {
      case State::comment:
      case State::block:
        return true;
      case State::single_quoted:
        if (c == '\'') {
          if (next() == '\'')
            ++i_;  // '' stands for one quote
          else
            st_ = State::done;
        }
        return true;
      case State::double_quoted:
        if (escaped_)
          escaped_ = false;
        else if (c == '\\')
          escaped_ = true;
        else if (c == '"')
          st_ = State::done;
        return true;
      case State::property:
        if (verbatim_) {
          if (c == '>') verbatim_ = false;
          return true;
        }
        if (space(c)) {
          st_ = State::token;
          return true;
        }
        // Anchor and tag names never hold flow indicators (YAML 1.2, sections 6.9.1 and 6.9.2): one ends
        // the property and is read as structure.
        if (!flow_indicator(c)) return true;
        st_ = State::token;
        break;
      default:
        break;
    }
    return false;
  }

  /// A flow indicator or value indicator acting as structure: true when `c` was one.
  bool structure(char c) {
    switch (c) {
      case '[':
      case '{':
        // In block context a bracket inside a plain scalar is text; in flow context it always opens.
        if (st_ == State::token || depth_ > 0) {
          if (++depth_ > kMaxFlowDepth)
            fail(i_, fmt::format("flow sequences and mappings are nested more than {} deep", kMaxFlowDepth));
          st_ = State::token;
          return true;
        }
        break;
      case ']':
      case '}':
        if (depth_ > 0) {
          --depth_;
          st_ = State::done;
          return true;
        }
        break;
      case ',':
        if (depth_ > 0) {
          st_ = State::token;
          return true;
        }
        break;
      case ':':
        // A value indicator: followed by a blank, or in flow context by an indicator or after a quoted key.
        if (space(next()) || next() == '\n' || st_ == State::done || (depth_ > 0 && flow_indicator(next()))) {
          st_ = State::token;
          return true;
        }
        break;
      default:
        break;
    }
    return false;
  }

  /// The first character of a token: what it starts (quoted text, a property, a block scalar or plain text).
  void start_token(char c) {
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

}  // namespace

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

void check_raw_text(std::string_view text, const std::string& source) { RawTextCheck(text, source).run(); }

}  // namespace qftplan::yaml_detail
