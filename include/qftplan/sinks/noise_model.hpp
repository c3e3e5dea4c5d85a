#pragma once
/// \file noise_model.hpp
/// Estimated success probability (ESP) of a native circuit from the device's calibration.
///
/// Definitions (README "What the numbers mean" repeats them):
///   esp            = product over every gate of the native circuit of (1 - error), where a two-qubit
///                    gate uses its coupler's error, h/x/sx use the qubit's error_1q, and rz and p are
///                    error-free frame changes (common practice for virtual Z gates).
///   duration_ns    = length of the ASAP schedule with the calibrated gate times (rz and p take no
///                    time; measurements are not scheduled).
///   esp_with_idle  = esp * product over used qubits q of exp(-t_q / T1_q) * exp(-t_q / T2_q), where t_q
///                    is how long q holds information: the whole duration for register qubits (they
///                    hold the input from the start), and from its first gate to the end for others.
///   esp_with_readout = esp * product over register qubits of (1 - error_readout), when measured.

#include <span>
#include <vector>

#include "qftplan/core/gate.hpp"
#include "qftplan/core/gate_program.hpp"
#include "qftplan/device/device.hpp"

namespace qftplan {

/// The figures of the noise model.
struct NoiseFigures {
  double esp = 1;
  double log_esp = 0;          ///< natural log of esp (finite even when esp underflows to 0)
  double esp_with_idle = 1;
  double esp_with_readout = 1;
  double duration_ns = 0;
};

/// Accumulates the noise figures of a native gate stream (h, x, sx, rz, p, cx, cz, measure; the
/// logical cp/swap/cp_swap/parity_step are counted as their 2/3/3/2 native two-qubit gates on the same
/// coupler).
class NoiseSink final : public GateSink {
 public:
  /// `register_qubits`: the physical qubits holding the register from the start.
  NoiseSink(const Device& device, std::vector<int> register_qubits);
  void gate(const Gate& g) override { add(g); }
  void batch(std::span<const Gate> run) override;
  /// What a program costs in this model, found once per program: its timed one-qubit gates (h, x,
  /// sx) counted between its two-qubit gates, so that replaying it is a handful of additions.
  struct ProgramCost {
    /// `timed[s]` one-qubit gates that take time on slot s, then `syncs` two-qubit gates.
    struct Segment {
      int timed[2] = {0, 0};
      int syncs = 0;
    };
    std::vector<Segment> segments;
    int errors_1q[2] = {0, 0};   ///< h, x, sx on each slot
    int natives_2q = 0;          ///< native two-qubit gates (cp counts 2, swap and cp_swap 3)
    bool used_early[2] = {false, false};  ///< slot has a gate before the first two-qubit gate
  };
  static ProgramCost cost_of(const GateProgram& program);
  /// Counts `program` on (q0, q1) as if its gates came one by one (equal to rounding: each term is
  /// added as a multiple, not once per gate). `cost` is cost_of(program).
  void replay(const GateProgram& program, const ProgramCost& cost, int q0, int q1);
  /// The figures so far (call after the last gate).
  NoiseFigures figures() const;

 private:
  void add(const Gate& g);
  // One gate that is not a measurement: `ra`/`fa` are the ready time and first use of its first
  // qubit `qa`, `rb`/`fb` of its second (two-qubit gates, on coupler `ci`, -1 when not coupled).
  void step(GateKind k, int qa, int ci, double& ra, double& fa, double& rb, double& fb);
  int coupler_of(int a, int b);
  const Device& dev_;
  std::vector<int> register_;
  double log_gates_ = 0;
  double log_readout_ = 0;
  bool measured_ = false;
  // Calibration looked up once per qubit and coupler, not per gate (the hot path of big plans).
  std::vector<double> log_keep_1q_, dur_1q_, log_keep_2q_, dur_2q_;
  std::vector<double> ready_;       // time each qubit becomes free, ns
  std::vector<double> first_use_;   // start of its first gate, ns; -1 when unused
  int last_a_ = -1, last_b_ = -1, last_coupler_ = -1;
};

}  // namespace qftplan
