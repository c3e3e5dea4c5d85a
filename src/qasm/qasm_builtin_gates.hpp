#pragma once
// Gates and keywords the OpenQASM reader knows without a definition (private to the reader).

#include <cstddef>
#include <cstdint>
#include <string_view>

#include "qftplan/core/gate.hpp"

namespace qftplan::qasm_detail {

/// A gate of stdgates.inc / qelib1.inc that the reader takes.
struct BuiltinGate {
  std::string_view name;   ///< its name in the file
  GateKind kind;           ///< the gate it becomes
  int params;              ///< angle parameters
  int qubits;              ///< qubit operands
  bool fixed = false;      ///< a phase gate with a fixed angle (z, s, t, ...)
  Angle angle{};           ///< that angle
  bool identity = false;   ///< id: nothing to emit
};

/// Up to 8 bytes of a name as one integer (0 for longer names), so keyword and gate-name tests
/// are integer compares rather than string compares on the hot path.
constexpr std::uint64_t pack(std::string_view s) {
  if (s.size() > 8) return 0;
  std::uint64_t k = 0;
  for (std::size_t i = 0; i < s.size(); ++i) k |= static_cast<std::uint64_t>(static_cast<unsigned char>(s[i])) << (8 * i);
  return k;
}

/// The built-in gate called `name`, or null.
const BuiltinGate* find_builtin(std::string_view name);

/// True for statements of the language that this reader deliberately does not take.
bool is_unsupported_keyword(std::string_view w);

}  // namespace qftplan::qasm_detail
