// Every chain network written to a file, read back and proved, at every register size from 2 to 130
// (issue 15: the parity network's files at n = 61..63 hold numerators of 19 digits, which the reader
// once rounded; sizes either side of the 64-bit boundary of exact angles are all covered).

#include <gtest/gtest.h>

#include <tuple>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_writer.hpp"
#include "plan_simulation.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

// Plans the QFT of `spec` on a line of n qubits with `network`, writes it in `version`, parses the text
// and runs the structural proof (the QFT's definition: Nielsen and Chuang, "Quantum Computation and
// Quantum Information", 2000, section 5.1).
CheckResult write_read_prove(const QftSpec& spec, NetworkChoice network, QasmVersion version, GateSet gates) {
  const Device dev = make_lattice("line:" + std::to_string(spec.qubits));
  PlanOptions opt;
  opt.spec = spec;
  opt.strategy = "chain";
  opt.network = network;
  opt.format = version;
  opt.gates = gates;
  testing::WrittenPlan w = testing::write_and_read(dev, opt, version);
  w.request.statevector_limit = 8;
  return check_qft_circuit(dev, w.program, w.request);
}

TEST(NetworkExactness, EveryNetworkAtEverySizeUpTo130) {
  for (int n = 2; n <= 130; ++n) {
    // Sanitizers: every size up to 20, then every fifth and the multiples of 16.
    if (n > 20 && n % 16 != 0 && !testing::sampled(n, 5)) continue;
    QftSpec exact;
    exact.qubits = n;
    for (NetworkChoice net : {NetworkChoice::reversal, NetworkChoice::anchored, NetworkChoice::parity}) {
      const CheckResult r = write_read_prove(exact, net, QasmVersion::v3, GateSet::cx);
      ASSERT_TRUE(r.ok) << network_choice_name(net) << " n=" << n << ": " << r.message;
    }
    // The leapfrog network is for the approximate QFT (degrees 3 .. n-1).
    if (n >= 4) {
      QftSpec approx = exact;
      approx.approx_degree = std::min(n - 1, 8);
      for (NetworkChoice net : {NetworkChoice::leapfrog, NetworkChoice::insertion, NetworkChoice::parity_insertion}) {
        const CheckResult r = write_read_prove(approx, net, QasmVersion::v3, GateSet::cx);
        ASSERT_TRUE(r.ok) << network_choice_name(net) << " n=" << n << ": " << r.message;
      }
      // Degrees past 2^61 in the one-bit sums (window_parity_qft.cpp counts those as angle sums).
      if (n % 16 == 0) {
        approx.approx_degree = n - 1;
        const CheckResult r = write_read_prove(approx, NetworkChoice::parity_insertion, QasmVersion::v3, GateSet::cx);
        ASSERT_TRUE(r.ok) << "parity-insertion n=" << n << " M=" << n - 1 << ": " << r.message;
      }
    }
  }
}

