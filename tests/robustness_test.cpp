// Robustness (issue 8): every seed and every saved crash input of the fuzz targets replayed; atomic
// outputs under forced failures; register and device caps; --time-limit and Ctrl-C.

#include <gtest/gtest.h>

#include <fcntl.h>
#include <signal.h>
#include <sys/mount.h>
#include <sys/wait.h>
#include <unistd.h>

#include <atomic>
#include <chrono>
#include <filesystem>
#include <fstream>
#include <stdexcept>
#include <string>
#include <thread>
#include <vector>

#include <nlohmann/json.hpp>

#include "fuzz_inputs.hpp"
#include "qftplan/core/atomic_file.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/core/run_budget.hpp"
#include "qftplan/device/device_yaml.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/chain_search.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_writer.hpp"
#include "qftplan/report/circuit_header.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

namespace fs = std::filesystem;
using testing::read_file;
using testing::run_qftplan;
using testing::run_qftplan_counting_clock;
using testing::source_dir;
using testing::temp_dir;
using testing::write_file;

// ---------------------------------------------------------------------------------------------
// Fuzz inputs replayed: the seed corpora and every crash input found so far (each one a bug that
// was fixed; the file name says which).

std::vector<fs::path> files_in(const fs::path& dir) {
  std::vector<fs::path> out;
  if (fs::is_directory(dir))
    for (const auto& e : fs::directory_iterator(dir))
      if (e.is_regular_file()) out.push_back(e.path());
  std::sort(out.begin(), out.end());
  return out;
}

class FuzzReplay : public ::testing::TestWithParam<fuzz::Target> {};

TEST_P(FuzzReplay, SeedsAndRegressionsPass) {
  const auto target = GetParam();
  int replayed = 0;
  for (const auto& dir : {source_dir() / "fuzz" / "corpus" / target.name,
                          source_dir() / "tests" / "data" / "regressions" / target.name})
    for (const auto& f : files_in(dir)) {
      SCOPED_TRACE(f.string());
      const std::string bytes = read_file(f);
      try {
        target.run(bytes);
      } catch (const std::exception& e) {
        ADD_FAILURE() << f << ": " << e.what();
      }
      ++replayed;
    }
  EXPECT_GT(replayed, 0) << "no seed corpus for " << target.name;
}

INSTANTIATE_TEST_SUITE_P(EveryTarget, FuzzReplay, ::testing::ValuesIn(fuzz::targets()),
                         [](const auto& info) {
                           std::string s = info.param.name;
                           std::replace(s.begin(), s.end(), '-', '_');
                           return s;
                         });

// Found by the plan fuzzer: a device name is free text and was copied raw into the OpenQASM header
// comment, so a name with a line break ended the comment and wrote a gate into the circuit file.
TEST(Regression, DeviceNameCannotInjectIntoTheCircuit) {
  const auto dir = temp_dir();
  write_file(dir / "evil.yaml", "name: \"evil\\nh $0;\"\nqubits: 3\ncouplers: [[0, 1], [1, 2]]\n");
  const auto r = run_qftplan("plan --device '" + (dir / "evil.yaml").string() + "' --qubits 2 --strategy chain --placement 1,2 --gates logical --output -");
  ASSERT_EQ(r.status, 0) << r.err;
  EXPECT_NE(r.out.find("// device: evil\\x0ah $0;\n"), std::string::npos) << r.out;
  EXPECT_EQ(r.out.find("\nh $0;"), std::string::npos) << r.out;
  // And a message quoting the name stays on one line.
  const auto big = run_qftplan("plan --device '" + (dir / "evil.yaml").string() + "' --qubits 5");
  EXPECT_EQ(big.status, 1);
  EXPECT_EQ(big.err, "qftplan: device evil\\x0ah $0; has 3 qubits, fewer than the 5 requested\n");
  fs::remove_all(dir);
}

// Found by all three text fuzzers: messages quoted user bytes raw (a DEL, ^C, form feed), which
// breaks the one-line promise and can reach the terminal as escape sequences.
TEST(Regression, ErrorMessagesShowControlCharactersEscaped) {
  EXPECT_EQ(std::string(InputError("f.qasm", 3, 4, "found '\x7f' and '\n'").what()),
            "f.qasm:3:4: found '\\x7f' and '\\x0a'");
  try {
    (void)make_lattice("line:\x1b[31m");
    FAIL();
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()).find('\x1b'), std::string::npos) << e.what();
  }
}

