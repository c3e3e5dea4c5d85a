// The semi-classical readout (issue 20): device keys, the recipe of Griffiths and Niu, the noise model
// of a dynamic circuit, OpenQASM 2 and 3 text read back, the readout choice and the checker with
// mutated files.

#include <gtest/gtest.h>

#include <cmath>
#include <string>
#include <vector>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/core/atomic_file.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/device/calibration_profile.hpp"
#include "qftplan/device/device_yaml.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_program.hpp"
#include "qftplan/qasm/qasm_writer.hpp"
#include "qftplan/report/circuit_header.hpp"

namespace qftplan {
namespace {

// A line of `n` qubits with uniform calibration and, unless `ff_ns` < 0, feed-forward.
std::string line_yaml(int n, double ff_ns, double ro_ns = 800) {
  std::string y = "name: dyn\nqubits: " + std::to_string(n) +
                  "\ncalibration:\n  error_1q: 0.001\n  error_2q: 0.01\n  error_readout: 0.02\n  duration_1q_ns: 40\n"
                  "  duration_2q_ns: 300\n  t1_us: 100\n  t2_us: 80\n  duration_readout_ns: " +
                  std::to_string(ro_ns) + "\n";
  if (ff_ns >= 0) y += "  feed_forward_ns: " + std::to_string(ff_ns) + "\n";
  y += "couplers:\n";
  for (int q = 0; q + 1 < n; ++q) y += "  - [" + std::to_string(q) + ", " + std::to_string(q + 1) + "]\n";
  return y;
}

PlanOptions measured(int n, bool inverse, const std::string& readout, std::optional<int> degree = std::nullopt) {
  PlanSettings s;
  s.qubits = n;
  s.inverse = inverse;
  s.measure = true;
  s.readout = readout;
  s.approx = degree ? std::to_string(*degree) : "none";
  return plan_options(s);
}

struct Written {
  std::string text;
  PreparedPlan plan;
  PlanReport report;
};

Written write(const Device& dev, const PlanOptions& opt, QasmVersion v = QasmVersion::v3) {
  Written w{{}, prepare_plan(dev, opt), {}};
  StringOutput out;
  PlanOptions o = opt;
  o.format = v;
  QasmWriter writer(v, circuit_header(dev, o, w.plan), out);
  w.report = execute_plan(dev, o, w.plan, &writer);
  writer.finish();
  w.text = out.text();
  return w;
}

CheckResult check_text(const Device& dev, const std::string& text, const QftSpec& spec) {
  const QasmProgram prog = parse_qasm(text, "sc.qasm");
  CheckRequest req;
  req.spec = spec;
  req.placement = *prog.placement;
  req.final_placement = *prog.final_placement;
  return check_qft_circuit(dev, prog, req);
}

// ----- device keys -----

TEST(Semiclassical, DeviceKeysDeviceWideAndPerQubitRoundTrip) {
  std::string y = line_yaml(3, 500, 900) + "qubit_calibration:\n  - {id: 1, duration_readout_ns: 1500, feed_forward_ns: 250}\n";
  const Device d = parse_device_yaml(y, "dyn.yaml");
  EXPECT_EQ(d.qubit_calibration(0).duration_readout_ns, 900);
  EXPECT_EQ(d.qubit_calibration(0).feed_forward_ns, 500);
  EXPECT_EQ(d.qubit_calibration(1).duration_readout_ns, 1500);
  EXPECT_EQ(d.qubit_calibration(1).feed_forward_ns, 250);
  EXPECT_EQ(parse_device_yaml(device_to_yaml(d), "again.yaml"), d);
  // No feed_forward_ns: none offered; no duration_readout_ns: the stated default.
  const Device none = parse_device_yaml("name: x\nqubits: 2\ncouplers: [[0, 1]]\n", "x.yaml");
  EXPECT_FALSE(none.qubit_calibration(0).feed_forward_ns);
  EXPECT_EQ(none.qubit_calibration(0).duration_readout_ns, kDefaultDurationReadoutNs);
  try {
    std::string neg = line_yaml(3, 500);
    neg.replace(neg.find("feed_forward_ns: 500"), 20, "feed_forward_ns: -5");
    parse_device_yaml(neg, "neg.yaml");
    FAIL() << "a negative latency was accepted";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("'feed_forward_ns' must be a positive number of ns"), std::string::npos) << e.what();
  }
}

TEST(Semiclassical, CalibrationProfileGivesALatticeFeedForward) {
  // A built-in lattice has no calibration; a profile with the two keys makes it offer feed-forward.
  const Device plain = make_lattice("line:4");
  const Device dyn = with_calibration_profile(
      plain, parse_calibration_profile("feed_forward_ns: 250\nduration_readout_ns: 600\n", "p.yaml"));
  EXPECT_EQ(dyn.qubit_calibration(2).feed_forward_ns, 250);
  EXPECT_EQ(dyn.qubit_calibration(2).duration_readout_ns, 600);
  EXPECT_THROW(prepare_plan(plain, measured(3, true, "semiclassical")), PlanningError);
  EXPECT_EQ(prepare_plan(dyn, measured(3, true, "semiclassical")).strategy, "semiclassical");
}

// ----- the recipe -----

// Griffiths and Niu (PRL 76, 3228, 1996), as Nielsen and Chuang write the measured inverse QFT of
// phase estimation (section 5.2; from memory): the qubit
// holding the lowest phase digit (input bit n-1) is turned and measured first, giving output bit 0;
// each later qubit first undoes the phases pi/2^(k-m) that earlier outcomes c[m] predict (minus for
// the inverse), then is turned and measured. Built here from the recipe alone and compared gate by gate.
std::vector<Gate> recipe(int n, bool inverse, int keep, const std::vector<int>& placement) {
  std::vector<Gate> g;
  for (int k = 0; k < n; ++k) {
    const int q = placement[n - 1 - k];
    for (int m = 0; m < k; ++m)
      if (k - m < keep) g.push_back(Gate{GateKind::p_if, q, m, Angle(inverse ? -1 : 1, static_cast<std::uint32_t>(k - m))});
    g.push_back(Gate{GateKind::h, q, -1, Angle{}});
    g.push_back(Gate{GateKind::measure, q, k, Angle{}});
  }
  return g;
}

TEST(Semiclassical, EmitsTheRecipeOfGriffithsAndNiu) {
  const Device dev = parse_device_yaml(line_yaml(7, 300), "dyn.yaml");
  for (bool inverse : {true, false})
    for (std::optional<int> degree : {std::optional<int>{}, std::optional<int>{1}, std::optional<int>{3}}) {
      const PreparedPlan p = prepare_plan(dev, measured(6, inverse, "semiclassical", degree));
      ASSERT_EQ(p.strategy, "semiclassical");
      VectorSink v;
      p.circuit->emit(v);
      EXPECT_EQ(v.gates, recipe(6, inverse, degree.value_or(6), p.maps.placement)) << inverse << " " << degree.value_or(0);
      // Output bit k is read from the qubit of input bit n-1-k.
      for (int k = 0; k < 6; ++k) EXPECT_EQ(p.maps.final_placement[k], p.maps.placement[5 - k]);
    }
}

// ----- the noise model of a dynamic circuit -----

TEST(Semiclassical, EspTotalByHandOnThreeQubits) {
  const double d1 = 40, ro = 800, ff = 300, t1 = 100, t2 = 80;
  const Device dev = parse_device_yaml(line_yaml(3, ff, ro), "dyn.yaml");
  const PlanReport r = plan_qft(dev, measured(3, true, "semiclassical"));
  // Round k starts when c[k-1] is known: k (d1 + ro + ff) after the start. The qubit of round k holds
  // its input from time 0, so it idles that long (one interval), then h (error_1q) and readout.
  // Idle channel: F(t) = (1 + e^(-t/T1) + 2 e^(-t/T2)) / 4 (Ghosh, Fowler, Geller, PRA 86, 062318, 2012).
  const auto F = [&](double t) { return (1 + std::exp(-t / (1000 * t1)) + 2 * std::exp(-t / (1000 * t2))) / 4; };
  const double step = d1 + ro + ff;
  const double idle = F(step) * F(2 * step);
  EXPECT_NEAR(r.noise.esp, std::pow(1 - 0.001, 3), 1e-12);
  EXPECT_NEAR(r.noise.esp_readout, std::pow(1 - 0.02, 3), 1e-12);
  EXPECT_NEAR(r.noise.esp_idle, idle, 1e-12);
  EXPECT_NEAR(r.noise.esp_total, std::pow(0.999, 3) * std::pow(0.98, 3) * idle, 1e-12);
  // The last measurement starts after two full rounds and one h (its own readout, as the unitary
  // plans' final readout, is not scheduled).
  EXPECT_NEAR(r.noise.duration_ns, 2 * step + d1, 1e-9);
  EXPECT_NEAR(r.noise.idle_ns, 3 * step, 1e-9);
  EXPECT_EQ(r.cx_count, 0);
}

// ----- text read back -----

TEST(Semiclassical, OpenQasm3And2ReadBack) {
  const Device dev = parse_device_yaml(line_yaml(5, 300), "dyn.yaml");
  for (QasmVersion v : {QasmVersion::v3, QasmVersion::v2}) {
    const Written w = write(dev, measured(4, true, "semiclassical"), v);
    VectorSink emitted;
    w.plan.circuit->emit(emitted);
    const QasmProgram prog = parse_qasm(w.text, "sc.qasm");
    EXPECT_EQ(prog.gates, emitted.gates) << w.text;
    if (v == QasmVersion::v3) {
      // OpenQASM 3 specification: `bit[n] c;`, `c[k] = measure $q;`, `if (c[j]) statement`.
      EXPECT_NE(w.text.find("bit[4] c;\n"), std::string::npos);
      EXPECT_NE(w.text.find("if (c[0]) p(-pi/2) $"), std::string::npos) << w.text;
      EXPECT_NE(w.text.find("c[3] = measure $"), std::string::npos);
    } else {
      // OpenQASM 2 (Cross et al., arXiv:1707.03429, section 3): `if(creg==int) qop;` tests a whole
      // register, so each bit is a register of its own.
      EXPECT_NE(w.text.find("creg c0[1];\ncreg c1[1];\ncreg c2[1];\ncreg c3[1];\n"), std::string::npos) << w.text;
      EXPECT_NE(w.text.find("if(c0==1) u1(-pi/2) q["), std::string::npos) << w.text;
      EXPECT_NE(w.text.find("] -> c3[0];"), std::string::npos);
    }
    EXPECT_TRUE(check_text(dev, w.text, w.plan.spec).ok);
  }
}

TEST(Semiclassical, ReaderRefusesConditionedGatesOtherThanPhases) {
  const std::string head = "OPENQASM 3.0;\ninclude \"stdgates.inc\";\nbit[2] c;\nc[0] = measure $0;\n";
  try {
    parse_qasm(head + "if (c[0]) h $1;\n", "bad.qasm");
    FAIL();
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("only a phase gate (p, u1) can be conditioned on a bit, not h"), std::string::npos)
        << e.what();
  }
  EXPECT_THROW(parse_qasm(head + "if (c) p(pi/2) $1;\n", "bad.qasm"), InputError);       // two bits
  EXPECT_THROW(parse_qasm(head + "if (c[0] == 0) p(pi/2) $1;\n", "bad.qasm"), InputError);  // only == 1
  const QasmProgram ok = parse_qasm(head + "if (c[1] == 1) p(pi/2) $1;\n", "ok.qasm");
  EXPECT_EQ(ok.gates.back(), (Gate{GateKind::p_if, 1, 1, Angle(1, 1)}));
}

