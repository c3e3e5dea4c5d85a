// The peephole pass on its own: each rewrite, cascades, gates on other qubits in between, nothing
// removed across a gate on the qubit, exact angle sums and the zero drop; then random streams whose
// unitary is compared before and after the pass by a dense simulation written here.

#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <complex>
#include <algorithm>
#include <random>

#include "qftplan/sinks/circuit_metrics.hpp"
#include "qftplan/sinks/native_gates.hpp"
#include "qftplan/sinks/peephole.hpp"

namespace qftplan {
namespace {

struct Passed {
  std::vector<Gate> gates;
  long long removed = 0;
};

Passed run_pass(int qubits, const std::vector<Gate>& in) {
  VectorSink out;
  PeepholePass pass(qubits, out);
  for (const Gate& g : in) pass.gate(g);
  pass.finish();
  return {out.gates, pass.removed()};
}

Gate h(int q) { return make_gate(GateKind::h, q); }
Gate x(int q) { return make_gate(GateKind::x, q); }
Gate cx(int c, int t) { return make_gate(GateKind::cx, c, t); }
Gate cz(int a, int b) { return make_gate(GateKind::cz, a, b); }
Gate rz(int q, Angle a) { return make_gate(GateKind::rz, q, -1, a); }
Gate p(int q, Angle a) { return make_gate(GateKind::p, q, -1, a); }

// The algebra behind each expectation: H^2 = X^2 = CX^2 = CZ^2 = I, CZ symmetric in its qubits,
// Rz(a) Rz(b) = Rz(a + b) and P(a) P(b) = P(a + b) (Nielsen and Chuang, "Quantum Computation and
// Quantum Information", 2000, sections 4.2 and 4.3).
TEST(PeepholePass, SelfInversePairsCancel) {
  for (const auto& pair : std::vector<std::vector<Gate>>{{h(0), h(0)}, {x(1), x(1)}, {cx(0, 1), cx(0, 1)},
                                                          {cz(0, 1), cz(0, 1)}, {cz(0, 1), cz(1, 0)}}) {
    const Passed r = run_pass(2, pair);
    EXPECT_TRUE(r.gates.empty()) << gate_name(pair[0].kind);
    EXPECT_EQ(r.removed, 2);
  }
}

TEST(PeepholePass, DifferentGatesStay) {
  // cx with control and target swapped is another gate; h x, rz p and cz on other pairs do not cancel.
  for (const auto& pair : std::vector<std::vector<Gate>>{{cx(0, 1), cx(1, 0)}, {h(0), x(0)}, {h(0), h(1)},
                                                          {cz(0, 1), cz(1, 2)}, {rz(0, Angle(1, 2)), p(0, Angle(1, 2))},
                                                          {make_gate(GateKind::sx, 0), make_gate(GateKind::sx, 0)}}) {
    const Passed r = run_pass(3, pair);
    EXPECT_EQ(r.gates, pair);
    EXPECT_EQ(r.removed, 0);
  }
}

TEST(PeepholePass, NothingIsRemovedAcrossAGateOnTheQubit) {
  const std::vector<std::vector<Gate>> blocked = {
      {h(0), rz(0, Angle(1, 3)), h(0)},            // a rotation between
      {h(1), cz(0, 1), h(1)},                      // a two-qubit gate on the qubit
      {cz(0, 1), h(1), cz(0, 1)},                  // a gate on one of the pair
      {cz(0, 1), cz(0, 2), cz(0, 1)},              // a two-qubit gate on one of the pair
      {cx(0, 1), h(0), cx(0, 1)},
      {rz(0, Angle(1, 3)), h(0), rz(0, Angle(-1, 3))},
      {h(0), make_gate(GateKind::measure, 0, 0), h(0)},  // a measurement stops everything on its qubit
  };
  for (const auto& in : blocked) {
    const Passed r = run_pass(3, in);
    EXPECT_EQ(r.gates, in);
    EXPECT_EQ(r.removed, 0);
  }
}

TEST(PeepholePass, GatesOnOtherQubitsCommutePast) {
  // h 0 and h 0 meet across gates on qubits 1 and 2; the cx pair across an h on qubit 2.
  const Passed r = run_pass(3, {h(0), h(1), cz(1, 2), rz(2, Angle(1, 4)), h(0), cx(0, 1), h(2), cx(0, 1)});
  EXPECT_EQ(r.gates, (std::vector<Gate>{h(1), cz(1, 2), rz(2, Angle(1, 4)), h(2)}));
  EXPECT_EQ(r.removed, 4);
}

TEST(PeepholePass, RemovalsCascade) {
  // cx 0,1 written twice with the cz target: h 1; cz; h 1; h 1; cz; h 1: the middle h pair goes, then
  // the two cz meet, then the outer h pair.
  Passed r = run_pass(2, {h(1), cz(0, 1), h(1), h(1), cz(0, 1), h(1)});
  EXPECT_TRUE(r.gates.empty());
  EXPECT_EQ(r.removed, 6);
  // A rotation pair that sums to zero lets the Hadamards around it meet.
  r = run_pass(2, {h(0), rz(0, Angle(3, 4)), rz(0, Angle(-3, 4)), h(0), x(1)});
  EXPECT_EQ(r.gates, (std::vector<Gate>{x(1)}));
  EXPECT_EQ(r.removed, 4);
  // Nested on both qubits of a pair, with a gate elsewhere in the middle.
  r = run_pass(3, {cx(0, 1), h(0), x(1), h(2), x(1), h(0), cx(0, 1), cz(0, 1)});
  EXPECT_EQ(r.gates, (std::vector<Gate>{h(2), cz(0, 1)}));
  EXPECT_EQ(r.removed, 6);
}

TEST(PeepholePass, RotationsMergeExactly) {
  // pi/8 + pi/32 = 5 pi/32, kept as the exact fraction.
  Passed r = run_pass(1, {rz(0, Angle(1, 3)), rz(0, Angle(1, 5))});
  ASSERT_EQ(r.gates.size(), 1u);
  EXPECT_EQ(r.gates[0], rz(0, Angle(5, 5)));
  EXPECT_EQ(r.removed, 1);
  // Tiny angles of a large QFT: pi/2^4000 + pi/2^4000 = pi/2^3999, no rounding.
  r = run_pass(1, {p(0, Angle(1, 4000)), p(0, Angle(1, 4000)), p(0, Angle(-3, 4001))});
  ASSERT_EQ(r.gates.size(), 1u);
  EXPECT_EQ(r.gates[0], p(0, Angle(1, 4001)));
  EXPECT_EQ(r.removed, 2);
  // Three in a row merge into the first one's place, across a gate on another qubit.
  r = run_pass(2, {h(0), rz(0, Angle(1, 2)), x(1), rz(0, Angle(1, 2)), rz(0, Angle(1, 2))});
  EXPECT_EQ(r.gates, (std::vector<Gate>{h(0), rz(0, Angle(3, 2)), x(1)}));
  EXPECT_EQ(r.removed, 2);
}

TEST(PeepholePass, ZeroRotationsAreDropped) {
  // Zero as given, and zero after a merge (mod 2 pi: pi + pi; rz(2 pi) = -I, a global phase).
  for (const auto& in : std::vector<std::vector<Gate>>{{rz(0, Angle{})},
                                                        {p(0, Angle{})},
                                                        {rz(0, Angle(1, 5)), rz(0, Angle(-1, 5))},
                                                        {rz(0, Angle(1, 0)), rz(0, Angle(1, 0))},
                                                        {p(0, Angle(3, 2)), p(0, Angle(5, 2))}}) {
    const Passed r = run_pass(1, in);
    EXPECT_TRUE(r.gates.empty()) << in.size();
    EXPECT_EQ(r.removed, static_cast<long long>(in.size()));
  }
}

TEST(PeepholePass, LongStreamsKeepTheOrderOnEveryQubit) {
  // More gates per qubit than the pass holds back: they leave in their order on each qubit.
  std::vector<Gate> in;
  for (int i = 0; i < 50; ++i) {
    in.push_back(rz(i % 3, Angle(1, 2 + i)));
    in.push_back(cx(i % 3, (i + 1) % 3));
    in.push_back(h(i % 3));
  }
  const Passed r = run_pass(3, in);
  EXPECT_EQ(r.removed, 0);
  ASSERT_EQ(r.gates.size(), in.size());
  for (int q = 0; q < 3; ++q) {
    std::vector<Gate> a, b;
    for (const Gate& g : in)
      if (g.q0 == q || (is_two_qubit(g.kind) && g.q1 == q)) a.push_back(g);
    for (const Gate& g : r.gates)
      if (g.q0 == q || (is_two_qubit(g.kind) && g.q1 == q)) b.push_back(g);
    EXPECT_EQ(a, b) << "qubit " << q;
  }
}

// --- random streams against a dense simulation ---------------------------------------------------

using Matrix = Eigen::MatrixXcd;

// The gates as the OpenQASM 3 standard library defines them (OpenQASM 3 specification, "stdgates.inc"):
// h, x, rz(t) = diag(e^(-it/2), e^(it/2)), p(t) = diag(1, e^(it)), cx (q0 control), cz. Qubit k is bit k
// of the basis index.
Matrix unitary(int n, const std::vector<Gate>& gates) {
  const int dim = 1 << n;
  Matrix u = Matrix::Identity(dim, dim);
  const std::complex<double> i1(0, 1);
  const double s = 1 / std::sqrt(2.0);
  for (const Gate& g : gates) {
    Matrix m = Matrix::Zero(dim, dim);
    const int a = 1 << g.q0, b = is_two_qubit(g.kind) ? 1 << g.q1 : 0;
    const double t = g.angle.radians();
    for (int col = 0; col < dim; ++col) {
      const bool va = col & a;
      switch (g.kind) {
        case GateKind::h:
          m(col & ~a, col) += s;
          m(col | a, col) += va ? -s : s;
          break;
        case GateKind::x: m(col ^ a, col) = 1; break;
        case GateKind::rz: m(col, col) = std::exp(i1 * (va ? t / 2 : -t / 2)); break;
        case GateKind::p: m(col, col) = va ? std::exp(i1 * t) : 1.0; break;
        case GateKind::cx: m(va ? col ^ b : col, col) = 1; break;
        case GateKind::cz: m(col, col) = va && (col & b) ? -1.0 : 1.0; break;
        default: ADD_FAILURE() << "unexpected gate"; break;
      }
    }
    u = m * u;
  }
  return u;
}

double distance_up_to_phase(const Matrix& a, const Matrix& b) {
  Eigen::Index r = 0, c = 0;
  a.cwiseAbs().maxCoeff(&r, &c);
  const std::complex<double> phase = b(r, c) / a(r, c);
  return (a * phase - b).cwiseAbs().maxCoeff();
}

// The pass leaves no pair it should have removed: on every qubit, no two neighbouring gates that
// cancel or merge (holds while no qubit carries more gates than the pass holds back).
void expect_no_pair_left(int n, const std::vector<Gate>& gates) {
  std::vector<int> last(n, -1);
  for (int i = 0; i < static_cast<int>(gates.size()); ++i) {
    const Gate& g = gates[i];
    const bool two = is_two_qubit(g.kind);
    EXPECT_FALSE((g.kind == GateKind::rz || g.kind == GateKind::p) && g.angle.is_zero());
    const int prev = last[g.q0];
    if (prev >= 0 && (!two || last[g.q1] == prev)) {
      const Gate& f = gates[prev];
      const bool same_kind = f.kind == g.kind;
      const bool cancels = same_kind && (g.kind == GateKind::h || g.kind == GateKind::x || g.kind == GateKind::rz ||
                                         g.kind == GateKind::p || g.kind == GateKind::cz ||
                                         (g.kind == GateKind::cx && f.q0 == g.q0));
      EXPECT_FALSE(cancels) << "gates " << prev << " and " << i;
    }
    last[g.q0] = i;
    if (two) last[g.q1] = i;
  }
}

TEST(PeepholePass, RandomStreamsKeepTheirUnitary) {
  std::mt19937_64 rng(20261204);
  const int n = 3;
  long long removed = 0, fully_checked = 0;
  for (int trial = 0; trial < 4000; ++trial) {
    std::vector<Gate> in;
    const int len = 2 + static_cast<int>(rng() % 11);
    for (int i = 0; i < len; ++i) {
      const int q = static_cast<int>(rng() % n), r = (q + 1 + static_cast<int>(rng() % (n - 1))) % n;
      // A few kinds and angles, so that pairs and zero sums are frequent.
      const Angle a(static_cast<std::int64_t>(rng() % 5) - 2, 2);
      switch (rng() % 6) {
        case 0: in.push_back(h(q)); break;
        case 1: in.push_back(x(q)); break;
        case 2: in.push_back(rz(q, a)); break;
        case 3: in.push_back(p(q, a)); break;
        case 4: in.push_back(cx(q, r)); break;
        default: in.push_back(cz(q, r)); break;
      }
    }
    const Passed out = run_pass(n, in);
    long long kept_zero = 0;
    for (const Gate& g : in) kept_zero += (g.kind == GateKind::rz || g.kind == GateKind::p) && g.angle.is_zero();
    EXPECT_EQ(static_cast<long long>(in.size()) - out.removed, static_cast<long long>(out.gates.size()));
    EXPECT_LT(distance_up_to_phase(unitary(n, in), unitary(n, out.gates)), 1e-9) << "trial " << trial;
    // Every pair must be found while no qubit has more gates than the pass holds back.
    std::vector<int> per_qubit(n, 0);
    for (const Gate& g : in) {
      ++per_qubit[g.q0];
      if (is_two_qubit(g.kind)) ++per_qubit[g.q1];
    }
    if (*std::max_element(per_qubit.begin(), per_qubit.end()) <= PeepholePass::kDepth) {
      expect_no_pair_left(n, out.gates);
      ++fully_checked;
    }
    removed += out.removed - kept_zero;
  }
  EXPECT_GT(removed, 1000);        // the streams do exercise the rewrites
  EXPECT_GT(fully_checked, 1000);  // and the search for pairs left
}

// NativePeephole (logical gates held whole where nothing can pair, opened where something can) on random
// logical streams: the native circuit it writes has the unitary of the plain decomposition, no pair left
// that the pass removes, and the counters it feeds equal a recount of what it wrote.
TEST(NativePeephole, RandomLogicalStreamsKeepTheirUnitaryAndCounts) {
  const int n = 3;
  std::mt19937_64 rng(18);
  long long removed = 0, fully_checked = 0;
  for (TwoQubitGate target : {TwoQubitGate::cx, TwoQubitGate::cz}) {
    DeviceDescription d;
    d.name = "triangle";
    d.qubits = n;
    d.couplers = {{0, 1, {}, {}}, {1, 2, {}, {}}, {0, 2, {}, {}}};
    d.native_2q = target;
    const Device dev(d);
    for (int trial = 0; trial < 1500; ++trial) {
      std::vector<Gate> logical;
      const int len = 1 + static_cast<int>(rng() % 6);
      for (int i = 0; i < len; ++i) {
        const int q = static_cast<int>(rng() % n), r = (q + 1 + static_cast<int>(rng() % (n - 1))) % n;
        const Angle a(static_cast<std::int64_t>(rng() % 5) - 2, 2);
        static constexpr GateKind kinds[] = {GateKind::h,  GateKind::p,       GateKind::cx,          GateKind::cz,
                                             GateKind::cp, GateKind::cp_swap, GateKind::parity_step, GateKind::swap};
        const GateKind k = kinds[rng() % 8];
        logical.push_back(make_gate(k, q, is_two_qubit(k) ? r : -1, has_angle(k) ? a : Angle{}));
      }
      VectorSink plain, written;
      NativeDecomposer dec(target, plain);
      dec.batch(logical);
      dec.finish();
      MetricsSink counts(n);
      NoiseSink noise(dev, {0, 1, 2});
      NativePeephole pass(target, n, counts, noise, &written);
      for (const Gate& g : logical) pass.gate(g);
      pass.finish();
      ASSERT_LT(distance_up_to_phase(unitary(n, plain.gates), unitary(n, written.gates)), 1e-9) << "trial " << trial;
      EXPECT_EQ(static_cast<long long>(plain.gates.size()) - pass.removed(), static_cast<long long>(written.gates.size()));
      // Every pair must be found while no qubit has more native gates than the pass holds back.
      std::vector<int> per_qubit(n, 0);
      for (const Gate& g : plain.gates) {
        ++per_qubit[g.q0];
        if (is_two_qubit(g.kind)) ++per_qubit[g.q1];
      }
      if (*std::max_element(per_qubit.begin(), per_qubit.end()) <= NativePeephole::kDepth) {
        expect_no_pair_left(n, written.gates);
        ++fully_checked;
      }
      MetricsSink recount(n);
      NoiseSink renoise(dev, {0, 1, 2});
      for (const Gate& g : written.gates) {
        recount.gate(g);
        renoise.gate(g);
      }
      EXPECT_EQ(recount.counts_by_name(), counts.counts_by_name());
      EXPECT_EQ(recount.depth(), counts.depth());
      EXPECT_EQ(recount.depth_2q(), counts.depth_2q());
      EXPECT_NEAR(renoise.figures().duration_ns, noise.figures().duration_ns, 1e-9);
      removed += pass.removed();
    }
  }
  EXPECT_GT(removed, 500);
  EXPECT_GT(fully_checked, 300);
}

}  // namespace
}  // namespace qftplan
