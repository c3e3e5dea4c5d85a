#pragma once
/// \file detour_sink.hpp
/// Runs two-qubit gates between uncoupled qubits through a common neighbour.

#include <map>
#include <utility>

#include "qftplan/core/gate.hpp"

namespace qftplan {

/// Forwards gates; a two-qubit gate on a pair with a registered detour qubit v becomes
/// swap(a, v); gate(v, b); swap(a, v), which has the same effect on the data and leaves v's
/// content where it was.
class DetourSink final : public GateSink {
 public:
  explicit DetourSink(GateSink& out) : out_(out) {}
  /// Gates between `a` and `b` go through `via` (which must be coupled to both). `a` is the end
  /// that steps aside.
  void add(int a, int b, int via) { detours_[{std::min(a, b), std::max(a, b)}] = {a, via}; }
  void gate(const Gate& g) override { batch({&g, 1}); }
  void batch(std::span<const Gate> run) override;
  void finish() override { out_.out().finish(); }
  bool empty() const { return detours_.empty(); }

 private:
  void rewrite(const Gate& g);
  GateRun out_;
  std::map<std::pair<int, int>, std::pair<int, int>> detours_;  // pair -> (end that steps aside, via)
};

}  // namespace qftplan
