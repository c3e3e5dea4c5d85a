#pragma once
// Private to the checker: files of the semi-classical readout (mid-circuit measurements and phases
// conditioned on their outcomes), proved structurally and by simulating every measurement branch.

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/qasm/qasm_writer.hpp"
#include "statevector_check.hpp"

namespace qftplan::semiclassical_check {

/// Largest register whose measurement branches are simulated (2^(n+1) branches of 2^n amplitudes).
inline constexpr int kBranchLimit = 10;

/// True when the program conditions a gate on a bit (then it is checked here).
bool is_semiclassical(const QasmProgram& program);

/// The structural proof (any n): proved, wrong (a certain difference, with its line) or cannot_prove.
CheckResult prove(const Device& device, const QasmProgram& program, const CheckRequest& request);

/// The outcome distribution simulated on basis and random inputs and compared with |reference_qft|^2:
/// every measurement branch walked (n <= kBranchLimit), or beyond that (n <= request.statevector_limit)
/// one state vector with the measurements deferred.
statevector_check::SimOutcome simulate(const Device& device, const QasmProgram& program, const CheckRequest& request);

/// Both, merged as check_qft_circuit merges its checks.
CheckResult check(const Device& device, const QasmProgram& program, const CheckRequest& request);

}  // namespace qftplan::semiclassical_check
