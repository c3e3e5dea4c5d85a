// The parity network (ours, parity_qft.hpp): its gate counts and depths against their formulas and
// against the published CX counts of linear-nearest-neighbour QFTs, and its plans end to end. Its
// unitaries are compared with FFTW in plan_fftw_test.cpp and its proofs in qft_checker_test.cpp.

#include <gtest/gtest.h>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/plan.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

PlanReport plan_line(int n, NetworkChoice network, std::optional<int> degree = std::nullopt, bool inverse = false) {
  PlanOptions opt;
  opt.spec.qubits = n;
  opt.spec.approx_degree = degree;
  opt.spec.inverse = inverse;
  opt.strategy = "chain";
  opt.network = network;
  return plan_qft(make_line(n), opt);
}

TEST(ParityNetwork, CountsAndDepthsFollowTheirFormulas) {
  for (int n = 3; n <= 64; ++n) {
    const PlanReport p = plan_line(n, NetworkChoice::parity);
    ASSERT_EQ(p.network, "parity");
    const long long pairs = static_cast<long long>(n) * (n - 1) / 2;
    // Ours (parity_qft.hpp): one parity step of 2 CX per meeting of the reversal network, then a
    // ladder of n-1 CX; meetings in 2n-3 layers of 2 CX, the ladder pipelined behind them.
    EXPECT_EQ(p.cx_count, static_cast<long long>(n) * n - 1) << n;
    EXPECT_EQ(p.two_qubit_blocks, pairs + n - 1) << n;
    EXPECT_EQ(p.rotations, pairs) << n;
    EXPECT_EQ(p.swaps, 0) << n;
    EXPECT_EQ(p.cx_depth, 4LL * n - 4) << n;
    EXPECT_EQ(p.depth_2q, 2LL * n - 1) << n;
    // Total depth, one-qubit layers included: Klaver, Rombouts, Fellner, Messinger, Ender, Ludwig and
    // Lechner, "SWAP-less Implementation of Quantum Algorithms", arXiv:2408.10907 (2024), abstract:
    // n^2 - 1 CNOT in depth 5n - 3 on a line. Ours (each parity step's rz after its second CX, where
    // the qubit's next step need not wait for it, and the last wire's Hadamard on its plain bit): 5n - 4
    // (it was 6n - 4, then 5n - 2).
    EXPECT_EQ(p.depth, 5LL * n - 4) << n;
    EXPECT_LT(p.depth, 5LL * n - 3) << n;
    EXPECT_EQ(p.placement, p.final_placement) << n;  // the reversal network's end: in order
    // Against the fused reversal network (3 CX per block: Vidal and Dawson, PRA 69, 010301, 2004):
    // a third fewer CX and a third less CX depth, asymptotically.
    const PlanReport f = plan_line(n, NetworkChoice::reversal);
    EXPECT_EQ(f.cx_count, 3 * pairs) << n;
    EXPECT_LT(p.cx_count, f.cx_count) << n;
    EXPECT_LT(p.cx_depth, f.cx_depth) << n;
  }
  // Park and Ahn (Scientific Reports 13, 8638, 2023, abstract) report an LNN QFT with about 40% of
  // the CX of earlier LNN circuits, which place a controlled phase (2 CX) and a SWAP (3 CX) per pair
  // of qubits, 5 n(n-1)/2 in all (Fowler, Devitt and Hollenberg 2004 with the usual decompositions,
  // common practice). The parity network reaches that ratio.
  const int n = 64;
  const double ratio = static_cast<double>(plan_line(n, NetworkChoice::parity).cx_count) / (2.5 * n * (n - 1));
  EXPECT_LT(ratio, 0.41);
  EXPECT_GT(ratio, 0.39);
}

TEST(ParityNetwork, ApproximateAndInverseKeepTheCounts) {
  for (int n : {8, 20, 33})
    for (int degree : {3, 5})
      for (bool inverse : {false, true}) {
        const PlanReport p = plan_line(n, NetworkChoice::parity, degree, inverse);
        EXPECT_EQ(p.network, "parity");
        // Dropped rotations leave bare exchanges, still 2 CX each.
        EXPECT_EQ(p.cx_count, static_cast<long long>(n) * n - 1);
        QftSpec spec;
        spec.qubits = n;
        spec.approx_degree = degree;
        EXPECT_EQ(p.rotations, spec.kept_rotations());
      }
}