// ----- the readout choice -----

TEST(Semiclassical, ReadoutSettingsAndRefusals) {
  PlanSettings s;
  s.qubits = 3;
  s.readout = "semiclassical";
  try {
    plan_options(s);
    FAIL();
  } catch (const SettingError& e) {
    EXPECT_EQ(e.setting(), "readout");
    EXPECT_NE(std::string(e.what()).find("needs a measured plan (--measure)"), std::string::npos);
  }
  s.measure = true;
  s.readout = "both";
  EXPECT_THROW(plan_options(s), SettingError);
  // No feed-forward: semiclassical is refused, auto is the unitary plan.
  const Device plain = parse_device_yaml(line_yaml(4, -1), "plain.yaml");
  try {
    prepare_plan(plain, measured(3, true, "semiclassical"));
    FAIL();
  } catch (const PlanningError& e) {
    EXPECT_NE(std::string(e.what()).find("offers no feed-forward"), std::string::npos) << e.what();
  }
  const PlanReport a = plan_qft(plain, measured(3, true, "auto"));
  const PlanReport u = plan_qft(plain, measured(3, true, "unitary"));
  EXPECT_EQ(a.readout->chosen, "unitary");
  EXPECT_EQ(a.noise.log_esp_total, u.noise.log_esp_total);
  EXPECT_FALSE(a.readout->semiclassical_log_esp_total);
}

