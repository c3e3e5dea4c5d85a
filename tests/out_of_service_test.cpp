// Parts out of service (issue 18, item 4): `disabled: true` on qubits and couplers, a coupler of error 1,
// and the guarantee that no strategy ever plans on them. The plans are written as OpenQASM, read back and
// checked gate by gate against the device file's disabled set, and proved by the independent checker.

#include <gtest/gtest.h>

#include <algorithm>
#include <random>
#include <set>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/device/device_check.hpp"
#include "qftplan/device/device_summary.hpp"
#include "qftplan/device/device_yaml.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_program.hpp"
#include "qftplan/svg/device_drawing.hpp"
#include "plan_simulation.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

// Every strategy of the registry (a new one is covered without touching this file).
std::vector<std::string> all_strategies() {
  std::vector<std::string> out;
  for (const auto& s : plan_strategies()) out.push_back(s.name);
  return out;
}
const std::vector<std::string> kStrategies = all_strategies();

// `base` with qubits `dead` and couplers `broken` (pairs) written `disabled: true`, everything else kept.
Device disable(const Device& base, const std::vector<int>& dead, const std::vector<std::pair<int, int>>& broken) {
  DeviceDescription d = base.description();
  for (int q : dead) {
    auto it = std::find_if(d.qubit_calibration.begin(), d.qubit_calibration.end(),
                           [q](const QubitOverride& o) { return o.id == q; });
    if (it == d.qubit_calibration.end()) {
      d.qubit_calibration.push_back({});
      it = d.qubit_calibration.end() - 1;
      it->id = q;
    }
    it->disabled = true;
  }
  for (auto& c : d.couplers)
    for (const auto& [a, b] : broken)
      if (std::minmax(a, b) == std::minmax(c.a, c.b)) c.disabled = true;
  return Device(std::move(d));
}

// What the device file says is out of service, read from the description alone (not from Device's
// graph, which is what is under test): disabled qubits, and disabled couplers or couplers of error 1
// or touching a disabled qubit.
struct FileOutOfService {
  std::set<int> qubits;
  std::set<std::pair<int, int>> couplers;
  std::set<std::pair<int, int>> in_service;
};

FileOutOfService read_out_of_service(const DeviceDescription& d) {
  FileOutOfService f;
  for (const auto& o : d.qubit_calibration)
    if (o.disabled) f.qubits.insert(o.id);
  for (const auto& c : d.couplers) {
    const double error = c.error.value_or(d.calibration.error_2q.value_or(0.0));
    const bool out = c.disabled || error >= 1.0 || f.qubits.count(c.a) || f.qubits.count(c.b);
    (out ? f.couplers : f.in_service).insert({std::min(c.a, c.b), std::max(c.a, c.b)});
  }
  return f;
}

// Plans, writes, reads back and checks that the plan avoids every part out of service; returns false
// when the strategy could not plan (PlanningError), true after a plan was checked.
bool plan_avoids(const Device& dev, const std::string& strategy, int n, std::uint64_t seed = 1) {
  PlanOptions opt;
  opt.spec.qubits = n;
  opt.strategy = strategy;
  opt.search.seed = seed;
  testing::WrittenPlan w;
  try {
    w = testing::write_and_read(dev, opt);
  } catch (const PlanningError&) {
    return false;
  }
  const FileOutOfService f = read_out_of_service(dev.description());
  const std::string what = dev.name() + " " + strategy + " n=" + std::to_string(n);
  for (int q : w.plan.maps.placement) EXPECT_FALSE(f.qubits.count(q)) << what << ": placement on " << q;
  for (int q : w.plan.maps.final_placement) EXPECT_FALSE(f.qubits.count(q)) << what << ": final placement on " << q;
  for (int q : w.report.chain) EXPECT_FALSE(f.qubits.count(q)) << what << ": chain through " << q;
  for (const Gate& g : w.program.gates) {
    EXPECT_FALSE(f.qubits.count(g.q0)) << what << ": " << gate_name(g.kind) << " on " << g.q0;
    if (!is_two_qubit(g.kind)) continue;
    EXPECT_FALSE(f.qubits.count(g.q1)) << what << ": " << gate_name(g.kind) << " on " << g.q1;
    const std::pair<int, int> pair{std::min(g.q0, g.q1), std::max(g.q0, g.q1)};
    EXPECT_TRUE(f.in_service.count(pair)) << what << ": " << gate_name(g.kind) << " on " << g.q0 << "," << g.q1;
  }
  // And it is still the QFT (the independent checker, which refuses parts out of service too).
  w.request.statevector_limit = 10;
  const CheckResult res = check_qft_circuit(dev, w.program, w.request);
  EXPECT_TRUE(res.ok) << what << ": " << res.message;
  return true;
}

