#pragma once
// The "device" command: prints a device as YAML, or its summary.

#include <string>

namespace CLI {
class App;
}

namespace qftplan::cli {

/// The options of the device command.
struct DeviceArgs {
  std::string device;
  std::string calibration;  // --calibration FILE (empty: none)
  bool summary = false;
};

/// Adds the device command to `app`; parsing fills `a`.
CLI::App* add_device_command(CLI::App& app, DeviceArgs& a);

/// Runs the device command; returns the exit status.
int run_device(const DeviceArgs& a);

}  // namespace qftplan::cli
