// The noise model, the ESP-driven placement and the automatic approximation degree.

#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <cmath>
#include <complex>
#include <numbers>
#include <random>

#include "qftplan/core/approximation.hpp"
#include "qftplan/core/atomic_file.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/chain_search.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_program.hpp"
#include "qftplan/qasm/qasm_writer.hpp"
#include "qftplan/report/circuit_header.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

// A 3x4 grid whose couplers and qubits have errors from a fixed integer sequence (std::mt19937 is
// fully specified by the C++ standard, so the device is the same everywhere).
Device noisy_grid_3x4() {
  DeviceDescription d = make_grid(3, 4).description();
  d.name = "test-noisy-3x4";
  std::mt19937 gen(7);
  for (auto& c : d.couplers) c.error = 0.002 + (gen() % 100) * 2e-4;
  d.calibration.error_1q = 3e-4;
  for (int q = 0; q < d.qubits; ++q) d.qubit_calibration.push_back({q, 1e-4 + (gen() % 10) * 1e-4, {}, {}, {}, {}});
  return Device(d);
}

// Plans, writes OpenQASM 3 into memory and reads it back with the reader.
struct Emitted {
  PlanReport report;
  QasmProgram program;
};
Emitted plan_and_read(const Device& dev, PlanOptions opt) {
  const auto plan = prepare_plan(dev, opt);
  StringOutput text;
  QasmWriter w(QasmVersion::v3, circuit_header(dev, opt, plan), text);
  Emitted e{execute_plan(dev, opt, plan, &w), {}};
  e.program = parse_qasm(text.text(), "<memory>");
  return e;
}

// The Pauli-twirled amplitude and phase damping channel over an idle interval t keeps the state with
// probability (1 + e^(-t/T1) + 2 e^(-t/T2)) / 4 (Ghosh, Fowler, Geller, "Surface code with
// decoherence: an analysis of three superconducting architectures", Phys. Rev. A 86, 062318, 2012:
// p_x = p_y = (1 - e^(-t/T1))/4, p_z = (1 - e^(-t/T2))/2 - (1 - e^(-t/T1))/4). Written out here in
// plain arithmetic, independently of the library's log_idle_fidelity.
double twirled_no_error(double t_ns, double t1_us, double t2_us) {
  const double px = (1 - std::exp(-t_ns / (t1_us * 1000))) / 4;
  const double pz = (1 - std::exp(-t_ns / (t2_us * 1000))) / 2 - px;
  return 1 - 2 * px - pz;
}

// The idling factor of a gate list, from its own ASAP schedule: every gate starts when its qubits
// are free (two-qubit gates when both are); a qubit that holds information (a register qubit from
// time 0, any other from its first gate) and waits for t > 0 ns loses the no-error probability of
// one interval; every holding qubit waits from its last gate to the end of the schedule.
struct IdleRecount {
  double factor = 1;
  double duration_ns = 0;
};
IdleRecount recount_idling(const Device& dev, const std::vector<Gate>& gates, const std::vector<int>& reg) {
  const int D = dev.qubit_count();
  std::vector<double> ready(D, 0.0);
  std::vector<bool> holds(D, false);
  for (int q : reg) holds[q] = true;
  IdleRecount r;
  auto wait = [&](int q, double gap) {
    if (gap > 0 && holds[q]) {
      const auto c = dev.qubit_calibration(q);
      r.factor *= twirled_no_error(gap, c.t1_us, c.t2_us);
    }
  };
  for (const Gate& g : gates) {
    if (g.kind == GateKind::measure) continue;
    if (g.kind == GateKind::cx || g.kind == GateKind::cz) {
      const double t = std::max(ready[g.q0], ready[g.q1]);
      wait(g.q0, t - ready[g.q0]);
      wait(g.q1, t - ready[g.q1]);
      holds[g.q0] = holds[g.q1] = true;
      ready[g.q0] = ready[g.q1] = t + dev.coupler_calibration(g.q0, g.q1).duration_ns;
    } else {
      holds[g.q0] = true;
      if (g.kind == GateKind::h || g.kind == GateKind::x || g.kind == GateKind::sx)
        ready[g.q0] += dev.qubit_calibration(g.q0).duration_1q_ns;
    }
  }
  for (double t : ready) r.duration_ns = std::max(r.duration_ns, t);
  for (int q = 0; q < D; ++q) wait(q, r.duration_ns - ready[q]);
  return r;
}