TEST(OutOfService, YamlLoadsAndRoundTrips) {
  const std::string text =
      "name: harbor-test-4\n"
      "qubits: 4\n"
      "couplers:\n"
      "  - [0, 1]\n"
      "  - {pair: [1, 2], disabled: true}\n"
      "  - {pair: [2, 3], error: 0.02, disabled: false}\n"
      "qubit_calibration:\n"
      "  - {id: 3, t1_us: 50, disabled: true}\n"
      "  - {id: 0, disabled: True}\n";
  const Device d = parse_device_yaml(text, "t.yaml");
  EXPECT_TRUE(d.description().couplers[1].disabled);
  EXPECT_FALSE(d.description().couplers[2].disabled);
  EXPECT_FALSE(d.usable(0));
  EXPECT_TRUE(d.usable(1));
  EXPECT_TRUE(d.usable(2));
  EXPECT_FALSE(d.usable(3));
  // The data stays: qubit 3's T1 is kept, coupler [2, 3] keeps its error.
  EXPECT_EQ(d.qubit_calibration(3).t1_us, 50);
  EXPECT_EQ(d.coupler_calibration(2).error, 0.02);
  // Nothing is in service between 0..3: [0,1] touches qubit 0, [1,2] is disabled, [2,3] touches 3.
  EXPECT_EQ(d.usable_coupler_count(), 0);
  EXPECT_FALSE(d.coupled(0, 1));
  EXPECT_EQ(d.any_coupler_index(1, 2), 1);
  EXPECT_TRUE(check_device(d).empty());
  const std::string written = device_to_yaml(d);
  EXPECT_NE(written.find("{pair: [1, 2], disabled: true}"), std::string::npos) << written;
  EXPECT_NE(written.find("{id: 3, t1_us: 50, disabled: true}"), std::string::npos) << written;
  EXPECT_EQ(parse_device_yaml(written, "w.yaml"), d);
}

TEST(OutOfService, NonBooleanValuesGiveThePosition) {
  // YAML 1.2 core schema booleans only (YAML 1.2, section 10.3.2): yes, 1, "true" are not booleans.
  const std::pair<const char*, const char*> cases[] = {
      {"name: x\nqubits: 2\ncouplers:\n  - {pair: [0, 1], disabled: yes}\n",
       "t.yaml:4:30: 'disabled' must be true or false, got 'yes'"},
      {"name: x\nqubits: 2\ncouplers: [[0, 1]]\nqubit_calibration:\n  - {id: 1, disabled: 1}\n",
       "t.yaml:5:23: 'disabled' must be true or false, got '1'"},
      {"name: x\nqubits: 2\ncouplers: [[0, 1]]\nqubit_calibration:\n  - {id: 1, disabled: \"true\"}\n",
       "t.yaml:5:23: 'disabled' must be true or false, got the quoted text 'true'"},
      {"name: x\nqubits: 2\ncouplers: [[0, 1]]\nqubit_calibration:\n  - id: 1\n    disabled: [true]\n",
       "t.yaml:6:15: 'disabled' must be true or false, got a sequence"},
      {"name: x\nqubits: 2\ncouplers:\n  - {pair: [0, 1], disabeld: true}\n",
       "t.yaml:4:20: unknown key 'disabeld' in coupler; did you mean 'disabled'?"},
  };
  for (const auto& [text, message] : cases) {
    try {
      parse_device_yaml(text, "t.yaml");
      ADD_FAILURE() << "accepted: " << text;
    } catch (const InputError& e) {
      EXPECT_EQ(std::string(e.what()), message);
    }
  }
}

