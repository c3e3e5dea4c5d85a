#pragma once
/// \file svg_layout.hpp
/// Where each qubit of a device is drawn: the device's own positions, or a deterministic layout
/// computed from the graph when some are missing.

#include <vector>

#include "qftplan/device/device.hpp"

namespace qftplan {

/// True when every qubit has a position.
bool has_all_positions(const Device& device);

/// A layout computed from the couplers alone, the median coupler one unit long: each connected
/// piece starts from pivot MDS (Brandes and Pich, 2006) and is refined by stress majorisation
/// (Gansner, Koren and North, 2004) on hop counts, then pairs nearer than 0.6 units are pushed
/// apart; pieces are packed in rows, largest first. No randomness: the same device always gets
/// the same picture.
std::vector<Point> computed_positions(const Device& device);

/// The drawing position of every qubit: the device's positions when all are given, otherwise
/// computed_positions.
std::vector<Point> drawing_positions(const Device& device);

/// The smallest distance between two of the points (infinity for fewer than two).
double closest_pair_distance(const std::vector<Point>& pos);

}  // namespace qftplan