// The program itself on the malformed circuits (fuzz/corpus/qasm-check/bad-*.qasm: truncations, huge
// indices and exponents, recursion, NUL bytes, a byte-order mark, ...) and on every saved crash input:
// never a signal, always 0, 1 or 2, and at most one line on standard error.
TEST(Catalogue, ProgramNeverCrashesOnMalformedFiles) {
  std::vector<std::pair<std::string, fs::path>> runs;
  for (const auto& f : files_in(source_dir() / "fuzz" / "corpus" / "qasm-check"))
    if (f.filename().string().rfind("bad-", 0) == 0) runs.emplace_back("check", f);
  for (const auto& f : files_in(source_dir() / "tests" / "data" / "regressions" / "qasm-check")) runs.emplace_back("check", f);
  for (const auto& f : files_in(source_dir() / "tests" / "data" / "regressions" / "device-yaml")) runs.emplace_back("device", f);
  ASSERT_GE(runs.size(), 30u);
  for (const auto& [command, f] : runs) {
    const std::string args = command == "check" ? "check " + std::string("'") + f.string() + "' --device grid:3x3 --qubits 3"
                                                : "device '" + f.string() + "'";
    const auto r = run_qftplan(args);
    // 0 proved, 1 wrong, 2 bad input, 4 cannot prove (README "Exit status").
    EXPECT_TRUE((r.status >= 0 && r.status <= 2) || r.status == 4) << f << " exit " << r.status << ": " << r.err;
    EXPECT_LE(std::count(r.err.begin(), r.err.end(), '\n'), 1) << f << ": " << r.err;
  }
}

// ---------------------------------------------------------------------------------------------
// Atomic outputs. Tests run as root, where a chmod 0555 folder is still writable, so unwritable
// places are a path below a regular file, and /proc.

std::string q(const fs::path& p) { return "'" + p.string() + "'"; }

// Every entry of a folder (temporaries are dot files: list them too).
std::vector<std::string> listing(const fs::path& dir) {
  std::vector<std::string> out;
  for (const auto& e : fs::directory_iterator(dir)) out.push_back(e.path().filename().string());
  std::sort(out.begin(), out.end());
  return out;
}

TEST(AtomicOutputs, FolderBelowARegularFileFailsCleanly) {
  const auto dir = temp_dir();
  write_file(dir / "plain", "not a folder\n");
  const auto r = run_qftplan("plan --device line:6 --qubits 4 --output " + q(dir / "plain" / "out.qasm") +
                             " --report " + q(dir / "r.json"));
  EXPECT_EQ(r.status, 2) << r.err;
  EXPECT_NE(r.err.find("out.qasm: cannot create a temporary file beside it"), std::string::npos) << r.err;
  EXPECT_EQ(listing(dir), std::vector<std::string>{"plain"});
  fs::remove_all(dir);
}

TEST(AtomicOutputs, ProcIsNotWritable) {
  const auto r = run_qftplan("plan --device line:6 --qubits 4 --output /proc/qftplan-out.qasm");
  EXPECT_EQ(r.status, 2) << r.err;
  EXPECT_FALSE(fs::exists("/proc/qftplan-out.qasm"));
}

// The circuit's temporary is already open when the report's folder turns out to be unusable: the
// existing circuit file keeps its old content and no temporary is left.
TEST(AtomicOutputs, SecondOutputFailingLeavesTheFirstUntouched) {
  const auto dir = temp_dir();
  write_file(dir / "out.qasm", "old circuit\n");
  write_file(dir / "plain", "x");
  const auto r = run_qftplan("plan --device line:6 --qubits 4 --output " + q(dir / "out.qasm") + " --report " +
                             q(dir / "plain" / "r.json"));
  EXPECT_EQ(r.status, 2) << r.err;
  EXPECT_EQ(read_file(dir / "out.qasm"), "old circuit\n");
  EXPECT_EQ(listing(dir), (std::vector<std::string>{"out.qasm", "plain"}));
  fs::remove_all(dir);
}

TEST(AtomicOutputs, OutputAndReportOnOneFileAreRefused) {
  const auto dir = temp_dir();
  const auto r = run_qftplan("plan --device line:6 --qubits 4 --output " + q(dir / "x") + " --report " +
                             q(dir / "." / "x"));
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.err.find("--output and --report name the same file"), std::string::npos) << r.err;
  EXPECT_TRUE(listing(dir).empty());
  fs::remove_all(dir);
}

