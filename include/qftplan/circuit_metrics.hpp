#pragma once
/// \file circuit_metrics.hpp
/// Counting and ASAP depth of a gate stream.

#include <algorithm>
#include <array>
#include <map>
#include <span>
#include <string>
#include <vector>

#include "qftplan/gate.hpp"

namespace qftplan {

/// Counts gates by kind and computes ASAP depths as the stream goes by (O(1) per gate).
class MetricsSink final : public GateSink {
 public:
  /// `qubits`: number of physical qubits the stream may address.
  /// `unfused_depth`: also track depth_2q_unfused().
  explicit MetricsSink(int qubits, bool unfused_depth = false);
  void gate(const Gate& g) override { add(g); }
  void batch(std::span<const Gate> run) override {
    for (const Gate& g : run) add(g);
  }

  long long count(GateKind k) const { return counts_[static_cast<int>(k)]; }
  long long two_qubit_count() const;
  long long total() const;
  /// Layers of all gates (measurements included).
  long long depth() const { return depth_; }
  /// Layers of two-qubit gates only (one-qubit gates take no layer).
  long long depth_2q() const { return depth_2q_; }
  /// Layers of two-qubit gates when each fused cp_swap is written as cp then swap (two layers);
  /// 0 unless constructed with `unfused_depth`.
  long long depth_2q_unfused() const { return depth_2q_unfused_; }
  /// Counts by gate name, leaving out kinds that never occurred.
  std::map<std::string, long long> counts_by_name() const;
  /// Physical qubits touched by at least one gate.
  std::vector<int> used_qubits() const;

 private:
  void add(const Gate& g) {
    ++counts_[static_cast<int>(g.kind)];
    used_[g.q0] = 1;
    if (is_two_qubit(g.kind)) {
      used_[g.q1] = 1;
      const long long l = std::max(level_[g.q0], level_[g.q1]) + 1;
      level_[g.q0] = level_[g.q1] = l;
      depth_ = std::max(depth_, l);
      const long long l2 = std::max(level_2q_[g.q0], level_2q_[g.q1]) + 1;
      level_2q_[g.q0] = level_2q_[g.q1] = l2;
      depth_2q_ = std::max(depth_2q_, l2);
      if (unfused_) {
        const long long lu = std::max(level_unfused_[g.q0], level_unfused_[g.q1]) + (g.kind == GateKind::cp_swap ? 2 : 1);
        level_unfused_[g.q0] = level_unfused_[g.q1] = lu;
        depth_2q_unfused_ = std::max(depth_2q_unfused_, lu);
      }
    } else {
      const long long l = ++level_[g.q0];
      depth_ = std::max(depth_, l);
    }
  }
  std::array<long long, kGateKindCount> counts_{};
  long long depth_ = 0, depth_2q_ = 0, depth_2q_unfused_ = 0;
  bool unfused_;
  std::vector<long long> level_, level_2q_, level_unfused_;
  std::vector<unsigned char> used_;
};

}  // namespace qftplan
