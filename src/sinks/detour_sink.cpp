#include "qftplan/sinks/detour_sink.hpp"

namespace qftplan {

void DetourSink::batch(std::span<const Gate> run) {
  for (const Gate& g : run) {
    rewrite(g);
    out_.flush_if_full();
  }
  out_.flush();
}

void DetourSink::rewrite(const Gate& g) {
  if (!is_two_qubit(g.kind)) {
    out_.put(g);
    return;
  }
  const auto it = detours_.find({std::min(g.q0, g.q1), std::max(g.q0, g.q1)});
  if (it == detours_.end()) {
    out_.put(g);
    return;
  }
  const auto [aside, via] = it->second;
  out_.put(make_gate(GateKind::swap, aside, via));
  Gate moved = g;
  if (moved.q0 == aside) moved.q0 = via;
  else moved.q1 = via;
  out_.put(moved);
  out_.put(make_gate(GateKind::swap, aside, via));
}

}  // namespace qftplan
