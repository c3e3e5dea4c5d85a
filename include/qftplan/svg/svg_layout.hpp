#pragma once
/// \file svg_layout.hpp
/// Where each qubit of a device is drawn: the device's own positions, or a deterministic layout
/// computed from the graph when some are missing.

#include <vector>

#include "qftplan/device/device.hpp"

namespace qftplan {

/// True when every qubit has a position.
bool has_all_positions(const Device& device);

/// The drawing position of every qubit: the device's positions when all are given; otherwise the
/// force-directed layout of Fruchterman and Reingold ("Graph drawing by force-directed placement",
/// Software: Practice and Experience 21(11), 1991) started from a circle, with a fixed number of
/// steps, so the same device always gets the same picture (devices above 600 qubits stay on the circle).
std::vector<Point> drawing_positions(const Device& device);

}  // namespace qftplan
