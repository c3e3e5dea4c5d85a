// State-vector simulator: gate matrices from their definitions, and the textbook QFT compared
// with FFTW and with the product formula of Nielsen & Chuang.

#include <fftw3.h>
#include <gtest/gtest.h>

#include <cmath>
#include <complex>
#include <numbers>
#include <random>
#include <stdexcept>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/check/statevector.hpp"

namespace qftplan {
namespace {

using cplx = std::complex<double>;
constexpr double kEps = 1e-12;
const double kPi = std::numbers::pi;

void expect_near(cplx got, cplx want, const char* what) {
  EXPECT_NEAR(got.real(), want.real(), kEps) << what;
  EXPECT_NEAR(got.imag(), want.imag(), kEps) << what;
}

// Applies one gate to basis state |index> of an n-qubit register and returns the amplitudes.
std::vector<cplx> run(int n, std::size_t index, const Gate& g) {
  StateVector sv(n);
  sv.set_basis(index);
  sv.apply(g);
  return sv.amplitudes();
}

// Textbook QFT circuit (Nielsen & Chuang, Quantum Computation and Quantum Information, 2000,
// section 5.1, Fig. 5.1): the most significant qubit first gets H, then R_k controlled by each
// less significant qubit; finally swaps reverse the qubit order. Logical qubit k has weight 2^k,
// so N&C's qubit 1 is our qubit n-1, and R_k between qubits a > b is cp(2 pi / 2^(a-b+1)).
std::vector<Gate> textbook_qft(int n) {
  std::vector<Gate> g;
  for (int a = n - 1; a >= 0; --a) {
    g.push_back(make_gate(GateKind::h, a));
    for (int b = a - 1; b >= 0; --b) g.push_back(make_gate(GateKind::cp, a, b, Angle::pi_over_pow2(a - b)));
  }
  for (int a = 0; a < n / 2; ++a) g.push_back(make_gate(GateKind::swap, a, n - 1 - a));
  return g;
}

// ----- gate definitions (OpenQASM 3 specification, stdgates.inc, and Nielsen & Chuang 2000,
// section 4.2 / 4.3 for H, X, controlled gates) -----

TEST(StateVector, StartsInZeroAndSetsBasis) {
  StateVector sv(3);
  EXPECT_EQ(sv.amplitudes().size(), 8u);
  expect_near(sv.amplitudes()[0], 1.0, "|000>");
  sv.set_basis(5);
  expect_near(sv.amplitudes()[5], 1.0, "|101>");
  expect_near(sv.amplitudes()[0], 0.0, "|000> cleared");
  EXPECT_THROW(sv.set_basis(8), std::invalid_argument);
}

TEST(StateVector, HadamardAndX) {
  const double r = 1 / std::sqrt(2.0);
  auto a = run(1, 0, make_gate(GateKind::h, 0));
  expect_near(a[0], r, "H|0> amplitude 0");
  expect_near(a[1], r, "H|0> amplitude 1");
  a = run(1, 1, make_gate(GateKind::h, 0));
  expect_near(a[0], r, "H|1> amplitude 0");
  expect_near(a[1], -r, "H|1> amplitude 1");
  a = run(1, 0, make_gate(GateKind::x, 0));
  expect_near(a[1], 1.0, "X|0> = |1>");
}

TEST(StateVector, QubitOrderIsLittleEndian) {
  // Basis index bit k is qubit k (qftplan convention, statevector.hpp).
  auto a = run(3, 0, make_gate(GateKind::x, 2));
  expect_near(a[4], 1.0, "X on qubit 2 gives index 4");
}

TEST(StateVector, SqrtXMatchesDefinitionAndSquaresToX) {
  // sx = [[1+i, 1-i], [1-i, 1+i]] / 2 (OpenQASM 3 spec, stdgates.inc); sx^2 = X.
  auto a = run(1, 0, make_gate(GateKind::sx, 0));
  expect_near(a[0], cplx(0.5, 0.5), "sx|0> amplitude 0");
  expect_near(a[1], cplx(0.5, -0.5), "sx|0> amplitude 1");
  StateVector sv(1);
  sv.apply(make_gate(GateKind::sx, 0));
  sv.apply(make_gate(GateKind::sx, 0));
  expect_near(sv.amplitudes()[0], 0.0, "sx sx |0> amplitude 0");
  expect_near(sv.amplitudes()[1], 1.0, "sx sx |0> amplitude 1");
}

TEST(StateVector, RzAndPhase) {
  // rz(t) = diag(e^{-it/2}, e^{it/2}); p(t) = diag(1, e^{it}) (OpenQASM 3 spec).
  const Angle t(3, 3);  // 3 pi / 8
  const double th = 3 * kPi / 8;
  expect_near(run(1, 0, make_gate(GateKind::rz, 0, -1, t))[0], std::polar(1.0, -th / 2), "rz|0>");
  expect_near(run(1, 1, make_gate(GateKind::rz, 0, -1, t))[1], std::polar(1.0, th / 2), "rz|1>");
  expect_near(run(1, 0, make_gate(GateKind::p, 0, -1, t))[0], 1.0, "p|0>");
  expect_near(run(1, 1, make_gate(GateKind::p, 0, -1, t))[1], std::polar(1.0, th), "p|1>");
}

TEST(StateVector, TwoQubitGates) {
  // Index = q0 + 2 q1 for qubits 0, 1.
  // cx with control 0: |q1 q0> = |01> (index 1) -> |11> (index 3); control clear: unchanged.
  expect_near(run(2, 1, make_gate(GateKind::cx, 0, 1))[3], 1.0, "cx |01>");
  expect_near(run(2, 2, make_gate(GateKind::cx, 0, 1))[2], 1.0, "cx |10> unchanged");
  expect_near(run(2, 2, make_gate(GateKind::cx, 1, 0))[3], 1.0, "cx control 1");
  expect_near(run(2, 3, make_gate(GateKind::cz, 0, 1))[3], -1.0, "cz |11>");
  expect_near(run(2, 1, make_gate(GateKind::cz, 0, 1))[1], 1.0, "cz |01>");
  const Angle t(1, 2);
  expect_near(run(2, 3, make_gate(GateKind::cp, 0, 1, t))[3], std::polar(1.0, kPi / 4), "cp |11>");
  expect_near(run(2, 2, make_gate(GateKind::cp, 0, 1, t))[2], 1.0, "cp |10>");
  expect_near(run(2, 1, make_gate(GateKind::swap, 0, 1))[2], 1.0, "swap |01> -> |10>");
  expect_near(run(2, 3, make_gate(GateKind::swap, 0, 1))[3], 1.0, "swap |11>");
  // cp_swap = cp then swap.
  expect_near(run(2, 3, make_gate(GateKind::cp_swap, 0, 1, t))[3], std::polar(1.0, kPi / 4), "cp_swap |11>");
  expect_near(run(2, 1, make_gate(GateKind::cp_swap, 0, 1, t))[2], 1.0, "cp_swap |01>");
}

TEST(StateVector, GatesOnFarApartQubitsOfABiggerRegister) {
  // cx(4 -> 1) on |10000> gives |10010>; the other qubits stay put.
  StateVector sv(5);
  sv.set_basis(0b10000 | 0b00100);
  sv.apply(make_gate(GateKind::cx, 4, 1));
  expect_near(sv.amplitudes()[0b10110], 1.0, "cx 4->1");
  sv.apply(make_gate(GateKind::swap, 0, 4));
  expect_near(sv.amplitudes()[0b00111], 1.0, "swap 0,4");
}

TEST(StateVector, RejectsBadGates) {
  StateVector sv(2);
  EXPECT_THROW(sv.apply(make_gate(GateKind::h, 2)), std::invalid_argument);
  EXPECT_THROW(sv.apply(make_gate(GateKind::cx, 0, 0)), std::invalid_argument);
  EXPECT_THROW(sv.apply(make_gate(GateKind::measure, 0, 0)), std::invalid_argument);
}

TEST(StateVector, Overlap) {
  std::vector<cplx> a{1.0, 0.0}, b{0.0, 1.0}, c{cplx(0, 1), 0.0};
  EXPECT_NEAR(overlap(a, b), 0.0, kEps);
  EXPECT_NEAR(overlap(a, c), 1.0, kEps);  // equal up to a global phase
}

// ----- the QFT against outside references -----

TEST(StateVector, TextbookQftOfThreeQubitsMatchesFftwBackwardDft) {
  // FFTW's FFTW_BACKWARD transform computes Y_k = sum_j X_j exp(+2 pi i j k / n), unnormalised
  // (FFTW manual, section 4.8.1 "What FFTW Really Computes"); the QFT |j> -> 2^(-n/2) sum_y
  // exp(2 pi i j y / 2^n) |y> (Nielsen & Chuang 2000, eq. 5.2) is that divided by sqrt(8).
  const int n = 3, dim = 8;
  const auto circuit = textbook_qft(n);
  fftw_complex* in = fftw_alloc_complex(dim);
  fftw_complex* out = fftw_alloc_complex(dim);
  fftw_plan plan = fftw_plan_dft_1d(dim, in, out, FFTW_BACKWARD, FFTW_ESTIMATE);
  std::mt19937 rng(7);
  std::normal_distribution<double> gauss;
  for (int trial = 0; trial < dim + 3; ++trial) {
    std::vector<cplx> x(dim, 0.0);
    if (trial < dim) {
      x[trial] = 1.0;  // every basis input
    } else {
      double norm = 0;
      for (auto& v : x) norm += std::norm(v = cplx(gauss(rng), gauss(rng)));
      for (auto& v : x) v /= std::sqrt(norm);
    }
    StateVector sv(n);
    sv.amplitudes() = x;
    for (const auto& g : circuit) sv.apply(g);
    for (int j = 0; j < dim; ++j) {
      in[j][0] = x[j].real();
      in[j][1] = x[j].imag();
    }
    fftw_execute(plan);
    for (int k = 0; k < dim; ++k) {
      const cplx want(out[k][0] / std::sqrt(8.0), out[k][1] / std::sqrt(8.0));
      expect_near(sv.amplitudes()[k], want, "QFT vs FFTW");
    }
  }
  fftw_destroy_plan(plan);
  fftw_free(in);
  fftw_free(out);
}

TEST(StateVector, QftOfFiveOnThreeQubitsHasTheTextbookProductPhases) {
  // Nielsen & Chuang 2000, eq. 5.4: QFT|j> = 2^(-n/2) (|0> + e^{2 pi i 0.j_n}|1>)
  // (|0> + e^{2 pi i 0.j_{n-1} j_n}|1>) ... ; for n = 3, j = 5 the output qubits of weight
  // 1, 2, 4 carry the relative phases 2 pi 5/8, 2 pi 5/4, 2 pi 5/2.
  StateVector sv(3);
  sv.set_basis(5);
  for (const auto& g : textbook_qft(3)) sv.apply(g);
  const double phase[3] = {2 * kPi * 5 / 8, 2 * kPi * 5 / 4, 2 * kPi * 5 / 2};
  for (int y = 0; y < 8; ++y) {
    double ph = 0;
    for (int k = 0; k < 3; ++k)
      if (y >> k & 1) ph += phase[k];
    expect_near(sv.amplitudes()[y], std::polar(1 / std::sqrt(8.0), ph), "product-state amplitude");
  }
}

}  // namespace
}  // namespace qftplan