// A full disk, simulated by a file-size limit (ulimit -f, in KiB blocks): the kernel fails the write
// with EFBIG part-way through the circuit. The old files stay, no temporary remains.
TEST(AtomicOutputs, WriteFailingMidwayChangesNothing) {
  const auto dir = temp_dir();
  write_file(dir / "out.qasm", "old circuit\n");
  write_file(dir / "r.json", "{}\n");
  const std::string cmd = "ulimit -f 16; exec '" + std::string(QFTPLAN_BINARY) +
                          "' plan --device line:40 --qubits 40 --output " + q(dir / "out.qasm") + " --report " +
                          q(dir / "r.json") + " 2>" + q(dir / "err");
  const int raw = std::system(("bash -c \"" + cmd + "\"").c_str());
  ASSERT_TRUE(WIFEXITED(raw)) << "killed by signal " << WTERMSIG(raw);
  EXPECT_EQ(WEXITSTATUS(raw), 2);
  const std::string err = read_file(dir / "err");
  EXPECT_NE(err.find("write failed: File too large"), std::string::npos) << err;
  fs::remove(dir / "err");
  EXPECT_EQ(read_file(dir / "out.qasm"), "old circuit\n");
  EXPECT_EQ(read_file(dir / "r.json"), "{}\n");
  EXPECT_EQ(listing(dir), (std::vector<std::string>{"out.qasm", "r.json"}));
  fs::remove_all(dir);
}

// A really full disk: a 32 KiB tmpfs, when this machine lets us mount one (root, no container
// restriction); skipped otherwise (the file-size limit above covers the same path).
TEST(AtomicOutputs, FullTmpfsChangesNothing) {
  const auto dir = temp_dir();
  if (::mount("tmpfs", dir.c_str(), "tmpfs", 0, "size=32k") != 0) {
    fs::remove_all(dir);
    GTEST_SKIP() << "cannot mount a tmpfs here";
  }
  struct Unmount {
    fs::path d;
    ~Unmount() {
      ::umount(d.c_str());
      fs::remove_all(d);
    }
  } unmount{dir};
  write_file(dir / "out.qasm", "old circuit\n");
  const auto r = run_qftplan("plan --device line:40 --qubits 40 --output " + q(dir / "out.qasm"));
  EXPECT_EQ(r.status, 2) << r.err;
  EXPECT_NE(r.err.find("No space left on device"), std::string::npos) << r.err;
  EXPECT_EQ(read_file(dir / "out.qasm"), "old circuit\n");
  EXPECT_EQ(listing(dir), std::vector<std::string>{"out.qasm"});
}

// A writer that fails after `limit` bytes, as a disk would.
class FailingOutput final : public TextOutput {
 public:
  explicit FailingOutput(std::size_t limit) : limit_(limit) {}
  void write(std::string_view text) override {
    written_ += text.size();
    if (written_ > limit_) throw std::runtime_error("out.qasm: write failed: No space left on device");
  }

 private:
  std::size_t limit_;
  std::size_t written_ = 0;
};

TEST(AtomicOutputs, LibraryPropagatesAWriterFailure) {
  const Device dev = make_lattice("line:64");
  PlanOptions opt;
  opt.spec.qubits = 64;
  const auto plan = prepare_plan(dev, opt);
  FailingOutput out(10'000);  // the file is about 60 kB
  QasmWriter w(QasmVersion::v3, circuit_header(dev, opt, plan), out);
  EXPECT_THROW(execute_plan(dev, opt, plan, &w), std::runtime_error);
}

TEST(AtomicOutputs, AtomicFileWithoutCommitLeavesNoTrace) {
  const auto dir = temp_dir();
  write_file(dir / "keep.txt", "old\n");
  {
    AtomicFile f((dir / "keep.txt").string());
    f.write("new text that never lands\n");
    AtomicFile g((dir / "fresh.txt").string());
    g.write("never created\n");
    g.flush();  // even a flushed file is not in place until commit
  }
  EXPECT_EQ(read_file(dir / "keep.txt"), "old\n");
  EXPECT_EQ(listing(dir), std::vector<std::string>{"keep.txt"});
  {
    AtomicFile f((dir / "keep.txt").string());
    f.write("new\n");
    f.commit();
  }
  EXPECT_EQ(read_file(dir / "keep.txt"), "new\n");
  EXPECT_EQ(listing(dir), std::vector<std::string>{"keep.txt"});
  fs::remove_all(dir);
}

// ---------------------------------------------------------------------------------------------
// Size caps.

TEST(Limits, RegisterCapIsClear) {
  const auto r = run_qftplan("plan --device line:20000 --qubits 20000");
  EXPECT_EQ(r.status, 2);
  EXPECT_EQ(r.err, "qftplan: --qubits 20000 is more than the limit of 16384 qubits per register\n");
}

TEST(Limits, DeviceCapIsClear) {
  const auto r = run_qftplan("device line:1000001");
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.err.find("more than the limit of 1000000 qubits"), std::string::npos) << r.err;
  const auto g = run_qftplan("device grid:1001x1000");
  EXPECT_EQ(g.status, 2);
  EXPECT_NE(g.err.find("more than the limit of 1000000"), std::string::npos) << g.err;
}

