#pragma once
/// \file native_gates.hpp
/// Decomposition of the planner's gates into a native two-qubit gate plus rz and h.

#include <array>
#include <span>
#include <string>
#include <vector>

#include "qftplan/core/gate.hpp"
#include "qftplan/core/gate_program.hpp"
#include "qftplan/device/device.hpp"
#include "qftplan/sinks/noise_model.hpp"

namespace qftplan {

class MetricsSink;

/// The gate set of an emitted circuit.
enum class GateSet { logical, cx, cz };

/// "logical", "cx", "cz".
const char* gate_set_name(GateSet g);
/// Parses a gate-set name; throws InputError listing the valid names.
GateSet parse_gate_set(const std::string& text);
GateSet gate_set_of(TwoQubitGate g);

/// Rewrites each gate into the target two-qubit gate, rz and h, and forwards it:
///   cp(t) a,b      -> rz(t/2) a; rz(t/2) b; cx a,b; rz(-t/2) b; cx a,b          (2 CX)
///   swap a,b       -> cx a,b; cx b,a; cx a,b                                   (3 CX)
///   cp_swap(t) a,b -> rz(t/2) a; rz(t/2) b; cx a,b; rz(-t/2) b; cx b,a; cx a,b  (3 CX: the CP's last CX
///                     cancels the SWAP's first; Vidal and Dawson, PRA 69, 010301, 2004 bound any
///                     two-qubit gate by 3 CX)
///   parity_step(t) a,b -> cx b,a; rz(t) a; cx a,b                             (2 CX; no rz when t = 0)
///   p(t)           -> rz(t) (equal up to global phase)
/// For the cz target every cx c,t becomes h t; cz c,t; h t. Gates already native pass through.
class NativeDecomposer final : public GateSink {
 public:
  NativeDecomposer(TwoQubitGate target, GateSink& out) : target_(target), out_(out) {}
  void gate(const Gate& g) override { batch({&g, 1}); }
  void batch(std::span<const Gate> run) override;
  void finish() override { out_.out().finish(); }

 private:
  void rewrite(const Gate& g);
  void cx(int c, int t);
  void cz(int a, int b);
  TwoQubitGate target_;
  GateRun out_;
};

/// The program NativeDecomposer makes of one gate of kind `k` on qubits 0 and 1 (found by running
/// it, so the program cannot drift from what is emitted), for a nonzero angle or, with `zero_angle`,
/// for the angle 0 (a rewrite may leave out an rz of angle 0). Not for measurements.
GateProgram native_program(TwoQubitGate target, GateKind k, bool zero_angle = false);

/// Feeds the native circuit of a logical stream to a counter and the noise model without writing
/// it out: each gate replays its kind's native_program on its own qubits. The counts and depths are
/// those of NativeDecomposer feeding the same sinks, and the noise figures equal to rounding. The
/// planner counts every plan this way, whether or not a writer also receives the native gates.
class NativeReplay final : public GateSink {
 public:
  NativeReplay(TwoQubitGate target, MetricsSink& metrics, NoiseSink& noise);
  void gate(const Gate& g) override { batch({&g, 1}); }
  void batch(std::span<const Gate> run) override;
  void finish() override;

 private:
  // Per kind, for a nonzero angle [0] and for the angle 0 [1].
  std::array<GateProgram, kGateKindCount> programs_[2];
  std::array<NoiseSink::ProgramCost, kGateKindCount> costs_[2];
  MetricsSink& metrics_;
  NoiseSink& noise_;
};

/// Splits each fused cp_swap into cp then swap, and each parity_step into its cx, rz, cx (how the
/// logical gate set is written).
class FusedBlockSplitter final : public GateSink {
 public:
  explicit FusedBlockSplitter(GateSink& out) : out_(out) {}
  void gate(const Gate& g) override { batch({&g, 1}); }
  void batch(std::span<const Gate> run) override;
  void finish() override { out_.out().finish(); }

 private:
  GateRun out_;
};

/// Writes each swap as three cx (OpenQASM 2's qelib1.inc has no swap); other gates pass.
class SwapExpander final : public GateSink {
 public:
  explicit SwapExpander(GateSink& out) : out_(out) {}
  void gate(const Gate& g) override { batch({&g, 1}); }
  void batch(std::span<const Gate> run) override;
  void finish() override { out_.out().finish(); }

 private:
  GateRun out_;
};

}  // namespace qftplan
