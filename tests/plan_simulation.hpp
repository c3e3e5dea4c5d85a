#pragma once
// Simulating a planned circuit and the QFT it must equal, for the tests that compare the two (the
// unitary against FFTW, column by column over every basis input).

#include <complex>
#include <string>
#include <vector>

#include "qftplan/core/gate.hpp"
#include "qftplan/device/device.hpp"
#include "qftplan/check/qft_checker.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_program.hpp"
#include "qftplan/qasm/qasm_writer.hpp"

namespace qftplan::testing {

/// A unitary on a register, column j the image of basis input j: [column][row].
using QftMatrix = std::vector<std::vector<std::complex<double>>>;

/// The QFT of n qubits (the inverse when `inverse`) from FFTW.
QftMatrix fftw_qft_matrix(int n, bool inverse);

/// The unitary of `gates` (the plan's emitted circuit) on the register: input bit k enters on
/// plan.maps.placement[k], output bit k is read on plan.maps.final_placement[k]; only the qubits the
/// circuit touches are simulated.
QftMatrix plan_unitary(const Device& device, const PreparedPlan& plan, const std::vector<Gate>& gates);

/// A plan written as OpenQASM with our header, read back, and the check request its maps give.
struct WrittenPlan {
  PreparedPlan plan;
  PlanReport report;
  std::string text;
  QasmProgram program;
  CheckRequest request;  ///< the plan's transform and maps (statevector_limit left at its default)
};

/// Plans `options` on `device`, writes the circuit in `version`, parses the text and fills the request.
WrittenPlan write_and_read(const Device& device, const PlanOptions& options, QasmVersion version = QasmVersion::v3);

/// Largest entry-wise difference of `a` and `b` after removing one global phase shared by all columns.
double distance_up_to_phase(const QftMatrix& a, const QftMatrix& b);

}  // namespace qftplan::testing