// A big register with a big degree used to build the leapfrog network (the insertion networks, today) in memory (n * 2d steps of 12
// bytes: 3 GB here) and die of std::bad_alloc; past 2^25 steps a streamed network (parity, the
// cheapest of them) is used instead.
TEST(Limits, BigApproximateRegisterNeedsNoHugeMemory) {
  QftSpec spec;
  spec.qubits = 16'384;
  spec.approx_degree = 4000;
  EXPECT_EQ(choose_network(spec)->name(), "parity");
  spec.approx_degree = 6;
  EXPECT_EQ(choose_network(spec)->name(), "parity-insertion");
}

TEST(Limits, TimeLimitValuesAreChecked) {
  for (const std::string v : {"0", "-1", "abc", "nan", "inf", "1s"}) {
    const auto r = run_qftplan("plan --device line:6 --qubits 4 --time-limit '" + v + "'");
    EXPECT_EQ(r.status, 2) << v;
    EXPECT_NE(r.err.find("--time-limit"), std::string::npos) << v << ": " << r.err;
  }
}

TEST(Limits, EffortValuesAreChecked) {
  for (const std::string v : {"0", "-1", "abc", "nan", "1001", "0.001"}) {
    const auto r = run_qftplan("plan --device line:6 --qubits 4 --effort '" + v + "'");
    EXPECT_EQ(r.status, 2) << v;
    EXPECT_NE(r.err.find("--effort"), std::string::npos) << v << ": " << r.err;
  }
}

// ---------------------------------------------------------------------------------------------
// Budgets: --time-limit and Ctrl-C.

TEST(RunBudget, DeadlineAndInterruption) {
  const RunBudget none;
  EXPECT_EQ(none.stop_reason(), StopReason::none);
  const RunBudget past(0.0, nullptr);
  EXPECT_EQ(past.stop_reason(), StopReason::time_limit);
  std::atomic<bool> flag{false};
  const RunBudget later(3600.0, &flag);
  EXPECT_EQ(later.stop_reason(), StopReason::none);
  flag = true;
  EXPECT_EQ(later.stop_reason(), StopReason::interrupted);
  EXPECT_THROW(throw_if_interrupted(&later), Interrupted);
  BudgetPoll poll(&past, 4);
  EXPECT_FALSE(poll.stop());  // the clock is read every 4th poll only
  EXPECT_FALSE(poll.stop());
  EXPECT_FALSE(poll.stop());
  EXPECT_TRUE(poll.stop());
  EXPECT_TRUE(poll.stop());  // sticky
}

// The counting clock advances one tick per reading: 0.25 s at 0.1 s a tick runs out at the third
// reading, whatever the machine's speed; without a time limit it never runs out.
TEST(RunBudget, CountingClockRunsOutAfterAFixedNumberOfReadings) {
  const RunBudget budget(0.25, nullptr, BudgetClock{0.1});
  EXPECT_EQ(budget.stop_reason(), StopReason::none);
  EXPECT_EQ(budget.stop_reason(), StopReason::none);
  EXPECT_EQ(budget.stop_reason(), StopReason::time_limit);
  const RunBudget unlimited(std::nullopt, nullptr, BudgetClock{0.1});
  for (int i = 0; i < 10; ++i) EXPECT_EQ(unlimited.stop_reason(), StopReason::none);
  ::setenv("QFTPLAN_TEST_CLOCK_TICK", "0.5", 1);
  EXPECT_EQ(BudgetClock::from_environment().tick_seconds, 0.5);
  ::setenv("QFTPLAN_TEST_CLOCK_TICK", "fast", 1);
  EXPECT_FALSE(BudgetClock::from_environment().tick_seconds);
  ::unsetenv("QFTPLAN_TEST_CLOCK_TICK");
  EXPECT_FALSE(BudgetClock::from_environment().tick_seconds);
}

