#include "qftplan/sinks/detour_sink.hpp"

#include <algorithm>

namespace qftplan {

void DetourSink::add(Detour d) {
  const int top = std::max(d.a, d.b);
  if (top >= static_cast<int>(by_qubit_.size())) by_qubit_.resize(static_cast<std::size_t>(top) + 1);
  // A second detour for the same pair replaces the first (as a map would).
  for (int i : by_qubit_[d.a])
    if ((detours_[i].a == d.a && detours_[i].b == d.b) || (detours_[i].a == d.b && detours_[i].b == d.a)) {
      detours_[i] = std::move(d);
      return;
    }
  const int index = static_cast<int>(detours_.size());
  by_qubit_[d.a].push_back(index);
  by_qubit_[d.b].push_back(index);
  detours_.push_back(std::move(d));
}

const Detour* DetourSink::find(int x, int y) const {
  if (x < 0 || y < 0 || x >= static_cast<int>(by_qubit_.size())) return nullptr;
  for (int i : by_qubit_[x]) {
    const Detour& d = detours_[i];
    if ((d.a == x && d.b == y) || (d.a == y && d.b == x)) return &d;
  }
  return nullptr;
}

void DetourSink::batch(std::span<const Gate> run) {
  for (const Gate& g : run) {
    rewrite(g);
    out_.flush_if_full();
  }
  out_.flush();
}

void DetourSink::rewrite(const Gate& g) {
  const Detour* d = is_two_qubit(g.kind) ? find(g.q0, g.q1) : nullptr;
  if (d == nullptr) {
    out_.put(g);
    return;
  }
  int from = d->a;
  for (int v : d->via) {
    out_.put(make_gate(GateKind::swap, from, v));
    from = v;
  }
  // The gate keeps its orientation: only the end that stepped aside is renamed.
  Gate moved = g;
  if (moved.q0 == d->a) moved.q0 = from;
  else moved.q1 = from;
  out_.put(moved);
  for (std::size_t k = d->via.size(); k-- > 0;) out_.put(make_gate(GateKind::swap, k == 0 ? d->a : d->via[k - 1], d->via[k]));
}

}  // namespace qftplan
