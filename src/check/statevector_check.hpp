#pragma once
// Private to the checker: the state-vector comparison of a circuit with the QFT it claims to be.

#include <string>

#include "qftplan/check/qft_checker.hpp"

namespace qftplan::statevector_check {

/// What the comparison found; `ran` false with a message when it was skipped.
struct SimOutcome {
  bool ran = false;
  bool ok = true;
  bool exhaustive = false;  ///< every basis input was simulated
  std::string message;
};

/// Simulates `program` (checked for ranges and trailing measurements before) on every basis input,
/// or on a sample when that is beyond the budget, and compares with reference_qft. Every basis
/// input is simulated up to 10 qubits, and beyond when `decides` and the budget allows.
SimOutcome simulate(const Device& device, const QasmProgram& program, const CheckRequest& req, bool decides);

}  // namespace qftplan::statevector_check
