// The "device" command: prints a device (built-in spec or YAML file) as YAML, or its summary.

#include "device_command.hpp"

#include <cstdio>

#include <CLI/CLI.hpp>

#include "cli_options.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/device/device_summary.hpp"
#include "qftplan/device/device_yaml.hpp"

namespace qftplan::cli {

CLI::App* add_device_command(CLI::App& app, DeviceArgs& a) {
  auto* device = app.add_subcommand("device", "print a device (built-in spec or YAML file) as YAML, or its summary");
  device->add_option("device", a.device, "built-in spec (line:N, ring:N, grid:RxC, heavy-hex:RxC, full:N) or YAML file")
      ->required();
  add_calibration_option(device, a.calibration);
  device->add_flag("--summary", a.summary, "print qubits, couplers, degrees, diameter, components, calibration ranges");
  return device;
}

int run_device(const DeviceArgs& a) {
  const Device dev = load_device(a.device, a.calibration);
  if (a.summary) std::fputs(format_summary(summarize(dev)).c_str(), stdout);
  else std::fputs(device_to_yaml(dev).c_str(), stdout);
  return 0;
}

}  // namespace qftplan::cli