TEST(ParityNetwork, NamedNetworksAndTheirErrors) {
  EXPECT_EQ(plan_line(10, NetworkChoice::reversal, 4).network, "reversal");
  EXPECT_EQ(plan_line(10, NetworkChoice::leapfrog, 4).network, "leapfrog");
  // Degrees 1 and 2 need no meetings; parity and reversal are still built as named (they end in
  // order, which --end-order same may want), the others give way.
  EXPECT_EQ(plan_line(10, NetworkChoice::anchored, 2).network, "adjacent");
  EXPECT_EQ(plan_line(10, NetworkChoice::anchored, 1).network, "hadamard-only");
  EXPECT_EQ(plan_line(10, NetworkChoice::parity, 2).network, "parity");
  EXPECT_EQ(plan_line(10, NetworkChoice::parity, 1).network, "parity");
  EXPECT_EQ(plan_line(10, NetworkChoice::reversal, 1).network, "reversal");
  try {
    plan_line(10, NetworkChoice::leapfrog);
    ADD_FAILURE() << "leapfrog for the exact QFT";
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()),
              "the leapfrog network is for the approximate QFT (degrees 3 .. n-1); use --approx or another --network");
  }
  try {
    parse_network_choice("fast");
    ADD_FAILURE() << "an unknown network";
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()), "unknown network 'fast' (valid: auto, reversal, anchored, leapfrog, insertion, parity-insertion, parity, blockwise)");
  }
}

// On the bundled noisy chip the parity network, with fewer CX, has the higher ESP, and the
// placement search chooses its chain for its own loads.
TEST(ParityNetwork, HigherEspOnTheNoisyChip) {
  const Device dev = load_device((testing::source_dir() / "topologies/harbor-noisy-20.yaml").string());
  PlanOptions opt;
  opt.spec.qubits = 12;
  opt.strategy = "chain";
  opt.network = NetworkChoice::anchored;
  const PlanReport fused = plan_qft(dev, opt);
  opt.network = NetworkChoice::parity;
  const PlanReport parity = plan_qft(dev, opt);
  EXPECT_EQ(parity.network, "parity");
  EXPECT_GT(parity.noise.esp, fused.noise.esp);
  EXPECT_EQ(parity.placement_choice.method, "exhaustive");
  // The best chains are counted exactly (esp_total) once the search has ranked them.
  EXPECT_NEAR(parity.placement_choice.best.front().log_esp, parity.noise.log_esp_total, 1e-9);
}

// The command line end to end: plan with --network parity, write both OpenQASM versions, check.
TEST(ParityNetwork, CommandLinePlanThenCheck) {
  const auto dir = testing::temp_dir();
  for (const std::string format : {"qasm3", "qasm2"})
    for (const std::string extra : {"", " --inverse", " --approx 4", " --gates cz"}) {
      const std::string file = (dir / ("p-" + format + ".qasm")).string();
      const auto plan = testing::run_qftplan("plan --device grid:5x5 --qubits 20 --strategy chain --network parity --format " +
                                             format + extra + " -o '" + file + "'");
      ASSERT_EQ(plan.status, 0) << plan.err;
      const std::string check_extra = extra == " --gates cz" ? "" : extra;
      const auto check = testing::run_qftplan("check '" + file + "' --device grid:5x5 --qubits 20" + check_extra);
      EXPECT_EQ(check.status, 0) << format << extra << ": " << check.out << check.err;
      EXPECT_NE(check.out.find("structural proof: the circuit is the"), std::string::npos) << check.out;
    }
  const auto bad = testing::run_qftplan("plan --device line:5 --qubits 5 --network fast");
  EXPECT_EQ(bad.status, 2);
  EXPECT_EQ(bad.err, "qftplan: unknown network 'fast' (valid: auto, reversal, anchored, leapfrog, insertion, parity-insertion, parity, blockwise)\n");
}

}  // namespace
}  // namespace qftplan
