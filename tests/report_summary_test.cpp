// The terminal summary of a plan (issue 15, item 6): counts agree in number with their nouns, and a
// comparison with a figure of zero says so instead of printing a ratio of zero.

#include <gtest/gtest.h>

#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/report/report.hpp"

namespace qftplan {
namespace {

TEST(Summary, OneQubitAndZeroFigures) {
  PlanOptions opt;
  opt.spec.qubits = 1;
  const std::string s = format_plan_summary(plan_qft(make_lattice("line:1"), opt));
  EXPECT_NE(s.find("QFT on 1 qubit, exact on line:1 (1 qubit)\n"), std::string::npos) << s;
  EXPECT_NE(s.find("1 layer in all"), std::string::npos) << s;
  EXPECT_EQ(s.find("x0.00"), std::string::npos) << s;
  EXPECT_NE(s.find("0 CX (same)"), std::string::npos) << s;
}

TEST(Summary, PluralsAndRatiosOnLargerRegisters) {
  PlanOptions opt;
  opt.spec.qubits = 5;
  opt.strategy = "auto";
  const std::string s = format_plan_summary(plan_qft(make_lattice("grid:3x3"), opt));
  EXPECT_NE(s.find("(9 qubits)"), std::string::npos) << s;
  EXPECT_NE(s.find("two-qubit blocks"), std::string::npos) << s;
  EXPECT_NE(s.find("vs routed"), std::string::npos) << s;
  EXPECT_NE(s.find(" CX (x"), std::string::npos) << s;
}

}  // namespace
}  // namespace qftplan
