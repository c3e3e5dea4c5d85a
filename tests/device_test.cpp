// Tests of load_device (spec or file), the device summary and check_device, including every
// bundled device in topologies/.

#include <gtest/gtest.h>

#include <algorithm>
#include <filesystem>
#include <random>
#include <string>
#include <vector>

#include <fmt/format.h>

#include "qftplan/core/input_error.hpp"
#include "qftplan/device/device_check.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/device/device_summary.hpp"
#include "qftplan/device/device_yaml.hpp"
#include "qftplan/device/lattices.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

namespace fs = std::filesystem;
using testing::source_dir;

std::string error_of(const std::string& spec) {
  try {
    load_device(spec);
  } catch (const InputError& e) {
    return e.what();
  }
  return "(no error)";
}

std::vector<fs::path> bundled_files() {
  std::vector<fs::path> out;
  for (const auto& entry : fs::directory_iterator(source_dir() / "topologies"))
    if (entry.path().extension() == ".yaml") out.push_back(entry.path());
  std::sort(out.begin(), out.end());
  return out;
}

TEST(LoadDevice, SpecOrFile) {
  EXPECT_EQ(load_device("grid:2x3").name(), "grid:2x3");
  const auto path = (source_dir() / "topologies" / "harbor-line-12.yaml").string();
  EXPECT_EQ(load_device(path).name(), "harbor-line-12");
  // A file whose name looks like a spec is reachable through a path with a folder in it.
  const auto dir = testing::temp_dir();
  testing::write_file(dir / "grid:9x9", "name: not-a-grid\nqubits: 2\ncouplers: [[0, 1]]\n");
  EXPECT_EQ(load_device((dir / "grid:9x9").string()).name(), "not-a-grid");
  fs::remove_all(dir);
}

TEST(LoadDevice, Errors) {
  EXPECT_EQ(error_of("nosuch:4"),
            "no file named 'nosuch:4', and unknown device family 'nosuch' (known: line, ring, grid, heavy-hex, full)");
  EXPECT_EQ(error_of("grid:0x3"), "device spec 'grid:0x3': a grid needs at least 1 row and 1 column");
  EXPECT_EQ(error_of("no-such-device.yaml"), "no-such-device.yaml: no such file");
  EXPECT_EQ(error_of("missing/dir:4"), "missing/dir:4: no such file");
  const auto topo = (source_dir() / "topologies").string();
  EXPECT_EQ(error_of(topo), topo + ": is a directory, not a device file");
}

TEST(DeviceSummary, GridNumbers) {
  // grid:3x4: degrees 2 (corners) to 4, diameter (3-1)+(4-1) = 5, bipartite ("common practice").
  const auto s = summarize(make_grid(3, 4));
  EXPECT_EQ(s.name, "grid:3x4");
  EXPECT_EQ(s.qubits, 12);
  EXPECT_EQ(s.couplers, 17);
  EXPECT_EQ(s.min_degree, 2);
  EXPECT_EQ(s.max_degree, 4);
  EXPECT_EQ(s.diameter, 5);
  EXPECT_EQ(s.components, 1);
  EXPECT_EQ(s.largest_component, 12);
  EXPECT_TRUE(s.bipartite);
  EXPECT_EQ(s.native_2q, "cx");
  EXPECT_FALSE(s.calibrated);
  const std::string text = format_summary(s);
  EXPECT_NE(text.find("diameter        5\n"), std::string::npos) << text;
  EXPECT_NE(text.find("components      1 (connected)\n"), std::string::npos) << text;
  EXPECT_EQ(text.find("disconnected"), std::string::npos) << text;
  EXPECT_NE(text.find("calibration     none"), std::string::npos) << text;
}

TEST(DeviceSummary, DisconnectedDeviceSaysSo) {
  const Device d =
      parse_device_yaml("name: islands\nqubits: 7\ncouplers: [[0, 1], [1, 2], [2, 3], [5, 6]]\n", "islands.yaml");
  const auto s = summarize(d);
  EXPECT_EQ(s.components, 3);
  EXPECT_EQ(s.largest_component, 4);
  EXPECT_EQ(s.diameter, 3);
  EXPECT_EQ(s.min_degree, 0);
  const std::string text = format_summary(s);
  EXPECT_NE(text.find("components      3, largest 4 qubits — disconnected: 3 qubits cannot reach the largest "
                      "component\n"),
            std::string::npos)
      << text;
  EXPECT_NE(text.find("3 within a component"), std::string::npos) << text;
}

TEST(DeviceSummary, CountsAreSingularForOne) {
  // "1 qubit", not "1 qubits" (English grammar, common practice).
  const auto text = [](const std::string& yaml) {
    return format_summary(summarize(parse_device_yaml(yaml, "s.yaml")));
  };
  EXPECT_NE(
      text("name: dust\nqubits: 3\ncouplers: []\n")
          .find("components      3, largest 1 qubit — disconnected: 2 qubits cannot reach the largest component\n"),
      std::string::npos)
      << text("name: dust\nqubits: 3\ncouplers: []\n");
  EXPECT_NE(
      text("name: pair\nqubits: 2\ncouplers: []\n")
          .find("components      2, largest 1 qubit — disconnected: 1 qubit cannot reach the largest component\n"),
      std::string::npos);
}

