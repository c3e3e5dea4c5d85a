#include "qftplan/svg/svg_markers.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>

#include "qftplan/svg/svg_palette.hpp"

namespace qftplan {

MarkerShape series_marker(std::size_t i) {
  const std::size_t colours = okabe_ito_colours().size();
  return static_cast<MarkerShape>((i + i / colours) % kMarkerShapeCount);
}

namespace {
// The two strokes of a cross or a plus of half size h.
void draw_marker_strokes(SvgDocument& doc, MarkerShape shape, double x, double y, double h, const SvgPaint& p) {
  if (shape == MarkerShape::cross) {
    doc.line(x - h * 0.75, y - h * 0.75, x + h * 0.75, y + h * 0.75, p);
    doc.line(x - h * 0.75, y + h * 0.75, x + h * 0.75, y - h * 0.75, p);
  } else {
    doc.line(x - h, y, x + h, y, p);
    doc.line(x, y - h, x, y + h, p);
  }
}
}  // namespace

void draw_marker(SvgDocument& doc, MarkerShape shape, double x, double y, double size, const std::string& colour) {
  const double h = size / 2;
  // Colours below 3:1 on white (WCAG 2.1, 1.4.11) get a dark rim, the others a white one that keeps
  // overlapping points apart.
  const bool light = needs_outline(colour);
  SvgPaint filled;
  filled.fill = colour;
  filled.stroke = light ? kOutlineColour : "#ffffff";
  filled.stroke_width = light ? 1.1 : 0.8;
  filled.linejoin = "round";
  SvgPaint stroked;
  stroked.stroke = colour;
  stroked.stroke_width = std::max(1.6, size / 5);
  stroked.linecap = "round";
  if (light && (shape == MarkerShape::cross || shape == MarkerShape::plus)) {
    // A dark casing under the strokes of a light cross or plus.
    SvgPaint casing = stroked;
    casing.stroke = kOutlineColour;
    casing.stroke_width = stroked.stroke_width + 2;
    draw_marker_strokes(doc, shape, x, y, h, casing);
  }
  switch (shape) {
    case MarkerShape::circle: doc.circle(x, y, h * 0.9, filled); break;
    case MarkerShape::square: doc.rect(x - h * 0.8, y - h * 0.8, h * 1.6, h * 1.6, filled); break;
    case MarkerShape::triangle_up: doc.polygon({{x, y - h}, {x + h, y + h * 0.75}, {x - h, y + h * 0.75}}, filled); break;
    case MarkerShape::triangle_down:
      doc.polygon({{x, y + h}, {x + h, y - h * 0.75}, {x - h, y - h * 0.75}}, filled);
      break;
    case MarkerShape::diamond: doc.polygon({{x, y - h}, {x + h, y}, {x, y + h}, {x - h, y}}, filled); break;
    case MarkerShape::cross:
    case MarkerShape::plus: draw_marker_strokes(doc, shape, x, y, h, stroked); break;
    case MarkerShape::hexagon: {
      std::vector<SvgPoint> p;
      for (int k = 0; k < 6; ++k) {
        const double a = std::numbers::pi / 3 * k;
        p.push_back({x + h * std::cos(a), y + h * std::sin(a)});
      }
      doc.polygon(p, filled);
      break;
    }
  }
}

}  // namespace qftplan
