// Determinism (issue 8): the same inputs and seed give byte-identical circuits and reports (minus the
// wall-clock field elapsed_ms), across separate runs of the program and within one process.

#include <gtest/gtest.h>

#include <filesystem>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "qftplan/core/atomic_file.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_writer.hpp"
#include "qftplan/report/report.hpp"
#include "qftplan/report/circuit_header.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

namespace fs = std::filesystem;
using testing::read_file;
using testing::run_qftplan;
using testing::source_dir;
using testing::temp_dir;

std::string topo(const std::string& name) { return "'" + (source_dir() / "topologies" / name).string() + "'"; }

// The report without its one wall-clock field.
std::string report_without_time(const std::string& text) {
  auto j = nlohmann::ordered_json::parse(text);
  j.erase("elapsed_ms");
  return j.dump(2);
}

struct Case {
  std::string name;
  std::string args;
};

class SameRunTwice : public ::testing::TestWithParam<Case> {};

// Two separate processes, same arguments: the circuit files are equal byte for byte, and so are
// the reports once elapsed_ms is removed.
TEST_P(SameRunTwice, ByteIdenticalOutputs) {
  const auto dir = temp_dir();
  std::string qasm[2], report[2];
  for (int run = 0; run < 2; ++run) {
    const auto c = dir / ("c" + std::to_string(run)), r = dir / ("r" + std::to_string(run));
    const auto res = run_qftplan("plan " + GetParam().args + " --output '" + c.string() + "' --report '" + r.string() + "'");
    ASSERT_EQ(res.status, 0) << res.err;
    qasm[run] = read_file(c);
    report[run] = read_file(r);
  }
  EXPECT_EQ(qasm[0], qasm[1]);
  EXPECT_EQ(report_without_time(report[0]), report_without_time(report[1]));
  EXPECT_NE(report[0].find("\"elapsed_ms\""), std::string::npos);
  fs::remove_all(dir);
}

// Every randomised or calibration-driven path: chain search with restarts, exhaustive and beam
// placement, --approx auto, each strategy, both formats and all gate sets.
std::vector<Case> cases() {
  return {
      {"noisy_auto", "--device " + topo("harbor-noisy-20.yaml") + " --qubits 12 --approx auto"},
      {"noisy_beam", "--device " + topo("harbor-noisy-20.yaml") + " --qubits 18 --seed 5"},
      {"hex_inverse_qasm2", "--device " + topo("harbor-hex-35.yaml") +
                                " --qubits 20 --inverse --gates logical --format qasm2 --measure"},
      {"defect_seed", "--device " + topo("harbor-grid-6x6-defect.yaml") + " --qubits 30 --seed 7 --approx 4"},
      {"ring_cz", "--device " + topo("harbor-ring-16.yaml") + " --qubits 16 --approx 3 --gates cz"},
      {"grid_calibrated", "--device " + topo("harbor-grid-5x5.yaml") + " --qubits 20 --approx auto --inverse"},
      {"routed", "--device heavy-hex:1x2 --qubits 14 --strategy routed --seed 3"},
      {"spine", "--device " + topo("harbor-hex-35.yaml") + " --qubits 35 --strategy spine --approx 5"},
      {"big_line", "--device line:300 --qubits 300 --approx 8 --seed 11"},
  };
}

INSTANTIATE_TEST_SUITE_P(Plans, SameRunTwice, ::testing::ValuesIn(cases()),
                         [](const auto& info) { return info.param.name; });

// A survey (threads over runs) gives the same files whatever --jobs says, and again when repeated:
// calibrated chips (placement search), --approx auto and every strategy, with --no-timing.
TEST(Determinism, SurveyAcrossJobs) {
  const auto dir = temp_dir();
  const std::string base = "survey " + topo("harbor-noisy-20.yaml") + " " + topo("harbor-hex-21.yaml") +
                           " 'grid:*' --qubits " + std::string(testing::kSanitized ? "4:8:4" : "4:16:4") + " --approx none,auto --strategy auto,chain,routed --seed 4 "
                           "--no-timing --quiet";
  std::string files[3];
  const char* jobs[3] = {"1", "2", "2"};
  for (int k = 0; k < 3; ++k) {
    const auto p = dir / std::to_string(k);
    const auto r = run_qftplan(base + " --jobs " + jobs[k] + " --csv '" + p.string() + ".csv' --jsonl '" + p.string() +
                               ".jsonl' --svg '" + p.string() + ".svg'");
    ASSERT_EQ(r.status, 0) << r.err;
    files[k] = read_file(p.string() + ".csv") + read_file(p.string() + ".jsonl") + read_file(p.string() + ".svg");
  }
  EXPECT_FALSE(files[0].empty());
  EXPECT_EQ(files[0], files[1]) << "--jobs 1 and --jobs 2 differ";
  EXPECT_EQ(files[1], files[2]) << "two runs with --jobs 2 differ";
  fs::remove_all(dir);
}

// Within one process: static caches (angle texts, networks) must not make a second plan differ.
TEST(Determinism, SameProcessTwice) {
  const Device dev = load_device((source_dir() / "topologies" / "harbor-noisy-20.yaml").string());
  const auto plan_text = [&](int qubits, bool inverse) {
    PlanOptions opt;
    opt.spec.qubits = qubits;
    opt.spec.inverse = inverse;
    opt.auto_approx = true;
    opt.search.seed = 9;
    const auto plan = prepare_plan(dev, opt);
    StringOutput out;
    QasmWriter w(QasmVersion::v2, circuit_header(dev, opt, plan), out);
    PlanReport r = execute_plan(dev, opt, plan, &w);
    r.elapsed_ms = 0;
    return out.text() + report_to_json_text(r);
  };
  const std::string first = plan_text(14, false);
  (void)plan_text(20, true);  // warm every cache with other angles and sizes
  EXPECT_EQ(plan_text(14, false), first);
}

}  // namespace
}  // namespace qftplan
