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
  const auto start_on = [&](std::initializer_list<int> qs, double duration) {
    double t = 0;
    for (int q : qs) t = std::max(t, ready_[q]);
    for (int q : qs) {
      if (first_use_[q] < 0) first_use_[q] = t;
      ready_[q] = t + duration;
    }
    makespan_ = std::max(makespan_, t + duration);
  };
  switch (g.kind) {
    case GateKind::rz:
    case GateKind::p:
      // Virtual Z: no error, no time; but the qubit is in use from here on.
      if (first_use_[g.q0] < 0) first_use_[g.q0] = ready_[g.q0];
      return;
    case GateKind::h:
    case GateKind::x:
    case GateKind::sx: {
      log_gates_ += log_keep_1q_[g.q0];
      start_on({g.q0}, dur_1q_[g.q0]);
      return;
    }
    case GateKind::measure: {
      log_readout_ += std::log1p(-dev_.qubit_calibration(g.q0).error_readout);
      measured_ = true;
      return;
    }
    default: {
      // Two-qubit gates; logical ones count as their native decomposition on the same coupler.
      const int ci = coupler_of(g.q0, g.q1);
      const int natives = g.kind == GateKind::cp ? 2 : (g.kind == GateKind::swap || g.kind == GateKind::cp_swap) ? 3 : 1;
      // A gate off the couplers cannot run: it counts as certain failure.
      log_gates_ += ci >= 0 ? natives * log_keep_2q_[ci] : -INFINITY;
      start_on({g.q0, g.q1}, ci >= 0 ? natives * dur_2q_[ci] : 0.0);
      return;
    }
  }
}

NoiseFigures NoiseSink::figures() const {
  NoiseFigures f;
  f.log_esp = log_gates_;
  f.esp = std::exp(log_gates_);
  f.duration_ns = makespan_;
  std::vector<bool> in_register(dev_.qubit_count(), false);
  for (int q : register_) in_register[q] = true;
  double log_idle = 0;
  for (int q = 0; q < dev_.qubit_count(); ++q) {
    if (!in_register[q] && first_use_[q] < 0) continue;
    const double t_ns = in_register[q] ? makespan_ : makespan_ - first_use_[q];
    const auto c = dev_.qubit_calibration(q);
    // T1 and T2 are in microseconds; an unknown time is +infinity and contributes nothing.
    log_idle -= t_ns / (1000.0 * c.t1_us) + t_ns / (1000.0 * c.t2_us);
  }
  f.esp_with_idle = std::exp(log_gates_ + log_idle);
  f.esp_with_readout = measured_ ? std::exp(log_gates_ + log_readout_) : f.esp;
  return f;
}

}  // namespace qftplan
