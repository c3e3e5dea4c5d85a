// Gates and keywords the OpenQASM reader knows without a definition.

#include "qasm_builtin_gates.hpp"

#include <array>
#include <iterator>

namespace qftplan::qasm_detail {

const BuiltinGate* find_builtin(std::string_view name) {
  // stdgates.inc (OpenQASM 3) and qelib1.inc (OpenQASM 2) names; u1/cu1/phase/cphase are the
  // older spellings of p/cp, and z, s, sdg, t, tdg are p with a fixed angle (OpenQASM 3 spec,
  // stdgates.inc). swap is not in qelib1.inc but is accepted in both versions.
  static const BuiltinGate table[] = {
      {"h", GateKind::h, 0, 1},
      {"cx", GateKind::cx, 0, 2},
      {"rz", GateKind::rz, 1, 1},
      {"p", GateKind::p, 1, 1},
      {"cp", GateKind::cp, 1, 2},
      {"swap", GateKind::swap, 0, 2},
      {"cz", GateKind::cz, 0, 2},
      {"x", GateKind::x, 0, 1},
      {"sx", GateKind::sx, 0, 1},
      {"u1", GateKind::p, 1, 1},
      {"cu1", GateKind::cp, 1, 2},
      {"CX", GateKind::cx, 0, 2},
      {"phase", GateKind::p, 1, 1},
      {"cphase", GateKind::cp, 1, 2},
      {"z", GateKind::p, 0, 1, true, Angle(1, 0)},
      {"s", GateKind::p, 0, 1, true, Angle(1, 1)},
      {"sdg", GateKind::p, 0, 1, true, Angle(-1, 1)},
      {"t", GateKind::p, 0, 1, true, Angle(1, 2)},
      {"tdg", GateKind::p, 0, 1, true, Angle(-1, 2)},
      {"id", GateKind::h, 0, 1, false, Angle{}, true},
  };
  static const auto keys = [] {
    std::array<std::uint64_t, std::size(table)> k{};
    for (std::size_t i = 0; i < std::size(table); ++i) k[i] = pack(table[i].name);
    return k;
  }();
  const std::uint64_t key = pack(name);
  if (key == 0) return nullptr;
  for (std::size_t i = 0; i < keys.size(); ++i)
    if (keys[i] == key) return &table[i];
  return nullptr;
}

bool is_unsupported_keyword(std::string_view w) {
  static const std::string_view words[] = {
      "reset", "if",     "else",   "opaque", "for",     "while",    "def",    "defcal", "cal",    "const",
      "let",   "input",  "output", "box",    "delay",   "gphase",   "U",      "ctrl",   "negctrl", "inv",
      "pow",   "extern", "int",    "uint",   "float",   "angle",    "bool",   "duration", "stretch", "array",
      "complex", "return", "break", "continue", "switch", "pragma"};
  for (auto k : words)
    if (k == w) return true;
  return false;
}

}  // namespace qftplan::qasm_detail