// The chain search on a device too small in effect (no chain of 4400 qubits exists in heavy-hex:30x30
// of 4739 qubits, and proving it takes a minute): the deadline stops it with the longest chain so far.
TEST(RunBudget, ChainSearchStopsAtTheDeadline) {
  const Device dev = make_lattice("heavy-hex:30x30");
  // The counting clock (1 ms per reading): the cut comes after the same work on any machine.
  const RunBudget budget(0.2, nullptr, BudgetClock{0.001});
  ChainSearchOptions o;
  o.budget = &budget;
  const auto r = find_chain(dev, 4400, o);
  EXPECT_TRUE(r.time_out);
  EXPECT_TRUE(r.chain.empty());
  EXPECT_GT(r.longest.size(), 100u);
  PlanOptions opt;
  opt.spec.qubits = 4400;
  opt.strategy = "chain";
  const RunBudget again(0.2, nullptr, BudgetClock{0.001});
  opt.budget = &again;
  EXPECT_THROW(prepare_plan(dev, opt), TimeLimitReached);
}

TEST(RunBudget, InterruptionStopsPlanning) {
  const Device dev = make_lattice("heavy-hex:30x30");
  std::atomic<bool> flag{true};
  const RunBudget budget(std::nullopt, &flag);
  PlanOptions opt;
  opt.spec.qubits = 4400;
  opt.budget = &budget;
  EXPECT_THROW(prepare_plan(dev, opt), Interrupted);
}

// An 8 x 8 grid with uneven coupler errors: at the default effort the placement search for 40 qubits
// runs out of its work budget (about 0.3 s) and finishes with a beam search.
std::string uneven_grid_yaml() {
  std::string yaml = "name: harbor-uneven-8x8\nqubits: 64\ncouplers:\n";
  for (int y = 0; y < 8; ++y)
    for (int x = 0; x < 8; ++x) {
      const int q = 8 * y + x;
      const double e = 0.005 + 0.0007 * ((q * 37) % 29);
      if (x < 7) yaml += "  - {pair: [" + std::to_string(q) + ", " + std::to_string(q + 1) + "], error: " + std::to_string(e) + "}\n";
      if (y < 7) yaml += "  - {pair: [" + std::to_string(q) + ", " + std::to_string(q + 8) + "], error: " + std::to_string(e * 1.3) + "}\n";
    }
  return yaml;
}

// --effort 1000 makes that search minutes long. With a short limit the plan found so far is written,
// checked correct, and the exit status is 3.
TEST(RunBudget, CutShortPlacementStillWritesAValidPlan) {
  const auto dir = temp_dir();
  write_file(dir / "dev.yaml", uneven_grid_yaml());
  // The counting clock (1 ms per reading, run_budget.hpp): the cut does not depend on the machine's speed.
  const auto r = run_qftplan_counting_clock("plan --device " + q(dir / "dev.yaml") + " --qubits 40 --strategy chain --effort 1000 --time-limit 0.3 " +
                             "--output " + q(dir / "c.qasm") + " --report " + q(dir / "r.json"));
  EXPECT_EQ(r.status, 3) << r.err;
  EXPECT_NE(r.err.find("warning: the time limit of 0.3 s ran out during the placement search"), std::string::npos)
      << r.err;
  EXPECT_NE(read_file(dir / "r.json").find("\"method\": \"time-limited\""), std::string::npos);
  const auto c = run_qftplan("check " + q(dir / "c.qasm") + " --device " + q(dir / "dev.yaml") + " --qubits 40");
  EXPECT_EQ(c.status, 0) << c.err << c.out;
  fs::remove_all(dir);
}

// --effort scales the placement search: less effort scores fewer chains, more scores more, and the
// chain found with more effort is at least as good on this device (1.2e-14 against 8.7e-11 when written).
TEST(Limits, EffortScalesThePlacementSearch) {
  const auto dir = temp_dir();
  write_file(dir / "dev.yaml", uneven_grid_yaml());
  const auto run = [&](const std::string& effort) {
    const auto r = run_qftplan("plan --device " + q(dir / "dev.yaml") + " --qubits 40 --strategy chain --effort " +
                               effort + " --report -");
    EXPECT_EQ(r.status, 0) << r.err;
    const auto j = nlohmann::json::parse(r.out);
    return std::pair{j["placement_choice"]["chains_scored"].get<long long>(), j["esp"].get<double>()};
  };
  const auto low = run("0.01"), normal = run("1");
  EXPECT_LT(low.first, normal.first);
  EXPECT_GE(normal.second, low.second);
  fs::remove_all(dir);
}

