#pragma once
/// \file qasm_writer.hpp
/// OpenQASM 3 and 2 text output of a gate stream, buffered for speed.

#include <string>
#include <vector>

#include "qftplan/atomic_file.hpp"
#include "qftplan/gate.hpp"
#include "qftplan/qft_spec.hpp"

namespace qftplan {

enum class QasmVersion { v2, v3 };

/// Parses "qasm3" / "qasm2"; InputError otherwise.
QasmVersion parse_qasm_version(const std::string& text);

/// What the header comment of an emitted file records.
struct CircuitHeader {
  std::string device_name;
  int device_qubits = 0;
  std::string strategy;              ///< e.g. "chain (reversal network)"
  QftSpec spec;
  std::vector<int> placement;
  std::vector<int> final_placement;
  int measured_bits = 0;             ///< > 0: declare a bit register of this size
};

/// Writes gates as OpenQASM text. Version 3 addresses physical qubits as $k with stdgates.inc
/// names; version 2 declares qreg q[D] with qelib1.inc names (cu1 for cp, u1 for p, three cx for
/// swap). A cp_swap is written as cp then swap. Angles are exact (pi/2**k, or pi/K in version 2).
class QasmWriter final : public GateSink {
 public:
  QasmWriter(QasmVersion version, const CircuitHeader& header, TextOutput& out);
  void gate(const Gate& g) override;
  void finish() override;
  /// Bytes written so far.
  long long bytes() const { return bytes_ + static_cast<long long>(buf_.size()); }

 private:
  void qubit(int q);
  void flush_if_full();
  QasmVersion version_;
  TextOutput& out_;
  std::string buf_;
  long long bytes_ = 0;
};

/// The human-readable description of the transform used in headers and summaries,
/// e.g. "inverse QFT on 8 qubits, approximate (degree 3)".
std::string describe_transform(const QftSpec& spec);

}  // namespace qftplan
