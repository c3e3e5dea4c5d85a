#include "qftplan/sinks/native_gates.hpp"

#include "qftplan/core/input_error.hpp"
#include "qftplan/sinks/circuit_metrics.hpp"

namespace qftplan {

const char* gate_set_name(GateSet g) {
  switch (g) {
    case GateSet::logical: return "logical";
    case GateSet::cx: return "cx";
    case GateSet::cz: return "cz";
  }
  return "?";
}

GateSet parse_gate_set(const std::string& text) {
  if (text == "logical") return GateSet::logical;
  if (text == "cx") return GateSet::cx;
  if (text == "cz") return GateSet::cz;
  throw InputError("unknown gate set '" + text + "' (valid: logical, cx, cz)");
}

GateSet gate_set_of(TwoQubitGate g) { return g == TwoQubitGate::cz ? GateSet::cz : GateSet::cx; }

void NativeDecomposer::cx(int c, int t) {
  if (target_ == TwoQubitGate::cx) {
    out_.put(make_gate(GateKind::cx, c, t));
  } else {
    out_.put(make_gate(GateKind::h, t));
    out_.put(make_gate(GateKind::cz, c, t));
    out_.put(make_gate(GateKind::h, t));
  }
}

void NativeDecomposer::cz(int a, int b) {
  if (target_ == TwoQubitGate::cz) {
    out_.put(make_gate(GateKind::cz, a, b));
  } else {
    out_.put(make_gate(GateKind::h, b));
    out_.put(make_gate(GateKind::cx, a, b));
    out_.put(make_gate(GateKind::h, b));
  }
}

void NativeDecomposer::batch(std::span<const Gate> run) {
  for (const Gate& g : run) {
    rewrite(g);
    out_.flush_if_full();
  }
  out_.flush();
}

void NativeDecomposer::rewrite(const Gate& g) {
  const int a = g.q0, b = g.q1;
  switch (g.kind) {
    case GateKind::cx: cx(a, b); return;
    case GateKind::cz: cz(a, b); return;
    case GateKind::p: out_.put(make_gate(GateKind::rz, a, -1, g.angle)); return;
    case GateKind::cp: {
      const Angle h = g.angle.half();
      out_.put(make_gate(GateKind::rz, a, -1, h));
      out_.put(make_gate(GateKind::rz, b, -1, h));
      cx(a, b);
      out_.put(make_gate(GateKind::rz, b, -1, -h));
      cx(a, b);
      return;
    }
    case GateKind::swap:
      cx(a, b);
      cx(b, a);
      cx(a, b);
      return;
    case GateKind::cp_swap: {
      const Angle h = g.angle.half();
      out_.put(make_gate(GateKind::rz, a, -1, h));
      out_.put(make_gate(GateKind::rz, b, -1, h));
      cx(a, b);
      out_.put(make_gate(GateKind::rz, b, -1, -h));
      cx(b, a);
      cx(a, b);
      return;
    }
    case GateKind::parity_step:
      cx(b, a);
      cx(a, b);
      if (!g.angle.is_zero()) out_.put(make_gate(GateKind::rz, a, -1, g.angle));
      return;
    default: out_.put(g); return;
  }
}

GateProgram native_program(TwoQubitGate target, GateKind k, bool zero_angle) {
  VectorSink v;
  NativeDecomposer dec(target, v);
  // A generic nonzero angle: no rewrite may depend on its value beyond being zero or not.
  dec.gate(make_gate(k, 0, is_two_qubit(k) ? 1 : -1, zero_angle ? Angle{} : Angle(3, 5)));
  std::vector<ProgramStep> steps;
  for (const Gate& g : v.gates) {
    const auto a = static_cast<std::uint8_t>(g.q0);
    steps.push_back({g.kind, a, is_two_qubit(g.kind) ? static_cast<std::uint8_t>(g.q1) : a});
  }
  return GateProgram(steps);
}

NativeReplay::NativeReplay(TwoQubitGate target, MetricsSink& metrics, NoiseSink& noise)
    : metrics_(metrics), noise_(noise) {
  for (int z = 0; z < 2; ++z)
    for (int k = 0; k < kGateKindCount; ++k)
      if (!uses_bit(static_cast<GateKind>(k))) {
        programs_[z][k] = native_program(target, static_cast<GateKind>(k), z == 1);
        costs_[z][k] = NoiseSink::cost_of(programs_[z][k]);
      }
}

void NativeReplay::batch(std::span<const Gate> run) {
  for (const Gate& g : run) {
    if (uses_bit(g.kind)) {
      metrics_.gate(g);
      noise_.gate(g);
      continue;
    }
    const int z = g.angle.is_zero() ? 1 : 0, k = static_cast<int>(g.kind);
    metrics_.replay(programs_[z][k], g.q0, g.q1);
    noise_.replay(programs_[z][k], costs_[z][k], g.q0, g.q1);
  }
}

void NativeReplay::finish() {
  metrics_.finish();
  noise_.finish();
}

void FusedBlockSplitter::batch(std::span<const Gate> run) {
  for (const Gate& g : run) {
    if (g.kind == GateKind::cp_swap) {
      out_.put(make_gate(GateKind::cp, g.q0, g.q1, g.angle));
      out_.put(make_gate(GateKind::swap, g.q0, g.q1));
    } else if (g.kind == GateKind::parity_step) {
      out_.put(make_gate(GateKind::cx, g.q1, g.q0));
      out_.put(make_gate(GateKind::cx, g.q0, g.q1));
      if (!g.angle.is_zero()) out_.put(make_gate(GateKind::rz, g.q0, -1, g.angle));
    } else {
      out_.put(g);
    }
    out_.flush_if_full();
  }
  out_.flush();
}

void SwapExpander::batch(std::span<const Gate> run) {
  for (const Gate& g : run) {
    if (g.kind != GateKind::swap) {
      out_.put(g);
    } else {
      out_.put(make_gate(GateKind::cx, g.q0, g.q1));
      out_.put(make_gate(GateKind::cx, g.q1, g.q0));
      out_.put(make_gate(GateKind::cx, g.q0, g.q1));
    }
    out_.flush_if_full();
  }
  out_.flush();
}

}  // namespace qftplan
