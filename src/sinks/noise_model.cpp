#include "qftplan/sinks/noise_model.hpp"

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

namespace {

double natives_of(GateKind k) {
  return k == GateKind::cp || k == GateKind::parity_step ? 2 : (k == GateKind::swap || k == GateKind::cp_swap) ? 3 : 1;
}

}  // namespace

inline void NoiseSink::step(GateKind k, int qa, int ci, double& ra, double& fa, double& rb, double& fb) {
  if (is_two_qubit(k)) {
    // Logical two-qubit gates count as their native decomposition on the same coupler.
    const double natives = natives_of(k);
    // A gate off the couplers cannot run: it counts as certain failure.
    log_gates_ += ci >= 0 ? natives * log_keep_2q_[ci] : -INFINITY;
    const double t = std::max(ra, rb);
    if (fa < 0) fa = t;
    if (fb < 0) fb = t;
    ra = rb = t + (ci >= 0 ? natives * dur_2q_[ci] : 0.0);
    return;
  }
  if (fa < 0) fa = ra;  // the qubit is in use from here on
  if (k == GateKind::rz || k == GateKind::p) return;  // virtual Z: no error, no time
  // h, x, sx
  log_gates_ += log_keep_1q_[qa];
  ra += dur_1q_[qa];
}

void NoiseSink::add(const Gate& g) {
  const int a = g.q0;
  if (g.kind == GateKind::measure) {
    log_readout_ += std::log1p(-dev_.qubit_calibration(a).error_readout);
    measured_ = true;
    return;
  }
  if (is_two_qubit(g.kind)) {
    const int b = g.q1;
    step(g.kind, a, coupler_of(a, b), ready_[a], first_use_[a], ready_[b], first_use_[b]);
  } else {
    step(g.kind, a, -1, ready_[a], first_use_[a], ready_[a], first_use_[a]);
  }
}


NoiseSink::ProgramCost NoiseSink::cost_of(const GateProgram& program) {
  ProgramCost c;
  c.segments.emplace_back();
  bool synced = false;
  for (const ProgramStep& s : program.view()) {
    if (is_two_qubit(s.kind)) {
      c.natives_2q += static_cast<int>(natives_of(s.kind));
      c.segments.back().syncs += static_cast<int>(natives_of(s.kind));
      synced = true;
      continue;
    }
    if (!synced) c.used_early[s.a] = true;
    if (s.kind == GateKind::rz || s.kind == GateKind::p) continue;  // virtual Z: no error, no time
    ++c.errors_1q[s.a];
    // A timed gate after two-qubit gates starts a new segment.
    if (c.segments.back().syncs > 0) c.segments.emplace_back();
    ++c.segments.back().timed[s.a];
  }
  return c;
}

void NoiseSink::replay(const GateProgram& program, const ProgramCost& cost, int q0, int q1) {
  if (!program.two_qubit() || q0 == q1) {
    for (const ProgramStep& s : program.view())
      add(make_gate(s.kind, GateProgram::qubit(s.a, q0, q1), GateProgram::qubit(s.b, q0, q1)));
    return;
  }
  const int ci = coupler_of(q0, q1);
  // A gate off the couplers cannot run: it counts as certain failure and takes no time.
  const double keep_2q = ci >= 0 ? log_keep_2q_[ci] : -INFINITY, dur_2q = ci >= 0 ? dur_2q_[ci] : 0.0;
  log_gates_ += cost.errors_1q[0] * log_keep_1q_[q0] + cost.errors_1q[1] * log_keep_1q_[q1] + cost.natives_2q * keep_2q;
  const double d0 = dur_1q_[q0], d1 = dur_1q_[q1];
  double r0 = ready_[q0], r1 = ready_[q1];
  // First use: at the start when the slot has a gate before the first two-qubit gate, else when
  // that gate starts.
  if (first_use_[q0] < 0 && cost.used_early[0]) first_use_[q0] = r0;
  if (first_use_[q1] < 0 && cost.used_early[1]) first_use_[q1] = r1;
  bool first_sync = true;
  for (const ProgramCost::Segment& seg : cost.segments) {
    r0 += seg.timed[0] * d0;
    r1 += seg.timed[1] * d1;
    if (seg.syncs == 0) continue;
    const double t = std::max(r0, r1);
    if (first_sync) {
      if (first_use_[q0] < 0) first_use_[q0] = t;
      if (first_use_[q1] < 0) first_use_[q1] = t;
      first_sync = false;
    }
    r0 = r1 = t + seg.syncs * dur_2q;
  }
  ready_[q0] = r0;
  ready_[q1] = r1;
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
