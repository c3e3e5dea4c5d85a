#include "qftplan/svg/svg_document.hpp"

#include <cmath>

#include <fmt/format.h>

namespace qftplan {

std::string svg_escape(std::string_view text) {
  std::string out;
  out.reserve(text.size());
  for (const char c : text) {
    switch (c) {
      case '&': out += "&amp;"; break;
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '"': out += "&quot;"; break;
      case '\'': out += "&apos;"; break;
      default:
        // Control characters other than tab and line breaks are not allowed in XML 1.0.
        if (static_cast<unsigned char>(c) < 0x20 && c != '\t' && c != '\n' && c != '\r') out += ' ';
        else out += c;
    }
  }
  return out;
}

std::string svg_number(double v) {
  if (!std::isfinite(v)) return "0";
  double r = std::round(v * 100) / 100;
  if (r == 0) r = 0;  // no "-0"
  std::string s = fmt::format("{:.2f}", r);
  while (s.back() == '0') s.pop_back();
  if (s.back() == '.') s.pop_back();
  return s;
}

SvgDocument::SvgDocument(double width, double height, std::string title)
    : width_(width), height_(height), title_(std::move(title)) {}

void SvgDocument::open(std::string_view tag, const SvgPaint& p) {
  body_ += fmt::format("<{}", tag);
  body_ += fmt::format(" fill=\"{}\"", svg_escape(p.fill.empty() ? "none" : p.fill));
  if (!p.stroke.empty()) {
    body_ += fmt::format(" stroke=\"{}\" stroke-width=\"{}\"", svg_escape(p.stroke), svg_number(p.stroke_width));
    if (!p.dash.empty()) body_ += fmt::format(" stroke-dasharray=\"{}\"", svg_escape(p.dash));
    if (!p.linecap.empty()) body_ += fmt::format(" stroke-linecap=\"{}\"", svg_escape(p.linecap));
    if (!p.linejoin.empty()) body_ += fmt::format(" stroke-linejoin=\"{}\"", svg_escape(p.linejoin));
  }
  if (p.opacity < 1) body_ += fmt::format(" opacity=\"{}\"", svg_number(p.opacity));
}

void SvgDocument::line(double x1, double y1, double x2, double y2, const SvgPaint& paint) {
  open("line", paint);
  body_ += fmt::format(" x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\"/>\n", svg_number(x1), svg_number(y1), svg_number(x2),
                       svg_number(y2));
}

void SvgDocument::rect(double x, double y, double w, double h, const SvgPaint& paint, double corner_radius) {
  open("rect", paint);
  body_ += fmt::format(" x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\"", svg_number(x), svg_number(y), svg_number(w),
                       svg_number(h));
  if (corner_radius > 0) body_ += fmt::format(" rx=\"{}\"", svg_number(corner_radius));
  body_ += "/>\n";
}

void SvgDocument::circle(double cx, double cy, double r, const SvgPaint& paint) {
  open("circle", paint);
  body_ += fmt::format(" cx=\"{}\" cy=\"{}\" r=\"{}\"/>\n", svg_number(cx), svg_number(cy), svg_number(r));
}

namespace {
std::string point_list(const std::vector<SvgPoint>& points) {
  std::string s;
  for (const auto& p : points) {
    if (!s.empty()) s += ' ';
    s += svg_number(p.x) + "," + svg_number(p.y);
  }
  return s;
}
}  // namespace

void SvgDocument::polyline(const std::vector<SvgPoint>& points, const SvgPaint& paint) {
  open("polyline", paint);
  body_ += fmt::format(" points=\"{}\"/>\n", point_list(points));
}

void SvgDocument::polygon(const std::vector<SvgPoint>& points, const SvgPaint& paint) {
  open("polygon", paint);
  body_ += fmt::format(" points=\"{}\"/>\n", point_list(points));
}

void SvgDocument::path(const std::string& d, const SvgPaint& paint) {
  open("path", paint);
  body_ += fmt::format(" d=\"{}\"/>\n", svg_escape(d));
}

void SvgDocument::text(double x, double y, std::string_view content, const SvgFont& f) {
  // A centred text's baseline sits below y; a rotation still turns about (x, y), the anchor asked for.
  const double base = f.middle ? y + kTextMiddleEm * f.size : y;
  body_ += fmt::format("<text x=\"{}\" y=\"{}\" font-size=\"{}\" fill=\"{}\"", svg_number(x), svg_number(base),
                       svg_number(f.size), svg_escape(f.fill));
  if (f.anchor != "start") body_ += fmt::format(" text-anchor=\"{}\"", svg_escape(f.anchor));
  if (f.bold) body_ += " font-weight=\"bold\"";
  if (!f.family.empty()) body_ += fmt::format(" font-family=\"{}\"", svg_escape(f.family));
  if (f.rotate != 0)
    body_ += fmt::format(" transform=\"rotate({} {} {})\"", svg_number(f.rotate), svg_number(x), svg_number(y));
  body_ += fmt::format(">{}</text>\n", svg_escape(content));
}

void SvgDocument::begin_group(std::string_view id, std::string_view css_class) {
  body_ += "<g";
  if (!id.empty()) body_ += fmt::format(" id=\"{}\"", svg_escape(id));
  if (!css_class.empty()) body_ += fmt::format(" class=\"{}\"", svg_escape(css_class));
  body_ += ">\n";
  ++open_groups_;
}

void SvgDocument::end_group() {
  if (open_groups_ == 0) return;
  body_ += "</g>\n";
  --open_groups_;
}

void SvgDocument::linear_gradient(std::string_view id, const std::vector<std::pair<double, std::string>>& stops,
                                  bool horizontal) {
  defs_ += fmt::format("<linearGradient id=\"{}\" x1=\"0\" y1=\"{}\" x2=\"{}\" y2=\"0\">\n", svg_escape(id),
                       horizontal ? 0 : 1, horizontal ? 1 : 0);
  for (const auto& [offset, colour] : stops)
    defs_ += fmt::format("<stop offset=\"{}\" stop-color=\"{}\"/>\n", svg_number(offset), svg_escape(colour));
  defs_ += "</linearGradient>\n";
}

void SvgDocument::comment(std::string_view text) {
  std::string t(text);
  for (std::size_t p; (p = t.find("--")) != std::string::npos;) t.replace(p, 2, "- -");
  body_ += fmt::format("<!-- {} -->\n", t);
}

std::string SvgDocument::str() const {
  std::string s = "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n";
  s += fmt::format(
      "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" width=\"{0}\" height=\"{1}\" viewBox=\"0 0 {0} {1}\" "
      "font-family=\"DejaVu Sans, Verdana, sans-serif\">\n",
      svg_number(width_), svg_number(height_));
  s += fmt::format("<title>{}</title>\n", svg_escape(title_));
  if (!defs_.empty()) s += "<defs>\n" + defs_ + "</defs>\n";
  s += body_;
  for (int i = 0; i < open_groups_; ++i) s += "</g>\n";
  s += "</svg>\n";
  return s;
}

}  // namespace qftplan
