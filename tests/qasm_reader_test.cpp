// OpenQASM reader. The accepted language follows the published specifications:
//   OpenQASM 2: Cross, Bishop, Smolin, Gambetta, "Open Quantum Assembly Language",
//               arXiv:1707.03429 (2017) — qreg/creg, qelib1.inc names (u1, cu1, CX), `measure a -> b`,
//               `gate` definitions, '^' as the power operator.
//   OpenQASM 3: Cross et al., "OpenQASM 3: A broader and deeper quantum assembly language",
//               ACM Trans. Quantum Comput. 3(3):12 (2022), and its live specification — qubit[N] / bit[N],
//               physical qubits $k, `c[i] = measure q;`, stdgates.inc names (p, cp, ...), '**', pi / π,
//               τ = 2 pi, and ** binding tighter than unary minus (precedence table; from memory).

#include <gtest/gtest.h>

#include <chrono>
#include <filesystem>
#include <random>
#include <string>

#include "qftplan/core/input_error.hpp"
#include "qftplan/qasm/qasm_program.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

QasmProgram parse(const std::string& text) { return parse_qasm(text, "t.qasm"); }

// The angle of the single gate of "OPENQASM 3; rz(EXPR) $0;".
Angle angle_of(const std::string& expr, int version = 3) {
  const std::string text = version == 3 ? "OPENQASM 3;\nrz(" + expr + ") $0;\n"
                                        : "OPENQASM 2.0;\nqreg q[1];\nrz(" + expr + ") q[0];\n";
  const auto p = parse(text);
  EXPECT_EQ(p.gates.size(), 1u);
  return p.gates.at(0).angle;
}

// Runs the parser and returns the error (fails the test when none is thrown).
InputError error_of(const std::string& text) {
  try {
    parse(text);
  } catch (const InputError& e) {
    return e;
  }
  ADD_FAILURE() << "no error for:\n" << text;
  return InputError("none");
}

// ----- OpenQASM 3 -----

TEST(QasmReader, Version3PhysicalQubitsAndEveryGate) {
  const auto p = parse(
      "OPENQASM 3.0;\n"
      "include \"stdgates.inc\";\n"
      "h $0;\n"
      "x $1;\n"
      "sx $2;\n"
      "rz(pi/4) $0;\n"
      "p(-pi/2) $1;\n"
      "cx $0, $1;\n"
      "CX $1, $2;\n"
      "cz $0, $2;\n"
      "cp(pi/8) $2, $0;\n"
      "swap $1, $0;\n"
      "u1(pi) $3;\n"
      "cu1(pi/2) $3, $0;\n");
  EXPECT_EQ(p.version, 3);
  EXPECT_EQ(p.qubit_count, 4);
  const std::vector<Gate> want = {
      make_gate(GateKind::h, 0),
      make_gate(GateKind::x, 1),
      make_gate(GateKind::sx, 2),
      make_gate(GateKind::rz, 0, -1, Angle(1, 2)),
      make_gate(GateKind::p, 1, -1, Angle(-1, 1)),
      make_gate(GateKind::cx, 0, 1),
      make_gate(GateKind::cx, 1, 2),
      make_gate(GateKind::cz, 0, 2),
      make_gate(GateKind::cp, 2, 0, Angle(1, 3)),
      make_gate(GateKind::swap, 1, 0),
      make_gate(GateKind::p, 3, -1, Angle(1, 0)),
      make_gate(GateKind::cp, 3, 0, Angle(1, 1)),
  };
  EXPECT_EQ(p.gates, want);
  EXPECT_EQ(p.gate_lines, (std::vector<int>{3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14}));
  EXPECT_FALSE(p.device_name);
  EXPECT_FALSE(p.placement);
}

TEST(QasmReader, Version3RegistersConcatenateInDeclarationOrder) {
  const auto p = parse(
      "OPENQASM 3;\n"
      "qubit[3] a;\n"
      "qubit b;\n"
      "qubit[2] c;\n"
      "h a[2];\n"
      "h b;\n"
      "cx c[1], a[0];\n");
  EXPECT_EQ(p.qubit_count, 6);
  EXPECT_EQ(p.gates, (std::vector<Gate>{make_gate(GateKind::h, 2), make_gate(GateKind::h, 3),
                                        make_gate(GateKind::cx, 5, 0)}));
}

