// Calibration profiles (issue 18, item 6): a small YAML file of device-wide calibration values applied to
// any device, built-in lattices included (--calibration FILE).

#include <gtest/gtest.h>

#include <cmath>
#include <map>

#include "qftplan/core/input_error.hpp"
#include "qftplan/device/calibration_profile.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/device/device_yaml.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_program.hpp"
#include "qftplan/survey/survey_request.hpp"
#include "plan_simulation.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

std::string profile_path() { return (testing::source_dir() / "topologies" / "profiles" / "harbor-typical.yaml").string(); }

std::string message_of(const std::string& text) {
  try {
    parse_calibration_profile(text, "p.yaml");
  } catch (const InputError& e) {
    return e.what();
  }
  return "(accepted)";
}

TEST(CalibrationProfile, ParsesTheBundledProfile) {
  const CalibrationProfile p = load_calibration_profile(profile_path());
  EXPECT_EQ(p.values.error_1q, 0.0003);
  EXPECT_EQ(p.values.error_2q, 0.008);
  EXPECT_EQ(p.values.error_readout, 0.02);
  EXPECT_EQ(p.values.duration_1q_ns, 35);
  EXPECT_EQ(p.values.duration_2q_ns, 300);
  EXPECT_EQ(p.values.t1_us, 110);
  EXPECT_EQ(p.values.t2_us, 90);
}

TEST(CalibrationProfile, ErrorsNameFileLineAndColumn) {
  EXPECT_EQ(message_of("error_2q: 0.01\neror_1q: 0.001\n"),
            "p.yaml:2:1: unknown key 'eror_1q' in calibration profile; did you mean 'error_1q'?");
  EXPECT_EQ(message_of("error_1q: 0.001\nerror_2q: 1.5\n"), "p.yaml:2:11: 'error_2q' must be a probability in [0, 1], got 1.5");
  EXPECT_EQ(message_of("duration_2q_ns: -3\n"),
            "p.yaml:1:17: 'duration_2q_ns' must be a positive number of ns, at most 1e9 (one second), got -3");
  EXPECT_EQ(message_of("t1_us: abc\n"), "p.yaml:1:8: 't1_us' must be a number, got 'abc'");
  EXPECT_EQ(message_of("error_2q: 0.01\nerror_2q: 0.02\n"),
            "p.yaml:2:1: key 'error_2q' appears twice in calibration profile (first on line 1)");
  EXPECT_EQ(message_of("- 0.01\n"),
            "p.yaml:1:1: expected a calibration profile (a mapping of calibration values such as {error_2q: 0.008}), "
            "found a sequence");
  EXPECT_EQ(message_of("{}\n"),
            "p.yaml:1:1: the calibration profile sets nothing; give at least one of error_1q, error_2q, error_readout, "
            "duration_1q_ns, duration_2q_ns, t1_us, t2_us, duration_readout_ns, feed_forward_ns");
  EXPECT_EQ(message_of(""), "p.yaml: the file is empty; expected a calibration profile such as {error_2q: 0.008}");
  EXPECT_EQ(message_of("error_2q: [0.01\n"), message_of("error_2q: [0.01\n"));  // stable
  EXPECT_NE(message_of("error_2q: [0.01\n").find("p.yaml:"), std::string::npos);
  // T2 <= 2 T1 (pure dephasing cannot be negative): inside the profile, and on a device as applied.
  EXPECT_NE(message_of("t1_us: 10\nt2_us: 30\n").find("p.yaml:1:1: the calibration profile has t2_us 30 above"),
            std::string::npos)
      << message_of("t1_us: 10\nt2_us: 30\n");
  DeviceDescription d = make_lattice("line:3").description();
  d.calibration.t1_us = 20;
  const CalibrationProfile only_t2 = parse_calibration_profile("t2_us: 50\n", "p.yaml");
  try {
    with_calibration_profile(Device(d), only_t2);
    ADD_FAILURE() << "T2 > 2 T1 accepted";
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()).rfind("p.yaml: applied to line:3: qubit 0 has t2_us 50 above 2 x t1_us = 40", 0), 0u)
        << e.what();
  }
  // The command line: one line, exit 2, no output.
  const auto dir = testing::temp_dir();
  testing::write_file(dir / "bad.yaml", "error_1q: 0.001\nerror_2q: 2\n");
  const auto r = testing::run_qftplan("plan --device grid:3x3 -n 4 --calibration '" + (dir / "bad.yaml").string() + "'");
  EXPECT_EQ(r.status, 2);
  EXPECT_EQ(r.out, "");
  EXPECT_EQ(r.err, "qftplan: " + (dir / "bad.yaml").string() + ":2:11: 'error_2q' must be a probability in [0, 1], got 2\n");
}