TEST(NoiseModel, EspRecomputedGateByGateFromTheFileEqualsTheReport) {
  // The definition (common practice, e.g. for estimated-success-probability figures of merit):
  // product of (1 - error) over the native gates, rz/p free, two-qubit gates at their coupler's
  // error. Recomputed here from the emitted file and the calibration, independently of NoiseSink.
  for (const std::string spec : {"topologies/harbor-noisy-20.yaml", "topologies/harbor-hex-21.yaml"}) {
    const Device dev = load_device((testing::source_dir() / spec).string());
    for (GateSet gates : {GateSet::cx, GateSet::cz}) {
      PlanOptions opt;
      opt.spec.qubits = 10;
      opt.gates = gates;
      opt.measure = true;
      // The report's esp is over the device's native gate; compare like with like.
      if (gate_set_of(dev.native_2q()) != gates) continue;
      const auto e = plan_and_read(dev, opt);
      double esp = 1, readout = 1;
      for (const auto& g : e.program.gates) {
        if (g.kind == GateKind::cx || g.kind == GateKind::cz) {
          ASSERT_TRUE(dev.coupled(g.q0, g.q1));
          esp *= 1 - dev.coupler_calibration(g.q0, g.q1).error;
        } else if (g.kind == GateKind::h || g.kind == GateKind::sx || g.kind == GateKind::x) {
          esp *= 1 - dev.qubit_calibration(g.q0).error_1q;
        } else if (g.kind == GateKind::measure) {
          readout *= 1 - dev.qubit_calibration(g.q0).error_readout;
        }
      }
      EXPECT_NEAR(e.report.noise.esp / esp, 1.0, 1e-12) << spec;
      EXPECT_NEAR(e.report.noise.esp_readout / readout, 1.0, 1e-12) << spec;
      // The idling factor from the file's own schedule (the planner counts it on the logical stream,
      // replaying native programs: the two must agree).
      const IdleRecount idle = recount_idling(dev, e.program.gates, e.report.placement);
      EXPECT_NEAR(e.report.noise.duration_ns, idle.duration_ns, 1e-6) << spec;
      EXPECT_NEAR(e.report.noise.esp_idle / idle.factor, 1.0, 1e-12) << spec;
      EXPECT_LT(e.report.noise.esp_idle, 1.0);
      EXPECT_NEAR(e.report.noise.esp_total / (esp * idle.factor * readout), 1.0, 1e-12) << spec;
    }
  }
}

TEST(NoiseModel, IdleFactorFollowsTheStatedFormula) {
  // Two qubits, one coupler: h (40 ns), cp (2 CX of 300 ns), h (40 ns): duration 680 ns on the ASAP
  // schedule; each register qubit idles 40 ns once (the second waits for the first h, the first for
  // the last h), and each such interval keeps the state with probability (1 + e^(-t/T1) + 2 e^(-t/T2))/4
  // (Ghosh, Fowler, Geller, Phys. Rev. A 86, 062318, 2012: Pauli twirl of amplitude and phase damping).
  DeviceDescription d;
  d.name = "pair";
  d.qubits = 2;
  d.couplers = {{0, 1, {}, {}}};
  d.calibration.error_1q = 0.001;
  d.calibration.error_2q = 0.01;
  d.calibration.duration_1q_ns = 40;
  d.calibration.duration_2q_ns = 300;
  d.calibration.t1_us = 100;
  d.calibration.t2_us = 50;
  const Device dev(d);
  PlanOptions opt;
  opt.spec.qubits = 2;
  opt.strategy = "chain";
  const auto r = plan_qft(dev, opt);
  // Anchored network on 2 qubits (the default): h, cp (2 CX), h; no SWAP.
  ASSERT_EQ(r.network, "anchored");
  const double esp = std::pow(0.999, 2) * std::pow(0.99, 2);
  EXPECT_NEAR(r.noise.esp, esp, 1e-15);
  const double t = 40 + 600 + 40;
  EXPECT_NEAR(r.noise.duration_ns, t, 1e-9);
  const double f40 = (1 + std::exp(-40 / 100e3) + 2 * std::exp(-40 / 50e3)) / 4;
  EXPECT_NEAR(r.noise.esp_idle, f40 * f40, 1e-15);
  EXPECT_NEAR(r.noise.idle_ns, 80, 1e-9);
  EXPECT_NEAR(r.noise.esp_total, esp * f40 * f40, 1e-15);
}

