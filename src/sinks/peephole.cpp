#include "qftplan/sinks/peephole.hpp"

#include <algorithm>
#include <stdexcept>

namespace qftplan {

PairRewrite pair_rewrite(Gate& held, const Gate& g) {
  if (held.kind != g.kind) return PairRewrite::none;
  switch (g.kind) {
    case GateKind::h:
    case GateKind::x:
    case GateKind::cz:  // symmetric: held is the last gate on both of g's qubits, so on the same pair
    case GateKind::swap: return PairRewrite::cancel;
    case GateKind::cx:   // control and target swapped is another gate
      return held.q0 == g.q0 ? PairRewrite::cancel : PairRewrite::none;
    case GateKind::rz:
    case GateKind::p: {
      Angle sum;
      try {
        sum = held.angle + g.angle;
      } catch (const std::overflow_error&) {
        return PairRewrite::none;  // denominators 2^62 apart: keep both as they are
      }
      held.angle = sum;
      return sum.is_zero() ? PairRewrite::merged_to_zero : PairRewrite::merged;
    }
    default: return PairRewrite::none;
  }
}

PeepholePass::PeepholePass(int qubits, GateSink& out) : stacks_(qubits), out_(out) {}

void PeepholePass::batch(std::span<const Gate> run) {
  for (const Gate& g : run) add(g);
}

void PeepholePass::add(const Gate& g) {
  if ((g.kind == GateKind::rz || g.kind == GateKind::p) && g.angle.is_zero()) {
    ++removed_;
    return;
  }
  if (g.kind != GateKind::measure && try_cancel(g)) return;
  push(g);
}

bool PeepholePass::try_cancel(const Gate& g) {
  Stack& s0 = stacks_[g.q0];
  if (s0.size == 0) return false;
  Slot& p = s0.top();
  if (p.g.kind != g.kind) return false;
  // Both operands must have the same last gate: nothing on either qubit in between.
  if (is_two_qubit(g.kind) && (stacks_[g.q1].size == 0 || stacks_[g.q1].top().seq != p.seq)) return false;
  switch (pair_rewrite(p.g, g)) {
    case PairRewrite::none: return false;
    case PairRewrite::merged: ++removed_; return true;
    case PairRewrite::merged_to_zero: s0.pop_top(); break;
    case PairRewrite::cancel: drop_top(p.g); break;
  }
  removed_ += 2;
  return true;
}

void PeepholePass::drop_top(const Gate& held) {
  const bool two = is_two_qubit(held.kind);
  const int q1 = held.q1;
  stacks_[held.q0].pop_top();  // `held` is not read after this
  if (two) stacks_[q1].pop_top();
}

void PeepholePass::push(const Gate& g) {
  const bool two = is_two_qubit(g.kind);
  // Room on each stack first: a full one sends out its oldest gate.
  while (stacks_[g.q0].size == kDepth) emit_bottom(g.q0);
  if (two)
    while (stacks_[g.q1].size == kDepth) emit_bottom(g.q1);
  const Slot s{g, seq_++};
  stacks_[g.q0].push(s);
  if (two) stacks_[g.q1].push(s);
}

void PeepholePass::emit_bottom(int q) {
  // The oldest gate of q goes out; a two-qubit one after the older gates held on its other qubit
  // (and theirs before them: an explicit stack, the chain can run through many qubits).
  {
    // Most often the oldest gate is ready at once (a one-qubit gate, or the oldest on both qubits).
    const Slot& b = stacks_[q].bottom();
    const bool two = is_two_qubit(b.g.kind);
    const int other = two ? (b.g.q0 == q ? b.g.q1 : b.g.q0) : q;
    if (!two || stacks_[other].bottom().seq == b.seq) {
      out_.put(b.g);
      out_.flush_if_full();
      if (two) stacks_[other].pop_bottom();
      stacks_[q].pop_bottom();
      return;
    }
  }
  work_.assign(1, q);
  while (!work_.empty()) {
    const int x = work_.back();
    const Slot& b = stacks_[x].bottom();
    if (is_two_qubit(b.g.kind)) {
      const int other = b.g.q0 == x ? b.g.q1 : b.g.q0;
      if (stacks_[other].bottom().seq != b.seq) {
        work_.push_back(other);
        continue;
      }
      stacks_[other].pop_bottom();
    }
    out_.put(b.g);
    out_.flush_if_full();
    stacks_[x].pop_bottom();
    work_.pop_back();
  }
}

void PeepholePass::finish() {
  release_oldest_first(stacks_, [this](int q) { emit_bottom(q); });
  out_.flush();
  out_.out().finish();
}

}  // namespace qftplan