TEST(DeviceSummary, InfiniteLifetimesAreShownAsSuch) {
  // T1 and T2 default to infinite (README "Device files"), and .inf says the same explicitly.
  const auto s =
      summarize(parse_device_yaml("name: t\nqubits: 2\ncouplers: [[0, 1]]\ncalibration: {error_2q: 0.01, t1_us: .inf}\n"
                                  "qubit_calibration: [{id: 1, t2_us: 50}]\n",
                                  "t.yaml"));
  const std::string text = format_summary(s);
  EXPECT_NE(text.find("T2 (us)         50 .. infinite\n"), std::string::npos) << text;
  EXPECT_NE(text.find("T1 (us)         infinite\n"), std::string::npos) << text;
}

TEST(DeviceSummary, OddRingIsNotBipartite) {
  EXPECT_FALSE(summarize(make_ring(7)).bipartite);  // an odd cycle (Diestel, Graph Theory, Prop. 1.6.1)
  EXPECT_TRUE(summarize(make_ring(8)).bipartite);
  EXPECT_TRUE(summarize(make_heavy_hex(2, 3)).bipartite);
}

TEST(DeviceSummary, CalibrationRanges) {
  const auto s = summarize(load_device((source_dir() / "topologies" / "harbor-noisy-20.yaml").string()));
  ASSERT_TRUE(s.calibrated);
  EXPECT_EQ(s.error_2q.max, 0.071);  // the worst coupler named in the file's header comment
  EXPECT_EQ(s.t1_us.min, 15);        // the shortest-lived qubit named there
  EXPECT_EQ(s.duration_2q_ns.min, 300);
  const std::string text = format_summary(s);
  EXPECT_NE(text.find("error 2q        0.0051 .. 0.071\n"), std::string::npos) << text;
}

/// A random graph with n qubits where each pair is coupled with probability p.
Device random_device(int n, double p, unsigned seed) {
  std::mt19937 rng(seed);
  std::bernoulli_distribution coin(p);
  DeviceDescription d;
  d.name = "random";
  d.qubits = n;
  for (int a = 0; a < n; ++a)
    for (int b = a + 1; b < n; ++b)
      if (coin(rng)) {
        Coupler c;
        c.a = a;
        c.b = b;
        d.couplers.push_back(c);
      }
  return Device(std::move(d));
}

TEST(DeviceSummary, ExactDiameterMatchesAllPairsSearch) {
  // Sparse and dense random graphs, each against Device::diameter() (a plain search from every qubit).
  for (unsigned seed = 1; seed <= 4; ++seed) {
    const Device sparse = random_device(150, 0.02, seed);
    EXPECT_EQ(summarize(sparse).diameter, sparse.diameter());
    const Device dense = random_device(200, 0.08 + 0.05 * seed, seed);
    EXPECT_EQ(summarize(dense).diameter, dense.diameter());
  }
  EXPECT_EQ(summarize(make_full(300)).diameter, 1);
}

TEST(DeviceSummary, LargeDevicesUseTheDoubleSweepBound) {
  // Above 5000 qubits the diameter is the double-sweep lower bound, marked "≥". For a grid, the
  // first sweep from corner 0 ends at the opposite corner, so the bound is the exact 99 + 99.
  const auto s = summarize(make_grid(100, 100));
  EXPECT_EQ(s.diameter, 198);
  EXPECT_NE(format_summary(s).find("diameter        ≥ 198"), std::string::npos) << format_summary(s);
  // A ~20k-qubit heavy-hex lattice is summarized (bench/ times it; no test depends on the machine's speed).
  const auto big = summarize(make_heavy_hex(62, 62));
  EXPECT_EQ(big.qubits, 5 * 62 * 62 + 4 * 62 + 4 * 62 - 1);
  EXPECT_GT(big.diameter, 0);
}

TEST(DeviceCheck, LatticesAreSane) {
  for (const char* spec : {"line:1", "line:9", "ring:12", "grid:5x7", "heavy-hex:3x2", "full:12"})
    EXPECT_EQ(check_device(make_lattice(spec)), std::vector<std::string>{}) << spec;
}