// The dense matrices of the QFT and of the AQFT of degree M, from their definitions (the AQFT keeps
// the phase terms pi/2^m j_a y_l with m + 1 <= M; Barenco et al., PRA 54, 139, 1996, section II).
Eigen::MatrixXcd transform(int n, std::optional<int> M) {
  const int N = 1 << n;
  Eigen::MatrixXcd U(N, N);
  for (int j = 0; j < N; ++j)
    for (int y = 0; y < N; ++y) {
      double ph = 0;
      for (int a = 0; a < n; ++a)
        for (int l = 0; l < n; ++l) {
          const int m = n - 1 - a - l;
          if (m < 0 || (M && m + 1 > *M)) continue;
          if (((j >> a) & 1) && ((y >> l) & 1)) ph += std::numbers::pi / std::ldexp(1.0, m);
        }
      U(y, j) = std::polar(1.0 / std::sqrt(double(N)), ph);
    }
  return U;
}

TEST(Approximation, SimulatedDistanceNeverExceedsTheBound) {
  // Bound: 2 sin(min(S, pi)/2), S the sum over qubits of their dropped phases (approximation.cpp; at most
  // the sum over dropped rotations of ||CR_k - I||, Nielsen & Chuang 2000, section 4.5.3, eq. 4.63;
  // Coppersmith, IBM RC19642, 1994). Checked against the exact operator norm (largest singular value,
  // Eigen's JacobiSVD) and the worst state fidelity it implies.
  for (int n = 2; n <= 8; ++n) {
    const Eigen::MatrixXcd U = transform(n, std::nullopt);
    for (int M = 1; M < n; ++M) {
      const Eigen::MatrixXcd V = transform(n, M);
      const double dist = Eigen::JacobiSVD<Eigen::MatrixXcd>(U - V).singularValues()(0);
      const double bound = approx_error_bound(n, M);
      EXPECT_LE(dist, bound + 1e-12) << "n=" << n << " M=" << M;
      // Worst-case fidelity over states: min over unit psi of |<U psi|V psi>|^2 >= bound formula.
      // Basis states are a sample of psi; the bound must hold for each.
      const double f_bound = approx_fidelity_lower_bound(bound);
      for (int j = 0; j < (1 << n); ++j) {
        const std::complex<double> ov = U.col(j).dot(V.col(j));
        EXPECT_GE(std::norm(ov), f_bound - 1e-12);
      }
    }
    EXPECT_EQ(approx_error_bound(n, std::nullopt), 0.0);
    EXPECT_EQ(approx_error_bound(n, n), 0.0);
  }
}

// Every chain of n qubits in a small device, by brute force (the test's own enumeration).
void all_chains(const Device& dev, int n, std::vector<int>& path, std::vector<bool>& on, std::vector<std::vector<int>>& out) {
  if (static_cast<int>(path.size()) == n) {
    out.push_back(path);
    return;
  }
  for (int nb : dev.neighbours(path.back()))
    if (!on[nb]) {
      on[nb] = true;
      path.push_back(nb);
      all_chains(dev, n, path, on, out);
      path.pop_back();
      on[nb] = false;
    }
}