TEST(CalibrationProfile, ValuesHoldOnEveryPartAndTheRestIsKept) {
  // harbor-noisy-20 carries per-qubit and per-coupler values; a profile of error_2q and t1_us replaces
  // those two quantities everywhere and leaves the others (error_1q, T2 ...) as the file has them.
  const Device noisy = load_device((testing::source_dir() / "topologies" / "harbor-noisy-20.yaml").string());
  const CalibrationProfile p = parse_calibration_profile("error_2q: 0.005\nt1_us: 400\n", "p.yaml");
  const Device dev = with_calibration_profile(noisy, p);
  for (int c = 0; c < dev.coupler_count(); ++c) EXPECT_EQ(dev.coupler_calibration(c).error, 0.005);
  for (int c = 0; c < dev.coupler_count(); ++c)
    EXPECT_EQ(dev.coupler_calibration(c).duration_ns, noisy.coupler_calibration(c).duration_ns);
  for (int q = 0; q < dev.qubit_count(); ++q) {
    EXPECT_EQ(dev.qubit_calibration(q).t1_us, 400);
    EXPECT_EQ(dev.qubit_calibration(q).t2_us, noisy.qubit_calibration(q).t2_us);
    EXPECT_EQ(dev.qubit_calibration(q).error_1q, noisy.qubit_calibration(q).error_1q);
  }
  EXPECT_EQ(dev.name(), noisy.name());
  // Parts out of service stay out of service.
  DeviceDescription d = make_lattice("line:4").description();
  d.couplers[1].disabled = true;
  const Device applied = with_calibration_profile(Device(d), load_calibration_profile(profile_path()));
  EXPECT_FALSE(applied.coupled(1, 2));
  EXPECT_TRUE(applied.description().couplers[1].disabled);
  // The applied device round-trips like any other.
  EXPECT_EQ(parse_device_yaml(device_to_yaml(applied), "a.yaml"), applied);
}

// The gates of a written file by name.
std::map<std::string, long long> count_gates(const QasmProgram& program) {
  std::map<std::string, long long> n;
  for (const Gate& g : program.gates) ++n[std::string(gate_name(g.kind))];
  return n;
}