TEST(DeviceCheck, FindsImplausibleCalibrationAndClashingPositions) {
  // T2 <= 2 T1 holds for any qubit (1/T2 = 1/(2 T1) + 1/T_phi); from memory: P. Krantz et al., "A quantum
  // engineer's guide to superconducting qubits", Appl. Phys. Rev. 6, 021318 (2019), sec. on decoherence.
  // Such a device is refused when built (the file's position in DeviceYaml tests), from a file or not.
  EXPECT_THROW(parse_device_yaml("name: odd\nqubits: 3\ncouplers: [[0, 1]]\ncalibration: {t1_us: 50, t2_us: 120}\n",
                                 "odd.yaml"),
               InputError);
  DeviceDescription impossible = make_line(3).description();
  impossible.qubit_calibration.push_back({1, {}, {}, {}, 10.0, 20.5});
  EXPECT_THROW(Device{impossible}, InputError);
  impossible.qubit_calibration.back().t2_us = 20.0;  // T2 = 2 T1 exactly: pure amplitude damping
  EXPECT_NO_THROW(Device{impossible});
  const Device d = parse_device_yaml(
      "name: odd\nqubits: 3\ncouplers: [[0, 1]]\npositions: [{id: 0, at: [1, 1]}, {id: 2, at: [1, 1]}]\n", "odd.yaml");
  const auto problems = check_device(d);
  EXPECT_NE(std::find(problems.begin(), problems.end(), "qubits 0 and 2 are drawn at the same position (1, 1)"),
            problems.end());
  // The same message for thousands of qubits is cut short.
  std::string all_at_once = "name: many\nqubits: 100\ncouplers: []\npositions:\n";
  for (int q = 0; q < 100; ++q) all_at_once += fmt::format("  - {{id: {}, at: [0, 0]}}\n", q);
  const auto cut = check_device(parse_device_yaml(all_at_once, "many.yaml"));
  ASSERT_EQ(cut.size(), 6u);
  EXPECT_EQ(cut.back(), "... and 94 more problems of the kind 'position clash'");
}

TEST(BundledDevices, EveryFileLoadsAndPassesTheCheck) {
  const auto files = bundled_files();
  ASSERT_GE(files.size(), 6u);
  for (const auto& f : files) {
    SCOPED_TRACE(f.string());
    const Device d = load_device(f.string());
    EXPECT_EQ(check_device(d), std::vector<std::string>{});
    // Named after the file, calibrated, drawn, and presented as the fictional lab's chip.
    EXPECT_EQ(d.name() + ".yaml", f.filename().string());
    EXPECT_EQ(d.name().rfind("harbor-", 0), 0u);
    EXPECT_TRUE(d.has_calibration());
    ASSERT_TRUE(d.has_positions());
    for (int q = 0; q < d.qubit_count(); ++q) EXPECT_TRUE(d.position(q).has_value()) << q;
    const std::string text = testing::read_file(f);
    EXPECT_EQ(text.rfind("# ", 0), 0u) << "header comment";
    EXPECT_NE(text.find("Harbor Lab"), std::string::npos);
  }
}

TEST(BundledDevices, HeaderClaimsMatchTheData) {
  // harbor-noisy-20: the poor couplers and short-lived qubits named in its header comment.
  const Device noisy = load_device((source_dir() / "topologies" / "harbor-noisy-20.yaml").string());
  std::vector<double> errors;
  for (int i = 0; i < noisy.coupler_count(); ++i) errors.push_back(noisy.coupler_calibration(i).error);
  std::sort(errors.begin(), errors.end());
  const double median = errors[errors.size() / 2];
  for (auto [a, b] : {std::pair{6, 7}, {3, 8}, {12, 17}}) EXPECT_GE(noisy.coupler_calibration(a, b).error, 5 * median);
  int poor = 0;
  for (double e : errors) poor += e >= 5 * median;
  EXPECT_EQ(poor, 3);
  for (int q = 0; q < noisy.qubit_count(); ++q)
    EXPECT_EQ(noisy.qubit_calibration(q).t1_us < 30, q == 5 || q == 11 || q == 18) << q;

  // harbor-grid-6x6-defect: dead qubits 14 and 27 keep their ids but have no couplers.
  const Device defect = load_device((source_dir() / "topologies" / "harbor-grid-6x6-defect.yaml").string());
  EXPECT_EQ(defect.qubit_count(), 36);
  EXPECT_EQ(defect.degree(14), 0);
  EXPECT_EQ(defect.degree(27), 0);
  EXPECT_FALSE(defect.coupled(3, 4));
  EXPECT_FALSE(defect.coupled(31, 32));
  EXPECT_EQ(defect.coupler_count(), 60 - 8 - 2);  // full 6x6 grid minus 4+4 at the dead qubits, minus 2
  const auto s = summarize(defect);
  EXPECT_EQ(s.components, 3);
  EXPECT_EQ(s.largest_component, 34);
  EXPECT_NE(format_summary(s).find("disconnected"), std::string::npos);

  // The heavy-hexagon chips share the built-in lattices' graphs.
  const Device hex = load_device((source_dir() / "topologies" / "harbor-hex-35.yaml").string());
  const Device lattice = make_heavy_hex(2, 2);
  ASSERT_EQ(hex.coupler_count(), lattice.coupler_count());
  for (const auto& c : lattice.couplers()) EXPECT_TRUE(hex.coupled(c.a, c.b)) << c.a << "-" << c.b;
  EXPECT_EQ(hex.description().positions, lattice.description().positions);
}

}  // namespace
}  // namespace qftplan
