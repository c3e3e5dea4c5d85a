// The peephole pass on planned circuits: written cz circuits keep no adjacent h h; the report's
// native figures are those of the written circuit; every network and strategy is still the QFT
// (simulated against FFTW, and proved by the checker's structural proof).

#include <gtest/gtest.h>

#include <map>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/sinks/circuit_metrics.hpp"
#include "qftplan/sinks/noise_model.hpp"
#include "plan_simulation.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

std::string topo(const std::string& name) { return (testing::source_dir() / "topologies" / name).string(); }

// Adjacent h h on one qubit (nothing else on that qubit between them) in a parsed file.
long long adjacent_hh(const std::vector<Gate>& gates, int qubits) {
  std::vector<char> last_is_h(qubits, 0);
  long long pairs = 0;
  for (const Gate& g : gates) {
    if (g.kind == GateKind::h) {
      if (last_is_h[g.q0]) {
        ++pairs;
        last_is_h[g.q0] = 0;
      } else {
        last_is_h[g.q0] = 1;
      }
      continue;
    }
    last_is_h[g.q0] = 0;
    if (is_two_qubit(g.kind)) last_is_h[g.q1] = 0;
  }
  return pairs;
}

testing::WrittenPlan written(const std::string& device, int n, GateSet gates, bool peephole, bool measure = false) {
  const Device dev = load_device(device);
  PlanOptions opt;
  opt.spec.qubits = n;
  opt.gates = gates;
  opt.peephole = peephole;
  opt.measure = measure;
  return testing::write_and_read(dev, opt);
}

// Issue 18: harbor-grid-5x5 with --gates cz held 45 adjacent h h pairs at n = 10 (h h = I: Nielsen
// and Chuang, "Quantum Computation and Quantum Information", 2000, section 4.2); 46 since the parity
// network's last Hadamard follows a cx onto its qubit (issue 19). Scanned in the text as written and
// parsed back.
TEST(PeepholePlans, CzFilesHoldNoAdjacentHadamardPair) {
  const testing::WrittenPlan raw = written(topo("harbor-grid-5x5.yaml"), 10, GateSet::cz, false);
  EXPECT_EQ(adjacent_hh(raw.program.gates, raw.program.qubit_count), 46);  // what the scan finds without the pass
  EXPECT_FALSE(raw.report.peephole_removed.has_value());
  const std::vector<std::pair<std::string, int>> cases = {
      {topo("harbor-grid-5x5.yaml"), 10}, {topo("harbor-grid-5x5.yaml"), 25}, {"grid:4x4", 16}, {"grid:5x5", 23},
      {"heavy-hex:2x2", 20}, {"line:16", 16}, {"ring:12", 11}, {topo("harbor-hex-21.yaml"), 15}};
  for (const auto& [device, n] : cases) {
    const testing::WrittenPlan w = written(device, n, GateSet::cz, true);
    EXPECT_EQ(adjacent_hh(w.program.gates, w.program.qubit_count), 0) << device << " n=" << n;
    ASSERT_TRUE(w.report.peephole_removed.has_value());
    EXPECT_GT(*w.report.peephole_removed, 0) << device << " n=" << n;
  }
}

