// `qftplan draw`: the device picture, and a plan report re-planned to count blocks per coupler.

#include <gtest/gtest.h>

#include <filesystem>
#include <cmath>
#include <numeric>

#include "qftplan/device_source.hpp"
#include "qftplan/input_error.hpp"
#include "qftplan/plan.hpp"
#include "qftplan/plan_drawing.hpp"
#include "qftplan/report.hpp"
#include "qftplan/svg_layout.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

using testing::read_file;
using testing::run_qftplan;
using testing::source_dir;
using testing::temp_dir;
using testing::write_file;

std::string topo_path(const std::string& name) { return (source_dir() / "topologies" / name).string(); }

TEST(CouplerLoads, AFusedBlockCountsOnceInEitherSpelling) {
  const Device dev = load_device("line:4");
  CouplerLoadSink s(dev, true);
  s.gate(make_gate(GateKind::h, 0));
  s.gate(make_gate(GateKind::cp_swap, 0, 1));  // fused
  s.gate(make_gate(GateKind::cp, 2, 1));        // written as cp then swap: one block
  s.gate(make_gate(GateKind::swap, 1, 2));
  s.gate(make_gate(GateKind::cp, 2, 3));        // a cp, then a swap elsewhere: two blocks
  s.gate(make_gate(GateKind::swap, 0, 1));
  s.gate(make_gate(GateKind::swap, 0, 1));      // a plain swap
  EXPECT_EQ(s.loads(), (std::vector<long long>{3, 1, 1}));
  EXPECT_EQ(s.total(), 5);
  CouplerLoadSink plain(dev, false);  // every two-qubit gate is a block
  plain.gate(make_gate(GateKind::cp, 2, 1));
  plain.gate(make_gate(GateKind::swap, 1, 2));
  EXPECT_EQ(plain.total(), 2);
}

struct Setting {
  std::string device;
  int qubits;
  std::optional<int> degree;
  bool inverse;
  std::string strategy;
};

// Loads recomputed from a report add up to the report's blocks, for every strategy.
TEST(DrawnPlan, LoadsAddUpToTheReportsBlocks) {
  for (const auto& s : std::vector<Setting>{{"grid:4x4", 12, std::nullopt, false, "chain"},
                                            {"grid:4x4", 12, 3, true, "chain"},
                                            {topo_path("harbor-noisy-20.yaml"), 10, std::nullopt, false, "auto"},
                                            {"heavy-hex:2x2", 30, std::nullopt, false, "auto"},
                                            {"heavy-hex:1x2", 16, std::nullopt, false, "routed"},
                                            {"heavy-hex:3x3", 64, 4, false, "auto"}}) {
    SCOPED_TRACE(s.device + " n=" + std::to_string(s.qubits) + " " + s.strategy);
    const Device dev = load_device(s.device);
    PlanOptions opt;
    opt.spec.qubits = s.qubits;
    opt.spec.approx_degree = s.degree;
    opt.spec.inverse = s.inverse;
    opt.strategy = s.strategy;
    const PlanReport r = plan_qft(dev, opt);
    const DrawnPlan d = drawn_plan_from_report(dev, nlohmann::json::parse(report_to_json_text(r)), "report.json");
    EXPECT_EQ(std::accumulate(d.coupler_blocks.begin(), d.coupler_blocks.end(), 0LL), r.two_qubit_blocks);
    EXPECT_EQ(d.placement, r.placement);
    EXPECT_EQ(d.final_placement, r.final_placement);
  }
}

// On a chain the exact QFT needs n(n-1)/2 blocks (one per controlled rotation: Nielsen & Chuang
// 2000, section 5.1; fused with SWAPs as in Fowler, Devitt and Hollenberg 2004), all of them on the
// chain's couplers and none elsewhere.
TEST(DrawnPlan, ChainPlanLoadsSitOnTheChain) {
  const Device dev = load_device("grid:4x4");
  PlanOptions opt;
  opt.spec.qubits = 11;
  opt.strategy = "chain";
  const PlanReport r = plan_qft(dev, opt);
  const DrawnPlan d = drawn_plan_from_report(dev, report_to_json(r), "r.json");
  long long on_chain = 0;
  for (std::size_t p = 0; p + 1 < d.chain.size(); ++p) {
    const int c = dev.coupler_index(d.chain[p], d.chain[p + 1]);
    ASSERT_GE(c, 0);
    EXPECT_GT(d.coupler_blocks[c], 0);
    on_chain += d.coupler_blocks[c];
  }
  EXPECT_EQ(on_chain, 11 * 10 / 2);
}