// Issue 18: native output goes through the peephole pass (h h, cx cx, cz cz pairs removed, rz merged),
// which leaves h-cz-h sandwiches whose Hadamards cancelled against the wire's own Hadamard or the next
// sandwich's. The structural proof alone (no simulation) must still prove every chain network in both
// native gate sets at every size from 2 to 40, forward and inverse, and the routed, cover and spine
// strategies on lattices.
TEST(NetworkExactness, PeepholeOutputIsProvedStructurally) {
  auto prove = [](const Device& dev, const PlanOptions& opt, const std::string& what) {
    testing::WrittenPlan w = testing::write_and_read(dev, opt, QasmVersion::v3);
    w.request.statevector_limit = 0;
    const CheckResult r = check_qft_circuit(dev, w.program, w.request);
    EXPECT_TRUE(r.ok && r.structural_proved) << what << ": " << r.message;
    ASSERT_TRUE(w.report.peephole_removed.has_value()) << what;
  };
  for (int n = 2; n <= 40; ++n) {
    if (n > 12 && !testing::sampled(n, 4)) continue;  // sanitizers: up to 12, then every fourth size
    const Device dev = make_lattice("line:" + std::to_string(n));
    for (GateSet gates : {GateSet::cx, GateSet::cz})
      for (bool inverse : {false, true})
        for (NetworkChoice net : {NetworkChoice::reversal, NetworkChoice::anchored, NetworkChoice::parity, NetworkChoice::leapfrog,
                                  NetworkChoice::insertion, NetworkChoice::parity_insertion}) {
          const bool approximate = net == NetworkChoice::leapfrog || net == NetworkChoice::insertion ||
                                   net == NetworkChoice::parity_insertion;
          if (approximate && n < 4) continue;
          PlanOptions opt;
          opt.spec.qubits = n;
          opt.spec.inverse = inverse;
          if (approximate) opt.spec.approx_degree = std::min(n - 1, 5);
          // Known gap (issue 19): the inverse parity-insertion network in cz gates, after the peephole
          // pass, opens Hadamard frames the structural proof does not follow (its closing CX ladder
          // comes first); it is proved without the pass (next test) and simulated with it (FFTW tests).
          if (net == NetworkChoice::parity_insertion && gates == GateSet::cz && inverse) continue;
          opt.strategy = "chain";
          opt.network = net;
          opt.gates = gates;
          prove(dev, opt, std::string(network_choice_name(net)) + " " + gate_set_name(gates) + (inverse ? " inverse" : "") +
                              " n=" + std::to_string(n));
        }
  }
  // The spine strategy only plans registers longer than the device's longest chain.
  const std::vector<std::tuple<std::string, const char*, int>> lattice_cases = {
      {"grid:5x5", "routed", 9}, {"grid:5x5", "cover", 17}, {"heavy-hex:2x2", "routed", 17},
      {"heavy-hex:2x2", "cover", 9}, {"heavy-hex:2x2", "spine", 34}, {"heavy-hex:2x2", "spine", 35}};
  for (const auto& [spec, strategy, n] : lattice_cases)
    for (GateSet gates : {GateSet::cx, GateSet::cz}) {
      const Device dev = make_lattice(spec);
      PlanOptions opt;
      opt.spec.qubits = n;
      opt.strategy = strategy;
      opt.gates = gates;
      prove(dev, opt, spec + " " + strategy + " " + gate_set_name(gates) + " n=" + std::to_string(n));
    }
}

// The gap above, closed without the peephole pass: the inverse parity-insertion network in cz gates,
// as decomposed, is proved structurally at every size from 4 to 40 and degrees 3 to 6.
TEST(NetworkExactness, InverseParityInsertionInCzWithoutThePassIsProved) {
  for (int n = 4; n <= 40; ++n) {
    const Device dev = make_lattice("line:" + std::to_string(n));
    for (int M = 3; M <= std::min(6, n - 1); ++M) {
      PlanOptions opt;
      opt.spec.qubits = n;
      opt.spec.inverse = true;
      opt.spec.approx_degree = M;
      opt.strategy = "chain";
      opt.network = NetworkChoice::parity_insertion;
      opt.gates = GateSet::cz;
      opt.peephole = false;
      testing::WrittenPlan w = testing::write_and_read(dev, opt, QasmVersion::v3);
      w.request.statevector_limit = 0;
      const CheckResult r = check_qft_circuit(dev, w.program, w.request);
      EXPECT_TRUE(r.ok && r.structural_proved) << "n=" << n << " M=" << M << ": " << r.message;
    }
  }
}

// The parity network's long numerators also in OpenQASM 2 (decimal denominators) and inverse.
TEST(NetworkExactness, ParityNetworkAroundThe64BitBoundary) {
  for (int n = 56; n <= 70; ++n)
    for (bool inverse : {false, true})
      for (QasmVersion v : {QasmVersion::v3, QasmVersion::v2}) {
        QftSpec spec;
        spec.qubits = n;
        spec.inverse = inverse;
        const CheckResult r = write_read_prove(spec, NetworkChoice::parity, v, GateSet::logical);
        ASSERT_TRUE(r.ok) << "n=" << n << (inverse ? " inverse" : "") << (v == QasmVersion::v2 ? " qasm2" : "")
                          << ": " << r.message;
      }
}

}  // namespace
}  // namespace qftplan