TEST(QasmReader, Version3MeasurementsIntoBits) {
  const auto p = parse(
      "OPENQASM 3;\n"
      "bit[2] c;\n"
      "bit d;\n"
      "c[1] = measure $4;\n"
      "d = measure $0;\n"
      "measure $2 -> c[0];\n");
  ASSERT_EQ(p.gates.size(), 3u);
  EXPECT_EQ(p.gates[0], (Gate{GateKind::measure, 4, 1, Angle{}}));
  EXPECT_EQ(p.gates[1], (Gate{GateKind::measure, 0, 2, Angle{}}));
  EXPECT_EQ(p.gates[2], (Gate{GateKind::measure, 2, 0, Angle{}}));
}

TEST(QasmReader, BroadcastOverRegisters) {
  const auto p = parse(
      "OPENQASM 3;\n"
      "qubit[3] q;\n"
      "qubit[3] r;\n"
      "bit[3] c;\n"
      "h q;\n"
      "cx q, r;\n"
      "cz q[0], r;\n"
      "c = measure r;\n");
  ASSERT_EQ(p.gates.size(), 12u);
  EXPECT_EQ(p.gates[2], make_gate(GateKind::h, 2));
  EXPECT_EQ(p.gates[4], make_gate(GateKind::cx, 1, 4));
  EXPECT_EQ(p.gates[8], make_gate(GateKind::cz, 0, 5));
  EXPECT_EQ(p.gates[11], (Gate{GateKind::measure, 5, 2, Angle{}}));
  EXPECT_EQ(error_of("OPENQASM 3;\nqubit[3] q;\nqubit[2] r;\ncx q, r;\n").line(), 4);
}

TEST(QasmReader, CommentsBarriersAndLineNumbers) {
  const auto p = parse(
      "// a comment\n"
      "OPENQASM 3; /* block\n"
      "   comment over lines */ h $0; // trailing\n"
      "barrier $0, $1;\n"
      "barrier;\n"
      "/* x $0; */ x $1;\n");
  ASSERT_EQ(p.gates.size(), 2u);
  EXPECT_EQ(p.gates[0], make_gate(GateKind::h, 0));
  EXPECT_EQ(p.gate_lines[0], 3);
  EXPECT_EQ(p.gates[1], make_gate(GateKind::x, 1));
  EXPECT_EQ(p.gate_lines[1], 6);
}

TEST(QasmReader, HeaderCommentsFillTheMaps) {
  const auto p = parse(
      "OPENQASM 3.0;\n"
      "// device: Lab chip \"Wren-7\"\n"
      "// placement: 4,3,2,1,0\n"
      "// final_placement: 0, 1, 2, 3, 4\n"
      "// an ordinary comment: placement: 9\n"
      "h $0;\n");
  ASSERT_TRUE(p.device_name);
  EXPECT_EQ(*p.device_name, "Lab chip \"Wren-7\"");
  ASSERT_TRUE(p.placement);
  EXPECT_EQ(*p.placement, (std::vector<int>{4, 3, 2, 1, 0}));
  ASSERT_TRUE(p.final_placement);
  EXPECT_EQ(*p.final_placement, (std::vector<int>{0, 1, 2, 3, 4}));
  const auto e = error_of("OPENQASM 3.0;\n// placement: 4,x\n");
  EXPECT_EQ(e.line(), 2);
  EXPECT_EQ(e.column(), 17);
}

TEST(QasmReader, MissingHeaderMeansVersion3) {
  const auto p = parse("h $0;\n");
  EXPECT_EQ(p.version, 3);
  EXPECT_EQ(p.gates.size(), 1u);
}

// ----- OpenQASM 2 -----

TEST(QasmReader, Version2QregCregMeasure) {
  const auto p = parse(
      "OPENQASM 2.0;\n"
      "include \"qelib1.inc\";\n"
      "qreg q[2];\n"
      "qreg anc[1];\n"
      "creg c[2];\n"
      "h q[0];\n"
      "cu1(pi/2) q[1], q[0];\n"
      "u1(pi/4) anc[0];\n"
      "CX q[0], anc[0];\n"
      "swap q[0], q[1];\n"
      "barrier q;\n"
      "measure q[0] -> c[1];\n"
      "measure q -> c;\n");
  EXPECT_EQ(p.version, 2);
  EXPECT_EQ(p.qubit_count, 3);
  const std::vector<Gate> want = {
      make_gate(GateKind::h, 0),
      make_gate(GateKind::cp, 1, 0, Angle(1, 1)),
      make_gate(GateKind::p, 2, -1, Angle(1, 2)),
      make_gate(GateKind::cx, 0, 2),
      make_gate(GateKind::swap, 0, 1),
      Gate{GateKind::measure, 0, 1, Angle{}},
      Gate{GateKind::measure, 0, 0, Angle{}},
      Gate{GateKind::measure, 1, 1, Angle{}},
  };
  EXPECT_EQ(p.gates, want);
}

