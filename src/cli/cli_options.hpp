#pragma once
// Option helpers that several commands register alike. Includes CLI11: only for the command files.

#include <cstdint>
#include <string>

#include <CLI/CLI.hpp>

namespace qftplan::cli {

/// Adds "--seed" (the seed of every randomised search) to `cmd`, refusing negative numbers.
inline CLI::Option* add_seed_option(CLI::App* cmd, std::uint64_t& seed) {
  // Seeds are unsigned: "-1" would wrap around silently.
  const CLI::Validator non_negative(
      [](std::string& s) { return !s.empty() && s[0] == '-' ? std::string("must be a non-negative integer") : std::string(); },
      "");  // no text of its own: the option's type already reads UINT
  return cmd->add_option("--seed", seed, "seed of every randomised search")->check(non_negative)->capture_default_str();
}

/// Adds "--calibration FILE" (a calibration profile applied to the device; README "Calibration profiles").
inline CLI::Option* add_calibration_option(CLI::App* cmd, std::string& file) {
  return cmd->add_option("--calibration", file,
                         "apply the calibration profile in FILE (YAML: error_1q, error_2q, error_readout, duration_1q_ns, "
                         "duration_2q_ns, t1_us, t2_us) to the device: its values hold on every qubit and coupler");
}

}  // namespace qftplan::cli
