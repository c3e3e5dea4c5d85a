#pragma once
/// \file gate.hpp
/// Gates on physical qubits, and the sink interface through which circuits stream.

#include <cstdint>
#include <span>
#include <string_view>
#include <vector>

#include "qftplan/core/angle.hpp"

namespace qftplan {

/// The gate kinds qftplan emits and reads. Names follow OpenQASM's standard gate library.
enum class GateKind : std::uint8_t {
  h,        ///< Hadamard
  x,        ///< Pauli X
  sx,       ///< square root of X
  rz,       ///< Z rotation diag(e^{-i t/2}, e^{i t/2})
  p,        ///< phase diag(1, e^{i t})
  cx,       ///< controlled X, q0 control
  cz,       ///< controlled Z (symmetric)
  cp,       ///< controlled phase diag(1,1,1,e^{i t}) (symmetric)
  swap,     ///< SWAP
  cp_swap,  ///< fused block: controlled phase then SWAP (one two-qubit block)
  measure,  ///< measurement of q0 into bit q1
  /// parity block (ours, the parity network): cx q1,q0; cx q0,q1; rz(t) q0. With values (A, B) on
  /// (q0, q1) it leaves (A xor B, A) and the phase t on A xor B (one two-qubit block, 2 CX). The rz
  /// comes last (q0 keeps A xor B through the second cx, of which it is the control), so a qubit's
  /// next block need not wait for it: the parity network's depth falls from 6n to 5n.
  parity_step,
  /// phase diag(1, e^{i t}) on q0 applied only when classical bit q1 reads 1 (ours: a classically
  /// conditioned phase of a dynamic circuit; written `if (c[j]) p(t) $q;`)
  p_if,
};

inline constexpr int kGateKindCount = 13;

/// OpenQASM-style lower-case name ("cp_swap" and "parity_step" for the blocks, which writers expand).
std::string_view gate_name(GateKind k);
/// True for cx, cz, cp, swap, cp_swap and parity_step.
constexpr bool is_two_qubit(GateKind k) {
  return k == GateKind::cx || k == GateKind::cz || k == GateKind::cp || k == GateKind::swap || k == GateKind::cp_swap ||
         k == GateKind::parity_step;
}
/// True for gates with an angle parameter (rz, p, cp, cp_swap, parity_step, p_if).
constexpr bool has_angle(GateKind k) {
  return k == GateKind::rz || k == GateKind::p || k == GateKind::cp || k == GateKind::cp_swap ||
         k == GateKind::parity_step || k == GateKind::p_if;
}
/// True for the gates that read or write a classical bit (q1 is the bit index): measure and p_if.
constexpr bool uses_bit(GateKind k) { return k == GateKind::measure || k == GateKind::p_if; }

/// One gate on physical qubits. For one-qubit gates q1 is unused; for measure and p_if, q1 is the bit index.
struct Gate {
  GateKind kind = GateKind::h;
  std::int32_t q0 = 0;
  std::int32_t q1 = -1;
  Angle angle;
  bool operator==(const Gate&) const = default;
};

/// Receives a circuit gate by gate. Planners emit into a sink, so big circuits stream.
class GateSink {
 public:
  virtual ~GateSink() = default;
  virtual void gate(const Gate& g) = 0;
  /// A run of consecutive gates, in order. The default hands them to gate() one by one; the sinks on
  /// the hot path override it, so that a planner's chunk of a few hundred gates costs one virtual
  /// call per sink instead of one per gate.
  virtual void batch(std::span<const Gate> run) {
    for (const Gate& g : run) gate(g);
  }
  /// Called once after the last gate.
  virtual void finish() {}
};

/// Forwards every gate to several sinks in order.
class TeeSink final : public GateSink {
 public:
  explicit TeeSink(std::vector<GateSink*> sinks) : sinks_(std::move(sinks)) {}
  void gate(const Gate& g) override {
    for (auto* s : sinks_) s->gate(g);
  }
  /// Each sink receives the whole run in turn (sinks are independent of one another).
  void batch(std::span<const Gate> run) override {
    for (auto* s : sinks_) s->batch(run);
  }
  void finish() override {
    for (auto* s : sinks_) s->finish();
  }

 private:
  std::vector<GateSink*> sinks_;
};

/// Collects the gates a rewriting sink produces and hands them on in runs of up to a thousand, so the
/// sinks downstream see one batch() call per run (used by the rewriting sinks: native decomposition, detours).
class GateRun {
 public:
  explicit GateRun(GateSink& out) : out_(out) { buf_.reserve(kCapacity + 8); }
  void put(const Gate& g) { buf_.push_back(g); }
  /// Hands on what is collected once it nears the capacity (a rewrite adds at most 8 gates).
  void flush_if_full() {
    if (buf_.size() >= kCapacity) flush();
  }
  void flush() {
    if (buf_.empty()) return;
    out_.batch(buf_);
    buf_.clear();
  }
  GateSink& out() { return out_; }

 private:
  static constexpr std::size_t kCapacity = 1024;
  GateSink& out_;
  std::vector<Gate> buf_;
};

/// Keeps every gate (for tests, small circuits and checkers that need the whole list).
class VectorSink final : public GateSink {
 public:
  void gate(const Gate& g) override { gates.push_back(g); }
  void batch(std::span<const Gate> run) override { gates.insert(gates.end(), run.begin(), run.end()); }
  std::vector<Gate> gates;
};

/// Convenience constructors.
inline Gate make_gate(GateKind k, int q0, int q1 = -1, Angle a = {}) { return Gate{k, q0, q1, a}; }

}  // namespace qftplan
