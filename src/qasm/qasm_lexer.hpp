#pragma once
// The scanner of the OpenQASM reader (private to the reader): positions and errors, whitespace
// and comments (with our header comments), identifiers, punctuation and unsigned integers. The
// per-token functions are inline: a 1024-qubit QFT in native gates is over a million lines.

#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace qftplan::qasm_detail {

/// A place in the buffer: line number, start of that line, and the character.
struct Pos {
  int line = 0;                       ///< 1-based line
  const char* line_start = nullptr;   ///< first character of that line
  const char* at = nullptr;           ///< the character
};

/// Character classes without the locale (std::isalpha and friends are calls into the C library).
inline bool is_digit(unsigned char c) { return c >= '0' && c <= '9'; }
/// ASCII letter.
inline bool is_alpha(unsigned char c) { return (c | 0x20) >= 'a' && (c | 0x20) <= 'z'; }
/// First character of an identifier (bytes of UTF-8 letters included).
inline bool ident_start(unsigned char c) { return is_alpha(c) || c == '_' || c >= 0x80; }
/// Later character of an identifier.
inline bool ident_char(unsigned char c) { return is_alpha(c) || is_digit(c) || c == '_' || c >= 0x80; }

/// What our writer's header comments said (`// device: NAME`, `// placement: ...`, `// final_placement: ...`).
struct HeaderComments {
  std::optional<std::string> device_name;           ///< from "// device: NAME"
  std::optional<std::vector<int>> placement;        ///< from "// placement: a,b,c"
  std::optional<std::vector<int>> final_placement;  ///< from "// final_placement: a,b,c"
  std::optional<std::string> transform;             ///< from "// transform: TEXT"
};

/// Reads tokens from one buffer; every error is an InputError at a line and column of `source`.
class Lexer {
 public:
  /// Scans `size` bytes at `data`, named `source` in messages (both must outlive the lexer).
  Lexer(const char* data, std::size_t size, const std::string& source)
      : begin_(data), p_(data), end_(data + size), line_start_(data), source_(source) {}

 protected:
  /// The current position.
  Pos here() const { return {line_, line_start_, p_}; }
  /// Throws InputError at `pos`.
  [[noreturn]] void fail(const Pos& pos, const std::string& msg) const;
  /// Throws InputError at the current position.
  [[noreturn]] void fail_here(const std::string& msg) const { fail(here(), msg); }
  /// The next token, spelled for an error message ("'x'", "end of file", ...).
  std::string found() const;

  /// Skips whitespace and comments, reading our header comments on the way.
  void skip_ws() {
    while (p_ < end_) {
      const char c = *p_;
      if (c == ' ' || c == '\t' || c == '\r') {
        ++p_;
      } else if (c == '\n') {
        ++p_;
        ++line_;
        line_start_ = p_;
      } else if (c == '/' && p_ + 1 < end_ && (p_[1] == '/' || p_[1] == '*')) {
        skip_comment();
      } else {
        break;
      }
    }
  }

  /// True when the next token is `c` (not consumed).
  bool peek(char c) {
    skip_ws();
    return p_ < end_ && *p_ == c;
  }
  /// Consumes `c` when it is the next token.
  bool accept(char c) {
    if (peek(c)) {
      ++p_;
      return true;
    }
    return false;
  }
  /// Consumes `c` or fails.
  void expect(char c) {
    if (!accept(c)) fail_expected(c);
  }

  /// The next identifier, or an empty view when none follows.
  std::string_view ident() {
    skip_ws();
    const char* s = p_;
    if (p_ < end_ && ident_start(static_cast<unsigned char>(*p_))) {
      ++p_;
      while (p_ < end_ && ident_char(static_cast<unsigned char>(*p_))) ++p_;
    }
    return {s, static_cast<std::size_t>(p_ - s)};
  }
  /// The next identifier, or fails saying `what` was expected.
  std::string_view expect_ident(const char* what);
  /// A non-negative decimal integer (sizes, indices, $k), or fails saying `what` was expected.
  std::int64_t expect_uint(const char* what);

  const char* begin_;        ///< start of the buffer
  const char* p_;            ///< next character
  const char* end_;          ///< end of the buffer
  int line_ = 1;             ///< line of p_
  const char* line_start_;   ///< start of that line
  const std::string& source_;  ///< file name for messages
  HeaderComments header_;    ///< what the header comments said so far

 private:
  // One // or /* comment at p_; a // comment followed by a space may be one of our header lines.
  void skip_comment();
  // `// device: NAME`, `// placement: 4,3,2,1,0`, `// final_placement: ...` (our writer's lines).
  void header_comment(const char* eol);
  // The comma-separated numbers of a placement comment.
  std::vector<int> int_list(const char* s, const char* e, const char* what);
  // Kept out of line: only the error path builds strings.
  [[noreturn]] void fail_expected(char c) const;
};

}  // namespace qftplan::qasm_detail