// The report describes the file it accompanies (common practice): counts by name, depth, native
// two-qubit count and depth, and the noise model's figures recomputed from the parsed file equal
// the report's, with and without the pass; the pass's count is the difference in gates.
TEST(PeepholePlans, ReportFiguresAreThoseOfTheWrittenFile) {
  const std::vector<std::tuple<std::string, int, GateSet>> cases = {
      {topo("harbor-grid-5x5.yaml"), 10, GateSet::cz}, {topo("harbor-noisy-20.yaml"), 12, GateSet::cx},
      {topo("harbor-hex-21.yaml"), 14, GateSet::cx}, {"grid:4x4", 13, GateSet::cx}};
  for (const auto& [device, n, gates] : cases) {
    const Device dev = load_device(device);
    long long total[2] = {0, 0};
    for (bool peephole : {false, true}) {
      const testing::WrittenPlan w = written(device, n, gates, peephole, /*measure=*/true);
      const std::string what = device + (peephole ? " with the pass" : " without");
      ASSERT_EQ(w.report.native_2q, gate_set_name(gates)) << what;  // the written gates are the native ones
      MetricsSink counts(dev.qubit_count());
      NoiseSink noise(dev, w.plan.maps.placement);
      for (const Gate& g : w.program.gates) {
        counts.gate(g);
        noise.gate(g);
      }
      const NoiseFigures f = noise.figures();
      EXPECT_EQ(counts.counts_by_name(), w.report.gate_counts) << what;
      EXPECT_EQ(counts.depth(), w.report.depth) << what;
      EXPECT_EQ(counts.two_qubit_count(), w.report.cx_count) << what;
      EXPECT_EQ(counts.depth_2q(), w.report.cx_depth) << what;
      EXPECT_NEAR(f.log_esp, w.report.noise.log_esp, 1e-12 * std::abs(f.log_esp)) << what;
      EXPECT_NEAR(f.log_esp_total, w.report.noise.log_esp_total, 1e-12 * std::abs(f.log_esp_total)) << what;
      EXPECT_NEAR(f.duration_ns, w.report.noise.duration_ns, 1e-9 * f.duration_ns) << what;
      EXPECT_NEAR(f.idle_ns, w.report.noise.idle_ns, 1e-9 * std::max(1.0, f.idle_ns)) << what;
      total[peephole] = counts.total();
      if (peephole) EXPECT_EQ(*w.report.peephole_removed, total[0] - total[1]) << what;
    }
    if (gates == GateSet::cz) EXPECT_LT(total[1], total[0]) << device;
  }
}

// A cz device written in cx gates: the file's counts are those of the cx stream after its own pass,
// and the noise figures those of the native cz stream after the pass (as when cz is written).
TEST(PeepholePlans, OtherNativeGateSetsAreCountedAfterTheirOwnPass) {
  const std::string device = topo("harbor-grid-5x5.yaml");
  const testing::WrittenPlan as_cx = written(device, 10, GateSet::cx, true);
  const testing::WrittenPlan as_cz = written(device, 10, GateSet::cz, true);
  const Device dev = load_device(device);
  MetricsSink counts(dev.qubit_count());
  for (const Gate& g : as_cx.program.gates) counts.gate(g);
  EXPECT_EQ(counts.counts_by_name(), as_cx.report.gate_counts);
  EXPECT_EQ(as_cx.report.cx_count, as_cz.report.cx_count);
  EXPECT_EQ(as_cx.report.noise.log_esp_total, as_cz.report.noise.log_esp_total);
  EXPECT_EQ(as_cx.report.noise.duration_ns, as_cz.report.noise.duration_ns);
}

// A spider (legs of 3, 3 and 2 from qubit 0) needs the spine strategy's detours; its pass output
// against FFTW's DFT (Frigo and Johnson, "The Design and Implementation of FFTW3", Proc. IEEE 93(2),
// 2005; the QFT is the DFT with the sign e^{+2 pi i jk/N}: Nielsen and Chuang 2000, eq. 5.1).
TEST(PeepholePlans, SpineOutputMatchesFftw) {
  DeviceDescription d;
  d.name = "spider";
  d.qubits = 9;
  for (const auto& [a, b] : std::vector<std::pair<int, int>>{{0, 1}, {1, 2}, {2, 3}, {0, 4}, {4, 5}, {5, 6}, {0, 7}, {7, 8}})
    d.couplers.push_back({a, b, {}, {}});
  for (TwoQubitGate native : {TwoQubitGate::cx, TwoQubitGate::cz}) {
    d.native_2q = native;
    const Device dev(d);
    for (bool inverse : {false, true}) {
      PlanOptions opt;
      opt.spec.qubits = 9;
      opt.spec.inverse = inverse;
      opt.strategy = "spine";
      const PreparedPlan plan = prepare_plan(dev, opt);
      VectorSink out;
      const PlanReport r = execute_plan(dev, opt, plan, &out);
      ASSERT_TRUE(r.peephole_removed.has_value());
      if (native == TwoQubitGate::cz) EXPECT_GT(*r.peephole_removed, 0);
      EXPECT_LT(testing::distance_up_to_phase(testing::plan_unitary(dev, plan, out.gates),
                                              testing::fftw_qft_matrix(9, inverse)),
                1e-9)
          << two_qubit_gate_name(native) << (inverse ? " inverse" : "");
    }
  }
}

}  // namespace
}  // namespace qftplan
