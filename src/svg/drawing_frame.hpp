#pragma once
/// \file drawing_frame.hpp
/// Private to the svg layer: the measures of a device drawing (where each qubit lands in px, the
/// size of the page and its parts) and the boxes that the label placement keeps apart.

#include <vector>

#include "qftplan/device/device.hpp"

namespace qftplan {

/// An axis-aligned box in px.
struct Box {
  double x0 = 0;  ///< left
  double y0 = 0;  ///< top
  double x1 = 0;  ///< right
  double y1 = 0;  ///< bottom
};

/// The measures of one device drawing: layout positions, the scale that takes them to px, and the
/// page around them.
struct DrawingFrame {
  std::vector<Point> pos;    ///< every qubit's layout position (drawing_positions)
  double unit = 1;           ///< a typical coupler's length in layout units (the median; 1 when none)
  double scale = 1;          ///< px per layout unit
  double ox = 0;             ///< px of layout x = 0
  double oy = 0;             ///< px of layout y = 0
  double node_r = 10;        ///< a qubit's radius in px
  double unit_px = 64;       ///< a typical coupler's length in px
  double head = 78;          ///< height of the heading above the drawing
  double legend_w = 250;     ///< width of the legend column on the right
  double width = 0;          ///< page width
  double height = 0;         ///< page height

  /// Horizontal px of qubit q's centre.
  double x(int q) const { return ox + scale * pos[q].x; }
  /// Vertical px of qubit q's centre.
  double y(int q) const { return oy + scale * pos[q].y; }
};

/// A coupler's block count and the box it is written in, at the coupler's middle.
struct CountBox {
  int coupler = -1;  ///< index into Device::couplers()
  Box box;           ///< where the count is written
};

/// Which input bit starts and which output bit ends on each qubit (-1: none).
struct RegisterBits {
  std::vector<int> in_bit;   ///< by physical qubit: input bit held at the start
  std::vector<int> out_bit;  ///< by physical qubit: output bit held at the end
};

}  // namespace qftplan
