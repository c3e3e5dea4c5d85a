#pragma once
/// \file device_check.hpp
/// Consistency check of a loaded device (run on every bundled device in CI).

#include <string>
#include <vector>

#include "qftplan/device/device.hpp"

namespace qftplan {

/// Returns the problems found (empty when sane): adjacency symmetric and consistent with the
/// coupler list, ids in range, calibration plausible (rates in [0,1], positive times, T2 <= 2 T1).
std::vector<std::string> check_device(const Device& device);

}  // namespace qftplan
