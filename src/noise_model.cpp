#include "qftplan/noise_model.hpp"

#include <algorithm>
#include <cmath>

namespace qftplan {

NoiseSink::NoiseSink(const Device& device, std::vector<int> register_qubits)
    : dev_(device), register_(std::move(register_qubits)), ready_(device.qubit_count(), 0.0),
      first_use_(device.qubit_count(), -1.0) {
  log_keep_1q_.resize(device.qubit_count());
  dur_1q_.resize(device.qubit_count());
  for (int q = 0; q < device.qubit_count(); ++q) {
    const auto c = device.qubit_calibration(q);
    log_keep_1q_[q] = std::log1p(-c.error_1q);
    dur_1q_[q] = c.duration_1q_ns;
  }
  log_keep_2q_.resize(device.coupler_count());
  dur_2q_.resize(device.coupler_count());
  for (int i = 0; i < device.coupler_count(); ++i) {
    const auto c = device.coupler_calibration(i);
    log_keep_2q_[i] = std::log1p(-c.error);
    dur_2q_[i] = c.duration_ns;
  }
}

void NoiseSink::batch(std::span<const Gate> run) {
  for (const Gate& g : run) add(g);
}

int NoiseSink::coupler_of(int a, int b) {
  // Decomposed blocks put several gates on one coupler in a row: remember the last lookup.
  if ((a == last_a_ && b == last_b_) || (a == last_b_ && b == last_a_)) return last_coupler_;
  last_a_ = a;
  last_b_ = b;
  last_coupler_ = dev_.coupler_index(a, b);
  return last_coupler_;
}

void NoiseSink::add(const Gate& g) {
  const int a = g.q0;
  if (is_two_qubit(g.kind)) {
    // Logical two-qubit gates count as their native decomposition on the same coupler.
    const int b = g.q1;
    const int ci = coupler_of(a, b);
    const double natives = g.kind == GateKind::cp ? 2 : (g.kind == GateKind::swap || g.kind == GateKind::cp_swap) ? 3 : 1;
    // A gate off the couplers cannot run: it counts as certain failure.
    log_gates_ += ci >= 0 ? natives * log_keep_2q_[ci] : -INFINITY;
    const double t = std::max(ready_[a], ready_[b]);
    if (first_use_[a] < 0) first_use_[a] = t;
    if (first_use_[b] < 0) first_use_[b] = t;
    ready_[a] = ready_[b] = t + (ci >= 0 ? natives * dur_2q_[ci] : 0.0);
    return;
  }
  switch (g.kind) {
    case GateKind::rz:
    case GateKind::p:
      // Virtual Z: no error, no time; but the qubit is in use from here on.
      if (first_use_[a] < 0) first_use_[a] = ready_[a];
      return;
    case GateKind::measure:
      log_readout_ += std::log1p(-dev_.qubit_calibration(a).error_readout);
      measured_ = true;
      return;
    default:  // h, x, sx
      log_gates_ += log_keep_1q_[a];
      if (first_use_[a] < 0) first_use_[a] = ready_[a];
      ready_[a] += dur_1q_[a];
      return;
  }
}

NoiseFigures NoiseSink::figures() const {
  NoiseFigures f;
  f.log_esp = log_gates_;
  f.esp = std::exp(log_gates_);
  // Ready times only grow, so the schedule ends at the latest one.
  const double makespan = ready_.empty() ? 0.0 : *std::max_element(ready_.begin(), ready_.end());
  f.duration_ns = makespan;
  std::vector<bool> in_register(dev_.qubit_count(), false);
  for (int q : register_) in_register[q] = true;
  double log_idle = 0;
  for (int q = 0; q < dev_.qubit_count(); ++q) {
    if (!in_register[q] && first_use_[q] < 0) continue;
    const double t_ns = in_register[q] ? makespan : makespan - first_use_[q];
    const auto c = dev_.qubit_calibration(q);
    // T1 and T2 are in microseconds; an unknown time is +infinity and contributes nothing.
    log_idle -= t_ns / (1000.0 * c.t1_us) + t_ns / (1000.0 * c.t2_us);
  }
  f.esp_with_idle = std::exp(log_gates_ + log_idle);
  f.esp_with_readout = measured_ ? std::exp(log_gates_ + log_readout_) : f.esp;
  return f;
}

}  // namespace qftplan
