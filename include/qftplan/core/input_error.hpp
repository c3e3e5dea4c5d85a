#pragma once
/// \file input_error.hpp
/// Errors caused by bad user input, carrying the source position when known, and the error of a
/// request that is valid but cannot be planned.

#include <stdexcept>
#include <string>
#include <string_view>

namespace qftplan {

/// Thrown for any malformed input (device file, built-in spec, circuit file, option value).
/// `what()` is the one-line message printed to the user: `file:line:column: message`.
class InputError : public std::runtime_error {
 public:
  /// `line` and `column` are 1-based; 0 means unknown (then they are left out of the text).
  InputError(std::string file, int line, int column, std::string message);
  /// An error about input with no file behind it (an option value, a spec string).
  explicit InputError(std::string message);

  const std::string& file() const { return file_; }
  int line() const { return line_; }
  int column() const { return column_; }
  /// The message without the position prefix.
  const std::string& message() const { return message_; }

 private:
  std::string file_;
  int line_ = 0;
  int column_ = 0;
  std::string message_;
};

/// How a front end spells the name of a setting: "--time-limit" on the command line, "time_limit" in
/// Python. Setting names are the command line's option names without the dashes.
using SettingNamer = std::string (*)(std::string_view setting);

/// Bad input in a setting of the request (no file behind it). The message starts with the setting's
/// name: what() spells it plainly ("approx expects ..."), and each front end words it as its own flag
/// or argument with worded() ("--approx expects ..." on the command line).
class SettingError : public InputError {
 public:
  /// `rest` follows the setting's name, separator included (" expects ...", ": 'x' is not ...").
  SettingError(std::string setting, std::string rest)
      : InputError(setting + rest), setting_(std::move(setting)), rest_(std::move(rest)) {}
  /// The setting's name ("time-limit").
  const std::string& setting() const { return setting_; }
  /// The message with the setting spelled by `namer`.
  std::string worded(SettingNamer namer) const { return namer(setting_) + rest_; }

 private:
  std::string setting_;
  std::string rest_;
};

/// A request that is well-formed but cannot be planned on this device (exit status 1).
class PlanningError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

/// Formats `file:line:column: message`, leaving out the parts that are unknown.
std::string format_input_error(const std::string& file, int line, int column, const std::string& message);

}  // namespace qftplan
