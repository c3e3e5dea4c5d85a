#pragma once
/// \file peephole.hpp
/// The peephole pass on a native gate stream: gates that meet on their qubits with nothing between
/// them there and together do nothing are removed, streaming, with a bounded state per qubit.

#include <algorithm>
#include <cstdint>
#include <iterator>
#include <optional>
#include <span>
#include <utility>
#include <vector>

#include "qftplan/core/gate.hpp"
#include "qftplan/core/gate_program.hpp"
#include "qftplan/device/device.hpp"
#include "qftplan/sinks/native_gates.hpp"
#include "qftplan/sinks/noise_model.hpp"

namespace qftplan {

/// What the peephole rewrites make of gate `g` arriving right after `held`, the last gate on every qubit
/// of `g`: `none`; `cancel` (a self-inverse pair: h h, x x, cx cx with the same control, cz cz, swap swap);
/// `merged` (rz rz or p p: `held` now carries the exact sum of the angles); `merged_to_zero` (the sum is
/// 0 mod 2 pi: both go). Angles whose denominators are 2^62 apart (never in a QFT) are left unmerged.
enum class PairRewrite { none, cancel, merged, merged_to_zero };
PairRewrite pair_rewrite(Gate& held, const Gate& g);

/// The gates held on one qubit by a peephole sink, oldest first, in a small ring of `Depth` slots stored
/// inline (a gate touches only the rings of its own qubits). `Slot` has a `Gate g` and a `seq`, its place
/// in the input (a two-qubit gate is held on both its qubits' rings as one gate: the same seq).
template <class Slot, int Depth>
struct HeldRing {
  Slot slot[Depth];
  std::uint8_t head = 0;  // index of the oldest
  std::uint8_t size = 0;
  Slot& top() { return slot[(head + size - 1) % Depth]; }
  Slot& bottom() { return slot[head]; }
  void push(const Slot& s) { slot[(head + size++) % Depth] = s; }
  void pop_top() { --size; }
  void pop_bottom() {
    head = static_cast<std::uint8_t>((head + 1) % Depth);
    --size;
  }
};

/// Sends everything `rings` hold, oldest first (each gate after those it depends on, as in the input):
/// `emit_bottom(q)` sends the oldest gate held on qubit q (and whatever it must wait for).
template <class Ring, class EmitBottom>
void release_oldest_first(std::vector<Ring>& rings, EmitBottom emit_bottom) {
  std::vector<std::pair<std::uint64_t, int>> held;
  for (int q = 0; q < static_cast<int>(rings.size()); ++q) {
    const Ring& r = rings[q];
    for (int i = 0; i < r.size; ++i) {
      const auto& s = r.slot[(r.head + i) % std::size(r.slot)];
      if (s.g.q0 == q) held.emplace_back(s.seq, q);
    }
  }
  std::sort(held.begin(), held.end());
  for (const auto& [seq, q] : held)
    while (rings[q].size > 0 && rings[q].bottom().seq <= seq) emit_bottom(q);
}

/// Removes from a stream of gates, as they arrive:
///   - two equal self-inverse gates adjacent on their qubits: h h, x x, cx a,b cx a,b (same control and
///     target), cz a,b cz a,b or cz a,b cz b,a, swap a,b swap a,b or swap b,a;
///   - the second of two rz (or two p) adjacent on one qubit, its angle added exactly to the first;
///   - an rz or p whose angle is zero (mod 2 pi), as it arrives or once a merge makes it so.
/// "Adjacent on their qubits" means no gate touches any of those qubits between the two; gates on
/// other qubits commute with both (common practice: operators on disjoint qubits commute). Removals
/// cascade: once a pair goes, the gates before it on its qubits meet the gates that follow.
///
/// The rewrites keep the unitary exactly, except rz(t) rz(u) -> rz(t + u) and rz(0) -> nothing, which
/// keep it up to a global phase because angles are reduced mod 2 pi (rz(2 pi) = -1); p merges are exact.
///
/// State: per qubit a stack of the last gates on it still held back (at most kDepth); when a stack
/// overflows its oldest gate goes out, after the held gates it depends on. Gates therefore leave in
/// an order that keeps the order of gates on every qubit (the circuit's dependency graph is that of
/// the input less the removed gates) but not always the input's order across qubits. Measurements
/// (q1 is the bit) pass through in order on their qubit and remove nothing. finish() sends what is
/// held, oldest first.
class PeepholePass final : public GateSink {
 public:
  /// Gates held back per qubit at most (how deep a cascade can reach).
  static constexpr int kDepth = 4;
  /// `qubits`: the number of physical qubits the stream may address.
  PeepholePass(int qubits, GateSink& out);
  void gate(const Gate& g) override { add(g); }
  void batch(std::span<const Gate> run) override;
  void finish() override;
  /// Gates removed so far (a merge of two rotations removes one).
  long long removed() const { return removed_; }

