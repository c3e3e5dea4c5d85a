// The structural proof of the block construction (check/structural_compose.cpp): a composition of
// textbook transforms, each wire with one Hadamard per transform it takes part in, proved term by term
// against the composition written out from the construction's description (Kahanamoku-Meyer, Blue,
// Bergamaschi, Gidney, Chuang, "A log-depth in-place quantum Fourier transform that rarely needs
// ancillas", arXiv:2505.00701, 2025; the textbook transform: Nielsen & Chuang, Quantum Computation and
// Quantum Information, 2000, section 5.1, fig. 5.1). The outside reference is the state-vector
// simulation of that description (check/qft_reference.cpp, itself compared with a radix-2 FFT and, in
// blockwise_qft_test.cpp, with the paper's closed forms): wherever a register can be enumerated, the
// proof's verdict must agree with it, and no mutant the simulation refutes may be proved.

#include <gtest/gtest.h>

#include <cstdio>
#include <random>
#include <string>
#include <vector>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/qasm/qasm_program.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

// Plans the block construction with the command-line program and reads the file back.
QasmProgram planned(const std::string& device, int n, int m, const std::string& extra) {
  const auto file = (testing::temp_dir() / "bw_proof.qasm").string();  // one file, rewritten
  const auto run = testing::run_qftplan("plan --device " + device + " --qubits " + std::to_string(n) +
                                        " --network blockwise --approx " + std::to_string(m) + " " + extra + " -q -o '" +
                                        file + "'");
  EXPECT_EQ(run.status, 0) << run.err;
  return parse_qasm(testing::read_file(file), file);
}

// The request the file's header names (as `qftplan check` settles it).
CheckRequest request_of(const QasmProgram& p, bool structural, int statevector_limit) {
  CheckRequest r;
  r.spec = check_transform(p, std::nullopt, std::nullopt, std::nullopt).spec;
  r.placement = *p.placement;
  r.final_placement = *p.final_placement;
  r.structural = structural;
  r.statevector_limit = statevector_limit;
  return r;
}

constexpr const char* kProved = "structural proof: the circuit is the";

// Small registers: the proof and the enumeration of every basis input agree, in each gate set the
// proof claims (cx and logical gates both ways, end order free or same; cz for the forward transform).
TEST(BlockwiseProof, SmallPlansAreProvedAndSimulationAgrees) {
  const Device line = make_lattice("line:10");
  int proved = 0, tried = 0;
  for (int n : {4, 6, 8})
    for (int m : {1, 2, 3})
      for (const std::string extra : {"", "--inverse", "--gates logical", "--inverse --gates logical", "--end-order same",
                                      "--inverse --end-order same", "--gates cz", "--no-peephole"}) {
        // Sanitizers: every option set at some (n, m), a third of the 72 plans.
        if (!testing::sampled(tried++, 3)) continue;
        const QasmProgram p = planned("line:10", n, m, extra);
        const auto r = check_qft_circuit(line, p, request_of(p, true, 16));
        ASSERT_TRUE(r.ok) << n << " " << m << " " << extra << ": " << r.message;
        EXPECT_TRUE(r.exhaustive) << r.message;  // every basis input simulated: the outside reference
        EXPECT_TRUE(r.structural_proved) << n << " " << m << " " << extra << ": " << r.message;
        proved += r.structural_proved;
      }
  EXPECT_EQ(proved, testing::kSanitized ? 3 * 3 * 8 / 3 : 3 * 3 * 8);
}

// Beyond simulation: plans of 17 to 200 qubits on a chain of a heavy-hexagon lattice (consecutive
// qubits of the chain are not consecutive numbers) are proved without simulating anything, with block
// lengths that leave a full, short or single top block and odd or even block counts.
TEST(BlockwiseProof, LargePlansAreProvedStructurally) {
  const std::string device = "heavy-hex:6x6";
  const Device dev = make_lattice(device);
  int tried = 0;
  for (const auto& [n, m] : std::vector<std::pair<int, int>>{{17, 2}, {40, 3}, {61, 4}, {100, 7}, {200, 16}})
    for (const std::string extra : {"", "--inverse", "--gates logical --inverse", "--end-order same", "--gates cz"}) {
      if (!testing::sampled(tried++, 3)) continue;  // sanitizers: each option set at some size
      const QasmProgram p = planned(device, n, m, extra);
      const auto r = check_qft_circuit(dev, p, request_of(p, true, 0));
      EXPECT_EQ(r.outcome, CheckOutcome::proved) << n << " " << m << " " << extra << ": " << r.message;
      EXPECT_NE(r.message.find(kProved), std::string::npos) << r.message;
      EXPECT_NE(r.message.find("block construction on " + std::to_string(n) + " qubits (blocks of " + std::to_string(m)),
                std::string::npos)
          << r.message;
    }
}

