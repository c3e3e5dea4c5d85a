// The independent QFT checker: coupler check, a streaming structural proof by path sums
// (structural_*.cpp, phase_polynomial.cpp) and a state-vector comparison against an exact
// reference for small registers (statevector_check.cpp). This file runs them in turn and merges
// their verdicts.

#include <optional>
#include <string>
#include <vector>

#include <fmt/format.h>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/core/run_budget.hpp"
#include "qftplan/qasm/qasm_program.hpp"
#include "qftplan/qasm/qasm_writer.hpp"
#include "semiclassical_check.hpp"
#include "statevector_check.hpp"

namespace qftplan {

namespace {

using statevector_check::SimOutcome;

CheckResult failure(std::string msg, int line) {
  CheckResult r;
  r.ok = false;
  r.outcome = CheckOutcome::wrong;
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
    for (const int q : {g.q0, two ? g.q1 : g.q0})
      if (!device.usable(q))
        return failure(std::string(gate_name(g.kind)) + " on qubit " + std::to_string(q) +
                           ", which is out of service (" + device.out_of_service_reason(q) + ")",
                       line_of(program, i));
    if (two && !device.coupled(g.q0, g.q1)) {
      const int any = device.any_coupler_index(g.q0, g.q1);
      return failure(std::string(gate_name(g.kind)) + " on qubits " + std::to_string(g.q0) + " and " +
                         std::to_string(g.q1) +
                         (any < 0 ? ", which have no coupler"
                                  : ", whose coupler is out of service (" + device.coupler_out_of_service_reason(any) + ")"),
                     line_of(program, i));
    }
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

CheckResult cannot_prove(std::string msg, int line) {
  CheckResult r = failure(std::move(msg), line);
  r.outcome = CheckOutcome::cannot_prove;
  r.inconclusive = true;
  return r;
}

// The structural proof passed; a simulation that disagrees means a bug in one of them, and the
// concrete counterexample wins.
CheckResult proved(CheckResult structural, const SimOutcome& sim) {
  if (sim.ran && !sim.ok) return failure(sim.message + "; the structural proof had passed", 0);
  structural.simulated = sim.ran;
  structural.exhaustive = sim.ran && sim.exhaustive;
  if (!sim.message.empty()) structural.message += "; " + sim.message;
  return structural;
}

// The structural proof lost track (or was not asked for): the simulation decides when it covered
// every basis input or found a counterexample; otherwise the circuit cannot be proved.
CheckResult decided_by_simulation(const std::optional<CheckResult>& lost, const SimOutcome& sim) {
  const std::string where =
      lost ? "the structural proof lost track" + (lost->line > 0 ? " at line " + std::to_string(lost->line) : std::string()) +
                 " (" + lost->message + ")"
           : std::string("no structural proof requested");
  CheckResult r;
  if (sim.ran && !sim.ok) {
    // The counterexample names no line: the line where the proof lost track is the place to look.
    r = failure(sim.message + "; " + where, lost ? lost->line : 0);
  } else if (sim.ran && sim.exhaustive) {
    r.message = sim.message + "; " + where;
    r.simulated = r.exhaustive = true;
  } else {
    std::string why = lost ? lost->message : "no structural proof requested";
    if (!sim.message.empty()) why += "; " + sim.message + (sim.ran ? ", but not every basis input was simulated" : "");
    r = cannot_prove(why, lost ? lost->line : 0);
    r.simulated = sim.ran;
  }
  r.inconclusive = lost.has_value();
  if (lost) {
    r.lost_track_line = lost->line;
    r.lost_track_reason = lost->message;
  }
  return r;
}

}  // namespace

namespace {

// The structural proof fed straight from the reader.
class ProofStream final : public QasmGateStream {
 public:
  ProofStream(const Device& device, const std::function<CheckRequest(const QasmProgram&)>& settle)
      : device_(device), settle_(settle) {}
  void begin(const QasmProgram& header) override {
    request_ = settle_(header);
    proof_.emplace(device_, request_.spec, request_.placement);
  }
  void gate(const Gate& g, int line) override {
    // A failure found is final: the rest of the file need not be proved.
    if (!proof_->failed()) proof_->gate(g, line);
  }
  // The verdict once the whole file is read (`program`: its header and notes, no gates).
  CheckResult finish(const QasmProgram& program) {
    if (!proof_) begin(program);  // a file without gates
    if (program.inexact_angle)
      return cannot_prove("cannot prove: " + program.inexact_angle->message, program.inexact_angle->line);
    return proof_->finish(request_.final_placement);
  }

