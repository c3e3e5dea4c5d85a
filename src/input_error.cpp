#include "qftplan/input_error.hpp"

namespace qftplan {

std::string format_input_error(const std::string& file, int line, int column, const std::string& message) {
  std::string out;
  if (!file.empty()) {
    out += file;
    if (line > 0) {
      out += ':' + std::to_string(line);
      if (column > 0) out += ':' + std::to_string(column);
    }
    out += ": ";
  }
  out += message;
  return out;
}

InputError::InputError(std::string file, int line, int column, std::string message)
    : std::runtime_error(format_input_error(file, line, column, message)),
      file_(std::move(file)),
      line_(line),
      column_(column),
      message_(std::move(message)) {}

InputError::InputError(std::string message) : InputError(std::string(), 0, 0, std::move(message)) {}

}  // namespace qftplan
