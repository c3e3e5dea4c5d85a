// The block construction as a plan (`--network blockwise`): what the report says about it, what the
// checker says about its files, how --approx auto and --approx-error choose it, and what is refused.
// Source of the construction: Kahanamoku-Meyer, Blue, Bergamaschi, Gidney, Chuang, "A log-depth in-place
// quantum Fourier transform that rarely needs ancillas", arXiv:2505.00701, 2025.

#include <gtest/gtest.h>

#include <cmath>
#include <string>

#include <nlohmann/json.hpp>

#include "qftplan/core/blockwise_error.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/plan.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

PlanSettings blockwise_settings(int n, const std::string& approx) {
  PlanSettings s;
  s.qubits = n;
  s.approx = approx;
  s.network = "blockwise";
  s.strategy = "chain";
  return s;
}

// Plan, write, check: the checker compares every basis input with the construction written from its
// description (check/qft_reference.cpp) where the register is small enough, forward and inverse, in
// every gate set; the report's figures are the library's (blockwise_error.hpp).
TEST(BlockwisePlan, CommandLinePlanThenCheck) {
  const auto dir = testing::temp_dir();
  int k = 0;
  for (const std::string extra : {"", " --gates cz", " --inverse", " --inverse --gates logical", " --end-order same"}) {
    if (!testing::sampled(k++, 2)) continue;  // sanitizers: 3 of the 5 (each enumerates 1024 inputs)
    const std::string file = (dir / "bw.qasm").string(), report = (dir / "bw.json").string();
    const auto plan = testing::run_qftplan("plan --device line:10 --qubits 10 --network blockwise --approx 3" + extra +
                                           " -q -o '" + file + "' --report '" + report + "'");
    ASSERT_EQ(plan.status, 0) << extra << plan.err;
    EXPECT_NE(testing::read_file(file).find("// transform: " + std::string(extra.find("--inverse") != std::string::npos ? "inverse " : "") +
                                            "QFT on 10 qubits, block construction (blocks of 3)"),
              std::string::npos);
    const auto check = testing::run_qftplan("check '" + file + "' --device line:10");
    EXPECT_EQ(check.status, 0) << extra << ": " << check.out << check.err;
    EXPECT_NE(check.out.find("all 1024 basis inputs"), std::string::npos) << check.out;
    const auto j = nlohmann::json::parse(testing::read_file(report));
    EXPECT_EQ(j["network"], "blockwise");
    EXPECT_EQ(j["block_length"], 3);
    EXPECT_TRUE(j["approx_degree"].is_null());
    EXPECT_EQ(j["approx_error_bound"], 2.0);
    EXPECT_EQ(j["readout_method"], "enumeration");
    const auto f = blockwise_figures(10, 3, kDefaultColumnThreshold);
    EXPECT_DOUBLE_EQ(j["readout_success"].get<double>(), f.readout_success);
    EXPECT_DOUBLE_EQ(j["blockwise"]["frobenius_distance"].get<double>(), f.frobenius);
    EXPECT_EQ(j["blockwise"]["blocks"], 4);
    EXPECT_EQ(j["blockwise"]["inputs"], 1024);
    // The textbook transform's bounds do not apply to another unitary.
    EXPECT_EQ(j["lower_bound_blocks"], 0);
  }
  // Checked against another transform, the same file is refuted by a counterexample.
  const std::string file = (dir / "bw.qasm").string();
  ASSERT_EQ(testing::run_qftplan("plan --device line:9 --qubits 9 --network blockwise --approx 2 -q -o '" + file + "'").status, 0);
  const auto wrong = testing::run_qftplan("check '" + file + "' --device line:9 --block-length 3");
  EXPECT_EQ(wrong.status, 1) << wrong.out << wrong.err;
  const auto exact = testing::run_qftplan("check '" + file + "' --device line:9 --approx none");
  EXPECT_EQ(exact.status, 1) << exact.out << exact.err;
}

// The report's rotation count is the spec's (one controlled phase a rotation of every block transform:
// common practice, s(s-1)/2 for a QFT of s bits), for register sizes that end in a full or a short block.
TEST(BlockwisePlan, RotationCountIsEveryBlockTransforms) {
  for (int n : {5, 9, 12, 24, 31})
    for (int m : {1, 2, 3, 4}) {
      const PlanReport r = plan_qft(make_line(n), plan_options(blockwise_settings(n, std::to_string(m))));
      QftSpec spec;
      spec.qubits = n;
      spec.block_length = m;
      EXPECT_EQ(r.rotations, spec.kept_rotations()) << n << " " << m;
    }
}

// Two blocks or fewer: the construction is the exact QFT (reported as such, no approximation figures),
// and the checker proves its file against the exact QFT.
TEST(BlockwisePlan, TwoBlocksAreReportedExact) {
  const Device dev = make_line(12);
  const PlanReport r = plan_qft(dev, plan_options(blockwise_settings(12, "6")));
  ASSERT_TRUE(r.approx.blockwise);
  EXPECT_TRUE(r.approx.blockwise->exact);
  EXPECT_EQ(r.approx_error_bound, 0);
  EXPECT_EQ(r.approx.readout_success, 1);
  const auto dir = testing::temp_dir();
  const std::string file = (dir / "bw2.qasm").string();
  ASSERT_EQ(testing::run_qftplan("plan --device line:8 --qubits 8 --network blockwise --approx 4 -q -o '" + file + "'").status, 0);
  const auto check = testing::run_qftplan("check '" + file + "' --device line:8 --approx none");
  EXPECT_EQ(check.status, 0) << check.out << check.err;
}

