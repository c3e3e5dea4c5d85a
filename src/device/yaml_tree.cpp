#include "yaml_tree.hpp"

#include <algorithm>
#include <cstdio>
#include <cstring>
#include <istream>
#include <streambuf>
#include <unordered_map>
#include <utility>

#include <fmt/format.h>
#include <yaml-cpp/depthguard.h>
#include <yaml-cpp/eventhandler.h>
#include <yaml-cpp/exceptions.h>
#include <yaml-cpp/mark.h>
#include <yaml-cpp/parser.h>

#include "yaml_messages.hpp"

namespace qftplan::yaml_detail {
namespace {

// The file is checked to be UTF-8 before yaml-cpp reads it, but yaml-cpp 0.7 decodes the escapes \N
// (U+0085) and \_ (U+00A0) of double-quoted scalars to the single Latin-1 bytes 0x85 and 0xA0 (YAML
// 1.2, section 5.7, names the characters, not bytes): a value is taken as UTF-8, such a lone byte is
// written as the two bytes of its character.
std::string as_utf8(const std::string& value) {
  std::string out;
  out.reserve(value.size());
  for (std::size_t i = 0; i < value.size();) {
    const auto u = static_cast<unsigned char>(value[i]);
    const std::size_t len = u < 0x80 ? 1 : (u >> 5) == 0x6 ? 2 : (u >> 4) == 0xE ? 3 : (u >> 3) == 0x1E ? 4 : 0;
    bool whole = len > 0 && i + len <= value.size();
    for (std::size_t k = 1; whole && k < len; ++k) whole = (static_cast<unsigned char>(value[i + k]) >> 6) == 0x2;
    if (whole) {
      out.append(value, i, len);
      i += len;
    } else {
      // A lone byte 0x80..0xFF stands for the character of that code point.
      out += static_cast<char>(0xC0 | (u >> 6));
      out += static_cast<char>(0x80 | (u & 0x3F));
      ++i;
    }
  }
  return out;
}

/// Upper bound on YAML nodes (and alias uses) in one file: bounds memory and work whatever the text.
constexpr long long kMaxVisitedNodes = 20'000'000;

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
    const std::string text = as_utf8(value);
    const std::uint32_t i = add(mark, Tree::Kind::scalar, style);
    t_.records[i].begin = static_cast<std::uint32_t>(t_.chars.size());
    t_.records[i].count = static_cast<std::uint32_t>(text.size());
    t_.chars += text;
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

/// The 1-based position of a yaml-cpp mark in `text` (0 = unknown).
Pos mark_pos(const YAML::Mark& m, std::string_view text) {
  if (m.is_null() || m.line < 0) return {};
  if (m.pos < 0 || static_cast<std::size_t>(m.pos) < text.size() || text.empty()) return {m.line + 1, m.column + 1};
  // yaml-cpp reports what is missing at the end of the text ("end of sequence flow not found") just
  // past the last line break, on a line the file does not have: point at the end of its last line.
  const std::size_t end = text.back() == '\n' ? text.size() - 1 : text.size();
  const std::size_t nl = end == 0 ? std::string_view::npos : text.rfind('\n', end - 1);
  const std::size_t start = nl == std::string_view::npos ? 0 : nl + 1;
  const int line =
      1 + static_cast<int>(std::count(text.begin(), text.begin() + static_cast<std::ptrdiff_t>(start), '\n'));
  return {line, static_cast<int>(end - start) + 1};
}

}  // namespace

int build_tree(std::string_view text, Tree& tree, const TreeFail& fail) {
  TreeBuilder builder(tree, text, [&](const YAML::Mark& m, const std::string& msg) { fail(mark_pos(m, text), msg); });
  try {
    TextBuf buf(text);
    std::istream in(&buf);
    YAML::Parser parser(in);
    while (parser.HandleNextDocument(builder)) {
    }
  } catch (const YAML::DeepRecursion& e) {
    // yaml-cpp's own message here is unhelpful ("bad file").
    fail(mark_pos(e.mark, text), "YAML syntax error: nesting is too deep");
  } catch (const YAML::ParserException& e) {
    unsigned long code = 0;
    if (std::sscanf(e.msg.c_str(), "invalid unicode: %lu", &code) == 1)
      fail(mark_pos(e.mark, text), fmt::format("YAML syntax error: the escape for U+{:04X} is not a character (a "
                                               "surrogate or above U+10FFFF)",
                                               code));
    fail(mark_pos(e.mark, text), "YAML syntax error: " + e.msg);
  }
  return builder.documents();
}

// yaml-cpp marks an implicit empty value ("- " with nothing after it) at the next token, so for those the
// position is the last character before it instead (the '-' or ':' that introduced the missing value).
Pos node_pos(const NodeRef& n, std::string_view text) {
  const auto& r = n.rec();
  if (r.line < 0) return {};
  const Pos marked{r.line + 1, r.column + 1};
  if (!n.null() || r.pos < 0) return marked;
  const std::string_view rest = text.substr(std::min<std::size_t>(r.pos, text.size()));
  for (std::string_view word : {"~", "null", "Null", "NULL"})
    if (rest.substr(0, word.size()) == word) return marked;
  std::size_t end = std::min<std::size_t>(r.pos, text.size());
  while (end > 0) {
    const std::size_t nl = text.rfind('\n', end - 1);
    const std::size_t start = nl == std::string::npos ? 0 : nl + 1;
    std::string_view line = text.substr(start, end - start);
    // Drop a comment: '#' at the start of the line or after a blank.
    for (std::size_t i = 0; i < line.size(); ++i)
      if (line[i] == '#' && (i == 0 || line[i - 1] == ' ' || line[i - 1] == '\t')) {
        line = line.substr(0, i);
        break;
      }
    while (!line.empty() && (line.back() == ' ' || line.back() == '\t' || line.back() == '\r' || line.back() == '\n'))
      line.remove_suffix(1);
    if (!line.empty()) {
      const int lineno = 1 + static_cast<int>(std::count(text.begin(), text.begin() + start, '\n'));
      return {lineno, static_cast<int>(line.size())};
    }
    if (start == 0) break;
    end = start - 1;
  }
  return marked;
}

}  // namespace qftplan::yaml_detail
