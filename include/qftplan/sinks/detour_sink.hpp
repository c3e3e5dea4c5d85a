#pragma once
/// \file detour_sink.hpp
/// Runs two-qubit gates between uncoupled qubits along a path of coupled ones.

#include <vector>

#include "qftplan/core/gate.hpp"

namespace qftplan {

/// A detour: `a` and `b` are not coupled, so their gates run along the path a, via[0], ..., via.back(), b
/// (consecutive qubits coupled). `a` is the end that steps aside.
struct Detour {
  int a = -1;              ///< the end that moves along the path
  int b = -1;              ///< the end that stays
  std::vector<int> via;    ///< the qubits between them, from a's side (at least one)
  bool operator==(const Detour&) const = default;
};

/// Forwards gates; a two-qubit gate on a pair with a registered detour a, v1, ..., vk, b becomes
/// swap(a, v1), swap(v1, v2), ..., swap(v(k-1), vk); the gate on (vk, b); then the same SWAPs in reverse
/// order. The SWAPs carry a's content to vk and back, and the reversed sequence returns every qubit of
/// the path to what it held, so the data sees exactly the gate on (a, b).
/// A SWAP next to a parity step on the same pair (nothing on either qubit between them) is fused with
/// it into one cx and an rz (5 CX become 1): a detour's first SWAP usually follows the parity step the
/// chain network ran on that pair just before. To find these, SWAPs and parity steps are held until
/// the next gate on one of their qubits; drain() (or finish()) hands on what is still held.
class DetourSink final : public GateSink {
 public:
  explicit DetourSink(GateSink& out) : out_(out) {}
  /// Gates between `d.a` and `d.b` go along `d` (every step must be a coupler; `d.via` not empty).
  void add(Detour d);
  void gate(const Gate& g) override { batch({&g, 1}); }
  void batch(std::span<const Gate> run) override;
  /// Hands on the gates still held (call at the end of a stream that is not finished here).
  void drain();
  void finish() override;
  bool empty() const { return detours_.empty(); }

 private:
  void rewrite(const Gate& g);
  void put(const Gate& g);
  void release(int index);
  const Detour* find(int x, int y) const;
  std::vector<Gate> held_;              // SWAPs and parity steps not yet handed on (slots)
  std::vector<long long> held_order_;   // arrival number of each slot's gate; -1 when the slot is free
  std::vector<int> free_;               // free slots
  std::vector<int> held_at_;            // qubit -> slot of the gate held on it, or -1
  long long arrivals_ = 0;
  GateRun out_;
  std::vector<Detour> detours_;
  std::vector<std::vector<int>> by_qubit_;  // qubit -> indices of the detours it ends (a line qubit ends at most two)
};

}  // namespace qftplan
