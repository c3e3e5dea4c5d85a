#pragma once
/// \file svg_document.hpp
/// A small writer of SVG 1.1 documents (W3C, Scalable Vector Graphics 1.1, 2011): shapes and text
/// appended in painting order, attributes escaped, numbers written compactly.

#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace qftplan {

/// Paint of a shape. Empty strings leave the attribute out.
struct SvgPaint {
  /// Fill, then optionally stroke colour, width and dash pattern.
  SvgPaint(std::string fill_ = "none", std::string stroke_ = {}, double width = 1, std::string dash_ = {})
      : fill(std::move(fill_)), stroke(std::move(stroke_)), stroke_width(width), dash(std::move(dash_)) {}
  std::string fill = "none";   ///< fill colour or "none"
  std::string stroke;          ///< stroke colour; empty: no stroke
  double stroke_width = 1;     ///< px
  std::string dash;            ///< stroke-dasharray, such as "6 3"
  double opacity = 1;          ///< applied to the whole shape
  std::string linecap;         ///< butt, round or square
  std::string linejoin;        ///< miter, round or bevel
};

/// Look of a text element.
struct SvgFont {
  /// Size in px, anchor, colour and weight.
  SvgFont(double size_ = 12, std::string anchor_ = "start", std::string fill_ = "#1a1a1a", bool bold_ = false)
      : size(size_), anchor(std::move(anchor_)), fill(std::move(fill_)), bold(bold_) {}
  double size = 12;                ///< px
  std::string anchor = "start";    ///< text-anchor: start, middle or end
  std::string fill = "#1a1a1a";   ///< text colour
  bool bold = false;              ///< bold weight
  double rotate = 0;               ///< degrees, about the anchor point
  bool middle = false;             ///< centred vertically on y (baseline moved down by kTextMiddleEm)
  std::string family;              ///< font-family; empty: the document's
};

/// How far below the middle of digits and capitals their baseline lies, in em: half the height of
/// DejaVu Sans digits (1493 of 2048 font units, from memory; the test measures a rendering). The
/// writer moves a `middle` text's baseline by this much instead of writing dominant-baseline,
/// which librsvg 2.54 ignores, so that every renderer centres the text the same way.
inline constexpr double kTextMiddleEm = 0.364;

/// A point of a polyline or polygon.
struct SvgPoint {
  double x = 0;  ///< px (or data units before scaling)
  double y = 0;  ///< px (or data units before scaling)
};

/// Escapes &, <, >, " and ' for XML text and attribute values.
std::string svg_escape(std::string_view text);

/// A number with at most two decimals and no trailing zeros ("12", "3.5", "-0.25").
std::string svg_number(double v);

/// An SVG document of a given size in px, built by appending elements.
class SvgDocument {
 public:
  /// `title` becomes the document's <title> (shown by viewers and read by screen readers).
  SvgDocument(double width, double height, std::string title);

  /// A straight line from (x1, y1) to (x2, y2).
  void line(double x1, double y1, double x2, double y2, const SvgPaint& paint);
  /// A rectangle with its top-left corner at (x, y), optionally with rounded corners.
  void rect(double x, double y, double w, double h, const SvgPaint& paint, double corner_radius = 0);
  /// A circle centred at (cx, cy).
  void circle(double cx, double cy, double r, const SvgPaint& paint);
  /// An open line through the points.
  void polyline(const std::vector<SvgPoint>& points, const SvgPaint& paint);
  /// A closed shape through the points.
  void polygon(const std::vector<SvgPoint>& points, const SvgPaint& paint);
  /// A path with SVG path data `d` (commands M, L, Z, ...).
  void path(const std::string& d, const SvgPaint& paint);
  /// Text anchored at (x, y) (escaped here).
  void text(double x, double y, std::string_view content, const SvgFont& font);
  /// Opens a group; `id` and `css_class` are left out when empty.
  void begin_group(std::string_view id = {}, std::string_view css_class = {});
  /// Closes the innermost open group.
  void end_group();
  /// A linear gradient definition usable as fill "url(#id)"; stops are (offset 0..1, colour).
  void linear_gradient(std::string_view id, const std::vector<std::pair<double, std::string>>& stops,
                       bool horizontal = true);
  /// An XML comment (double hyphens are broken up).
  void comment(std::string_view text);

  /// Width in px.
  double width() const { return width_; }
  /// Height in px.
  double height() const { return height_; }
  /// The whole document: XML declaration, <svg> with the definitions and every element, and a newline.
  std::string str() const;

 private:
  void open(std::string_view tag, const SvgPaint& paint);
  double width_, height_;
  std::string title_;
  std::string defs_;
  std::string body_;
  int open_groups_ = 0;
};

}  // namespace qftplan
