// The command line end to end: plan -> file -> check, bad input, atomic outputs.

#include <gtest/gtest.h>

#include <filesystem>
#include <regex>

#include "test_support.hpp"

namespace qftplan {
namespace {

using testing::read_file;
using testing::run_qftplan;
using testing::source_dir;
using testing::temp_dir;
using testing::write_file;

std::string topo(const std::string& name) { return "'" + (source_dir() / "topologies" / name).string() + "'"; }

struct RoundTrip {
  std::string device;
  std::string gates;
  std::string format;
  std::string extra;
};

class PlanThenCheck : public ::testing::TestWithParam<RoundTrip> {};

// Every emitted file, both versions, every gate set, passes `qftplan check` (issue: plan and prove).
TEST_P(PlanThenCheck, EmittedFilePassesTheChecker) {
  const auto p = GetParam();
  const auto dir = temp_dir();
  const auto file = (dir / "c.qasm").string();
  const auto plan = run_qftplan("plan --device " + p.device + " --qubits 6 --gates " + p.gates + " --format " + p.format +
                                " " + p.extra + " --output '" + file + "'");
  ASSERT_EQ(plan.status, 0) << plan.err;
  const auto check = run_qftplan("check '" + file + "' --device " + p.device + " --qubits 6 " + p.extra);
  EXPECT_EQ(check.status, 0) << check.err << check.out;
  EXPECT_NE(check.out.find("structural proof"), std::string::npos) << check.out;
  std::filesystem::remove_all(dir);
}

std::vector<RoundTrip> round_trips() {
  std::vector<RoundTrip> v;
  for (const std::string dev : std::vector<std::string>{"line:7", "grid:3x3", "heavy-hex:1x1", topo("harbor-noisy-20.yaml"), topo("harbor-hex-21.yaml")})
    for (const std::string gates : {"logical", "cx", "cz"})
      for (const std::string fmt : {"qasm3", "qasm2"})
        for (const std::string extra : {"", "--inverse", "--approx 3", "--inverse --approx 4"}) v.push_back({dev, gates, fmt, extra});
  return v;
}

INSTANTIATE_TEST_SUITE_P(AllGateSetsAndVersions, PlanThenCheck, ::testing::ValuesIn(round_trips()));

// Mutations of an emitted file must be rejected with the offending line.
class Mutated : public ::testing::Test {
 protected:
  void SetUp() override {
    dir = temp_dir();
    good = (dir / "good.qasm").string();
    const auto r = run_qftplan("plan --device grid:3x3 --qubits 5 --gates logical --network anchored --output '" + good + "'");
    ASSERT_EQ(r.status, 0) << r.err;
    text = read_file(good);
  }
  void TearDown() override { std::filesystem::remove_all(dir); }
  testing::RunResult check_text(const std::string& t) {
    const auto f = (dir / "bad.qasm").string();
    write_file(f, t);
    return run_qftplan("check '" + f + "' --device grid:3x3 --qubits 5");
  }
  std::filesystem::path dir;
  std::string good, text;
};

TEST_F(Mutated, SingleWrongAngleFails) {
  const auto pos = text.find("cp(pi/2**2)");
  ASSERT_NE(pos, std::string::npos);
  std::string t = text;
  t.replace(pos, 11, "cp(pi/2**3)");
  const auto r = check_text(t);
  EXPECT_EQ(r.status, 1);
  EXPECT_TRUE(std::regex_search(r.err, std::regex("bad\\.qasm:[0-9]+: "))) << r.err;
}

TEST_F(Mutated, MissingRotationFails) {
  const auto pos = text.find("cp(");
  const auto end = text.find('\n', pos);
  std::string t = text;
  t.erase(pos, end - pos + 1);
  EXPECT_EQ(check_text(t).status, 1);
}

TEST_F(Mutated, ExtraRotationFails) {
  const auto pos = text.find("cp(");
  const auto end = text.find('\n', pos);
  std::string t = text;
  t.insert(end + 1, text.substr(pos, end - pos + 1));
  EXPECT_EQ(check_text(t).status, 1);
}

TEST_F(Mutated, GateOnANonCouplerFails) {
  // grid:3x3: qubits 0 and 8 are opposite corners, not coupled.
  std::string t = text + "cz $0, $8;\n";
  const auto r = check_text(t);
  EXPECT_EQ(r.status, 1);
  EXPECT_NE(r.err.find("coupler"), std::string::npos) << r.err;
}

TEST_F(Mutated, HadamardMovedPastARotationItDependsOnFails) {
  // Move the second Hadamard line to just after the first one.
  std::vector<std::string> lines;
  std::size_t i = 0;
  while (i < text.size()) {
    const auto e = text.find('\n', i);
    lines.push_back(text.substr(i, e - i));
    i = e + 1;
  }
  std::vector<std::size_t> hs;
  for (std::size_t k = 0; k < lines.size(); ++k)
    if (lines[k].rfind("h ", 0) == 0) hs.push_back(k);
  ASSERT_GE(hs.size(), 2u);
  const std::string h2 = lines[hs[1]];
  lines.erase(lines.begin() + hs[1]);
  lines.insert(lines.begin() + hs[0] + 1, h2);
  std::string t;
  for (const auto& l : lines) t += l + "\n";
  EXPECT_EQ(check_text(t).status, 1);
}

TEST(Cli, UnreadableCircuitIsExitTwo) {
  const auto dir = temp_dir();
  write_file(dir / "x.qasm", "OPENQASM 3.0;\nfoo $1;\n");
  const auto r = run_qftplan("check '" + (dir / "x.qasm").string() + "' --device line:3 --qubits 2");
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.err.find("x.qasm:2:"), std::string::npos) << r.err;
  std::filesystem::remove_all(dir);
}

// Bad devices through the command line: exit 2, the file named, and a line number where the fault is
// on a line (the catalogue in tests/data/bad_devices; device_yaml_test asserts each exact message).
TEST(Cli, EveryBadDeviceFileIsExitTwoNamingTheFile) {
  int n = 0;
  for (const auto& e : std::filesystem::directory_iterator(source_dir() / "tests/data/bad_devices")) {
    // Sanitizers: every other file (DeviceYaml.CommandRefusesEveryBadFileWithStatus2 runs them all).
    if (!testing::sampled(n, 2)) {
      ++n;
      continue;
    }
    const auto r = run_qftplan("device '" + e.path().string() + "'");
    EXPECT_EQ(r.status, 2) << e.path();
    EXPECT_NE(r.err.find(e.path().filename().string()), std::string::npos) << r.err;
    EXPECT_EQ(r.out, "") << "no partial output on " << e.path();
    EXPECT_EQ(std::count(r.err.begin(), r.err.end(), '\n'), 1) << "one line: " << r.err;
    ++n;
  }
  EXPECT_GE(n, 30);
}

TEST(Cli, MalformedSpecsAndMissingFiles) {
  for (const std::string spec : {"grid:0x3", "grid:3", "line:abc", "ring:2", "nosuch:4", "no/such/file.yaml"}) {
    const auto r = run_qftplan("device '" + spec + "'");
    EXPECT_EQ(r.status, 2) << spec;
    EXPECT_NE(r.err.find(spec.substr(0, spec.find(':'))), std::string::npos) << r.err;
  }
  const auto dir = temp_dir();
  const auto r = run_qftplan("device '" + dir.string() + "'");
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.err.find("directory"), std::string::npos) << r.err;
  std::filesystem::remove_all(dir);
}

