// Exact angles and their OpenQASM text.

#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "qftplan/core/angle.hpp"

namespace qftplan {
namespace {

TEST(Angle, ReducesAndWrapsIntoMinusPiToPi) {
  EXPECT_EQ(Angle(2, 2), Angle(1, 1));
  EXPECT_EQ(Angle(3, 1), Angle(-1, 1));  // 3pi/2 == -pi/2 mod 2pi
  EXPECT_EQ(Angle(4, 1), Angle());       // 2pi == 0
  EXPECT_EQ(Angle(-1, 0), Angle(1, 0));  // -pi == pi
  EXPECT_TRUE(Angle(8, 2).is_zero());
  EXPECT_EQ(Angle(1, 3) + Angle(1, 3), Angle(1, 2));
  EXPECT_EQ(Angle(1, 2).half(), Angle(1, 3));
  EXPECT_NEAR(Angle(1, 2).radians(), std::numbers::pi / 4, 1e-15);
  EXPECT_NEAR(Angle(-3, 5).radians(), -3 * std::numbers::pi / 32, 1e-15);
}

TEST(Angle, WritesOpenQasm3AndOpenQasm2Text) {
  // OpenQASM 3 has the power operator '**' (OpenQASM 3 specification, "Classical types" /
  // arithmetic expressions); OpenQASM 2 has only + - * / (Cross et al., "Open Quantum Assembly
  // Language", arXiv:1707.03429, 2017, section 3).
  EXPECT_EQ(Angle(1, 0).qasm3(), "pi");
  EXPECT_EQ(Angle(1, 1).qasm3(), "pi/2");
  EXPECT_EQ(Angle(-1, 2).qasm3(), "-pi/2**2");
  EXPECT_EQ(Angle(3, 5).qasm3(), "3*pi/2**5");
  EXPECT_EQ(Angle().qasm3(), "0");
  EXPECT_EQ(Angle(1, 2).qasm2(), "pi/4");
  EXPECT_EQ(Angle(-3, 5).qasm2(), "-3*pi/32");
}

TEST(Angle, KeepsTinyAnglesExact) {
  // n = 4096 needs pi/2^4095: far below double precision, but kept exactly.
  const Angle tiny = Angle::pi_over_pow2(4095);
  EXPECT_EQ(tiny.num(), 1);
  EXPECT_EQ(tiny.log2_den(), 4095u);
  EXPECT_EQ(tiny.half().log2_den(), 4096u);
  EXPECT_EQ(tiny.qasm3(), "pi/2**4095");
  const std::string k = pow2_decimal(100);
  EXPECT_EQ(k, "1267650600228229401496703205376");  // 2^100, a textbook value (common practice)
  EXPECT_EQ(pow2_decimal(4095).size(), 1233u);     // floor(4095 log10 2) + 1 digits
}

}  // namespace
}  // namespace qftplan