TEST(QasmReader, Version2CaretIsPower) {
  EXPECT_EQ(angle_of("pi/2^3", 2), Angle(1, 3));
  // In OpenQASM 3, '^' is bitwise xor, not a power.
  EXPECT_NE(std::string(error_of("OPENQASM 3;\nrz(pi/2^3) $0;\n").what()).find("'^'"), std::string::npos);
}

// ----- user gate definitions -----

TEST(QasmReader, GateDefinitionsAreInlined) {
  const auto p = parse(
      "OPENQASM 2.0;\n"
      "qreg q[3];\n"
      "gate myswap a, b { cx a, b; cx b, a; cx a, b; }\n"
      "gate crot(theta) c, t {\n"
      "  u1(theta/2) c;\n"
      "  cx c, t;\n"
      "  u1(-theta/2) t;\n"
      "  cx c, t;\n"
      "  u1(theta/2) t;\n"
      "}\n"
      "gate both(l) a, b { crot(l) a, b; myswap a, b; }\n"
      "both(pi/4) q[2], q[0];\n");
  const Angle e(1, 3);
  const std::vector<Gate> want = {
      make_gate(GateKind::p, 2, -1, e),  make_gate(GateKind::cx, 2, 0), make_gate(GateKind::p, 0, -1, -e),
      make_gate(GateKind::cx, 2, 0),     make_gate(GateKind::p, 0, -1, e), make_gate(GateKind::cx, 2, 0),
      make_gate(GateKind::cx, 0, 2),     make_gate(GateKind::cx, 2, 0),
  };
  EXPECT_EQ(p.gates, want);
  for (int line : p.gate_lines) EXPECT_EQ(line, 12);  // the line of the call
}

TEST(QasmReader, DefinitionOfABuiltinNameReplacesIt) {
  // qelib1.inc has no swap; a file may define it from cx.
  const auto p = parse(
      "OPENQASM 2.0;\n"
      "qreg q[2];\n"
      "gate swap a, b { cx a, b; cx b, a; cx a, b; }\n"
      "swap q[0], q[1];\n");
  EXPECT_EQ(p.gates, (std::vector<Gate>{make_gate(GateKind::cx, 0, 1), make_gate(GateKind::cx, 1, 0),
                                        make_gate(GateKind::cx, 0, 1)}));
  // Inside its own body the name still means the built-in gate: no recursion.
  const auto q = parse("OPENQASM 3;\ngate h a { h a; x a; }\nh $0;\n");
  EXPECT_EQ(q.gates, (std::vector<Gate>{make_gate(GateKind::h, 0), make_gate(GateKind::x, 0)}));
}

TEST(QasmReader, BadGateDefinitions) {
  auto e = error_of("OPENQASM 3;\ngate g a {\n  frob a;\n}\n");
  EXPECT_EQ(e.line(), 3);
  EXPECT_EQ(e.column(), 3);
  EXPECT_NE(e.message().find("unknown gate 'frob'"), std::string::npos);
  e = error_of("OPENQASM 3;\ngate loop a { loop a; }\n");
  EXPECT_NE(e.message().find("its own definition"), std::string::npos);
  e = error_of("OPENQASM 3;\ngate g a { cx a, b; }\n");
  EXPECT_NE(e.message().find("'b' is not an argument of gate g"), std::string::npos);
  e = error_of("OPENQASM 3;\ngate g(t) a { rz(t) a; }\ng $0;\n");
  EXPECT_NE(e.message().find("takes 1 parameter, got 0"), std::string::npos);
  e = error_of("OPENQASM 3;\ngate g a { h a; }\ngate g a { x a; }\n");
  EXPECT_NE(e.message().find("already defined"), std::string::npos);
  // The angle is evaluated when the call binds the parameter: the inexact angle is inside the body.
  const auto p = parse("OPENQASM 3;\ngate g(t) a { rz(t/3) a; }\ng(pi) $0;\n");
  ASSERT_TRUE(p.inexact_angle.has_value());
  EXPECT_EQ(p.inexact_angle->line, 2);
  EXPECT_NE(p.inexact_angle->message.find("not a multiple of pi/2^k"), std::string::npos);
}