TEST(Placement, ChosenChainHasTheBestEspOverAllChains) {
  const Device dev = noisy_grid_3x4();
  for (int n : {4, 6}) {
    std::vector<std::vector<int>> chains;
    std::vector<bool> on(dev.qubit_count(), false);
    for (int s = 0; s < dev.qubit_count(); ++s) {
      std::vector<int> path{s};
      on[s] = true;
      all_chains(dev, n, path, on, chains);
      on[s] = false;
    }
    ASSERT_GT(chains.size(), 20u);
    PlanOptions opt;
    opt.spec.qubits = n;
    const auto r = plan_qft(dev, opt);
    EXPECT_EQ(r.placement_choice.method, "exhaustive");
    // Every chain with the default network (choose_network), and with every network, counted by the
    // noise model: the plan is the best of the first (its chain is chosen for that network's loads), and
    // switching the network on that chain only helps; within 1% of the best pair of all.
    double best_default = 0, best_any = 0;
    const CountSettings count{gate_set_of(dev.native_2q())};
    for (const auto& c : chains)
      for (NetworkChoice net : {NetworkChoice::automatic, NetworkChoice::parity, NetworkChoice::anchored}) {
        const double esp =
            count_circuit(dev, *make_line_circuit(opt.spec, choose_network(opt.spec, net), c), count, nullptr).noise.esp_total;
        if (net == NetworkChoice::automatic) best_default = std::max(best_default, esp);
        best_any = std::max(best_any, esp);
      }
    EXPECT_GE(r.noise.esp_total, best_default * (1 - 1e-12)) << "n=" << n;
    EXPECT_GE(r.noise.esp_total, 0.99 * best_any) << "n=" << n;
  }
}

TEST(Placement, AvoidsThePoorCouplersOfTheNoisyChip) {
  // topologies/harbor-noisy-20.yaml names its poor couplers in its header comment:
  // [6, 7] (0.062), [3, 8] (0.048) and [12, 17] (0.071), against a typical 0.008.
  const Device dev = load_device((testing::source_dir() / "topologies/harbor-noisy-20.yaml").string());
  const std::vector<std::pair<int, int>> poor{{6, 7}, {3, 8}, {12, 17}};
  for (int n : {4, 8, 12, 16}) {
    PlanOptions opt;
    opt.spec.qubits = n;
    const auto r = plan_qft(dev, opt);
    for (std::size_t p = 0; p + 1 < r.chain.size(); ++p)
      for (auto [a, b] : poor)
        EXPECT_FALSE((r.chain[p] == a && r.chain[p + 1] == b) || (r.chain[p] == b && r.chain[p + 1] == a))
            << "n=" << n << " uses poor coupler [" << a << ", " << b << "]";
  }
}

TEST(ApproxAuto, BeatsExactOnANoisyDeviceAndKeepsExactOnACleanOne) {
  auto line_with_error = [](double e2) {
    DeviceDescription d = make_line(64).description();
    d.calibration.error_2q = e2;
    d.calibration.error_1q = e2 / 10;
    return Device(d);
  };
  PlanOptions opt;
  opt.spec.qubits = 64;
  opt.auto_approx = true;
  const auto noisy = plan_qft(line_with_error(0.01), opt);
  ASSERT_TRUE(noisy.degree_choice);
  ASSERT_TRUE(noisy.approx_degree.has_value());
  double exact_score = 0, chosen_score = 0;
  for (const auto& c : noisy.degree_choice->considered) {
    if (!c.degree) exact_score = c.score;
    if (c.degree == noisy.approx_degree) chosen_score = c.score;
  }
  EXPECT_GT(chosen_score, 10 * exact_score);
  EXPECT_LT(noisy.cx_count, 3LL * 64 * 63 / 2);

  // On a clean chip the rotations cost almost nothing: exact, or a degree that loses almost no readout
  // success (at 1e-9 per CX the insertion network's parity form saves ~500 of 4095 CX at degree 15,
  // worth 5e-7 of ESP, against a readout loss below that; the score decides).
  const auto clean = plan_qft(line_with_error(1e-9), opt);
  ASSERT_TRUE(clean.degree_choice);
  double best = 0;
  for (const auto& c : clean.degree_choice->considered) {
    best = std::max(best, c.score);
    if (c.degree == clean.approx_degree) EXPECT_GE(c.approx.readout_success, 1 - 1e-6) << "degree " << *c.degree;
    if (!c.degree) EXPECT_GE(c.score, 1 - 1e-5);  // exact: ESP of 4095 CX at 1e-9
  }
  for (const auto& c : clean.degree_choice->considered)
    if (c.degree == clean.approx_degree) EXPECT_EQ(c.score, best) << "the chosen degree has the best score";
}

