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
///   esp_idle       = product over every idle interval of a qubit that holds information of the
///                    probability that the Pauli-twirled amplitude and phase damping channel of that
///                    interval applies no error, F(t) = (1 + e^(-t/T1) + 2 e^(-t/T2)) / 4 (the
///                    entanglement fidelity of the channel). An interval is a gap of length t > 0 on the
///                    ASAP schedule where the qubit waits (for its partner of a two-qubit gate, or for the
///                    end of the circuit). Register qubits hold information from time 0 (the input);
///                    other qubits from their first gate. Time inside a gate is the gate's own error.
///                    Source: Ghosh, Fowler, Geller, "Surface code with decoherence: an analysis of three
///                    superconducting architectures", Phys. Rev. A 86, 062318 (2012) (the Pauli
///                    twirl approximation of the amplitude and phase damping channel: p_x = p_y =
///                    (1 - e^(-t/T1)) / 4, p_z = (1 - e^(-t/T2)) / 2 - (1 - e^(-t/T1)) / 4).
///   esp_readout    = product over measured qubits of (1 - error_readout); 1 when not measured.
///   esp_total      = esp * esp_idle * esp_readout, the headline figure every automatic choice maximises.
///
/// Dynamic circuits (the semi-classical readout, `mid_circuit` set): a measurement of qubit q starts when
/// q is free and takes its duration_readout_ns; afterwards q holds no information (it idles no more). A
/// phase conditioned on bit b (p_if) is a frame change like p (no error, no time) that starts no earlier
/// than feed_forward_ns (of the measured qubit) after the measurement writing b ends; the qubit waits
/// until then, and that wait is an idle interval as above. duration_ns ends when the last measurement
/// starts: as in the unitary plans, whose final measurements are not scheduled, the last readout itself
/// is not counted, so the two durations (and idle times) compare.

#include <span>
#include <vector>

#include "qftplan/core/gate.hpp"
#include "qftplan/core/gate_program.hpp"
#include "qftplan/device/device.hpp"

namespace qftplan {

/// The figures of the noise model.
struct NoiseFigures {
  double esp = 1;              ///< gates only
  double log_esp = 0;          ///< natural log of esp (finite even when esp underflows to 0)
  double esp_idle = 1;         ///< idling factor
  double log_esp_idle = 0;
  double esp_readout = 1;      ///< readout factor (1 when not measured)
  double log_esp_readout = 0;
  double esp_total = 1;        ///< esp * esp_idle * esp_readout
  double log_esp_total = 0;
  double duration_ns = 0;
  double idle_ns = 0;          ///< idle time summed over the intervals counted in esp_idle, ns
};

/// F(t) of one idle interval of length `t_ns` on a qubit with lifetimes T1, T2 in microseconds (+infinity:
/// no decay), as its natural log: ln((1 + e^(-t/T1) + 2 e^(-t/T2)) / 4) (see esp_idle above).
double log_idle_fidelity(double t_ns, double t1_us, double t2_us);

/// Accumulates the noise figures of a native gate stream (h, x, sx, rz, p, cx, cz, measure; the
/// logical cp/swap/cp_swap/parity_step are counted as their 2/3/3/2 native two-qubit gates on the same
/// coupler).
class NoiseSink final : public GateSink {
 public:
  /// `register_qubits`: the physical qubits holding the register from the start.
  /// `mid_circuit`: measurements are scheduled as in a dynamic circuit (see above); otherwise they are
  /// the final readout and only their errors count.
  NoiseSink(const Device& device, std::vector<int> register_qubits, bool mid_circuit = false);
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
  // One gate that is not a measurement on qubit `qa` (and `qb` for a two-qubit gate on coupler `ci`,
  // -1 when not coupled).
  void step(GateKind k, int qa, int qb, int ci);
  // `q` waits `gap_ns` before its next gate (or the end): counted when it holds information.
  void idle(int q, double gap_ns);
  bool holds(int q) const { return (first_use_[q] >= 0 || in_register_[q]) && !measured_q_[q]; }
  // A measurement (mid-circuit) and a phase conditioned on a bit.
  void measure_now(const Gate& g);
  void conditioned(const Gate& g);
  bool mid_circuit_ = false;
  std::vector<char> measured_q_;      // measured mid-circuit: holds no information any more
  std::vector<double> not_before_;    // earliest start of each qubit's next timed gate (its corrections' outcomes known)
  std::vector<double> bit_ready_;     // earliest start of a gate conditioned on each bit, ns
  void start_timed(int q);
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
  std::vector<char> in_register_;
  // Idle intervals: lifetimes in microseconds (+infinity: none), and the last gap's log fidelity per qubit
  // (regular networks repeat the same gap).
  std::vector<double> t1_us_, t2_us_, last_gap_, last_log_idle_;
  double log_idle_ = 0;
  double idle_ns_ = 0;
  int last_a_ = -1, last_b_ = -1, last_coupler_ = -1;
};

}  // namespace qftplan