// ----- angle expressions -----

TEST(QasmReader, AnglesAreExactMultiplesOfPiOverPowersOfTwo) {
  EXPECT_EQ(angle_of("pi"), Angle(1, 0));
  EXPECT_EQ(angle_of("π/2"), Angle(1, 1));
  EXPECT_EQ(angle_of("τ/8"), Angle(1, 2));  // tau = 2 pi
  EXPECT_EQ(angle_of("-pi/2**5"), Angle(-1, 5));
  EXPECT_EQ(angle_of("3*pi/2**5"), Angle(3, 5));
  EXPECT_EQ(angle_of("-(pi/4)"), Angle(-1, 2));
  EXPECT_EQ(angle_of("pi/4 + pi/8"), Angle(3, 3));
  EXPECT_EQ(angle_of("pi - pi/4"), Angle(3, 2));
  EXPECT_EQ(angle_of("2*pi + pi/4"), Angle(1, 2));     // reduced mod 2 pi
  EXPECT_EQ(angle_of("(pi/4) * 2"), Angle(1, 1));
  EXPECT_EQ(angle_of("pi * 2**-3"), Angle(1, 3));
  EXPECT_EQ(angle_of("pi/2**2**3"), Angle(1, 8));      // ** is right-associative
  EXPECT_EQ(angle_of("-2**2*pi/16"), Angle(-1, 2));    // -(2**2)
  EXPECT_EQ(angle_of("0.5*pi"), Angle(1, 1));          // decimals are exact rationals
  EXPECT_EQ(angle_of("pi*1.25e-1"), Angle(1, 3));
  EXPECT_EQ(angle_of("pi/0.25"), Angle{});             // 4 pi
  EXPECT_EQ(angle_of("0"), Angle{});
  EXPECT_EQ(angle_of("pi/3*3"), Angle(1, 0));          // exact rationals cancel
  // QFT-sized denominators stay exact.
  EXPECT_EQ(angle_of("pi/2**4095"), Angle(1, 4095));
  EXPECT_EQ(angle_of("-pi/2**1023"), Angle(-1, 1023));
  EXPECT_EQ(angle_of("pi/4294967296", 2), Angle(1, 32));
  EXPECT_EQ(angle_of("-pi/" + pow2_decimal(300), 2), Angle(-1, 300));
  EXPECT_EQ(angle_of("3*pi/" + pow2_decimal(1000), 2), Angle(3, 1000));
}

// The writer's shapes ([-]pi, [-]pi/2**k, [-]pi/2^j in digits, then ')') are read on a short path
// (qasm_gate_calls.cpp); every shape next to them must still reach the evaluator and get its value
// by the OpenQASM 3 precedence table (Cross et al. 2022, see the top of this file): ** before * and /,
// which go left to right.
TEST(QasmReader, ShortPathAnglesAndTheirNeighbours) {
  EXPECT_EQ(angle_of("-pi"), Angle(1, 0));            // -pi == pi mod 2 pi
  EXPECT_EQ(angle_of("pi/8"), Angle(1, 3));
  EXPECT_EQ(angle_of("-pi/4096"), Angle(-1, 12));
  EXPECT_EQ(angle_of("-pi/2**0"), Angle(1, 0));
  EXPECT_EQ(angle_of("-pi/2**9999"), Angle(-1, 9999));
  EXPECT_EQ(angle_of("  -pi/2**3"), Angle(-1, 3));
  // Not the short path's shape: the evaluator decides.
  EXPECT_EQ(angle_of("pi/2**12345"), Angle(1, 12345));  // five digits
  EXPECT_EQ(angle_of("pi/2**3 "), Angle(1, 3));
  EXPECT_EQ(angle_of("pi/2 **3"), Angle(1, 3));
  EXPECT_EQ(angle_of("pi/2**3*2"), Angle(1, 2));        // (pi/8)*2
  EXPECT_EQ(angle_of("pi/2**3+pi/8"), Angle(1, 2));
  EXPECT_EQ(angle_of("pi/2**-3"), Angle{});             // 8 pi
  EXPECT_EQ(angle_of("pi/4**2"), Angle(1, 4));
  EXPECT_EQ(angle_of("pi/1"), Angle(1, 0));
  EXPECT_EQ(angle_of("pi/6*3"), Angle(1, 1));
  EXPECT_EQ(angle_of("-pi/2^3", 2), Angle(-1, 3));      // OpenQASM 2 power
  EXPECT_EQ(angle_of("pi/8", 2), Angle(1, 3));
  EXPECT_TRUE(parse("OPENQASM 3;\nrz(pi/6) $0;\n").inexact_angle.has_value());
  EXPECT_NE(error_of("OPENQASM 3;\nrz(pi/2**3 $0;\n").message().find("expected ')'"), std::string::npos)
      << error_of("OPENQASM 3;\nrz(pi/2**3 $0;\n").message();
  EXPECT_NE(error_of("OPENQASM 3;\nrz(pix) $0;\n").message().find("unknown identifier 'pix'"), std::string::npos);
  // A gate whose angle is fixed by its name or that takes no angle gets no short path.
  EXPECT_NE(error_of("OPENQASM 3;\nh(pi) $0;\n").message().find("parameter"), std::string::npos);
}