// Where approximating saves no gate it is no gain: the parity network needs n^2 - 1 CX at every
// degree from 3 on (ours, parity_qft.hpp), so with that network pinned on a 34-qubit noisy line every
// degree it serves has the exact transform's ESP and a readout success below 1: exact is chosen.
TEST(ApproxAuto, ApproximatesOnlyWhereItSavesGates) {
  DeviceDescription d = make_line(34).description();
  d.calibration.error_2q = 0.01;
  const Device dev(d);
  PlanOptions opt;
  opt.spec.qubits = 34;
  opt.auto_approx = true;
  opt.strategy = "chain";
  opt.network = parse_network_choice("parity");
  const auto r = plan_qft(dev, opt);
  EXPECT_EQ(r.network, "parity");
  EXPECT_FALSE(r.approx_degree.has_value()) << "degree " << *r.approx_degree;
  EXPECT_EQ(r.cx_count, 34 * 34 - 1);
  // Every degree the parity network serves costs the same, so none of them may be chosen over exact.
  for (const auto& c : r.degree_choice->considered)
    if (c.degree && c.native_2q == r.cx_count) EXPECT_LE(c.score, r.noise.esp_total * (1 + 1e-12)) << *c.degree;
}

// Unpinned, the same line approximates: the readout success of a low degree outweighs the ESP of the
// n^2 - 1 CX of the exact transform (issue 19: "--approx auto almost never approximates below ~36 qubits").
TEST(ApproxAuto, ApproximatesOnANoisy34QubitLine) {
  DeviceDescription d = make_line(34).description();
  d.calibration.error_2q = 0.01;
  const Device dev(d);
  PlanOptions opt;
  opt.spec.qubits = 34;
  opt.auto_approx = true;
  const auto r = plan_qft(dev, opt);
  ASSERT_TRUE(r.approx_degree.has_value());
  ASSERT_TRUE(r.degree_choice);
  double best = -INFINITY, exact = -INFINITY, chosen = -INFINITY;
  for (const auto& c : r.degree_choice->considered) {
    best = std::max(best, c.log_score);
    if (!c.degree) exact = c.log_score;
    if (c.degree == r.approx_degree) chosen = c.log_score;
    // The score is the product of its two factors.
    EXPECT_NEAR(c.log_score, c.log_esp + c.approx.log_readout_success, 1e-12);
  }
  EXPECT_EQ(chosen, best);
  EXPECT_GT(chosen, exact + std::log(10.0));
  EXPECT_LT(r.cx_count, 34 * 34 - 1);
  EXPECT_GT(r.approx.readout_success, 0.0);
  EXPECT_LT(r.approx.readout_success, 1.0);
}

TEST(ApproxAuto, ExplainShowsTheChoices) {
  const auto r = testing::run_qftplan("plan --device '" + (testing::source_dir() / "topologies/harbor-noisy-20.yaml").string() +
                                      "' --qubits 8 --approx auto --explain");
  ASSERT_EQ(r.status, 0) << r.err;
  EXPECT_NE(r.out.find("runner-up"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("<- chosen"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("approximation degree:"), std::string::npos) << r.out;
  // Both factors of the score, per degree.
  EXPECT_NE(r.out.find("esp_total    x readout    = score"), std::string::npos) << r.out;
}

}  // namespace
}  // namespace qftplan
