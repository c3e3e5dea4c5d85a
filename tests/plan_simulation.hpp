#pragma once
// Simulating a planned circuit and the QFT it must equal, for the tests that compare the two (the
// unitary against FFTW, column by column over every basis input).

#include <complex>
#include <vector>

#include "qftplan/core/gate.hpp"
#include "qftplan/device/device.hpp"
#include "qftplan/planners/plan.hpp"

namespace qftplan::testing {

/// A unitary on a register, column j the image of basis input j: [column][row].
using QftMatrix = std::vector<std::vector<std::complex<double>>>;

/// The QFT of n qubits (the inverse when `inverse`) from FFTW.
QftMatrix fftw_qft_matrix(int n, bool inverse);

/// The unitary of `gates` (the plan's emitted circuit) on the register: input bit k enters on
/// plan.maps.placement[k], output bit k is read on plan.maps.final_placement[k]; only the qubits the
/// circuit touches are simulated.
QftMatrix plan_unitary(const Device& device, const PreparedPlan& plan, const std::vector<Gate>& gates);

/// Largest entry-wise difference of `a` and `b` after removing one global phase shared by all columns.
double distance_up_to_phase(const QftMatrix& a, const QftMatrix& b);

}  // namespace qftplan::testing
