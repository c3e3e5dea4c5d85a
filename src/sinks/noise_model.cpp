#include "qftplan/sinks/noise_model.hpp"

#include <algorithm>
#include <cmath>

namespace qftplan {

double log_idle_fidelity(double t_ns, double t1_us, double t2_us) {
  // 1 - F = (1 - e^(-t/T1) + 2 (1 - e^(-t/T2))) / 4, with expm1 so that short gaps keep their digits.
  const double loss = (-std::expm1(-t_ns / (1000.0 * t1_us)) - 2.0 * std::expm1(-t_ns / (1000.0 * t2_us))) / 4.0;
  return std::log1p(-loss);
}

NoiseSink::NoiseSink(const Device& device, std::vector<int> register_qubits, bool mid_circuit)
    : mid_circuit_(mid_circuit), measured_q_(device.qubit_count(), 0), not_before_(device.qubit_count(), 0.0), dev_(device),
      register_(std::move(register_qubits)), ready_(device.qubit_count(), 0.0),
      first_use_(device.qubit_count(), -1.0), in_register_(device.qubit_count(), 0) {
  const int D = device.qubit_count();
  log_keep_1q_.resize(D);
  dur_1q_.resize(D);
  t1_us_.resize(D);
  t2_us_.resize(D);
  last_gap_.assign(D, -1.0);
  last_log_idle_.assign(D, 0.0);
  for (int q = 0; q < D; ++q) {
    const auto c = device.qubit_calibration(q);
    log_keep_1q_[q] = std::log1p(-c.error_1q);
    dur_1q_[q] = c.duration_1q_ns;
    t1_us_[q] = c.t1_us;
    t2_us_[q] = c.t2_us;
  }
  for (int q : register_) in_register_[q] = 1;
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

inline void NoiseSink::idle(int q, double gap_ns) {
  if (!(gap_ns > 0) || !holds(q)) return;
  idle_ns_ += gap_ns;
  if (gap_ns != last_gap_[q]) {
    last_gap_[q] = gap_ns;
    // T1 and T2 are in microseconds; an unknown time is +infinity and contributes nothing.
    last_log_idle_[q] = log_idle_fidelity(gap_ns, t1_us_[q], t2_us_[q]);
  }
  log_idle_ += last_log_idle_[q];
}

inline void NoiseSink::step(GateKind k, int qa, int qb, int ci) {
  double& ra = ready_[qa];
  if (is_two_qubit(k)) {
    double& rb = ready_[qb];
    // Logical two-qubit gates count as their native decomposition on the same coupler.
    const double natives = natives_of(k);
    // A gate off the couplers cannot run: it counts as certain failure.
    log_gates_ += ci >= 0 ? natives * log_keep_2q_[ci] : -INFINITY;
    // On the ASAP schedule the gate starts when both qubits are free: the earlier one waits.
    const double t = std::max(ra, rb);
    idle(qa, t - ra);
    idle(qb, t - rb);
    if (first_use_[qa] < 0) first_use_[qa] = t;
    if (first_use_[qb] < 0) first_use_[qb] = t;
    ra = rb = t + (ci >= 0 ? natives * dur_2q_[ci] : 0.0);
    return;
  }
  if (first_use_[qa] < 0) first_use_[qa] = ra;  // the qubit is in use from here on
  if (k == GateKind::rz || k == GateKind::p) return;  // virtual Z: no error, no time
  // h, x, sx
  if (mid_circuit_) start_timed(qa);
  log_gates_ += log_keep_1q_[qa];
  ra += dur_1q_[qa];
}

void NoiseSink::measure_now(const Gate& g) {
  const int q = g.q0;
  const QubitCalibration c = dev_.qubit_calibration(q);
  if (first_use_[q] < 0) first_use_[q] = ready_[q];
  start_timed(q);
  // The qubit is being measured from ready_[q]: its readout error covers that time; afterwards it
  // holds no information. A gate conditioned on the outcome waits for the end plus the latency.
  measured_q_[q] = 1;
  if (g.q1 < 0) return;
  const auto b = static_cast<std::size_t>(g.q1);
  if (bit_ready_.size() <= b) bit_ready_.resize(b + 1, 0.0);
  // No feed-forward from this qubit: a gate conditioned on it can never run (the planner does not
  // plan one; a read file may): +infinity makes it certain failure below.
  bit_ready_[b] = ready_[q] + c.duration_readout_ns + c.feed_forward_ns.value_or(INFINITY);
}

void NoiseSink::conditioned(const Gate& g) {
  const int q = g.q0;
  const auto b = static_cast<std::size_t>(g.q1);
  const double at = b < bit_ready_.size() ? bit_ready_[b] : 0.0;
  if (first_use_[q] < 0) first_use_[q] = ready_[q];
  if (!std::isfinite(at)) {
    log_gates_ = -INFINITY;
    return;
  }
  // Like p, a frame change taking no time: it does not split the qubit's wait, it only holds back the
  // qubit's next timed gate (start_timed) until the outcome is known.
  not_before_[q] = std::max(not_before_[q], at);
}

void NoiseSink::start_timed(int q) {
  if (not_before_[q] > ready_[q]) {
    idle(q, not_before_[q] - ready_[q]);
    ready_[q] = not_before_[q];
  }
}

void NoiseSink::add(const Gate& g) {
  const int a = g.q0;
  if (g.kind == GateKind::p_if) {
    conditioned(g);
    return;
  }
  if (g.kind == GateKind::measure) {
    log_readout_ += std::log1p(-dev_.qubit_calibration(a).error_readout);
    measured_ = true;
    if (mid_circuit_) measure_now(g);
    return;
  }
  if (is_two_qubit(g.kind))
    step(g.kind, a, g.q1, coupler_of(a, g.q1));
  else
    step(g.kind, a, a, -1);
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
    // The slot that is ready first waits for the other (counted as in step()).
    idle(q0, t - r0);
    idle(q1, t - r1);
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
  // Every qubit holding information waits from its last gate to the end of the schedule.
  double log_idle = log_idle_, idle_ns = idle_ns_;
  for (int q = 0; q < dev_.qubit_count(); ++q) {
    const double gap = makespan - ready_[q];
    if (!(gap > 0) || !holds(q)) continue;
    idle_ns += gap;
    log_idle += log_idle_fidelity(gap, t1_us_[q], t2_us_[q]);
  }
  f.log_esp_idle = log_idle;
  f.esp_idle = std::exp(log_idle);
  f.idle_ns = idle_ns;
  f.log_esp_readout = measured_ ? log_readout_ : 0.0;
  f.esp_readout = std::exp(f.log_esp_readout);
  f.log_esp_total = log_gates_ + log_idle + f.log_esp_readout;
  f.esp_total = std::exp(f.log_esp_total);
  return f;
}

}  // namespace qftplan
