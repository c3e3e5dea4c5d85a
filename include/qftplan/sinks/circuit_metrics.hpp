#pragma once
/// \file circuit_metrics.hpp
/// Counting and ASAP depth of a gate stream.

#include <algorithm>
#include <array>
#include <map>
#include <span>
#include <string>
#include <vector>

#include "qftplan/core/gate.hpp"
#include "qftplan/core/gate_program.hpp"

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
  /// Counts `program` as if its gates came one by one on (q0, q1): the same counts and depths.
  void replay(const GateProgram& program, int q0, int q1);

  long long count(GateKind k) const { return counts_[static_cast<int>(k)]; }
  /// Two-qubit gates that are controlled phases: cp and cp_swap.
  long long rotations() const { return count(GateKind::cp) + count(GateKind::cp_swap); }
  long long two_qubit_count() const;
  long long total() const;
  /// Layers of all gates (measurements included).
  long long depth() const;
  /// Layers of two-qubit gates only (one-qubit gates take no layer).
  long long depth_2q() const;
  /// Layers of two-qubit gates when each fused cp_swap is written as cp then swap, and each
  /// parity_step as its two cx (two layers each);
  /// 0 unless constructed with `unfused_depth`.
  long long depth_2q_unfused() const;
  /// Counts by gate name, leaving out kinds that never occurred.
  std::map<std::string, long long> counts_by_name() const;
  /// Physical qubits touched by at least one gate.
  std::vector<int> used_qubits() const;

 private:
  // Levels only grow, so the depths are the largest final levels (computed when asked). Written
  // without branches on the kind: a one-qubit gate is a "two-qubit gate" on (q0, q0) that adds no
  // two-qubit layer.
  void add(const Gate& g) {
    ++counts_[static_cast<int>(g.kind)];
    if (uses_bit(g.kind) && g.q1 >= 0) {
      classical(g);
      return;
    }
    const bool two = is_two_qubit(g.kind);
    const int a = g.q0, b = two ? g.q1 : g.q0;
    step(two, level_[a], level_[b], level_2q_[a], level_2q_[b]);
    if (unfused_) {
      const long long lu = std::max(level_unfused_[a], level_unfused_[b]) + (two ? 1 : 0) +
                           (g.kind == GateKind::cp_swap || g.kind == GateKind::parity_step ? 1 : 0);
      level_unfused_[a] = level_unfused_[b] = lu;
    }
  }
  // One gate's effect on the levels of its qubits (for a one-qubit gate both pairs name one qubit).
  static void step(bool two, long long& la, long long& lb, long long& ma, long long& mb) {
    const long long l = std::max(la, lb) + 1;
    la = lb = l;
    const long long l2 = std::max(ma, mb) + (two ? 1 : 0);
    ma = mb = l2;
  }
  // A measurement or a conditioned phase: the layer also follows the bit it writes or reads (a
  // conditioned gate comes after the measurement it depends on).
  void classical(const Gate& g) {
    const auto b = static_cast<std::size_t>(g.q1);
    if (bit_level_.size() <= b) bit_level_.resize(b + 1, 0);
    const long long l = std::max(level_[g.q0], bit_level_[b]) + 1;
    level_[g.q0] = l;
    if (g.kind == GateKind::measure) bit_level_[b] = l;
  }
  std::vector<long long> bit_level_;  // layer of the measurement that last wrote each bit
  std::array<long long, kGateKindCount> counts_{};
  bool unfused_;
  std::vector<long long> level_, level_2q_, level_unfused_;  // per qubit; level_ > 0 iff used
};

}  // namespace qftplan
