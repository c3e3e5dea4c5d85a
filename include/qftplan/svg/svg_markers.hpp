#pragma once
/// \file svg_markers.hpp
/// Marker shapes for the points of chart series, so that series differ in shape as well as colour.

#include <cstddef>
#include <string>

#include "qftplan/svg/svg_document.hpp"

namespace qftplan {

/// The shapes, in the order given to series.
enum class MarkerShape { circle, square, triangle_up, diamond, triangle_down, cross, plus, hexagon };

/// Number of distinct shapes.
inline constexpr std::size_t kMarkerShapeCount = 8;

/// The shape of series i: series i and j with the same colour (i = j mod 8) differ in shape for i, j < 64,
/// so (colour, shape) tells 64 series apart.
MarkerShape series_marker(std::size_t i);

/// Draws a marker centred at (x, y) whose shape fits a box of `size` px; filled shapes get a white
/// rim so that overlapping points stay apart, cross and plus are stroked; colours for which
/// needs_outline() holds get a dark rim (or casing) instead.
void draw_marker(SvgDocument& doc, MarkerShape shape, double x, double y, double size, const std::string& colour);

}  // namespace qftplan
