#include "qftplan/device/calibration_profile.hpp"

// Applying a calibration profile (parse_calibration_profile lives with the device reader in
// device_yaml.cpp, which it shares).

#include <algorithm>

#include <fmt/format.h>

#include "qftplan/core/input_error.hpp"

namespace qftplan {

Device with_calibration_profile(const Device& device, const CalibrationProfile& profile) {
  const CalibrationValues& p = profile.values;
  DeviceDescription d = device.description();
  auto set = [](std::optional<double>& wide, const std::optional<double>& value) {
    if (value) wide = value;
  };
  set(d.calibration.error_1q, p.error_1q);
  set(d.calibration.error_2q, p.error_2q);
  set(d.calibration.error_readout, p.error_readout);
  set(d.calibration.duration_1q_ns, p.duration_1q_ns);
  set(d.calibration.duration_2q_ns, p.duration_2q_ns);
  set(d.calibration.t1_us, p.t1_us);
  set(d.calibration.t2_us, p.t2_us);
  set(d.calibration.duration_readout_ns, p.duration_readout_ns);
  set(d.calibration.feed_forward_ns, p.feed_forward_ns);
  // The profile's value holds on every part: drop the per-part values of the quantities it sets.
  auto clear = [](std::optional<double>& part, const std::optional<double>& value) {
    if (value) part.reset();
  };
  for (auto& o : d.qubit_calibration) {
    clear(o.error_1q, p.error_1q);
    clear(o.error_readout, p.error_readout);
    clear(o.duration_1q_ns, p.duration_1q_ns);
    clear(o.t1_us, p.t1_us);
    clear(o.t2_us, p.t2_us);
    clear(o.duration_readout_ns, p.duration_readout_ns);
    clear(o.feed_forward_ns, p.feed_forward_ns);
  }
  // An entry left with nothing to say goes; one that disables its qubit stays.
  std::erase_if(d.qubit_calibration, [](const QubitOverride& o) {
    return !o.disabled && !o.error_1q && !o.error_readout && !o.duration_1q_ns && !o.t1_us && !o.t2_us &&
           !o.duration_readout_ns && !o.feed_forward_ns;
  });
  for (auto& c : d.couplers) {
    clear(c.error, p.error_2q);
    clear(c.duration_ns, p.duration_2q_ns);
  }
  try {
    return Device(std::move(d));
  } catch (const InputError& e) {
    throw InputError(profile.source, 0, 0, fmt::format("applied to {}: {}", device.name(), e.message()));
  }
}

}  // namespace qftplan
