#pragma once
/// \file qasm_writer.hpp
/// OpenQASM 3 and 2 text output of a gate stream, buffered for speed.

#include <map>
#include <memory>
#include <string>
#include <optional>
#include <string_view>
#include <vector>

#include "qftplan/core/atomic_file.hpp"
#include "qftplan/core/gate.hpp"
#include "qftplan/core/qft_spec.hpp"

namespace qftplan {

enum class QasmVersion { v2, v3 };

/// Parses "qasm3" / "qasm2"; InputError otherwise.
QasmVersion parse_qasm_version(const std::string& text);

/// A sink that hands on the gates as a file of `version` spells them, so that counts and depths are
/// the file's: OpenQASM 2 (qelib1.inc has no swap in our files) writes each swap as three cx. Null
/// when the version needs no rewriting (then count the stream itself).
std::unique_ptr<GateSink> as_written(QasmVersion version, GateSink& next);

/// Renames gate counts to the names a file of `version` uses: OpenQASM 2 calls cp and p cu1 and u1.
void rename_as_written(QasmVersion version, std::map<std::string, long long>& counts);

/// What the header comment of an emitted file records.
struct CircuitHeader {
  std::string device_name;
  int device_qubits = 0;
  std::string strategy;              ///< e.g. "chain (reversal network)"
  QftSpec spec;
  std::vector<int> placement;
  std::vector<int> final_placement;
  int measured_bits = 0;             ///< > 0: declare a bit register of this size
  /// Mid-circuit measurements with conditioned phases (the semi-classical readout): OpenQASM 2, whose
  /// `if` compares a whole register, then gets one one-bit register per bit, c0 .. c{n-1}.
  bool conditioned = false;
};

/// Writes gates as OpenQASM text. Version 3 addresses physical qubits as $k with stdgates.inc
/// names; version 2 declares qreg q[D] with qelib1.inc names (cu1 for cp, u1 for p, three cx for
/// swap). A cp_swap is written as cp then swap, a parity_step as cx, rz, cx. Angles are exact (pi/2**k,
/// or pi/K in version 2).
class QasmWriter final : public GateSink {
 public:
  QasmWriter(QasmVersion version, const CircuitHeader& header, TextOutput& out);
  void gate(const Gate& g) override;
  void finish() override;
  /// Bytes written so far.
  long long bytes() const { return bytes_ + static_cast<long long>(len_); }

 private:
  // The text goes into a fixed buffer through a cursor (no per-append capacity checks); room() makes
  // sure a whole gate's line fits, handing the buffer on when it is full.
  char* room(std::size_t n);
  char* qubit(char* p, int q) const;
  char* angle(char* p, const Angle& a);
  void append(std::string_view text);
  void flush();
  QasmVersion version_;
  TextOutput& out_;
  std::vector<char> buf_;
  std::size_t len_ = 0;
  bool bit_registers_ = false;  // OpenQASM 2 with conditioned phases: one register c{k}[1] per bit
  std::string angle2_;  // an OpenQASM 2 angle (its denominator can have thousands of digits)
  // Each gate names one or two qubits and most angles are +-pi/2^k, so their texts are made once:
  // 16-byte slots holding the length then the characters ("$17", "q[17]"; "pi/2**5", "-pi/2**5").
  static constexpr std::size_t kSlot = 16;
  std::vector<char> qubit_text_;
  std::vector<char> angle_text_;  // OpenQASM 3: slot 2k for pi/2^k, 2k+1 for -pi/2^k
  long long bytes_ = 0;
};

/// The human-readable description of the transform used in headers and summaries,
/// e.g. "inverse QFT on 8 qubits, approximate (degree 3)".
std::string describe_transform(const QftSpec& spec);

/// The transform a header's "// transform:" text names (the inverse of describe_transform), or
/// nullopt when the text is not in that form.
std::optional<QftSpec> parse_transform(std::string_view text);

}  // namespace qftplan
