// Defects an independent audit found, each pinned by a test of the behaviour the brief and the
// README promise: one-line errors with exit 2, writes that fail loudly, files written through links
// and onto devices, check verdicts with lines, and fused routing.

#include <gtest/gtest.h>
#include <sys/stat.h>
#include <sys/wait.h>

#include <algorithm>
#include <filesystem>
#include <regex>

#include "qftplan/core/atomic_file.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/plan.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

using testing::read_file;
using testing::run_qftplan;
using testing::temp_dir;
using testing::write_file;

// Command-line mistakes are one line with the program's prefix and exit 2 (README "Exit status").
TEST(CommandLine, ParseErrorsAreOneLine) {
  const struct {
    const char* args;
    const char* err;
  } cases[] = {
      {"plan", "qftplan: --device is required (see qftplan help plan)\n"},
      {"bogus", "qftplan: unknown command 'bogus' (commands: device, plan, check, survey, merge, draw, help)\n"},
      {"--versio", "qftplan: unknown option '--versio' (see qftplan --help)\n"},
      {"plan --device line:4 --qubits 4 --seed -1", "qftplan: --seed: must be a non-negative integer (see qftplan help plan)\n"},
      {"plan --device line:4 --qubits 4 --placement ''",
       "qftplan: --placement: '' is not a qubit id (expected comma-separated non-negative integers)\n"},
      {"plan --device line:4 --qubits 4 --approx 99999",
       "qftplan: --approx 99999 is outside 1 .. 16384\n"},
  };
  for (const auto& c : cases) {
    const auto r = run_qftplan(c.args);
    EXPECT_EQ(r.status, 2) << c.args;
    EXPECT_EQ(r.err, c.err) << c.args;
    EXPECT_EQ(r.out, "") << c.args;
  }
  // help COMMAND and COMMAND --help print the same text, usage line included.
  EXPECT_EQ(run_qftplan("help plan").out, run_qftplan("plan --help").out);
}

// Text for standard output that cannot be written is an error, not silently lost (a full disk is
// /dev/full: every write fails with ENOSPC, Linux documentation of the full(4) device).
TEST(CommandLine, FailedWritesToStandardOutputExitTwo) {
  const auto dir = temp_dir();
  const auto err = dir / "stderr";
  for (const char* args : {"device line:300", "plan --device line:8 --qubits 4", "plan --device line:8 --qubits 4 --report -",
                           "survey line:8 --qubits 4 --csv -", "help --man"}) {
    const std::string cmd = std::string("'") + QFTPLAN_BINARY + "' " + args + " >/dev/full 2>'" + err.string() + "'";
    const int raw = std::system(cmd.c_str());
    EXPECT_TRUE(WIFEXITED(raw) && WEXITSTATUS(raw) == 2) << args;
    EXPECT_NE(read_file(err).find("write to standard output failed"), std::string::npos) << args << ": " << read_file(err);
  }
}

// Outputs through symbolic links replace the file the link names (the link stays, the mode of the
// replaced file is kept); devices and pipes are written directly, never replaced by a file.
TEST(AtomicOutputs, LinksAreFollowedAndDevicesWrittenDirectly) {
  namespace fs = std::filesystem;
  const auto dir = temp_dir();
  write_file(dir / "real.qasm", "old\n");
  ::chmod((dir / "real.qasm").c_str(), 0640);
  fs::create_symlink("real.qasm", dir / "link.qasm");
  const auto r = run_qftplan("plan --device line:4 --qubits 4 -o '" + (dir / "link.qasm").string() + "'");
  ASSERT_EQ(r.status, 0) << r.err;
  EXPECT_TRUE(fs::is_symlink(dir / "link.qasm"));
  EXPECT_EQ(read_file(dir / "real.qasm").rfind("OPENQASM 3.0;", 0), 0u);
  struct stat st {};
  ASSERT_EQ(::stat((dir / "real.qasm").c_str(), &st), 0);
  EXPECT_EQ(st.st_mode & 0777, 0640u);
  // /dev/null stays a device (as root a rename would have replaced it with a regular file).
  const auto n = run_qftplan("plan --device line:4 --qubits 4 -o /dev/null --report /dev/null");
  EXPECT_EQ(n.status, 0) << n.err;
  EXPECT_TRUE(fs::is_character_file("/dev/null"));
  // A new file gets the usual mode under the umask, not the temporary's 0600.
  const auto m = run_qftplan("plan --device line:4 --qubits 4 -o '" + (dir / "new.qasm").string() + "'");
  ASSERT_EQ(m.status, 0);
  ASSERT_EQ(::stat((dir / "new.qasm").c_str(), &st), 0);
  const mode_t mask = ::umask(0);
  ::umask(mask);
  EXPECT_EQ(st.st_mode & 0777, 0666u & ~mask);
  // Nothing else was left in the folder.
  int entries = 0;
  for ([[maybe_unused]] const auto& e : fs::directory_iterator(dir)) ++entries;
  EXPECT_EQ(entries, 3);
}