TEST(QasmReader, DecimalAnglesWithinToleranceOfAMultiple) {
  // A plain decimal is taken when within 1e-12 (relative) of num * pi / 2^k.
  EXPECT_EQ(angle_of("1.5707963267948966"), Angle(1, 1));
  EXPECT_EQ(angle_of("-0.19634954084936207"), Angle(-1, 4));
  EXPECT_EQ(angle_of("3.141592653589793"), Angle(1, 0));
  EXPECT_EQ(angle_of("0.7853981633974483", 2), Angle(1, 2));
}

// A readable angle that is no multiple of pi/2^k is no input error (the file is valid OpenQASM), but
// no QFT can contain it: the reader records the first one with its line, and check refuses to prove
// the file (qft_checker_test). Expressions that cannot be evaluated stay errors.
TEST(QasmReader, AnglesThatAreNotMultiplesOfPiOverPowersOfTwoAreRecorded) {
  for (const char* bad : {"1.0", "pi/3", "0.5", "1.5707", "euler", "sqrt(2)*pi"}) {
    const auto p = parse(std::string("OPENQASM 3;\nh $0;\nrz(") + bad + ") $0;\nrz(pi/7) $0;\n");
    ASSERT_TRUE(p.inexact_angle.has_value()) << bad;
    EXPECT_EQ(p.inexact_angle->line, 3) << bad;  // the first one, not the pi/7 after it
    const std::string& m = p.inexact_angle->message;
    EXPECT_NE(m.find("angle " + std::string(bad) + " (= "), std::string::npos) << m;
    EXPECT_NE(m.find("is not a multiple of pi/2^k"), std::string::npos) << m;
    ASSERT_EQ(p.gates.size(), 3u) << bad;
    EXPECT_EQ(p.gates[1].angle, Angle{}) << bad;  // read as 0
  }
  EXPECT_FALSE(parse("OPENQASM 3;\nrz(pi/8) $0;\n").inexact_angle.has_value());
  EXPECT_NE(error_of("OPENQASM 3;\nrz(pi/0) $0;\n").message().find("division by zero"), std::string::npos);
  EXPECT_NE(error_of("OPENQASM 3;\nrz(foo) $0;\n").message().find("unknown identifier 'foo'"), std::string::npos);
}

TEST(QasmReader, FixedPhaseGatesOfTheStandardLibrary) {
  // z, s, sdg, t, tdg are p(pi), p(pi/2), p(-pi/2), p(pi/4), p(-pi/4) (stdgates.inc); id is nothing.
  const auto p = parse("OPENQASM 3;\nz $0;\ns $0;\nsdg $0;\nt $0;\ntdg $0;\nid $0;\n");
  EXPECT_EQ(p.gates, (std::vector<Gate>{make_gate(GateKind::p, 0, -1, Angle(1, 0)), make_gate(GateKind::p, 0, -1, Angle(1, 1)),
                                        make_gate(GateKind::p, 0, -1, Angle(-1, 1)), make_gate(GateKind::p, 0, -1, Angle(1, 2)),
                                        make_gate(GateKind::p, 0, -1, Angle(-1, 2))}));
}

// ----- errors with positions -----

