#include "qftplan/sinks/circuit_metrics.hpp"

#include <algorithm>
#include <tuple>

namespace qftplan {

MetricsSink::MetricsSink(int qubits, bool unfused_depth)
    : unfused_(unfused_depth),
      level_(qubits, 0),
      level_2q_(qubits, 0),
      level_unfused_(unfused_depth ? qubits : 0, 0) {}

void MetricsSink::replay(const GateProgram& program, int q0, int q1) {
  // The unfused depth and gates on one qubit take the plain path; otherwise the program's max-plus
  // matrices move both levels at once.
  if (unfused_ || !program.two_qubit() || q0 == q1) {
    for (const ProgramStep& s : program.view())
      add(make_gate(s.kind, GateProgram::qubit(s.a, q0, q1), GateProgram::qubit(s.b, q0, q1)));
    return;
  }
  for (const auto& [kind, count] : program.kind_counts()) counts_[static_cast<int>(kind)] += count;
  std::tie(level_[q0], level_[q1]) = program.levels().apply(level_[q0], level_[q1]);
  std::tie(level_2q_[q0], level_2q_[q1]) = program.levels_2q().apply(level_2q_[q0], level_2q_[q1]);
}

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