TEST(CalibrationProfile, LatticeEspIsTheTextbookProduct) {
  // ESP = prod (1 - e) over the gates of the native circuit, virtual Z gates error-free (common practice;
  // README "What the numbers mean"). With one error_1q and one error_2q on every part it is
  // (1 - e2)^(two-qubit gates) (1 - e1)^(h, x, sx gates), counted here from the written file. The
  // parity network on a line needs N^2 - 1 CX for the exact QFT (README "Chain networks").
  const double e1 = 0.0007, e2 = 0.011;
  const auto dir = testing::temp_dir();
  testing::write_file(dir / "p.yaml", "error_1q: 0.0007\nerror_2q: 0.011\n");
  const CalibrationProfile p = load_calibration_profile((dir / "p.yaml").string());
  for (int n : {3, 5, 8, 12}) {
    const Device dev = with_calibration_profile(make_lattice("line:" + std::to_string(n)), p);
    PlanOptions opt;
    opt.spec.qubits = n;
    opt.strategy = "chain";
    opt.network = NetworkChoice::parity;
    const testing::WrittenPlan w = testing::write_and_read(dev, opt);
    const auto counts = count_gates(w.program);
    const long long two = counts.count("cx") ? counts.at("cx") : 0;
    long long one = 0;
    for (const char* k : {"h", "x", "sx"}) one += counts.count(k) ? counts.at(k) : 0;
    EXPECT_EQ(two, static_cast<long long>(n) * n - 1) << n;
    const double expected = std::pow(1 - e2, static_cast<double>(n) * n - 1) * std::pow(1 - e1, static_cast<double>(one));
    ASSERT_TRUE(w.report.calibrated);
    EXPECT_NEAR(w.report.noise.esp, expected, 1e-12 * expected) << n;
    // Without the profile the lattice has no calibration at all.
    EXPECT_FALSE(testing::write_and_read(make_lattice("line:" + std::to_string(n)), opt).report.calibrated);
  }
}

TEST(CalibrationProfile, LoadDeviceAppliesIt) {
  const Device plain = load_device("heavy-hex:1x2");
  const Device cal = load_device("heavy-hex:1x2", profile_path());
  EXPECT_FALSE(plain.has_calibration());
  EXPECT_TRUE(cal.has_calibration());
  EXPECT_EQ(cal.coupler_calibration(0).error, 0.008);
  EXPECT_EQ(cal.qubit_calibration(3).t2_us, 90);
  EXPECT_EQ(load_device("heavy-hex:1x2", std::string()), plain);  // empty: none
}

TEST(CalibrationProfile, SurveysOfLatticeFamiliesHaveEsp) {
  const std::string args = "survey 'grid:*' 'heavy-hex:*' grid:3x4 -n 4,8 --csv - --no-progress";
  const auto without = testing::run_qftplan(args);
  const auto with = testing::run_qftplan(args + " --calibration '" + profile_path() + "'");
  ASSERT_EQ(without.status, 0) << without.err;
  ASSERT_EQ(with.status, 0) << with.err;
  // The esp column: empty without calibration, a number in (0, 1) with the profile, on every row.
  auto esp_column = [](const std::string& csv) {
    std::vector<std::string> lines;
    std::size_t i = 0;
    while (i < csv.size()) {
      const std::size_t j = csv.find('\n', i);
      lines.push_back(csv.substr(i, j - i));
      i = j + 1;
    }
    auto fields = [](const std::string& line) {
      std::vector<std::string> f;
      std::size_t a = 0;
      while (true) {
        const std::size_t b = line.find(',', a);
        f.push_back(line.substr(a, b == std::string::npos ? std::string::npos : b - a));
        if (b == std::string::npos) break;
        a = b + 1;
      }
      return f;
    };
    const auto head = fields(lines.at(0));
    const auto col = std::find(head.begin(), head.end(), "esp") - head.begin();
    std::vector<std::string> out;
    for (std::size_t k = 1; k < lines.size(); ++k) out.push_back(fields(lines[k]).at(static_cast<std::size_t>(col)));
    return out;
  };
  const auto a = esp_column(without.out), b = esp_column(with.out);
  ASSERT_EQ(a.size(), 6u);
  ASSERT_EQ(b.size(), 6u);
  for (const auto& v : a) EXPECT_EQ(v, "");
  for (const auto& v : b) {
    const double esp = std::stod(v);
    EXPECT_GT(esp, 0);
    EXPECT_LT(esp, 1);
  }
  // Shards of differently calibrated surveys do not merge: the fingerprint covers the profile's values.
  SurveyRequest r;
  r.devices = {make_survey_entry("grid:*")};
  r.sizes = {4};
  const std::string plain = survey_fingerprint(r);
  r.calibration = load_calibration_profile(profile_path());
  EXPECT_NE(survey_fingerprint(r), plain);
}

}  // namespace
}  // namespace qftplan