TEST(QasmReader, ErrorsCarryFileLineAndColumn) {
  struct Case {
    const char* text;
    int line, column;
    const char* message;
  };
  const Case cases[] = {
      {"OPENQASM 3;\nfoo $0;\n", 2, 1, "unknown gate 'foo'"},
      {"OPENQASM 3;\nh $0, $1;\n", 2, 1, "gate h takes 1 qubit, got 2"},
      {"OPENQASM 3;\ncx $0;\n", 2, 1, "gate cx takes 2 qubits, got 1"},
      {"OPENQASM 3;\nrz $0;\n", 2, 1, "gate rz takes 1 parameter, got 0"},
      {"OPENQASM 3;\nh(pi) $0;\n", 2, 1, "gate h takes 0 parameters, got 1"},
      {"OPENQASM 3;\nh(1.0) $0;\n", 2, 1, "gate h takes 0 parameters, got 1"},
      {"OPENQASM 3;\nrz(pi, pi) $0;\n", 2, 1, "gate rz takes 1 parameter, got 2"},
      {"OPENQASM 2.0;\nqreg q[3];\nh q[3];\n", 3, 5, "index 3 is out of range for register 'q' of size 3"},
      {"OPENQASM 2.0;\nqreg q[3];\nh r[0];\n", 3, 3, "unknown register 'r'"},
      {"OPENQASM 3;\nh $0\nx $1;\n", 3, 1, "expected ';' but found 'x'"},
      {"OPENQASM 3;\ncx $1, $1;\n", 2, 8, "applied to the same qubit twice"},
      {"OPENQASM 4.0;\n", 1, 10, "unsupported OpenQASM version 4.0"},
      {"h $0;\nOPENQASM 3;\n", 2, 1, "OPENQASM must be the first statement"},
      {"OPENQASM 3;\n/* open\n", 2, 1, "unterminated /* comment"},
      {"OPENQASM 3;\nqubit[2] q;\nh $0;\n", 3, 3, "cannot be mixed"},
      {"OPENQASM 3;\nqubit[2] q;\nqubit[1] q;\n", 3, 10, "already declared"},
      {"OPENQASM 3;\nreset $0;\n", 2, 1, "'reset' is not supported"},
      {"OPENQASM 3;\nrz(pi/4 $0;\n", 2, 9, "expected ')'"},
      {"OPENQASM 3;\n  h $0;\n  π $0;\n", 3, 3, "unknown gate 'π'"},
      {"OPENQASM 3;\nrz(π/4) $9999999;\n", 2, 9, "$9999999 is out of range"},  // columns count characters
      {"OPENQASM 2.0;\nqreg q[1];\ncreg c[1];\nmeasure q[0] -> q[0];\n", 4, 17, "'q' is a qubit register"},
      {"OPENQASM 3;\nh $;\n", 2, 3, "expected a qubit number after '$'"},
  };
  for (const auto& c : cases) {
    const auto e = error_of(c.text);
    EXPECT_EQ(e.file(), "t.qasm") << c.text;
    EXPECT_EQ(e.line(), c.line) << c.text << e.what();
    EXPECT_EQ(e.column(), c.column) << c.text << e.what();
    EXPECT_NE(e.message().find(c.message), std::string::npos) << c.text << " -> " << e.what();
    EXPECT_EQ(std::string(e.what()).rfind("t.qasm:" + std::to_string(c.line) + ":" + std::to_string(c.column) + ": ", 0),
              0u)
        << e.what();
  }
}

// ----- hostile input -----

TEST(QasmReader, DeepNestingIsAnErrorNotACrash) {
  const std::string deep = "OPENQASM 3;\nrz(" + std::string(100000, '(') + "pi" + std::string(100000, ')') + ") $0;\n";
  EXPECT_NE(error_of(deep).message().find("nested too deeply"), std::string::npos);
  EXPECT_NE(error_of("OPENQASM 3;\nrz(" + std::string(100000, '-') + "pi) $0;\n").message().find("nested too deeply"),
            std::string::npos);
  std::string chain = "OPENQASM 3;\ngate g0 a { h a; }\n";
  for (int i = 1; i <= 300; ++i)
    chain += "gate g" + std::to_string(i) + " a { g" + std::to_string(i - 1) + " a; }\n";
  chain += "g300 $0;\n";
  const auto e = error_of(chain);
  EXPECT_EQ(e.line(), 303);
  EXPECT_NE(e.message().find("nested more than"), std::string::npos);
}

