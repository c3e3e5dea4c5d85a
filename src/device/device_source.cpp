#include "qftplan/device/device_source.hpp"

#include <filesystem>
#include <system_error>

#include <fmt/format.h>

#include "qftplan/core/input_error.hpp"
#include "qftplan/device/calibration_profile.hpp"
#include "qftplan/device/device_yaml.hpp"
#include "qftplan/device/lattices.hpp"

namespace qftplan {

Device load_device(const std::string& spec_or_path) {
  // A known family prefix always means a built-in lattice; a file with such a name can still be
  // reached as "./grid:3x3".
  if (is_lattice_spec(spec_or_path)) return make_lattice(spec_or_path);
  std::error_code ec;
  const bool exists = std::filesystem::exists(spec_or_path, ec);
  const auto colon = spec_or_path.find(':');
  // "nosuch:4" looks like a mistyped spec rather than a file name: say which families exist.
  if (!exists && colon != std::string::npos && spec_or_path.find('/') == std::string::npos) {
    std::string known;
    for (const auto& f : lattice_families()) known += (known.empty() ? "" : ", ") + f;
    throw InputError(fmt::format("no file named '{}', and unknown device family '{}' (known: {})", spec_or_path,
                                 spec_or_path.substr(0, colon), known));
  }
  return load_device_file(spec_or_path);
}

Device load_device(const std::string& spec_or_path, const std::optional<std::string>& calibration) {
  if (!calibration || calibration->empty()) return load_device(spec_or_path);
  // The profile first: a bad profile is reported before a large device is built.
  const CalibrationProfile profile = load_calibration_profile(*calibration);
  return with_calibration_profile(load_device(spec_or_path), profile);
}

}  // namespace qftplan