TEST(Cli, PlacementErrorsAreClear) {
  struct Case {
    std::string placement, expect;
  };
  for (const auto& c : std::vector<Case>{{"0,1,1", "twice"},
                                         {"0,1,9", "qubit 9"},
                                         {"0,1", "lists 2 qubits"},
                                         {"0,2,1", "not a chain"},
                                         {"0,x,2", "not a qubit id"}}) {
    const auto r = run_qftplan("plan --device line:5 --qubits 3 --placement " + c.placement);
    EXPECT_EQ(r.status, 2) << c.placement;
    EXPECT_NE(r.err.find(c.expect), std::string::npos) << r.err;
  }
  // A valid pin is honoured: input bit k on the pinned qubit.
  const auto ok = run_qftplan("plan --device line:5 --qubits 3 --placement 4,3,2 --report -");
  ASSERT_EQ(ok.status, 0) << ok.err;
  EXPECT_NE(ok.out.find("\"placement\": [\n    4,\n    3,\n    2\n  ]"), std::string::npos) << ok.out;
}

TEST(Cli, NoChainSaysTheLongestFound) {
  // A heavy-hexagon lattice has no simple path through all its qubits (the dangling edge qubits).
  const auto r = run_qftplan("plan --device heavy-hex:2x2 --qubits 35 --strategy chain");
  EXPECT_EQ(r.status, 1);
  EXPECT_NE(r.err.find("no chain of 35 qubits"), std::string::npos) << r.err;
  EXPECT_NE(r.err.find("longest found"), std::string::npos) << r.err;
  const auto big = run_qftplan("plan --device line:4 --qubits 5");
  EXPECT_EQ(big.status, 1);
  EXPECT_NE(big.err.find("fewer than the 5 requested"), std::string::npos) << big.err;
}

