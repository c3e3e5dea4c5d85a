#include "qftplan/detour_sink.hpp"

namespace qftplan {

void DetourSink::gate(const Gate& g) {
  if (!is_two_qubit(g.kind)) {
    out_.gate(g);
    return;
  }
  const auto it = detours_.find({std::min(g.q0, g.q1), std::max(g.q0, g.q1)});
  if (it == detours_.end()) {
    out_.gate(g);
    return;
  }
  const auto [aside, via] = it->second;
  const int other = g.q0 == aside ? g.q1 : g.q0;
  out_.gate(make_gate(GateKind::swap, aside, via));
  Gate moved = g;
  if (moved.q0 == aside) moved.q0 = via;
  else moved.q1 = via;
  (void)other;
  out_.gate(moved);
  out_.gate(make_gate(GateKind::swap, aside, via));
}

}  // namespace qftplan