TEST(DrawnPlan, ReportsThatDoNotFitAreRejected) {
  const Device dev = load_device("grid:4x4");
  PlanOptions opt;
  opt.spec.qubits = 6;
  opt.strategy = "chain";
  auto j = report_to_json(plan_qft(dev, opt));
  EXPECT_THROW(drawn_plan_from_report(load_device("grid:5x5"), j, "r.json"), InputError);  // another device
  auto tampered = j;
  tampered["final_placement"][0] = tampered["final_placement"][1].get<int>();
  try {
    drawn_plan_from_report(dev, tampered, "r.json");
    ADD_FAILURE() << "accepted a report whose maps do not match";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("r.json: re-planning gives another plan"), std::string::npos) << e.what();
  }
  auto missing = j;
  missing.erase("placement");
  EXPECT_THROW(drawn_plan_from_report(dev, missing, "r.json"), InputError);
}

// Devices without positions get a deterministic layout with distinct points.
TEST(DrawLayout, ComputedLayoutIsDeterministic) {
  const std::string yaml = "name: petal\nqubits: 7\ncouplers:\n  - [0, 1]\n  - [1, 2]\n  - [2, 3]\n  - [3, 0]\n  - [1, 4]\n  - [4, 5]\n";
  const auto dir = temp_dir();
  write_file(dir / "p.yaml", yaml);
  const Device dev = load_device((dir / "p.yaml").string());
  const auto a = drawing_positions(dev), b = drawing_positions(dev);
  ASSERT_EQ(a.size(), 7u);
  EXPECT_EQ(a, b);
  for (int i = 0; i < 7; ++i)
    for (int k = i + 1; k < 7; ++k) EXPECT_GT(std::hypot(a[i].x - a[k].x, a[i].y - a[k].y), 0.2) << i << " " << k;
  std::filesystem::remove_all(dir);
}

TEST(DrawCommand, DrawsAPlanAndRefusesBadReports) {
  const auto dir = temp_dir();
  const std::string chip = "'" + topo_path("harbor-noisy-20.yaml") + "'";
  const auto report = dir / "r.json", svg = dir / "d.svg";
  ASSERT_EQ(run_qftplan("plan --device " + chip + " --qubits 9 --report '" + report.string() + "'").status, 0);
  const auto r = run_qftplan("draw " + chip + " --plan '" + report.string() + "' --svg '" + svg.string() + "'");
  ASSERT_EQ(r.status, 0) << r.err;
  const std::string text = read_file(svg);
  for (const std::string want : {"harbor-noisy-20", ">in 0<", ">out 8<", "two-qubit error (log scale)", "QFT on 9 qubits, exact"})
    EXPECT_NE(text.find(want), std::string::npos) << want;
  if (std::filesystem::exists("/usr/bin/xmllint"))
    EXPECT_EQ(std::system(("/usr/bin/xmllint --noout '" + svg.string() + "'").c_str()), 0);
  if (std::filesystem::exists("/usr/bin/rsvg-convert"))
    EXPECT_EQ(std::system(("/usr/bin/rsvg-convert -o '" + (dir / "d.png").string() + "' '" + svg.string() + "'").c_str()), 0);

  // A report with SWAPs at the end (--end-order same) is re-planned the same way.
  const auto same = dir / "same.json";
  ASSERT_EQ(run_qftplan("plan --device grid:3x3 --qubits 6 --approx 2 --end-order same --report '" + same.string() + "'").status, 0);
  const auto rs = run_qftplan("draw grid:3x3 --plan '" + same.string() + "' --svg -");
  EXPECT_EQ(rs.status, 0) << rs.err;
  EXPECT_NE(rs.out.find("<svg"), std::string::npos);

  // A device alone, uncalibrated.
  EXPECT_EQ(run_qftplan("draw heavy-hex:1x1 --svg '" + (dir / "h.svg").string() + "'").status, 0);
  EXPECT_NE(read_file(dir / "h.svg").find("coupler (no error calibrated)"), std::string::npos);

  // Malformed JSON: file, line and column; nothing written.
  write_file(dir / "bad.json", "{\n  \"qubits\": 4,\n  oops\n}\n");
  const auto bad = run_qftplan("draw " + chip + " --plan '" + (dir / "bad.json").string() + "' --svg '" + (dir / "x.svg").string() + "'");
  EXPECT_EQ(bad.status, 2);
  EXPECT_NE(bad.err.find("bad.json:3:"), std::string::npos) << bad.err;
  EXPECT_FALSE(std::filesystem::exists(dir / "x.svg"));
  // A report of another device.
  const auto other = run_qftplan("draw grid:5x5 --plan '" + report.string() + "' --svg '" + (dir / "x.svg").string() + "'");
  EXPECT_EQ(other.status, 2);
  EXPECT_NE(other.err.find("not on 'grid:5x5'"), std::string::npos) << other.err;
  std::filesystem::remove_all(dir);
}

}  // namespace
}  // namespace qftplan