TEST(Cli, BadOptionValues) {
  for (const std::string args : {"--approx 0", "--approx x", "--format qasm4", "--gates foo", "--qubits 0"}) {
    std::string a = "plan --device line:5 --qubits 3 " + args;
    const auto r = run_qftplan(a);
    EXPECT_EQ(r.status, 2) << args << ": " << r.err;
  }
}

TEST(Cli, FailedRunsLeaveNoFileAndKeepOldOnes) {
  const auto dir = temp_dir();
  const auto out = dir / "c.qasm";
  // Planning error: nothing created.
  auto r = run_qftplan("plan --device line:4 --qubits 5 --output '" + out.string() + "'");
  EXPECT_EQ(r.status, 1);
  EXPECT_FALSE(std::filesystem::exists(out));
  // An existing file is left untouched by a failing run.
  write_file(out, "old contents\n");
  r = run_qftplan("plan --device line:4 --qubits 5 --output '" + out.string() + "'");
  EXPECT_EQ(read_file(out), "old contents\n");
  // Unwritable folder: a clear error, exit 2.
  r = run_qftplan("plan --device line:4 --qubits 3 --output '" + (dir / "missing" / "c.qasm").string() + "'");
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.err.find("missing"), std::string::npos) << r.err;
  // No temporaries left behind.
  int files = 0;
  for (const auto& e : std::filesystem::directory_iterator(dir)) files += e.is_regular_file();
  EXPECT_EQ(files, 1);
  std::filesystem::remove_all(dir);
}

TEST(Cli, ReportCountsMatchTheFile) {
  // The report's gate counts are recounted from the emitted file (common practice: the report must
  // describe the file it accompanies).
  const auto dir = temp_dir();
  const auto file = (dir / "c.qasm").string();
  const auto r = run_qftplan("plan --device grid:3x4 --qubits 10 --gates cx --output '" + file + "' --report -");
  ASSERT_EQ(r.status, 0) << r.err;
  const std::string text = read_file(file);
  auto count = [&](const std::string& prefix) {
    long n = 0;
    for (std::size_t i = 0; (i = text.find("\n" + prefix, i)) != std::string::npos; ++i) ++n;
    return n;
  };
  const long cx = count("cx "), h = count("h "), rz = count("rz(");
  EXPECT_NE(r.out.find("\"cx_count\": " + std::to_string(cx)), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("\"cx\": " + std::to_string(cx)), std::string::npos);
  EXPECT_NE(r.out.find("\"h\": " + std::to_string(h)), std::string::npos);
  EXPECT_NE(r.out.find("\"rz\": " + std::to_string(rz)), std::string::npos);
  EXPECT_EQ(cx, 10 * 10 - 1);  // the parity network (auto's choice at n = 10): n^2 - 1 CX
  std::filesystem::remove_all(dir);
}