 private:
  // A held gate and its place in the input (a two-qubit gate is held on both its qubits' stacks,
  // as one gate: the same seq).
  struct Slot {
    Gate g;
    std::uint64_t seq = 0;
  };
  using Stack = HeldRing<Slot, kDepth>;
  void add(const Gate& g);
  bool try_cancel(const Gate& g);
  void push(const Gate& g);
  void drop_top(const Gate& held);
  void emit_bottom(int q);

  std::vector<Stack> stacks_;
  std::vector<int> work_;  // emit_bottom's explicit stack of qubits
  std::uint64_t seq_ = 0;
  long long removed_ = 0;
  GateRun out_;
};

class MetricsSink;

/// The native decomposition of a logical stream followed by PeepholePass's rewrites, fed to the
/// native counters and the noise model and, when given, a writer of the native gates. Where the
/// first native gate a logical gate puts on a qubit cannot pair with the last one held there, the
/// logical gate is held whole and counted, when it leaves, by replaying its kind's native program
/// (NativeReplay's fast path: one step per logical gate); otherwise both are opened into native
/// gates and the rewrites run on those. Gates that leave are counted in the order they leave, and
/// the writer receives the same gates, so the figures are those of the written circuit.
class NativePeephole final : public GateSink {
 public:
  static constexpr int kDepth = 3;
  NativePeephole(TwoQubitGate target, int qubits, MetricsSink& metrics, NoiseSink& noise, GateSink* writer);
  void gate(const Gate& g) override { add(g); }
  void batch(std::span<const Gate> run) override;
  void finish() override;
  /// Native gates removed so far.
  long long removed() const { return removed_; }

 private:
  struct Slot {
    Gate g;
    std::uint64_t seq = 0;
    bool block = false;  // a logical gate held whole
  };
  using Stack = HeldRing<Slot, kDepth>;
  // A kind's native program and where each slot's first and last step are (-1: slot unused).
  // The first or last step of a program on one slot.
  struct End {
    int index = -1;  // -1: the slot is unused
    GateKind kind = GateKind::h;
    std::uint8_t a = 0, b = 0;  // its slots
  };
  struct Program {
    GateProgram steps;
    NoiseSink::ProgramCost cost;
    End head[2];
    End tail[2];
  };
  static bool slots2(const Slot& s) { return is_two_qubit(s.g.kind); }
  const Program& program_of(const Gate& g) const {
    return programs_[g.angle.is_zero() ? 1 : 0][static_cast<int>(g.kind)];
  }
  void add(const Gate& g);
  bool pairs_with_top(const Gate& g, int slot);
  void open(int q);
  void add_native(const Gate& g);
  bool try_cancel(const Gate& g);
  void push(const Slot& s);
  void emit_bottom(int q);
  void emit(const Slot& s);
  void send(const Gate& native);
  const std::vector<Gate>& decompose(const Gate& g);  // valid until the next call

  Program programs_[2][kGateKindCount];
  MetricsSink& metrics_;
  NoiseSink& noise_;
  GateSink* writer_;
  std::optional<GateRun> written_;
  std::vector<Stack> stacks_;
  std::vector<int> work_;
  std::uint64_t seq_ = 0;
  long long removed_ = 0;
  VectorSink scratch_;
  NativeDecomposer scratch_dec_;
};

}  // namespace qftplan
