#pragma once
// User gate definitions and the scope statements are read in (private to the OpenQASM reader).

#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include "qasm_lexer.hpp"
#include "qasm_value.hpp"

namespace qftplan::qasm_detail {

/// A user `gate` definition; its body is re-read from the buffer at every call.
struct UserGate {
  std::string name;                 ///< the gate's name
  std::size_t order = 0;            ///< definition order: a body sees only gates defined before it
  std::vector<std::string> params;  ///< parameter names
  std::vector<std::string> args;    ///< qubit argument names
  Pos body;                         ///< just after '{'
  std::uint64_t size = 0;           ///< gates one call emits (counted when defined, capped past kMaxGates)
};

/// Where the statements being read live: top level, or inside a gate body (checked once at the
/// definition with `eval` false, then evaluated at every call).
struct Scope {
  const UserGate* gate = nullptr;             ///< the gate whose body is read; null at top level
  const std::vector<Value>* params = nullptr;  ///< values of its parameters (when eval)
  const std::vector<int>* qubits = nullptr;    ///< qubits bound to its arguments (when eval)
  bool eval = true;                            ///< false: check the body only
  int call_line = 0;                           ///< line of the top-level call, given to every gate
};

}  // namespace qftplan::qasm_detail
