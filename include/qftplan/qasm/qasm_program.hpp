#pragma once
/// \file qasm_program.hpp
/// A circuit read from an OpenQASM 2 or 3 file: gates on physical qubits plus the maps from our
/// header comment.

#include <atomic>
#include <optional>
#include <string>
#include <vector>

#include "qftplan/core/gate.hpp"

namespace qftplan {

/// Result of reading an OpenQASM file.
struct QasmProgram {
  int version = 3;                 ///< 2 or 3
  int qubit_count = 0;             ///< physical qubits addressed: highest index + 1
  std::vector<Gate> gates;         ///< in file order, on physical qubit ids; cp_swap never appears
  std::vector<int> gate_lines;     ///< 1-based source line of each gate
  std::optional<std::string> device_name;            ///< from "// device: NAME"
  std::optional<std::vector<int>> placement;         ///< from "// placement: a,b,c"
  std::optional<std::vector<int>> final_placement;   ///< from "// final_placement: a,b,c"
  std::optional<std::string> transform;              ///< from "// transform: inverse QFT on 4 qubits, exact"
  /// The first angle that is no multiple of pi/2^k (such a gate is kept with angle 0): the file is
  /// readable, but no QFT check can pass it (check_qft_circuit says so with this line).
  struct InexactAngle {
    int line = 0;
    std::string message;
  };
  std::optional<InexactAngle> inexact_angle;
};

/// Receives the gates of a file as they are read (a streaming read keeps no gate list).
class QasmGateStream {
 public:
  virtual ~QasmGateStream() = default;
  /// Called once, before the first gate, with the header comments read so far (and the version).
  virtual void begin(const QasmProgram& header) = 0;
  /// One gate of the file, with its line.
  virtual void gate(const Gate& g, int line) = 0;
};

/// Reads the OpenQASM file at `path` like load_qasm_file, but hands every gate to `stream` as it is
/// read and keeps none, releasing the file's pages behind the read position: memory stays bounded
/// on files of many gigabytes. The result has every field but `gates` and `gate_lines`; the limit of
/// 10^8 gates of a stored program does not apply.
QasmProgram stream_qasm_file(const std::string& path, QasmGateStream& stream, const std::atomic<bool>* interrupt);

/// Parses OpenQASM 3 (physical qubits `$k` or declared `qubit[N] name;` registers) or OpenQASM 2
/// (`qreg`), with the stdgates.inc / qelib1.inc gate names qftplan understands: h, x, sx, rz, p,
/// u1, cx, CX, cz, cp, cu1, swap, measure, barrier, plus user `gate` definitions built from those.
/// Angles are arithmetic on pi and numbers; they are kept exact as multiples of pi/2^k (a decimal
/// number is accepted when it equals such a multiple to 1e-12; another value is recorded in
/// `inexact_angle` and read as 0). Throws InputError with the line
/// and column of the fault. Also accepted: z, s, sdg, t, tdg (p with a fixed angle), phase and
/// cphase (= p, cp), id (dropped), and broadcast over whole registers (`h q;`).
/// A call of a user gate is refused before it is expanded when the file's gates would pass 10^8.
/// When `interrupt` is given and becomes true, throws Interrupted (run_budget.hpp).
QasmProgram parse_qasm(const std::string& text, const std::string& source,
                       const std::atomic<bool>* interrupt = nullptr);

/// Reads a file and parses it; InputError for missing or unreadable files.
QasmProgram load_qasm_file(const std::string& path, const std::atomic<bool>* interrupt = nullptr);

}  // namespace qftplan
