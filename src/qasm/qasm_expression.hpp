#pragma once
// The expression evaluator of the OpenQASM reader (private to the reader): angle expressions on
// pi, numbers and gate parameters, kept exact where possible (qasm_value.hpp).

#include <optional>
#include <string_view>
#include <unordered_map>

#include "qasm_gate_scope.hpp"
#include "qasm_lexer.hpp"
#include "qasm_value.hpp"
#include "qftplan/qasm/qasm_program.hpp"

namespace qftplan::qasm_detail {

/// Parentheses, unary signs and gate calls nest at most this deep, against stack overflow.
inline constexpr int kMaxNesting = 200;

/// Reads and evaluates expressions from the lexer's buffer.
class ExpressionReader : protected Lexer {
 public:
  using Lexer::Lexer;

 protected:
  /// expression := term (('+' | '-') term)*; a dummy zero when `sc.eval` is false.
  Value expression(const Scope& sc);
  /// An angle parameter: exact multiple of pi/2^k, or a number within 1e-12 (relative) of one;
  /// another number is recorded in `inexact_angle_` (the first one only) and read as 0.
  /// `at` is where the expression starts and `text_end` just past it.
  Angle to_angle(const Value& v, const Pos& at, const char* text_end);

  int version_ = 0;  ///< OpenQASM version from the OPENQASM statement, 0 before it
  std::optional<QasmProgram::InexactAngle> inexact_angle_;  ///< the first angle that is no multiple of pi/2^k

 private:
  Value term(const Scope& sc);
  Value unary(const Scope& sc);
  Value power_expression(const Scope& sc);
  Value primary(const Scope& sc);
  // pi, tau, euler, a gate parameter or a function call; `w` was read at `at`.
  Value named_value(std::string_view w, const Pos& at, const Scope& sc);
  Value number();
  Value integer_literal(std::string_view digits);

  int expr_depth_ = 0;
  std::unordered_map<std::string_view, int> pow2_cache_;  // decimal spelling -> k of 2^k, or -1
};

}  // namespace qftplan::qasm_detail
