#include "qftplan/core/input_error.hpp"

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
  // Messages quote user text (file names, tokens, specs): a control character would break the one
  // line, or reach the terminal as an escape sequence. Show it as \xNN instead.
  std::string safe;
  for (char c : out) {
    const auto u = static_cast<unsigned char>(c);
    if (u < 0x20 || u == 0x7f) {
      static const char* hex = "0123456789abcdef";
      safe += "\\x";
      safe += hex[u >> 4];
      safe += hex[u & 15];
    } else {
      safe += c;
    }
  }
  return safe;
}

InputError::InputError(std::string file, int line, int column, std::string message)
    : std::runtime_error(format_input_error(file, line, column, message)),
      file_(std::move(file)),
      line_(line),
      column_(column),
      message_(std::move(message)) {}

InputError::InputError(std::string message) : InputError(std::string(), 0, 0, std::move(message)) {}

}  // namespace qftplan
