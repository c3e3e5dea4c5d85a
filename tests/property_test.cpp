// Property tests (issue 8): hundreds of random small devices (connected random graphs, trees, grids
// with dead qubits; fixed seeds) and register sizes; every plan, in every direction, degree and gate
// set, written as OpenQASM, read back and checked by the structural proof and by state-vector
// simulation against the textbook QFT (Nielsen & Chuang 2000, section 5.1, eq. 5.2: every basis input
// up to 10 qubits, so the whole unitary up to one global phase). And every bundled device at every
// register size it can hold.

#include <gtest/gtest.h>

#include <algorithm>
#include <filesystem>
#include <map>
#include <random>
#include <set>
#include <string>
#include <vector>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/core/atomic_file.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/device/device_yaml.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_program.hpp"
#include "qftplan/qasm/qasm_writer.hpp"
#include "qftplan/report/circuit_header.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

namespace fs = std::filesystem;
using Rng = std::mt19937_64;

int uniform(Rng& rng, int lo, int hi) { return std::uniform_int_distribution<int>(lo, hi)(rng); }

// Undirected edges without repeats.
struct EdgeSet {
  std::set<std::pair<int, int>> e;
  void add(int a, int b) {
    if (a != b) e.insert({std::min(a, b), std::max(a, b)});
  }
};

// A random connected graph: a random spanning tree (each qubit joins an earlier one) plus extra edges.
EdgeSet connected_graph(Rng& rng, int n) {
  EdgeSet s;
  for (int q = 1; q < n; ++q) s.add(q, uniform(rng, 0, q - 1));
  const int extra = uniform(rng, 0, n);
  for (int k = 0; k < extra; ++k) s.add(uniform(rng, 0, n - 1), uniform(rng, 0, n - 1));
  return s;
}

// A random tree: no cycles, often no long path (chains fail; the other strategies must cope).
EdgeSet tree(Rng& rng, int n) {
  EdgeSet s;
  for (int q = 1; q < n; ++q) s.add(q, uniform(rng, std::max(0, q - 3), q - 1));
  return s;
}

// A rows x cols grid whose dead qubits keep their ids but lose their couplers (as on real chips).
EdgeSet grid_with_holes(Rng& rng, int rows, int cols) {
  std::vector<bool> dead(rows * cols, false);
  const int holes = uniform(rng, 1, 2);
  for (int k = 0; k < holes; ++k) dead[uniform(rng, 0, rows * cols - 1)] = true;
  EdgeSet s;
  for (int r = 0; r < rows; ++r)
    for (int c = 0; c < cols; ++c) {
      const int q = r * cols + c;
      if (dead[q]) continue;
      if (c + 1 < cols && !dead[q + 1]) s.add(q, q + 1);
      if (r + 1 < rows && !dead[q + cols]) s.add(q, q + cols);
    }
  return s;
}

Device random_device(Rng& rng, int index) {
  DeviceDescription d;
  d.name = "harbor-random-" + std::to_string(index);
  EdgeSet edges;
  switch (index % 3) {
    case 0:
      d.qubits = uniform(rng, 2, 8);
      edges = connected_graph(rng, d.qubits);
      break;
    case 1:
      d.qubits = uniform(rng, 2, 8);
      edges = tree(rng, d.qubits);
      break;
    default: {
      const int rows = uniform(rng, 2, 3), cols = rows == 2 ? uniform(rng, 2, 4) : uniform(rng, 2, 3);
      d.qubits = rows * cols;
      edges = grid_with_holes(rng, rows, cols);
    }
  }
  // A calibrated chip every other time, so the ESP-driven placement search runs too.
  const bool calibrated = uniform(rng, 0, 1);
  for (const auto& [a, b] : edges.e) {
    Coupler c;
    c.a = a;
    c.b = b;
    if (calibrated) c.error = uniform(rng, 2, 40) / 1000.0;
    d.couplers.push_back(c);
  }
  if (calibrated) d.calibration.error_1q = 0.0005;
  if (uniform(rng, 0, 3) == 0) d.native_2q = TwoQubitGate::cz;
  return Device(std::move(d));
}

// Plans `opt`, writes the circuit as OpenQASM text, reads it back and checks it. Returns false when
// the request cannot be planned (PlanningError); any other failure is a test failure.
bool plan_and_check(const Device& dev, const PlanOptions& opt, QasmVersion version, int statevector_limit,
                    const std::string& what) {
  PreparedPlan plan;
  try {
    plan = prepare_plan(dev, opt);
  } catch (const PlanningError&) {
    return false;
  }
  StringOutput text;
  QasmWriter writer(version, circuit_header(dev, opt, plan), text);
  const PlanReport r = execute_plan(dev, opt, plan, &writer);
  const QasmProgram prog = parse_qasm(text.text(), what);
  CheckRequest req;
  req.spec = plan.spec;
  req.placement = r.placement;
  req.final_placement = r.final_placement;
  req.statevector_limit = statevector_limit;
  const CheckResult res = check_qft_circuit(dev, prog, req);
  EXPECT_TRUE(res.ok) << what << ": " << res.message << "\n" << text.text();
  EXPECT_TRUE(res.structural_proved) << what << ": " << res.message;
  if (opt.spec.qubits <= statevector_limit) EXPECT_TRUE(res.simulated) << what << ": " << res.message;
  return true;
}