TEST(QasmReader, RandomlyDamagedFilesOnlyEverThrowInputError) {
  // Fuzzing with a fixed seed: cut, duplicate and insert bytes in a file that uses every
  // construct; the reader must either parse or throw InputError (never crash or throw anything else).
  const std::string good =
      "OPENQASM 2.0;\ninclude \"qelib1.inc\";\n// placement: 1,0\n// final_placement: 0,1\n"
      "qreg q[2];\ncreg c[2];\ngate g(t) a, b { cu1(t/2) a, b; cx b, a; }\n"
      "h q[0]; /* c */ g(pi/2^3) q[0], q[1];\nu1(-3*pi/4294967296) q[1];\nbarrier q;\n"
      "rz(π/2**4) q[1];\nc[0] = measure q[0];\nmeasure q -> c;\n";
  ASSERT_EQ(parse(good).gates.size(), 8u);
  const std::string inserts[] = {"(", ")", ";", "[", "]", "{", "}", "$", "-", "**", "/", "/*", "//", "\n",
                                 "pi", "π", "\xCF", "\xFF", "0", "99999999999999999999", "1e400", ".", ",", "->",
                                 "=", "gate", "g", "measure", "\"", " ", "\0"};
  std::mt19937 rng(5);
  int parsed = 0, errors = 0;
  for (int trial = 0; trial < 4000; ++trial) {
    std::string t = good;
    const int edits = 1 + static_cast<int>(rng() % 4);
    for (int e = 0; e < edits; ++e) {
      const std::size_t at = rng() % (t.size() + 1);
      switch (rng() % 3) {
        case 0: t.erase(at, rng() % 8); break;
        case 1: t.insert(at, inserts[rng() % std::size(inserts)]); break;
        default: t.insert(at, t.substr(rng() % t.size(), rng() % 20)); break;
      }
    }
    try {
      parse(t);
      ++parsed;
    } catch (const InputError&) {
      ++errors;
    }
  }
  EXPECT_GT(errors, 1000);
  EXPECT_GT(parsed, 10);
}

// ----- files -----

TEST(QasmReader, LoadsFilesAndReportsMissingOnes) {
  const auto dir = testing::temp_dir();
  const auto path = dir / "c.qasm";
  testing::write_file(path, "OPENQASM 3;\nh $0;\n");
  const auto p = load_qasm_file(path.string());
  EXPECT_EQ(p.gates.size(), 1u);
  testing::write_file(dir / "empty.qasm", "");
  EXPECT_TRUE(load_qasm_file((dir / "empty.qasm").string()).gates.empty());
  try {
    load_qasm_file((dir / "missing.qasm").string());
    ADD_FAILURE() << "no error";
  } catch (const InputError& e) {
    EXPECT_EQ(e.file(), (dir / "missing.qasm").string());
    EXPECT_NE(e.message().find("cannot open"), std::string::npos);
  }
  try {
    testing::write_file(dir / "bad.qasm", "OPENQASM 3;\n\nnope $0;\n");
    load_qasm_file((dir / "bad.qasm").string());
    ADD_FAILURE() << "no error";
  } catch (const InputError& e) {
    EXPECT_EQ(e.line(), 3);
  }
  std::filesystem::remove_all(dir);
}

TEST(QasmReader, ReadsAMillionGateLines) {
  // 1 048 576 gate lines in the shape of a large decomposed QFT, read completely and exactly
  // (timings belong in benchmarks, not in unit tests).
  std::string text = "OPENQASM 3.0;\n";
  for (int i = 0; i < (1 << 18); ++i) {
    const int q = i % 1000;
    text += "rz(-pi/2**" + std::to_string(i % 700 + 2) + ") $" + std::to_string(q) + ";\n";
    text += "cx $" + std::to_string(q) + ", $" + std::to_string(q + 1) + ";\n";
    text += "p(3*pi/2**9) $" + std::to_string(q + 1) + ";\n";
    text += "h $" + std::to_string(q) + ";\n";
  }
  const auto p = parse(text);
  EXPECT_EQ(p.gates.size(), std::size_t{1} << 20);
  EXPECT_EQ(p.gates[4], make_gate(GateKind::rz, 1, -1, Angle(-1, 3)));
}

}  // namespace
}  // namespace qftplan