// `check` verdicts: a readable file with an angle outside the QFT's is a failed check (exit 1) with
// its line, not unreadable input; h h cancels; a simulation failure names the line where the proof
// lost track.
TEST(Check, VerdictsNameTheirLines) {
  const auto dir = temp_dir();
  const auto good = (dir / "good.qasm").string();
  ASSERT_EQ(run_qftplan("plan --device line:6 --qubits 6 --gates cx -o '" + good + "'").status, 0);
  std::string text = read_file(good);
  // An angle of pi/3 in place of the first rz angle.
  const auto at = text.find("rz(");
  ASSERT_NE(at, std::string::npos);
  const auto close = text.find(')', at);
  std::string third = text;
  third.replace(at + 3, close - at - 3, "pi/3");
  const int line = 1 + static_cast<int>(std::count(third.begin(), third.begin() + static_cast<long>(at), '\n'));
  write_file(dir / "third.qasm", third);
  auto r = run_qftplan("check '" + (dir / "third.qasm").string() + "' --device line:6 --qubits 6");
  EXPECT_EQ(r.status, 4) << r.err;  // issue 21: "cannot prove" has its own status
  EXPECT_NE(r.err.find(":" + std::to_string(line) + ": cannot prove: angle pi/3"), std::string::npos) << r.err;
  // h h at the end: the identity.
  write_file(dir / "hh.qasm", text + "h $2;\nh $2;\n");
  r = run_qftplan("check '" + (dir / "hh.qasm").string() + "' --device line:6 --qubits 6");
  EXPECT_EQ(r.status, 0) << r.err;
  // A Hadamard moved before the cx just above it on its qubit (gates on other qubits between them
  // commute with both; the peephole pass leaves some there): wrong, and the line is named.
  std::vector<std::string> lines;
  for (std::size_t i = 0, j = 0; i < text.size(); i = j + 1) {
    j = text.find('\n', i);
    if (j == std::string::npos) j = text.size();
    lines.push_back(text.substr(i, j - i));
  }
  std::size_t h = 0;
  while (h < lines.size() && lines[h].rfind("cx ", 0) != 0) ++h;
  while (h < lines.size() && lines[h].rfind("h $", 0) != 0) ++h;
  ASSERT_LT(h, lines.size());
  const std::string qubit = lines[h].substr(2, lines[h].size() - 3);  // "$5"
  std::size_t cx = h;
  while (cx > 0 && !(lines[cx].rfind("cx ", 0) == 0 && std::regex_search(lines[cx], std::regex("\\" + qubit + "[,;]"))))
    --cx;
  ASSERT_EQ(lines[cx].rfind("cx ", 0), 0u);
  std::rotate(lines.begin() + static_cast<long>(cx), lines.begin() + static_cast<long>(h), lines.begin() + static_cast<long>(h) + 1);
  std::string moved;
  for (const auto& l : lines) moved += l + "\n";
  write_file(dir / "moved.qasm", moved);
  r = run_qftplan("check '" + (dir / "moved.qasm").string() + "' --device line:6 --qubits 6");
  EXPECT_EQ(r.status, 1) << r.out;
  EXPECT_TRUE(std::regex_search(r.err, std::regex("moved\\.qasm:[1-9][0-9]*: "))) << r.err;
}

// A small file of nested gate definitions that would expand to more gates than the limit is refused
// at the call, before it is expanded (each level calls the one before twice: 2^64 gates).
TEST(Check, ExponentialGateDefinitionsAreRefusedBeforeExpanding) {
  const auto dir = temp_dir();
  std::string text = "OPENQASM 2.0;\ninclude \"qelib1.inc\";\nqreg q[2];\ngate g0 a { h a; }\n";
  for (int k = 1; k <= 64; ++k)
    text += "gate g" + std::to_string(k) + " a { g" + std::to_string(k - 1) + " a; g" + std::to_string(k - 1) + " a; }\n";
  text += "g64 q[0];\n";
  write_file(dir / "bomb.qasm", text);
  const auto r = run_qftplan("check '" + (dir / "bomb.qasm").string() + "' --device line:2 --qubits 2 --initial 0,1 --final 0,1");
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.err.find(":69:1: gate g64 expands to more than 100000000 gates in all"), std::string::npos) << r.err;
}

// The router fuses a controlled phase with a SWAP on the same pair (README "Strategies"): no cp is
// followed directly by a swap on its qubits, and some blocks carry both.
TEST(Routed, FusesPhasesWithTheirSwaps) {
  const Device dev = make_lattice("heavy-hex:2x2");
  PlanOptions opt;
  opt.spec.qubits = 35;
  opt.strategy = "routed";
  opt.gates = GateSet::logical;
  const PreparedPlan plan = prepare_plan(dev, opt);
  VectorSink routed;
  plan.circuit->emit(routed);
  const auto& g = routed.gates;
  int fused = 0;
  for (std::size_t k = 0; k < g.size(); ++k) {
    if (g[k].kind == GateKind::cp_swap) ++fused;
    if (g[k].kind != GateKind::cp) continue;
    for (std::size_t j = k + 1; j < g.size(); ++j) {
      const bool touches = g[j].q0 == g[k].q0 || g[j].q0 == g[k].q1 ||
                           (is_two_qubit(g[j].kind) && (g[j].q1 == g[k].q0 || g[j].q1 == g[k].q1));
      if (!touches) continue;
      const bool same_pair = is_two_qubit(g[j].kind) && std::minmax(g[j].q0, g[j].q1) == std::minmax(g[k].q0, g[k].q1);
      EXPECT_FALSE(same_pair && g[j].kind == GateKind::swap) << "cp then swap at gate " << k;
      break;
    }
  }
  EXPECT_GT(fused, 100);
}

// OpenQASM 2 reports count gates by the file's names (cu1, u1), and every report names its seed.
TEST(Report, QasmTwoNamesAndTheSeed) {
  const auto r = run_qftplan("plan --device line:5 --qubits 5 --gates logical --network anchored --format qasm2 --seed 7 --report -");
  ASSERT_EQ(r.status, 0) << r.err;
  EXPECT_NE(r.out.find("\"cu1\": 10"), std::string::npos) << r.out;
  EXPECT_EQ(r.out.find("\"cp\""), std::string::npos);
  EXPECT_NE(r.out.find("\"seed\": 7"), std::string::npos);
}

}  // namespace
}  // namespace qftplan
