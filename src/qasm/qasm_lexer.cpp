// The scanner of the OpenQASM reader: the parts off the per-token path (comments, errors).

#include "qasm_lexer.hpp"

#include <charconv>
#include <cstring>

#include "qftplan/core/input_error.hpp"

namespace qftplan::qasm_detail {

void Lexer::fail(const Pos& pos, const std::string& msg) const {
  // Columns count characters, not bytes (a line may hold a UTF-8 pi).
  int col = 1;
  for (const char* c = pos.line_start; c < pos.at && c < end_; ++c)
    if ((static_cast<unsigned char>(*c) & 0xC0) != 0x80) ++col;
  throw InputError(source_, pos.line, col, msg);
}

void Lexer::fail_expected(char c) const { fail_here(std::string("expected '") + c + "' but found " + found()); }

std::string Lexer::found() const {
  if (p_ >= end_) return "end of file";
  const unsigned char c = static_cast<unsigned char>(*p_);
  if (ident_start(c)) {
    const char* q = p_;
    while (q < end_ && ident_char(static_cast<unsigned char>(*q))) ++q;
    return "'" + std::string(p_, q) + "'";
  }
  if (c < 0x20) return "character code " + std::to_string(c);
  return std::string("'") + static_cast<char>(c) + "'";
}

void Lexer::skip_comment() {
  if (p_[1] == '/') {
    const char* eol = static_cast<const char*>(std::memchr(p_, '\n', static_cast<std::size_t>(end_ - p_)));
    if (!eol) eol = end_;
    if (p_ + 2 < eol && p_[2] == ' ') header_comment(eol);
    p_ = eol;
    return;
  }
  const Pos open = here();
  p_ += 2;
  for (;;) {
    if (p_ + 1 >= end_) fail(open, "unterminated /* comment");
    if (*p_ == '*' && p_[1] == '/') {
      p_ += 2;
      break;
    }
    if (*p_ == '\n') {
      ++line_;
      line_start_ = p_ + 1;
    }
    ++p_;
  }
}

void Lexer::header_comment(const char* eol) {
  const char* s = p_ + 3;
  auto key = [&](std::string_view k) {
    if (static_cast<std::size_t>(eol - s) >= k.size() && std::memcmp(s, k.data(), k.size()) == 0) {
      s += k.size();
      return true;
    }
    return false;
  };
  const char* e = eol;
  while (e > s && (e[-1] == '\r' || e[-1] == ' ' || e[-1] == '\t')) --e;
  if (key("device:")) {
    while (s < e && (*s == ' ' || *s == '\t')) ++s;
    if (header_.device_name) fail(here(), "second '// device:' comment");
    header_.device_name = std::string(s, e);
  } else if (key("placement:")) {
    if (header_.placement) fail(here(), "second '// placement:' comment");
    header_.placement = int_list(s, e, "placement");
  } else if (key("transform:")) {
    while (s < e && (*s == ' ' || *s == '\t')) ++s;
    if (header_.transform) fail(here(), "second '// transform:' comment");
    header_.transform = std::string(s, e);
  } else if (key("final_placement:")) {
    if (header_.final_placement) fail(here(), "second '// final_placement:' comment");
    header_.final_placement = int_list(s, e, "final_placement");
  }
}

std::vector<int> Lexer::int_list(const char* s, const char* e, const char* what) {
  std::vector<int> out;
  for (;;) {
    while (s < e && (*s == ' ' || *s == '\t')) ++s;
    int v = 0;
    auto [q, ec] = std::from_chars(s, e, v);
    if (ec != std::errc() || v < 0) fail({line_, line_start_, s}, std::string("bad number in the ") + what + " comment");
    out.push_back(v);
    s = q;
    while (s < e && (*s == ' ' || *s == '\t')) ++s;
    if (s == e) break;
    if (*s != ',') fail({line_, line_start_, s}, std::string("expected ',' in the ") + what + " comment");
    ++s;
  }
  return out;
}

std::string_view Lexer::expect_ident(const char* what) {
  auto w = ident();
  if (w.empty()) fail_here(std::string("expected ") + what + " but found " + found());
  return w;
}

std::int64_t Lexer::expect_uint(const char* what) {
  skip_ws();
  const Pos at = here();
  if (p_ >= end_ || !is_digit(static_cast<unsigned char>(*p_)))
    fail_here(std::string("expected ") + what + " but found " + found());
  std::int64_t v = 0;
  while (p_ < end_ && is_digit(static_cast<unsigned char>(*p_))) {
    if (v < (std::int64_t{1} << 40)) v = v * 10 + (*p_ - '0');
    ++p_;
  }
  if (p_ < end_ && ident_char(static_cast<unsigned char>(*p_))) fail(at, std::string("bad ") + what);
  return v;
}

}  // namespace qftplan::qasm_detail
