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

void DetourSink::drain() {
  // In the order they came (they act on disjoint qubits, so any order would do; this one is stable).
  std::vector<std::pair<long long, int>> live;
  for (std::size_t i = 0; i < held_.size(); ++i)
    if (held_order_[i] >= 0) live.emplace_back(held_order_[i], static_cast<int>(i));
  std::sort(live.begin(), live.end());
  for (const auto& [order, index] : live) out_.put(held_[index]);
  held_.clear();
  held_order_.clear();
  free_.clear();
  std::fill(held_at_.begin(), held_at_.end(), -1);
  out_.flush();
}

void DetourSink::finish() {
  drain();
  out_.out().finish();
}

void DetourSink::release(int index) {
  const Gate& h = held_[index];
  held_at_[h.q0] = held_at_[h.q1] = -1;
  held_order_[index] = -1;
  free_.push_back(index);
}

void DetourSink::put(const Gate& g) {
  const bool two = is_two_qubit(g.kind);
  const int top = std::max(g.q0, two ? g.q1 : -1);
  if (top >= static_cast<int>(held_at_.size())) held_at_.resize(static_cast<std::size_t>(top) + 1, -1);
  // A SWAP and a parity step on the same pair with nothing on either qubit between them are one CX and
  // an rz. With values (A, B) on (q0, q1), parity_step(q0, q1, t) leaves (A^B, A) with phase t on
  // A^B (gate.hpp): followed by the SWAP, (A, A^B), which is cx q0->q1 and rz(t) on q1; preceded by
  // it, (A^B, B), which is cx q1->q0 and rz(t) on q0. (The linear part of a two-qubit CX circuit is
  // an invertible 2 x 2 matrix over GF(2); the parity step times a SWAP is a single CX: common practice.)
  if (two && held_at_[g.q0] >= 0 && held_at_[g.q0] == held_at_[g.q1]) {
    const int index = held_at_[g.q0];
    const Gate h = held_[index];
    const bool step_then_swap = h.kind == GateKind::parity_step && g.kind == GateKind::swap;
    const bool swap_then_step = h.kind == GateKind::swap && g.kind == GateKind::parity_step;
    if (step_then_swap || swap_then_step) {
      release(index);
      const Gate& step = step_then_swap ? h : g;
      const int control = step_then_swap ? step.q0 : step.q1, target = step_then_swap ? step.q1 : step.q0;
      out_.put(make_gate(GateKind::cx, control, target));
      if (!step.angle.is_zero()) out_.put(make_gate(GateKind::rz, target, -1, step.angle));
      return;
    }
  }
  // Gates held on the qubits g acts on go first (held gates act on other qubits than everything
  // passed on after them, so they commute with it).
  for (int q : {g.q0, two ? g.q1 : -1})
    if (q >= 0 && held_at_[q] >= 0) {
      const int index = held_at_[q];
      const Gate h = held_[index];
      release(index);
      out_.put(h);
    }
  if (g.kind == GateKind::swap || g.kind == GateKind::parity_step) {
    // A slot freed earlier is reused: at most one gate is held per qubit.
    int index;
    if (free_.empty()) {
      index = static_cast<int>(held_.size());
      held_.push_back(g);
      held_order_.push_back(arrivals_++);
    } else {
      index = free_.back();
      free_.pop_back();
      held_[index] = g;
      held_order_[index] = arrivals_++;
    }
    held_at_[g.q0] = held_at_[g.q1] = index;
    return;
  }
  out_.put(g);
}

void DetourSink::rewrite(const Gate& g) {
  const Detour* d = is_two_qubit(g.kind) ? find(g.q0, g.q1) : nullptr;
  if (d == nullptr) {
    put(g);
    return;
  }
  int from = d->a;
  for (int v : d->via) {
    put(make_gate(GateKind::swap, from, v));
    from = v;
  }
  // The gate keeps its orientation: only the end that stepped aside is renamed.
  Gate moved = g;
  if (moved.q0 == d->a) moved.q0 = from;
  else moved.q1 = from;
  put(moved);
  for (std::size_t k = d->via.size(); k-- > 0;) put(make_gate(GateKind::swap, k == 0 ? d->a : d->via[k - 1], d->via[k]));
}

}  // namespace qftplan