TEST(Semiclassical, AutoTakesTheHigherEspTotalOfBothPinned) {
  // Short latency: the semi-classical form wins; a very long one: the unitary form.
  for (double ff : {200.0, 40000.0}) {
    const Device dev = parse_device_yaml(line_yaml(6, ff), "dyn.yaml");
    const PlanReport a = plan_qft(dev, measured(6, true, "auto"));
    const PlanReport u = plan_qft(dev, measured(6, true, "unitary"));
    const PlanReport s = plan_qft(dev, measured(6, true, "semiclassical"));
    const bool semi = s.noise.log_esp_total > u.noise.log_esp_total;
    EXPECT_EQ(semi, ff < 1000) << ff;
    EXPECT_EQ(a.readout->chosen, semi ? "semiclassical" : "unitary");
    EXPECT_DOUBLE_EQ(a.noise.log_esp_total, std::max(s.noise.log_esp_total, u.noise.log_esp_total));
    EXPECT_DOUBLE_EQ(*a.readout->unitary_log_esp_total, u.noise.log_esp_total);
    EXPECT_DOUBLE_EQ(*a.readout->semiclassical_log_esp_total, s.noise.log_esp_total);
  }
}

TEST(Semiclassical, PlacementPrefersGoodReadoutAndLongLives) {
  // Qubit 1 reads out badly and qubit 3 lives briefly: a 3-qubit register avoids both, and the
  // longest-lived qubit (4) waits longest (input bit 0, processed last).
  std::string y = line_yaml(5, 300) +
                  "qubit_calibration:\n  - {id: 1, error_readout: 0.2}\n  - {id: 3, t1_us: 10, t2_us: 8}\n"
                  "  - {id: 4, t1_us: 300, t2_us: 400}\n";
  const Device dev = parse_device_yaml(y, "dyn.yaml");
  const PreparedPlan p = prepare_plan(dev, measured(3, true, "semiclassical"));
  EXPECT_EQ(p.maps.placement, (std::vector<int>{4, 0, 2}));
}

