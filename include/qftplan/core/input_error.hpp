#pragma once
/// \file input_error.hpp
/// Errors caused by bad user input, carrying the source position when known, and the error of a
/// request that is valid but cannot be planned.

#include <stdexcept>
#include <string>

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

/// A request that is well-formed but cannot be planned on this device (exit status 1).
class PlanningError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

/// Formats `file:line:column: message`, leaving out the parts that are unknown.
std::string format_input_error(const std::string& file, int line, int column, const std::string& message);

}  // namespace qftplan