 private:
  const Device& device_;
  const std::function<CheckRequest(const QasmProgram&)>& settle_;
  CheckRequest request_;
  std::optional<StructuralChecker> proof_;
};

}  // namespace

CheckResult check_qft_file_streaming(const Device& device, const std::string& path,
                                     const std::function<CheckRequest(const QasmProgram& header)>& settle,
                                     const std::atomic<bool>* interrupt) {
  ProofStream stream(device, settle);
  const QasmProgram program = stream_qasm_file(path, stream, interrupt);
  return stream.finish(program);
}

CheckTransform check_transform(const QasmProgram& program, std::optional<int> qubits,
                               std::optional<std::optional<int>> degree, std::optional<bool> inverse,
                               std::optional<int> block_length) {
  const std::optional<QftSpec> header = program.transform ? parse_transform(*program.transform) : std::nullopt;
  if (!qubits && !header)
    throw SettingError("qubits", " is needed: the file has no '// transform:' header comment naming the register");
  CheckTransform out;
  out.spec = header.value_or(QftSpec{});
  if (qubits) out.spec.qubits = *qubits;
  if (degree) {
    out.spec.approx_degree = *degree;
    out.spec.block_length.reset();
  }
  if (block_length) {
    out.spec.block_length = *block_length;
    out.spec.approx_degree.reset();
  }
  if (inverse) out.spec.inverse = *inverse;
  // A degree that drops nothing is the exact transform (both spellings name the same circuit).
  const auto effective = [](QftSpec s) {
    if (s.approx_degree && *s.approx_degree >= s.qubits) s.approx_degree.reset();
    return s;
  };
  if (header && (effective(*header).qubits != effective(out.spec).qubits ||
                 effective(*header).approx_degree != effective(out.spec).approx_degree ||
                 header->block_length != out.spec.block_length ||
                 header->inverse != out.spec.inverse))
    out.mismatch = fmt::format("the file's header says {}, but the check asks for {}", describe_transform(*header),
                               describe_transform(out.spec));
  return out;
}

CheckResult check_qft_circuit(const Device& device, const QasmProgram& program, const CheckRequest& request) {
  const int n = request.spec.qubits;
  const int nq = device.qubit_count();
  if (n < 1) return failure("the QFT needs at least one qubit", 0);
  if (auto e = map_error(request.placement, "placement", n, nq); !e.empty()) return failure(e, 0);
  if (auto e = map_error(request.final_placement, "final_placement", n, nq); !e.empty()) return failure(e, 0);

  // a. Qubit ranges, couplers, and measurements only at the end of their qubit.
  if (auto f = coupler_failure(device, program)) return *f;

  // Phases conditioned on measured bits: the semi-classical readout, proved by its own rules.
  if (semiclassical_check::is_semiclassical(program)) {
    if (program.inexact_angle)
      return cannot_prove("cannot prove: " + program.inexact_angle->message, program.inexact_angle->line);
    return semiclassical_check::check(device, program, request);
  }

  // A rotation angle that is no multiple of pi/2^k: the QFT uses none, and neither check can follow
  // it exactly.
  if (program.inexact_angle) return cannot_prove("cannot prove: " + program.inexact_angle->message, program.inexact_angle->line);

  // b. Structural proof: proved, wrong (certain) or lost track.
  std::optional<CheckResult> structural;
  if (request.structural) {
    structural = structural_proof(device, program, request);
    if (structural->outcome == CheckOutcome::wrong) return *structural;
  }

  // c. State-vector comparison: a cross-check of a proof, or the judge where the proof lost track
  // (then every basis input is simulated whenever that fits the budget).
  const bool decides = !structural || !structural->ok;
  SimOutcome sim;
  if (n <= request.statevector_limit) sim = statevector_check::simulate(device, program, request, decides);
  if (!decides) return proved(std::move(*structural), sim);
  if (!structural && request.statevector_limit <= 0) {
    CheckResult r;
    r.message = "coupler check passed (no proof requested)";
    return r;
  }
  return decided_by_simulation(structural, sim);
}

const char* outcome_name(CheckOutcome o) {
  switch (o) {
    case CheckOutcome::proved: return "proved";
    case CheckOutcome::wrong: return "wrong";
    case CheckOutcome::cannot_prove: return "cannot prove";
  }
  return "?";
}

}  // namespace qftplan