TEST(RunBudget, NoChainInTimeIsExitThreeWithoutFiles) {
  const auto dir = temp_dir();
  // The counting clock: the deadline does not depend on how fast this machine searches.
  const auto r = run_qftplan_counting_clock("plan --device heavy-hex:30x30 --qubits 4400 --time-limit 0.3 --output " +
                             q(dir / "c.qasm"));
  EXPECT_EQ(r.status, 3) << r.err;
  EXPECT_NE(r.err.find("the time limit ran out before a chain of 4400 qubits was found"), std::string::npos) << r.err;
  EXPECT_TRUE(listing(dir).empty());
  fs::remove_all(dir);
}

// Runs qftplan with `args` in the background, standard error to `err`.
struct Spawned {
  pid_t pid = -1;
  Spawned(const std::vector<std::string>& args, const fs::path& err) {
    pid = ::fork();
    if (pid == 0) {
      const int null = ::open("/dev/null", O_WRONLY);
      const int e = ::open(err.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
      ::dup2(null, 1);
      ::dup2(e, 2);
      std::vector<char*> argv;
      std::string bin = QFTPLAN_BINARY;
      argv.push_back(bin.data());
      std::vector<std::string> copy = args;
      for (auto& a : copy) argv.push_back(a.data());
      argv.push_back(nullptr);
      ::execv(bin.c_str(), argv.data());
      ::_exit(127);
    }
  }
  int wait_status() {
    int raw = 0;
    // Bounded: a run that ignores the signal would otherwise hang the suite.
    for (int i = 0; i < 600; ++i) {
      if (::waitpid(pid, &raw, WNOHANG) == pid) return WIFEXITED(raw) ? WEXITSTATUS(raw) : 128 + WTERMSIG(raw);
      std::this_thread::sleep_for(std::chrono::milliseconds(50));
    }
    ::kill(pid, SIGKILL);
    ::waitpid(pid, &raw, 0);
    return -1;
  }
};

// Ctrl-C while the circuit streams into its temporary: exit 130, and neither the circuit nor the
// report nor any temporary is left.
TEST(RunBudget, CtrlCWhileWritingLeavesNoFiles) {
  const auto dir = temp_dir(), logs = temp_dir();
  // 8 million blocks, about 400 MB of text: seconds of writing on any machine we run on.
  Spawned p({"plan", "--device", "line:4000", "--qubits", "4000", "--strategy", "chain", "--gates", "logical",
             "--output", (dir / "c.qasm").string(), "--report", (dir / "r.json").string()},
            logs / "err");
  // Wait for the temporary to hold text (the stream has started and flushed once), then interrupt.
  const auto writing = [&dir] {
    std::error_code ec;
    for (const auto& e : fs::directory_iterator(dir, ec)) {
      const auto size = fs::file_size(e.path(), ec);
      if (!ec && size > 0) return true;
    }
    return false;
  };
  for (int i = 0; i < 2000 && !writing(); ++i) std::this_thread::sleep_for(std::chrono::milliseconds(5));
  ASSERT_TRUE(writing()) << "the plan never started writing";
  ::kill(p.pid, SIGINT);
  EXPECT_EQ(p.wait_status(), 130);
  EXPECT_EQ(read_file(logs / "err"), "qftplan: interrupted; no output written\n");
  EXPECT_TRUE(listing(dir).empty());
  fs::remove_all(dir);
  fs::remove_all(logs);
}

// Ctrl-C during a long search, before any output is opened.
TEST(RunBudget, CtrlCDuringTheSearch) {
  const auto dir = temp_dir(), logs = temp_dir();
  Spawned p({"plan", "--device", "heavy-hex:30x30", "--qubits", "4400", "--output", (dir / "c.qasm").string()},
            logs / "err");
  std::this_thread::sleep_for(std::chrono::milliseconds(1500));
  ::kill(p.pid, SIGINT);
  EXPECT_EQ(p.wait_status(), 130);
  // The message shows the handler ran (the default action would also give 130, silently).
  EXPECT_EQ(read_file(logs / "err"), "qftplan: interrupted; no output written\n");
  EXPECT_TRUE(listing(dir).empty());
  fs::remove_all(dir);
  fs::remove_all(logs);
}

}  // namespace
}  // namespace qftplan
