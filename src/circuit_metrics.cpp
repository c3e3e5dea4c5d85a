#include "qftplan/circuit_metrics.hpp"

#include <algorithm>

namespace qftplan {

MetricsSink::MetricsSink(int qubits) : level_(qubits, 0), level_2q_(qubits, 0), used_(qubits, false) {}

void MetricsSink::gate(const Gate& g) {
  ++counts_[static_cast<int>(g.kind)];
  ++total_;
  used_[g.q0] = true;
  if (is_two_qubit(g.kind)) {
    ++two_qubit_;
    used_[g.q1] = true;
    const long long l = std::max(level_[g.q0], level_[g.q1]) + 1;
    level_[g.q0] = level_[g.q1] = l;
    depth_ = std::max(depth_, l);
    const long long l2 = std::max(level_2q_[g.q0], level_2q_[g.q1]) + 1;
    level_2q_[g.q0] = level_2q_[g.q1] = l2;
    depth_2q_ = std::max(depth_2q_, l2);
  } else {
    const long long l = ++level_[g.q0];
    depth_ = std::max(depth_, l);
  }
}

std::map<std::string, long long> MetricsSink::counts_by_name() const {
  std::map<std::string, long long> out;
  for (int k = 0; k < kGateKindCount; ++k)
    if (counts_[k] > 0) out[std::string(gate_name(static_cast<GateKind>(k)))] = counts_[k];
  return out;
}

std::vector<int> MetricsSink::used_qubits() const {
  std::vector<int> out;
  for (int q = 0; q < static_cast<int>(used_.size()); ++q)
    if (used_[q]) out.push_back(q);
  return out;
}

}  // namespace qftplan
