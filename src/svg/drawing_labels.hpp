#pragma once
/// \file drawing_labels.hpp
/// Private to the svg layer: the placement labels of a device drawing ("in k", "out k" beside the
/// register qubits), set where they hide nothing.

#include <vector>

#include "drawing_frame.hpp"
#include "qftplan/device/device.hpp"
#include "qftplan/svg/svg_document.hpp"

namespace qftplan {

/// Draws the group "placement": a label beside every qubit that holds an input bit at the start or
/// an output bit at the end. Each goes to the best of 16 directions times 4 distances around its
/// qubit: never over a qubit, a block count, another label or the edge of the drawing; then as few
/// couplers under it as may be, near its qubit, nearer to it than to any other qubit, and away from
/// its neighbours. Most constrained qubits choose first; every rule is deterministic. A label set
/// off beyond the first ring, or about as near to another qubit, gets a thin line to its qubit.
void draw_placement_labels(SvgDocument& doc, const Device& device, const DrawingFrame& fr, const RegisterBits& bits,
                           const std::vector<CountBox>& counts);

}  // namespace qftplan