TEST(OutOfService, CouplerOfErrorOneIsOutOfService) {
  // Error 1 is certain failure: a plan over it would have ESP 0, so it carries none.
  DeviceDescription d = make_lattice("line:6").description();
  d.couplers[2].error = 1.0;  // [2, 3]
  const Device dev(d);
  EXPECT_FALSE(dev.coupled(2, 3));
  EXPECT_EQ(dev.coupler_out_of_service_reason(2), "error 1");
  EXPECT_TRUE(plan_avoids(dev, "chain", 3));
  EXPECT_FALSE(plan_avoids(dev, "chain", 4));  // the halves have three qubits each
  // The same through a file: the message of the command line.
  const auto dir = testing::temp_dir();
  testing::write_file(dir / "e1.yaml", device_to_yaml(dev));
  const auto r = testing::run_qftplan("plan --device " + (dir / "e1.yaml").string() + " -n 4 --strategy chain");
  EXPECT_EQ(r.status, 1) << r.err;
  EXPECT_EQ(r.out, "");
}

TEST(OutOfService, EveryStrategyAvoidsAMiddleQubitOfAGrid) {
  const Device dev = disable(make_lattice("grid:5x5"), {12}, {});
  for (const std::string& s : kStrategies) {
    int planned = 0;
    for (int n : {1, 2, 5, 9, 16, 24}) planned += plan_avoids(dev, s, n);
    // Every strategy plans most of these; spine only what no chain holds (here: nothing).
    EXPECT_GE(planned, s == "spine" ? 0 : 5) << s;
  }
  // 25 qubits would need the disabled one.
  PlanOptions opt;
  opt.spec.qubits = 25;
  try {
    prepare_plan(dev, opt);
    ADD_FAILURE() << "planned on 25 qubits";
  } catch (const PlanningError& e) {
    EXPECT_EQ(std::string(e.what()),
              "device grid:5x5 has 24 qubits in service (1 out of service), fewer than the 25 requested");
  }
}

TEST(OutOfService, EveryStrategyAvoidsBrokenCouplersOfAHeavyHexagon) {
  const Device base = make_lattice("heavy-hex:2x2");
  std::vector<std::pair<int, int>> broken;
  for (int i = 0; i < base.coupler_count(); i += 7) broken.push_back({base.couplers()[i].a, base.couplers()[i].b});
  const Device dev = disable(base, {}, broken);
  ASSERT_EQ(dev.usable_coupler_count(), base.coupler_count() - static_cast<int>(broken.size()));
  for (const std::string& s : kStrategies) {
    int planned = 0;
    for (int n : {2, 4, 8, 12, 20}) planned += plan_avoids(dev, s, n);
    EXPECT_GE(planned, s == "spine" ? 1 : 4) << s;
  }
}

TEST(OutOfService, TheOnlyLongChainThroughADisabledQubitIsNotUsed) {
  // A line of 9 whose middle qubit is disabled: two pieces of 4. No strategy may plan 5 qubits, and
  // 4 fit on one side only.
  const Device dev = disable(make_lattice("line:9"), {4}, {});
  // (The spine strategy leaves registers that fit on a chain to the chain strategy.)
  for (const std::string& s : kStrategies) {
    EXPECT_FALSE(plan_avoids(dev, s, 5)) << s;
    EXPECT_EQ(plan_avoids(dev, s, 4), s != "spine") << s;
  }
  PlanOptions opt;
  opt.spec.qubits = 5;
  opt.strategy = "chain";
  try {
    prepare_plan(dev, opt);
    ADD_FAILURE() << "a chain of 5";
  } catch (const PlanningError& e) {
    EXPECT_EQ(std::string(e.what()).rfind("no chain of 5 qubits exists in line:9 among the parts in service (proved", 0), 0u)
        << e.what();
  }
  // A ring of 10 with one coupler disabled is a line: the chain must not close over [0, 9].
  const Device ring = disable(make_lattice("ring:10"), {}, {{0, 9}});
  for (const std::string& s : kStrategies) EXPECT_EQ(plan_avoids(ring, s, 10), s != "spine") << s;
}

