#pragma once
/// \file device_drawing.hpp
/// The SVG drawing of a device and, optionally, of a plan on it (the plan comes from
/// plan_drawing.hpp, which includes this header).

#include <string>

#include "qftplan/device/device.hpp"

namespace qftplan {

struct DrawnPlan;

/// The SVG document: the device (and the plan when given) with a legend. Placement labels are set
/// greedily, most constrained qubit first, at the nearest of 64 candidate spots around their qubit
/// that touches no qubit, no block count and no other label (deterministic).
std::string draw_device_svg(const Device& device, const DrawnPlan* plan);

}  // namespace qftplan