// ----- the checker -----

TEST(Semiclassical, CheckerProvesPlansSmallAndLarge) {
  const Device dev = parse_device_yaml(line_yaml(40, 300), "dyn.yaml");
  for (int n : {1, 2, 5, 8, 40})
    for (bool inverse : {true, false})
      for (std::optional<int> degree : {std::optional<int>{}, std::optional<int>{2}}) {
        const Written w = write(dev, measured(n, inverse, "semiclassical", degree));
        const CheckResult r = check_text(dev, w.text, w.plan.spec);
        EXPECT_TRUE(r.ok) << n << " " << r.message;
        EXPECT_EQ(r.simulated, n <= 10) << r.message;
      }
}

// Replaces the first occurrence of `from` in `text` by `to` (which must occur).
std::string mutate(std::string text, const std::string& from, const std::string& to) {
  const auto at = text.find(from);
  EXPECT_NE(at, std::string::npos) << from;
  if (at != std::string::npos) text.replace(at, from.size(), to);
  return text;
}

// Moves the line containing `what` to just after the line containing `after`.
std::string move_line(const std::string& text, const std::string& what, const std::string& after) {
  std::vector<std::string> lines;
  std::size_t i = 0;
  while (i < text.size()) {
    const auto j = text.find('\n', i);
    lines.push_back(text.substr(i, j - i + 1));
    i = j + 1;
  }
  std::size_t from = 0, to = 0;
  for (std::size_t k = 0; k < lines.size(); ++k) {
    if (lines[k].find(what) != std::string::npos && !from) from = k;
    if (lines[k].find(after) != std::string::npos && !to) to = k;
  }
  EXPECT_TRUE(from && to);
  std::string line = lines[from];
  lines.erase(lines.begin() + static_cast<long>(from));
  if (to > from) --to;
  lines.insert(lines.begin() + static_cast<long>(to) + 1, line);
  std::string out;
  for (const auto& l : lines) out += l;
  return out;
}

