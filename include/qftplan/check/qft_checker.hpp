#pragma once
/// \file qft_checker.hpp
/// Decides whether a circuit on a device implements a given QFT with given qubit maps.

#include <atomic>
#include <functional>
#include <complex>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "qftplan/core/gate.hpp"
#include "qftplan/core/qft_spec.hpp"
#include "qftplan/device/device.hpp"
#include "qftplan/qasm/qasm_program.hpp"

namespace qftplan {

/// What to check against.
struct CheckRequest {
  QftSpec spec;
  std::vector<int> placement;        ///< physical qubit holding input bit k at the start
  std::vector<int> final_placement;  ///< physical qubit holding output bit k at the end
  int statevector_limit = 16;        ///< simulate when spec.qubits <= this
  bool structural = true;            ///< run the structural proof (any size)
  const std::atomic<bool>* interrupt = nullptr;  ///< when set and true: throw Interrupted (run_budget.hpp)
};

/// The three verdicts of a check.
enum class CheckOutcome {
  proved,        ///< the structural proof passed, or every basis input was simulated and matched
  wrong,         ///< refuted: a counterexample input, a gate on a non-coupler, or a certain structural fact
  cannot_prove,  ///< the structural proof lost track and the register is too large to simulate exhaustively
};

/// The name of an outcome as printed: "proved", "wrong", "cannot prove".
const char* outcome_name(CheckOutcome o);

/// Verdict. `ok` is true exactly when `outcome` is proved; a wrong circuit comes with the first
/// offending gate's line (0 when not tied to a line).
struct CheckResult {
  bool ok = true;
  CheckOutcome outcome = CheckOutcome::proved;  ///< the verdict; `ok` == (outcome == proved)
  std::string message;               ///< the counterexample, why it cannot be proved, or what was proved
  int line = 0;
  bool structural_proved = false;    ///< the structural proof ran and passed
  bool simulated = false;            ///< the state-vector comparison ran and passed
  bool exhaustive = false;           ///< the simulation covered every basis input (a proof by itself)
  /// The structural proof lost track (sx, wide parities, phases of degree > 2, a Hadamard it
  /// cannot pair with a wire): not a refutation. Also set when simulation then decided.
  bool inconclusive = false;
  int lost_track_line = 0;           ///< where the structural proof lost track (0: at the end, or never)
  std::string lost_track_reason;     ///< why it lost track (empty when it did not)
};

/// Streaming structural proof: tracks the parity (GF(2)-linear function of the input and
/// Hadamard-output variables) held by every physical qubit and the phase polynomial in monomial
/// form, and at every Hadamard requires exactly the controlled phases the QFT order demands. The
/// block construction (spec.block_length) is followed as a composition of textbook transforms, one
/// Hadamard per wire per transform; there a difference makes the verdict cannot_prove, never wrong.
/// Handles h, x, rz, p, cx, cz, cp, swap and cp_swap, and h-cz-h sandwiches written as cz. Its
/// finish() returns proved, wrong (only when the proof followed the circuit exactly to the end,
/// so that the difference it found is certain) or cannot_prove (it lost track: see inconclusive).
class StructuralChecker final : public GateSink {
 public:
  /// `device` must outlive the checker; `placement[k]` is the qubit holding input bit k.
  StructuralChecker(const Device& device, const QftSpec& spec, std::vector<int> placement);
  /// Feeds one gate; `line` is reported on failure (0 for none).
  void gate(const Gate& g, int line);
  void gate(const Gate& g) override { gate(g, 0); }
  /// Checks the end state against `final_placement` and returns the verdict.
  CheckResult finish(const std::vector<int>& final_placement);
  /// The stream's end as a sink (nothing to do: the verdict needs the final placement above).
  using GateSink::finish;
  bool failed() const;
  /// Number of gates fed so far.
  long long gate_count() const;

 private:
  struct Impl;
  std::shared_ptr<Impl> impl_;
};

/// Checks a parsed program: couplers, then the structural proof and/or state-vector simulation.
CheckResult check_qft_circuit(const Device& device, const QasmProgram& program, const CheckRequest& request);

/// Checks the file at `path` by streaming it through the structural proof, keeping no gate list (for
/// files too large to hold: an 8192-qubit exact QFT is 10^8 gates). `settle(header)` gives the request
/// (transform and maps) from the header comments read before the first gate. There is no simulation,
/// so a proof that loses track ends as cannot_prove.
CheckResult check_qft_file_streaming(const Device& device, const std::string& path,
                                     const std::function<CheckRequest(const QasmProgram& header)>& settle,
                                     const std::atomic<bool>* interrupt);

/// The transform to check a file against, settled from what the caller gives and what the file's
/// "// transform:" header says.
struct CheckTransform {
  QftSpec spec;            ///< what to check against
  std::string mismatch;    ///< where the caller's settings differ from the header (empty: they agree)
};

/// Each setting the caller gives wins (`qubits`; `degree`, whose inner nullopt means exact;
/// `inverse`; `block_length`, the block construction); the others come from the header. A degree or a
/// block length given names the transform on its own (the header's other one is dropped). SettingError
/// when the register size is given by neither; a header that names no transform in our form counts as absent.
CheckTransform check_transform(const QasmProgram& program, std::optional<int> qubits,
                               std::optional<std::optional<int>> degree, std::optional<bool> inverse,
                               std::optional<int> block_length = std::nullopt);

/// The exact QFT of a logical state vector (index bit k = bit k of the register): forward
/// b_y = 2^(-n/2) sum_j exp(+2 pi i j y / 2^n) a_j, inverse with the opposite sign. Radix-2 FFT.
std::vector<std::complex<double>> exact_qft(std::vector<std::complex<double>> a, bool inverse);

/// The transform `spec` asks for, applied to a logical state vector of spec.qubits qubits:
/// exact_qft when every rotation is kept, else the textbook approximate-QFT gate list simulated.
std::vector<std::complex<double>> reference_qft(const QftSpec& spec, const std::vector<std::complex<double>>& a);

/// A readable angle: "pi/8", "-3*pi/32", or "pi/2**40" for tiny ones.
std::string angle_text(const Angle& a);

}  // namespace qftplan
