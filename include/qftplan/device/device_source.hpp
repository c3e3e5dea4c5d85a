#pragma once
/// \file device_source.hpp
/// One entry point for "a device named on the command line": a built-in spec or a YAML file.

#include <optional>
#include <string>

#include "qftplan/device/device.hpp"

namespace qftplan {

/// A spec such as "grid:4x4" when it has a known family prefix, else a YAML file path.
Device load_device(const std::string& spec_or_path);

/// The same, with the calibration profile in file `calibration` applied when it is given and not empty
/// (--calibration; calibration_profile.hpp).
Device load_device(const std::string& spec_or_path, const std::optional<std::string>& calibration);

}  // namespace qftplan