TEST(Semiclassical, CheckerRejectsMutatedFiles) {
  const Device dev = parse_device_yaml(line_yaml(20, 300), "dyn.yaml");
  // n = 5 (simulated too) and n = 20 (beyond any simulation: the structural proof alone).
  for (int n : {5, 20}) {
    const Written w = write(dev, measured(n, true, "semiclassical"));
    const QftSpec spec = w.plan.spec;
    ASSERT_TRUE(check_text(dev, w.text, spec).ok);
    const auto wrong = [&](const std::string& text, const std::string& why) {
      const CheckResult r = check_text(dev, text, spec);
      EXPECT_EQ(r.outcome, CheckOutcome::wrong) << why << ": " << r.message;
    };
    // A wrong correction angle.
    wrong(mutate(w.text, "if (c[1]) p(-pi/2**2)", "if (c[1]) p(-pi/2**3)"), "angle");
    wrong(mutate(w.text, "if (c[0]) p(-pi/2)", "if (c[0]) p(pi/2)"), "sign");
    // A correction conditioned on the wrong bit.
    wrong(mutate(w.text, "if (c[1]) p(-pi/2**2)", "if (c[0]) p(-pi/2**2)"), "bit");
    // A correction dropped.
    wrong(mutate(w.text, "if (c[2]) p(-pi/2)", "// dropped"), "missing");
    // A measurement moved: after a correction that reads it, or before its own h.
    wrong(move_line(w.text, "c[1] = measure", "if (c[1])"), "measurement after its reader");
    wrong(move_line(w.text, "c[2] = measure", "c[0] = measure"), "measurement before its h");
    // Bits swapped between two measurements.
    wrong(mutate(mutate(mutate(w.text, "c[3] = measure", "c[@] = measure"), "c[4] = measure", "c[3] = measure"),
                 "c[@] = measure", "c[4] = measure"),
          "bits");
  }
  // A gate the structural proof does not follow (an x on a qubit about to be measured): the branch
  // simulation decides.
  const Written w = write(dev, measured(4, true, "semiclassical"));
  const auto at = w.text.find("c[1] = measure ") + 15;
  const std::string q = w.text.substr(at, w.text.find(';', at) - at);
  const CheckResult r = check_text(dev, mutate(w.text, "c[1] = measure", "x " + q + ";\nc[1] = measure"), w.plan.spec);
  EXPECT_EQ(r.outcome, CheckOutcome::wrong) << r.message;
  EXPECT_NE(r.message.find("outcome"), std::string::npos) << r.message;
}

TEST(Semiclassical, LargerRegistersAreSimulatedWithTheMeasurementsDeferred) {
  // 13 qubits: beyond the branch walk, within the checker's simulation limit (16): one state vector with
  // each conditioned phase as the controlled phase with the measured qubit (Nielsen and Chuang, section
  // 4.4, the principle of deferred measurement).
  const Device dev = parse_device_yaml(line_yaml(13, 300), "dyn.yaml");
  const Written w = write(dev, measured(13, true, "semiclassical", 4));
  const CheckResult r = check_text(dev, w.text, w.plan.spec);
  EXPECT_TRUE(r.ok && r.simulated) << r.message;
  EXPECT_NE(r.message.find("simulated with the measurements deferred"), std::string::npos) << r.message;
  // An x before a measurement: the structural proof loses track, the deferred simulation refutes.
  const auto at = w.text.find("c[5] = measure ") + 15;
  const std::string q = w.text.substr(at, w.text.find(';', at) - at);
  const CheckResult bad = check_text(dev, mutate(w.text, "c[5] = measure", "x " + q + ";\nc[5] = measure"), w.plan.spec);
  EXPECT_EQ(bad.outcome, CheckOutcome::wrong) << bad.message;
}

TEST(Semiclassical, TwoQubitGatesInASemiclassicalFileAreSimulated) {
  // The measured inverse QFT on 2 qubits by hand, once right and once with a cz in front: the structural
  // proof does not follow a cz here, and the branch simulation (which must map both of its qubits) decides.
  const Device dev = make_lattice("line:2");
  const std::string body =
      "h $1;\nc[0] = measure $1;\nif (c[0]) p(-pi/2) $0;\nh $0;\nc[1] = measure $0;\n";
  const std::string head =
      "OPENQASM 3.0;\ninclude \"stdgates.inc\";\n// placement: 0,1\n// final_placement: 1,0\nbit[2] c;\n";
  const QftSpec spec{2, std::nullopt, true};
  EXPECT_TRUE(check_text(dev, head + body, spec).ok);
  const CheckResult r = check_text(dev, head + "cz $0, $1;\n" + body, spec);
  EXPECT_EQ(r.outcome, CheckOutcome::wrong) << r.message;
  // The same with the cz undone: the simulation proves what the structural proof cannot follow.
  const CheckResult twice = check_text(dev, head + "cz $0, $1;\ncz $0, $1;\n" + body, spec);
  EXPECT_TRUE(twice.ok) << twice.message;
  EXPECT_TRUE(twice.exhaustive);
}

}  // namespace
}  // namespace qftplan