TEST(OutOfService, ASingleQubitRegisterNeverLandsOnADisabledQubit) {
  // Qubit 0 is the best qubit by calibration (no error at all) but disabled: a search over every qubit
  // that forgot the service flag would pick it.
  DeviceDescription d = make_lattice("line:5").description();
  d.calibration.error_1q = 0.01;
  d.calibration.error_readout = 0.03;
  QubitOverride best;
  best.id = 0;
  best.error_1q = 0.0;
  best.error_readout = 0.0;
  best.disabled = true;
  d.qubit_calibration.push_back(best);
  const Device dev(d);
  for (const std::string& s : kStrategies) EXPECT_EQ(plan_avoids(dev, s, 1), s != "spine") << s;
  // Every qubit but one disabled, and that one isolated: n = 1 goes there, n = 2 cannot be planned.
  const Device lone = disable(make_lattice("grid:3x3"), {0, 1, 2, 3, 5, 6, 7, 8}, {});
  for (const std::string& s : kStrategies) {
    EXPECT_FALSE(plan_avoids(lone, s, 2)) << s;
    if (s == "spine") continue;  // a chain holds one qubit: the spine strategy declines
    PlanOptions opt;
    opt.spec.qubits = 1;
    opt.strategy = s;
    const PreparedPlan p = prepare_plan(lone, opt);
    EXPECT_EQ(p.maps.placement, std::vector<int>{4}) << s;
  }
}

TEST(OutOfService, PinnedPlacementOnADisabledQubitIsRefused) {
  const Device dev = disable(make_lattice("grid:3x3"), {4}, {{0, 1}});
  PlanOptions opt;
  opt.spec.qubits = 3;
  opt.strategy = "chain";
  opt.placement = std::vector<int>{3, 4, 5};
  try {
    prepare_plan(dev, opt);
    ADD_FAILURE() << "planned on a disabled qubit";
  } catch (const SettingError& e) {
    EXPECT_EQ(std::string(e.what()), "placement names qubit 4, which is out of service on grid:3x3 (disabled)");
  }
  // A pinned chain over a disabled coupler is no chain.
  opt.placement = std::vector<int>{0, 1, 2};
  EXPECT_THROW(prepare_plan(dev, opt), SettingError);
  // The command line words it as its option.
  const auto dir = testing::temp_dir();
  testing::write_file(dir / "d.yaml", device_to_yaml(dev));
  const auto r = testing::run_qftplan("plan --device " + (dir / "d.yaml").string() + " -n 3 --placement 3,4,5");
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.err.find("--placement names qubit 4, which is out of service on grid:3x3 (disabled)"), std::string::npos)
      << r.err;
}

TEST(OutOfService, CheckerRefusesGatesOnPartsOutOfService) {
  const Device dev = disable(make_lattice("line:4"), {3}, {{0, 1}});
  CheckRequest req;
  req.spec.qubits = 2;
  req.placement = {1, 2};
  req.final_placement = {1, 2};
  const auto run = [&](const std::string& body) {
    return check_qft_circuit(dev, parse_qasm("OPENQASM 3.0;\ninclude \"stdgates.inc\";\nqubit[4] q;\n" + body, "c.qasm"),
                             req);
  };
  const CheckResult a = run("cx q[0], q[1];\n");
  EXPECT_FALSE(a.ok);
  EXPECT_NE(a.message.find("on qubits 0 and 1, whose coupler is out of service (disabled)"), std::string::npos)
      << a.message;
  const CheckResult b = run("h q[3];\n");
  EXPECT_FALSE(b.ok);
  EXPECT_NE(b.message.find("on qubit 3, which is out of service (disabled)"), std::string::npos) << b.message;
}

TEST(OutOfService, RandomDisabledSetsOnLatticesAreNeverUsed) {
  // Property: for random disabled sets (qubits and couplers) on several lattices, every strategy's plan
  // of every size avoids them. std::mt19937 is fully specified by the C++ standard, so the sets are
  // the same everywhere.
  std::mt19937 g(20261204);
  int planned = 0;
  for (const std::string spec : {"grid:4x4", "heavy-hex:1x2", "ring:12", "grid:3x5"}) {
    const Device base = make_lattice(spec);
    for (int trial = 0; trial < 4; ++trial) {
      std::vector<int> dead;
      for (int q = 0; q < base.qubit_count(); ++q)
        if (g() % 8 == 0) dead.push_back(q);
      std::vector<std::pair<int, int>> broken;
      for (const auto& c : base.couplers())
        if (g() % 6 == 0) broken.push_back({c.a, c.b});
      const Device dev = disable(base, dead, broken);
      for (const std::string& s : kStrategies)
        for (int n : {1, 2, 3, 5, 7}) planned += plan_avoids(dev, s, n, trial + 1);
    }
  }
  EXPECT_GE(planned, 200);  // most requests fit; the count shows the property was exercised
}

