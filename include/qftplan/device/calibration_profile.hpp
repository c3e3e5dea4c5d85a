#pragma once
/// \file calibration_profile.hpp
/// Calibration profiles: a small YAML file of device-wide calibration values (the keys of a device
/// file's `calibration` block) applied to any device, built-in lattices included, so that plans and
/// surveys compare devices at equal gate quality (README "Calibration profiles").

#include <string>

#include "qftplan/device/device.hpp"

namespace qftplan {

/// The values of a profile and the file they came from (named in error messages).
struct CalibrationProfile {
  CalibrationValues values;  ///< at least one value set
  std::string source;        ///< the file name, or what the text was called
};

/// Parses profile text: one mapping of error_1q, error_2q, error_readout, duration_1q_ns, duration_2q_ns,
/// t1_us, t2_us, duration_readout_ns, feed_forward_ns (the device file's rules for each), at least one of them. InputError with file, line and
/// column otherwise.
CalibrationProfile parse_calibration_profile(const std::string& text, const std::string& source);

/// Reads and parses a profile file (at most 1 MiB).
CalibrationProfile load_calibration_profile(const std::string& path);

/// `device` with the profile applied: each value the profile gives becomes the device-wide value and
/// replaces that quantity on every qubit and coupler (per-part values of it are dropped), so it holds
/// exactly everywhere; quantities the profile leaves out keep the device's values, and parts out of
/// service stay out of service. The result goes through Device validation (T2 <= 2 T1 on every qubit
/// as applied); a violation is an InputError naming the profile's file.
Device with_calibration_profile(const Device& device, const CalibrationProfile& profile);

}  // namespace qftplan
