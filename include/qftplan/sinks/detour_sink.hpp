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
class DetourSink final : public GateSink {
 public:
  explicit DetourSink(GateSink& out) : out_(out) {}
  /// Gates between `d.a` and `d.b` go along `d` (every step must be a coupler; `d.via` not empty).
  void add(Detour d);
  void gate(const Gate& g) override { batch({&g, 1}); }
  void batch(std::span<const Gate> run) override;
  void finish() override { out_.out().finish(); }
  bool empty() const { return detours_.empty(); }

 private:
  void rewrite(const Gate& g);
  const Detour* find(int x, int y) const;
  GateRun out_;
  std::vector<Detour> detours_;
  std::vector<std::vector<int>> by_qubit_;  // qubit -> indices of the detours it ends (a line qubit ends at most two)
};

}  // namespace qftplan