TEST(OutOfService, SummaryAndDrawingShowThem) {
  DeviceDescription d = disable(make_lattice("grid:3x3"), {4}, {{0, 1}}).description();
  d.calibration.error_2q = 0.01;
  d.couplers[2].error = 1.0;  // [1, 2]
  const Device dev(d);
  const DeviceSummary s = summarize(dev);
  ASSERT_EQ(s.out_of_service.size(), 7u);  // qubit 4; couplers [0,1], [1,2], and the four around qubit 4
  const std::string text = format_summary(s);
  EXPECT_NE(text.find("qubits          9 (1 out of service)"), std::string::npos) << text;
  EXPECT_NE(text.find("couplers        12 (6 out of service)"), std::string::npos) << text;
  EXPECT_NE(text.find("qubit 4 (disabled), coupler [0, 1] (disabled), coupler [1, 2] (error 1), coupler [1, 4] "
                      "(qubit 4 out of service)"),
            std::string::npos)
      << text;
  // The graph in service: the ring of 8 around the hole, less [0,1] and [1,2] (qubit 1 hangs free).
  EXPECT_NE(text.find("components      2, largest 7 qubits"), std::string::npos) << text;
  EXPECT_NE(text.find("error 2q        0.01\n"), std::string::npos) << text;
  const std::string svg = draw_device_svg(dev, nullptr);
  EXPECT_NE(svg.find("1 qubit and 6 couplers out of service"), std::string::npos);
  EXPECT_NE(svg.find("qubit out of service"), std::string::npos);
  EXPECT_NE(svg.find("coupler out of service"), std::string::npos);
  EXPECT_NE(svg.find("couplers-out-of-service"), std::string::npos);
  // A device with everything in service draws no such marks.
  EXPECT_NE(draw_device_svg(disable(make_lattice("line:3"), {}, {{1, 2}}), nullptr).find("; 1 coupler out of service"),
            std::string::npos);
  const std::string clean = draw_device_svg(make_lattice("grid:3x3"), nullptr);
  EXPECT_EQ(clean.find("out of service"), std::string::npos);
}

TEST(OutOfService, TheMaintenanceExampleFile) {
  // examples/harbor-grid-4x4-service.yaml (README "Device files"): every strategy avoids its hole, and
  // the drawing of a plan on it shows the parts out of service beside the plan's chain.
  const Device dev = load_device_file((testing::source_dir() / "examples" / "harbor-grid-4x4-service.yaml").string());
  EXPECT_TRUE(check_device(dev).empty());
  EXPECT_EQ(dev.usable_qubit_count(), 15);
  EXPECT_EQ(dev.usable_coupler_count(), 18);
  for (const std::string& s : kStrategies)
    for (int n : {4, 10, 15}) plan_avoids(dev, s, n);
  EXPECT_TRUE(plan_avoids(dev, "chain", 15));
  const auto dir = testing::temp_dir();
  const std::string file = (testing::source_dir() / "examples" / "harbor-grid-4x4-service.yaml").string();
  const auto r = testing::run_qftplan("plan --device '" + file + "' -n 15 --quiet --report '" +
                                      (dir / "r.json").string() + "'");
  ASSERT_EQ(r.status, 0) << r.err;
  const auto d = testing::run_qftplan("draw '" + file + "' --plan '" + (dir / "r.json").string() + "' --svg -");
  ASSERT_EQ(d.status, 0) << d.err;
  EXPECT_NE(d.out.find("1 qubit and 6 couplers out of service"), std::string::npos);
  EXPECT_NE(d.out.find("chain (15 qubits)"), std::string::npos);
  EXPECT_NE(d.out.find("coupler out of service"), std::string::npos);
}

}  // namespace
}  // namespace qftplan