// The depth depends on the block length, not on the register (the paper's point): the planned
// two-qubit depth at n = 64 and at n = 1024 is the same for a fixed block length, while the CX count
// grows linearly (at most 3 (2m)^2 block steps a pair of blocks, each at most 3 CX: common practice).
TEST(BlockwisePlan, DepthFlatAcrossRegisterSizes) {
  for (int m : {4, 8}) {
    const PlanReport small = plan_qft(make_line(64), plan_options(blockwise_settings(64, std::to_string(m))));
    const PlanReport large = plan_qft(make_line(1024), plan_options(blockwise_settings(1024, std::to_string(m))));
    EXPECT_EQ(small.depth_2q, large.depth_2q) << m;
    EXPECT_EQ(small.cx_depth, large.cx_depth) << m;
    EXPECT_LE(large.depth_2q, 3 * (2 * (2 * m) - 3)) << m;  // three layers of reversal networks on 2m wires
    EXPECT_LE(large.cx_count, 1024 / (2 * m) * 3 * (2 * m) * (2 * m) * 3 / 2 + 1) << m;
    EXPECT_EQ(large.approx.method, ReadoutMethod::sampled);
    EXPECT_GT(large.approx.readout_standard_error, 0);
  }
}

// --approx auto with --network blockwise scores block lengths by esp_total x readout success; with
// --approx-error EPS the shortest block length whose Frobenius distance is at most EPS. Without the
// network named, --approx-error lets the automatic degree choice consider the construction too.
TEST(BlockwisePlan, AutomaticBlockLength) {
  DeviceDescription d = make_line(40).description();
  d.name = "line-40-noisy";
  d.calibration.error_2q = 1e-3;
  const Device dev(d);
  const PlanReport best = plan_qft(dev, plan_options(blockwise_settings(40, "auto")));
  ASSERT_TRUE(best.degree_choice);
  ASSERT_TRUE(best.degree_choice->chosen_block_length);
  EXPECT_EQ(best.block_length, best.degree_choice->chosen_block_length);
  for (const auto& c : best.degree_choice->considered) {
    EXPECT_TRUE(c.block_length) << "only block lengths are candidates";
    EXPECT_NEAR(c.score, std::exp(c.log_esp) * c.approx.readout_success, 1e-12 + 1e-9 * c.score);
  }
  double top = -INFINITY;
  for (const auto& c : best.degree_choice->considered) top = std::max(top, c.log_score);
  for (const auto& c : best.degree_choice->considered)
    if (c.block_length == best.block_length) EXPECT_NEAR(c.log_score, top, 1e-12);

  PlanSettings s = blockwise_settings(40, "auto");
  s.approx_error = 0.05;
  const PlanReport eps = plan_qft(dev, plan_options(s));
  ASSERT_TRUE(eps.block_length);
  const int m = *eps.block_length;
  ASSERT_GT(m, 1);
  EXPECT_LE(blockwise_figures(40, m, 0.05).frobenius, 0.05);
  EXPECT_GT(blockwise_figures(40, m - 1, 0.05).frobenius, 0.05);
  EXPECT_EQ(eps.approx.blockwise->threshold, 0.05);

  // Consent without naming the network: a candidate among the degrees, chosen only by its score.
  PlanSettings any;
  any.qubits = 40;
  any.approx = "auto";
  any.strategy = "chain";
  any.approx_error = 0.05;
  const PlanReport mixed = plan_qft(dev, plan_options(any));
  int blocks = 0, degrees = 0;
  for (const auto& c : mixed.degree_choice->considered) (c.block_length ? blocks : degrees) += 1;
  EXPECT_EQ(blocks, 1);
  EXPECT_GT(degrees, 1);
  // Without consent the construction is never considered.
  any.approx_error.reset();
  const PlanReport without = plan_qft(dev, plan_options(any));
  for (const auto& c : without.degree_choice->considered) EXPECT_FALSE(c.block_length);
}

// What is refused, with one message naming the setting.
TEST(BlockwisePlan, Refusals) {
  const auto no_length = testing::run_qftplan("plan --device line:8 --qubits 8 --network blockwise");
  EXPECT_EQ(no_length.status, 2);
  EXPECT_NE(no_length.err.find("blockwise needs its block length"), std::string::npos) << no_length.err;
  const auto eps_alone = testing::run_qftplan("plan --device line:8 --qubits 8 --approx 3 --approx-error 0.1");
  EXPECT_EQ(eps_alone.status, 2);
  EXPECT_NE(eps_alone.err.find("--approx-error"), std::string::npos) << eps_alone.err;
  const auto eps_range = testing::run_qftplan("plan --device line:8 --qubits 8 --approx auto --approx-error 3");
  EXPECT_EQ(eps_range.status, 2);
  const auto semi = testing::run_qftplan(
      "plan --device line:8 --qubits 8 --network blockwise --approx 3 --measure --readout semiclassical");
  EXPECT_EQ(semi.status, 2);
  EXPECT_NE(semi.err.find("block construction"), std::string::npos) << semi.err;
  const auto routed = testing::run_qftplan("plan --device line:8 --qubits 8 --network blockwise --approx 3 --strategy routed");
  EXPECT_EQ(routed.status, 2) << routed.err;
  const auto long_blocks = testing::run_qftplan("plan --device line:64 --qubits 64 --network blockwise --approx 25");
  EXPECT_EQ(long_blocks.status, 2);
  EXPECT_NE(long_blocks.err.find("block length"), std::string::npos) << long_blocks.err;
}

}  // namespace
}  // namespace qftplan
