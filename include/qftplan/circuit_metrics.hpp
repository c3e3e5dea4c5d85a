#pragma once
/// \file circuit_metrics.hpp
/// Counting and ASAP depth of a gate stream.

#include <array>
#include <map>
#include <string>
#include <vector>

#include "qftplan/gate.hpp"

namespace qftplan {

/// Counts gates by kind and computes ASAP depths as the stream goes by (O(1) per gate).
class MetricsSink final : public GateSink {
 public:
  /// `qubits`: number of physical qubits the stream may address.
  explicit MetricsSink(int qubits);
  void gate(const Gate& g) override;

  long long count(GateKind k) const { return counts_[static_cast<int>(k)]; }
  long long two_qubit_count() const { return two_qubit_; }
  long long total() const { return total_; }
  /// Layers of all gates (measurements included).
  long long depth() const { return depth_; }
  /// Layers of two-qubit gates only (one-qubit gates take no layer).
  long long depth_2q() const { return depth_2q_; }
  /// Counts by gate name, leaving out kinds that never occurred.
  std::map<std::string, long long> counts_by_name() const;
  /// Physical qubits touched by at least one gate.
  std::vector<int> used_qubits() const;

 private:
  std::array<long long, kGateKindCount> counts_{};
  long long two_qubit_ = 0, total_ = 0, depth_ = 0, depth_2q_ = 0;
  std::vector<long long> level_, level_2q_;
  std::vector<bool> used_;
};

}  // namespace qftplan
