// The independent QFT checker: coupler check, a streaming structural proof by path sums
// (structural_*.cpp, phase_polynomial.cpp) and a state-vector comparison against an exact
// reference for small registers (statevector_check.cpp). This file runs them in turn and merges
// their verdicts.

#include <optional>
#include <string>
#include <vector>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/core/run_budget.hpp"
#include "statevector_check.hpp"

namespace qftplan {

namespace {

using statevector_check::SimOutcome;

CheckResult failure(std::string msg, int line) {
  CheckResult r;
  r.ok = false;
  r.message = std::move(msg);
  r.line = line;
  return r;
}

int line_of(const QasmProgram& program, std::size_t i) {
  return i < program.gate_lines.size() ? program.gate_lines[i] : 0;
}

// Why a qubit map is unusable, or empty.
std::string map_error(const std::vector<int>& map, const char* what, int n, int nq) {
  if (static_cast<int>(map.size()) != n)
    return std::string(what) + " lists " + std::to_string(map.size()) + " qubits for a " + std::to_string(n) +
           "-qubit QFT";
  std::vector<char> used(nq, 0);
  for (int q : map) {
    if (q < 0 || q >= nq) return std::string(what) + " names qubit " + std::to_string(q) + ", outside the device";
    if (used[q]) return std::string(what) + " names qubit " + std::to_string(q) + " twice";
    used[q] = 1;
  }
  return {};
}

// Qubit ranges, couplers, and measurements only at the end of their qubit.
std::optional<CheckResult> coupler_failure(const Device& device, const QasmProgram& program) {
  const int nq = device.qubit_count();
  std::vector<char> measured(nq, 0);
  for (std::size_t i = 0; i < program.gates.size(); ++i) {
    const Gate& g = program.gates[i];
    const bool two = is_two_qubit(g.kind);
    if (g.q0 < 0 || g.q0 >= nq || (two && (g.q1 < 0 || g.q1 >= nq)))
      return failure(std::string(gate_name(g.kind)) + " on qubit " + std::to_string(g.q0 < 0 || g.q0 >= nq ? g.q0 : g.q1) +
                         ", but the device has qubits 0.." + std::to_string(nq - 1),
                     line_of(program, i));
    if (two && !device.coupled(g.q0, g.q1))
      return failure(std::string(gate_name(g.kind)) + " on qubits " + std::to_string(g.q0) + " and " +
                         std::to_string(g.q1) + ", which have no coupler",
                     line_of(program, i));
    if (g.kind == GateKind::measure) {
      measured[g.q0] = 1;
      continue;
    }
    if (measured[g.q0] || (two && measured[g.q1]))
      return failure("gate on qubit " + std::to_string(measured[g.q0] ? g.q0 : g.q1) +
                         " after its measurement (measurements must come last)",
                     line_of(program, i));
  }
  return std::nullopt;
}

CheckResult structural_proof(const Device& device, const QasmProgram& program, const CheckRequest& request) {
  StructuralChecker sc(device, request.spec, request.placement);
  for (std::size_t i = 0; i < program.gates.size() && !sc.failed(); ++i) {
    if ((i & 0xffff) == 0 && request.interrupt && request.interrupt->load(std::memory_order_relaxed))
      throw Interrupted();
    sc.gate(program.gates[i], line_of(program, i));
  }
  return sc.finish(request.final_placement);
}

// The verdict when no check refuted the circuit: passed, or inconclusive when the proof could not
// decide and simulation did not run.
CheckResult merge(std::optional<CheckResult> structural, const SimOutcome& sim) {
  CheckResult r;
  const bool structural_ran = structural.has_value();
  r.structural_proved = structural_ran && structural->ok;
  r.simulated = sim.ran && sim.ok;
  if (structural_ran && !structural->ok && !r.simulated) {
    structural->message += sim.message.empty() ? "" : "; " + sim.message;
    return *structural;  // inconclusive and nothing else decided it
  }
  r.ok = true;
  std::vector<std::string> parts;
  if (structural_ran)
    parts.push_back(structural->ok ? structural->message : "structural proof inconclusive (" + structural->message + ")");
  if (!sim.message.empty()) parts.push_back(sim.message);
  if (parts.empty()) parts.push_back("coupler check passed (no proof requested)");
  for (std::size_t i = 0; i < parts.size(); ++i) r.message += (i ? "; " : "") + parts[i];
  r.inconclusive = structural_ran && !structural->ok;
  return r;
}

}  // namespace

CheckResult check_qft_circuit(const Device& device, const QasmProgram& program, const CheckRequest& request) {
  const int n = request.spec.qubits;
  const int nq = device.qubit_count();
  if (n < 1) return failure("the QFT needs at least one qubit", 0);
  if (auto e = map_error(request.placement, "placement", n, nq); !e.empty()) return failure(e, 0);
  if (auto e = map_error(request.final_placement, "final_placement", n, nq); !e.empty()) return failure(e, 0);

  // a. Qubit ranges, couplers, and measurements only at the end of their qubit.
  if (auto f = coupler_failure(device, program)) return *f;

  // A rotation angle that is no multiple of pi/2^k: the QFT uses none, and neither check can follow
  // it exactly.
  if (program.inexact_angle) {
    CheckResult r = failure("cannot prove: " + program.inexact_angle->message, program.inexact_angle->line);
    r.inconclusive = true;
    return r;
  }

  // b. Structural proof.
  std::optional<CheckResult> structural;
  if (request.structural) {
    structural = structural_proof(device, program, request);
    if (!structural->ok && !structural->inconclusive) return *structural;
  }

  // c. State-vector comparison.
  SimOutcome sim;
  if (n <= request.statevector_limit) {
    sim = statevector_check::simulate(device, program, request);
    if (sim.ran && !sim.ok) {
      // Simulation decides, but names no line: the line where the proof lost track is the place
      // to look (the circuit is wrong from there on or before).
      if (structural && structural->line > 0)
        return failure(sim.message + "; the structural proof stopped at line " + std::to_string(structural->line) +
                           " (" + structural->message + ")",
                       structural->line);
      return failure(sim.message, 0);
    }
  }
  return merge(std::move(structural), sim);
}

}  // namespace qftplan
