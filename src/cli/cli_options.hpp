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

}  // namespace qftplan::cli