TEST(Cli, DeviceOutputLoadsBackIdentically) {
  const auto dir = temp_dir();
  for (const std::string spec : std::vector<std::string>{"line:5", "ring:6", "grid:3x4", "heavy-hex:2x3", "full:5", topo("harbor-noisy-20.yaml")}) {
    const auto a = run_qftplan("device " + spec);
    ASSERT_EQ(a.status, 0) << a.err;
    write_file(dir / "d.yaml", a.out);
    const auto b = run_qftplan("device '" + (dir / "d.yaml").string() + "'");
    ASSERT_EQ(b.status, 0) << b.err;
    EXPECT_EQ(a.out, b.out) << spec;
  }
  std::filesystem::remove_all(dir);
}

// Issue 15, items 6 and 8: a mistyped option is named with the nearest real one; a plan written to a
// file still prints its summary (on standard error when the circuit goes to standard output), unless
// --quiet.
TEST(Cli, TyposAreNamedWithTheNearestOption) {
  const auto r = run_qftplan("plan --device line:4 --qubits 3 --aprox 3");
  EXPECT_EQ(r.status, 2);
  EXPECT_EQ(r.err, "qftplan: unknown option --aprox; did you mean --approx? (see qftplan help plan)\n");
  const auto far = run_qftplan("plan --device line:4 --qubits 3 --frobnicate");
  EXPECT_EQ(far.err, "qftplan: unknown option --frobnicate (see qftplan help plan)\n");
}

TEST(Cli, WrittenPlansPrintTheirSummary) {
  const auto dir = temp_dir();
  const std::string file = (dir / "c.qasm").string();
  const auto r = run_qftplan("plan --device line:5 --qubits 5 -o '" + file + "'");
  EXPECT_EQ(r.status, 0) << r.err;
  EXPECT_NE(r.out.find("QFT on 5 qubits, exact on line:5"), std::string::npos) << r.out;
  const auto piped = run_qftplan("plan --device line:5 --qubits 5 -o -");
  EXPECT_EQ(piped.out.rfind("OPENQASM 3.0;", 0), 0u) << piped.out.substr(0, 80);
  EXPECT_NE(piped.err.find("QFT on 5 qubits"), std::string::npos) << piped.err;
  const auto quiet = run_qftplan("plan --device line:5 --qubits 5 --quiet -o '" + file + "'");
  EXPECT_TRUE(quiet.out.empty()) << quiet.out;
  std::filesystem::remove_all(dir);
}

// Issue 15, item 4: check reads the transform from the file's header; options override it, and a
// disagreement is said.
TEST(Cli, CheckTakesTheTransformFromTheHeader) {
  const auto dir = temp_dir();
  const std::string file = (dir / "inv.qasm").string();
  ASSERT_EQ(run_qftplan("plan --device line:6 --qubits 6 --inverse --approx 3 --quiet -o '" + file + "'").status, 0);
  const auto r = run_qftplan("check '" + file + "' --device line:6");
  EXPECT_EQ(r.status, 0) << r.err;
  EXPECT_NE(r.out.find("inverse QFT on 6 qubits"), std::string::npos) << r.out;
  const auto forward = run_qftplan("check '" + file + "' --device line:6 --forward");
  EXPECT_NE(forward.status, 0);
  EXPECT_NE(forward.err.find("warning: the file's header says inverse QFT on 6 qubits, approximate (degree 3), but the "
                             "check asks for QFT on 6 qubits"),
            std::string::npos)
      << forward.err;
  std::filesystem::remove_all(dir);
}

}  // namespace
}  // namespace qftplan
