#pragma once
/// \file yaml_tree.hpp
/// Private to the device layer: a parsed YAML document in compact form, built from yaml-cpp's parse events.

#include <cstdint>
#include <functional>
#include <string>
#include <string_view>
#include <vector>

namespace qftplan::yaml_detail {

/// A 1-based source position (0 = unknown).
struct Pos {
  int line = 0;
  int column = 0;
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

/// Reports a problem found while parsing; it must throw (the parse cannot go on after it returns).
using TreeFail = std::function<void(Pos, const std::string&)>;

/// Parses `text` (as normalized_text leaves it) into `tree` and returns how many YAML documents it holds
/// (0 for none). Syntax errors, explicit tags, NUL characters, a second document, more than 20,000,000
/// nodes and an alias inside its own anchored node are reported through `fail`.
int build_tree(std::string_view text, Tree& tree, const TreeFail& fail);

/// The position of node `n` of a tree parsed from `text`; an implicit empty value is placed on the '-'
/// or ':' that introduced it rather than at the next token, which may be lines further on.
Pos node_pos(const NodeRef& n, std::string_view text);

}  // namespace qftplan::yaml_detail