// Soundness: mutants of small plans (an angle changed, a gate dropped, two neighbouring gates
// exchanged, a Hadamard added) are never proved when the enumeration of every basis input refutes them;
// and the proof is not idle (it refuses most of them).
TEST(BlockwiseProof, MutantsNeverFoolTheProof) {
  const Device line = make_lattice("line:10");
  std::mt19937_64 rng(20261205);
  int mutants = 0, refused = 0;
  for (int n : {6, 9})
    for (int m : {2, 3})
      for (const std::string extra : {"", "--inverse", "--gates cz", "--gates logical --inverse"}) {
        const QasmProgram base = planned("line:10", n, m, extra);
        for (int trial = 0; trial < (testing::kSanitized ? 8 : 16); ++trial) {  // each kind of mutation either way
          QasmProgram p = base;
          auto& g = p.gates;
          std::uniform_int_distribution<std::size_t> pick(0, g.size() - 1);
          const std::size_t i = pick(rng);
          switch (trial % 4) {
            case 0: {  // an angle off by pi/2^k, or a phase added where there was none
              const Angle delta(1, static_cast<std::uint32_t>(1 + rng() % 6));
              std::size_t k = i;
              while (k < g.size() && g[k].kind != GateKind::rz) ++k;
              if (k < g.size()) g[k].angle = g[k].angle + delta;
              else g.push_back(make_gate(GateKind::rz, g[i].q0, -1, delta));
              break;
            }
            case 1: g.erase(g.begin() + static_cast<std::ptrdiff_t>(i)); break;
            case 2:
              if (i + 1 < g.size()) std::swap(g[i], g[i + 1]);
              break;
            default: g.insert(g.begin() + static_cast<std::ptrdiff_t>(i), make_gate(GateKind::h, g[i].q0)); break;
          }
          p.gate_lines.assign(g.size(), 0);
          const auto proof = check_qft_circuit(line, p, request_of(p, true, 0));
          const auto sim = check_qft_circuit(line, p, request_of(p, false, 16));
          ASSERT_TRUE(sim.exhaustive || !sim.ok) << sim.message;
          ++mutants;
          if (proof.ok) {
            EXPECT_TRUE(sim.ok) << "a mutant the simulation refutes was proved: n " << n << ", m " << m << " " << extra
                                << ", trial " << trial << ": " << sim.message;
          } else {
            ++refused;
            EXPECT_NE(proof.outcome, CheckOutcome::proved);
          }
        }
      }
  EXPECT_GT(refused, mutants * 3 / 4) << refused << " of " << mutants;
  std::printf("[ info ] %d of %d mutants refused\n", refused, mutants);
}

// A plan of 60 qubits with one angle changed, or checked as another block length or as the textbook
// transform, is not proved (the register is too large to simulate).
TEST(BlockwiseProof, LargeMutantsAndOtherTransformsAreNotProved) {
  const Device dev = make_lattice("line:60");
  const QasmProgram p = planned("line:60", 60, 4, "");
  ASSERT_TRUE(check_qft_circuit(dev, p, request_of(p, true, 0)).ok);
  for (std::size_t at : {std::size_t{0}, p.gates.size() / 2, p.gates.size() - 1}) {
    QasmProgram q = p;
    std::size_t k = at;
    while (q.gates[k].kind != GateKind::rz) k = (k + 1) % q.gates.size();
    q.gates[k].angle = q.gates[k].angle + Angle(1, 3);
    const auto r = check_qft_circuit(dev, q, request_of(q, true, 0));
    EXPECT_FALSE(r.ok) << "angle at gate " << k << ": " << r.message;
  }
  for (int other : {3, 5}) {
    auto req = request_of(p, true, 0);
    req.spec.block_length = other;
    EXPECT_FALSE(check_qft_circuit(dev, p, req).ok) << other;
  }
  auto textbook = request_of(p, true, 0);
  textbook.spec.block_length.reset();
  textbook.spec.approx_degree = 8;
  EXPECT_FALSE(check_qft_circuit(dev, p, textbook).ok);
}

}  // namespace
}  // namespace qftplan
