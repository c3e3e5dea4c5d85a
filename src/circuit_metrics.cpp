#include "qftplan/circuit_metrics.hpp"

#include <algorithm>

namespace qftplan {

MetricsSink::MetricsSink(int qubits, bool unfused_depth)
    : unfused_(unfused_depth),
      level_(qubits, 0),
      level_2q_(qubits, 0),
      level_unfused_(unfused_depth ? qubits : 0, 0) {}

static long long largest(const std::vector<long long>& v) { return v.empty() ? 0 : *std::max_element(v.begin(), v.end()); }

long long MetricsSink::depth() const { return largest(level_); }
long long MetricsSink::depth_2q() const { return largest(level_2q_); }
long long MetricsSink::depth_2q_unfused() const { return largest(level_unfused_); }

long long MetricsSink::two_qubit_count() const {
  long long c = 0;
  for (int k = 0; k < kGateKindCount; ++k)
    if (is_two_qubit(static_cast<GateKind>(k))) c += counts_[k];
  return c;
}

long long MetricsSink::total() const {
  long long c = 0;
  for (long long k : counts_) c += k;
  return c;
}

std::map<std::string, long long> MetricsSink::counts_by_name() const {
  std::map<std::string, long long> out;
  for (int k = 0; k < kGateKindCount; ++k)
    if (counts_[k] > 0) out[std::string(gate_name(static_cast<GateKind>(k)))] = counts_[k];
  return out;
}

std::vector<int> MetricsSink::used_qubits() const {
  std::vector<int> out;
  for (int q = 0; q < static_cast<int>(level_.size()); ++q)
    if (level_[q] > 0) out.push_back(q);
  return out;
}

}  // namespace qftplan