// 300 random devices x 4 requests. Gate sets and formats rotate so that every combination of
// direction, degree kind and gate set occurs many times.
TEST(Property, RandomDevicesEveryPlanIsTheQft) {
  Rng rng(20260808);
  const auto& strategies = plan_strategies();
  int planned = 0, unplannable = 0;
  std::map<std::string, int> by_strategy;
  const int devices = testing::kSanitized ? 100 : 300;  // sanitizers: the first 100
  for (int i = 0; i < devices; ++i) {
    const Device dev = random_device(rng, i);
    for (int variant = 0; variant < 4; ++variant) {
      PlanOptions opt;
      opt.spec.qubits = uniform(rng, 1, dev.qubit_count());
      const int n = opt.spec.qubits;
      switch (variant) {
        case 0: break;                                                   // exact
        case 1: opt.spec.inverse = true; break;                          // inverse
        case 2:                                                          // approximate, either way
          opt.spec.approx_degree = uniform(rng, 1, n + 1);
          opt.spec.inverse = uniform(rng, 0, 1);
          break;
        default: opt.auto_approx = true;                                 // degree chosen by ESP
      }
      opt.gates = std::vector<GateSet>{GateSet::logical, GateSet::cx, GateSet::cz}[(i + variant) % 3];
      opt.measure = (i + variant) % 5 == 0;
      const QasmVersion version = (i + variant) % 2 ? QasmVersion::v2 : QasmVersion::v3;
      opt.format = version;
      opt.search.seed = i;
      // Auto-approx is offered by the strategies that score degrees; "auto" picks among them.
      opt.strategy = opt.auto_approx ? "auto" : strategies[uniform(rng, 0, static_cast<int>(strategies.size()) - 1)].name;
      const std::string what = dev.name() + " n=" + std::to_string(n) + " variant " + std::to_string(variant) +
                               " strategy " + opt.strategy;
      try {
        if (plan_and_check(dev, opt, version, 16, what)) {
          ++planned;
          ++by_strategy[opt.strategy];
        } else {
          ++unplannable;
        }
      } catch (const InputError& e) {
        // Only strategy/option combinations a strategy documents as unsupported may be refused.
        const std::string m = e.what();
        EXPECT_TRUE(m.find("strateg") != std::string::npos || m.find("--approx auto") != std::string::npos)
            << what << ": " << m;
        ++unplannable;
      }
    }
  }
  std::cout << "[ property ] " << planned << " plans checked, " << unplannable << " requests not plannable (";
  for (const auto& [s, k] : by_strategy) std::cout << s << " " << k << " ";
  std::cout << ")\n";
  // Trees and holes make some registers unplannable for a chain; most requests must still plan.
  EXPECT_GE(planned, devices * 850 / 300);
}

// Every bundled chip at every register size up to its largest connected region: forward exact, and
// inverse approximate of degree 3. Simulation up to 9 qubits (full unitary), the proof at every size.
class BundledDevice : public ::testing::TestWithParam<std::string> {};

TEST_P(BundledDevice, EveryRegisterSize) {
  const fs::path file = testing::source_dir() / "topologies" / GetParam();
  const Device dev = load_device_file(file.string());
  const auto [comp, count] = dev.components();
  std::vector<int> size(count, 0);
  for (int c : comp) ++size[c];
  const int largest = *std::max_element(size.begin(), size.end());
  int planned = 0;
  for (int n = 1; n <= dev.qubit_count(); ++n) {
    for (int variant = 0; variant < 2; ++variant) {
      PlanOptions opt;
      opt.spec.qubits = n;
      // Correctness is the point here, not the best chain: keep the exhaustive placement search short.
      opt.placement_search.work_budget = 200'000;
      if (variant == 1) {
        opt.spec.inverse = true;
        opt.spec.approx_degree = 3;
        opt.gates = GateSet::logical;
      }
      const std::string what = GetParam() + " n=" + std::to_string(n) + (variant ? " inverse degree 3" : " exact");
      const bool ok = plan_and_check(dev, opt, variant ? QasmVersion::v2 : QasmVersion::v3, 9, what);
      // Any register fits a connected region of its size (the routed strategy needs no chain).
      if (n <= largest) EXPECT_TRUE(ok) << what << " was not planned";
      else EXPECT_FALSE(ok) << what << " planned beyond the largest connected region";
      planned += ok;
    }
  }
  EXPECT_GE(planned, 2 * largest);
}

std::vector<std::string> bundled() {
  std::vector<std::string> out;
  for (const auto& e : fs::directory_iterator(testing::source_dir() / "topologies"))
    if (e.path().extension() == ".yaml") out.push_back(e.path().filename().string());
  std::sort(out.begin(), out.end());
  return out;
}

INSTANTIATE_TEST_SUITE_P(Topologies, BundledDevice, ::testing::ValuesIn(bundled()), [](const auto& info) {
  std::string s = info.param.substr(0, info.param.size() - 5);
  std::replace(s.begin(), s.end(), '-', '_');
  return s;
});

}  // namespace
}  // namespace qftplan
