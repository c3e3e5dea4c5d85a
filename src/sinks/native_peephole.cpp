// NativePeephole: the native decomposition and the peephole pass in one step, with logical gates
// held whole where nothing can pair with them (see peephole.hpp).

#include <algorithm>

#include "qftplan/sinks/circuit_metrics.hpp"
#include "qftplan/sinks/native_gates.hpp"
#include "qftplan/sinks/peephole.hpp"

namespace qftplan {

NativePeephole::NativePeephole(TwoQubitGate target, int qubits, MetricsSink& metrics, NoiseSink& noise,
                               GateSink* writer)
    : metrics_(metrics), noise_(noise), writer_(writer), stacks_(qubits), scratch_dec_(target, scratch_) {
  if (writer_) written_.emplace(*writer_);
  for (int z = 0; z < 2; ++z)
    for (int k = 0; k < kGateKindCount; ++k) {
      if (static_cast<GateKind>(k) == GateKind::measure) continue;
      Program& p = programs_[z][k];
      p.steps = native_program(target, static_cast<GateKind>(k), z == 1);
      p.cost = NoiseSink::cost_of(p.steps);
      const auto steps = p.steps.view();
      for (int i = 0; i < static_cast<int>(steps.size()); ++i)
        for (int slot : {int(steps[i].a), int(steps[i].b)}) {
          const End e{i, steps[i].kind, steps[i].a, steps[i].b};
          if (p.head[slot].index < 0) p.head[slot] = e;
          p.tail[slot] = e;
        }
    }
}

void NativePeephole::batch(std::span<const Gate> run) {
  for (const Gate& g : run) add(g);
}

const std::vector<Gate>& NativePeephole::decompose(const Gate& g) {
  scratch_.gates.clear();
  scratch_dec_.gate(g);
  return scratch_.gates;
}

// Whether the first native gate of logical gate `g` on its qubit of `slot` can pair (cancel or merge)
// with the last gate held on that qubit.
bool NativePeephole::pairs_with_top(const Gate& g, int slot) {
  const int q = slot == 0 ? g.q0 : g.q1;
  const Stack& st = stacks_[q];
  if (st.size == 0) return false;
  const End& head = program_of(g).head[slot];
  const Slot& t = st.slot[(st.head + st.size - 1) % kDepth];
  GateKind last_kind = t.g.kind;
  int l0 = t.g.q0, l1 = t.g.q1;
  const End* tail = nullptr;
  if (t.block) {
    tail = &program_of(t.g).tail[t.g.q0 == q ? 0 : 1];
    last_kind = tail->kind;
    l0 = GateProgram::qubit(tail->a, t.g.q0, t.g.q1);
    l1 = GateProgram::qubit(tail->b, t.g.q0, t.g.q1);
  }
  if (head.index < 0 || last_kind != head.kind) return false;
  switch (head.kind) {
    case GateKind::h:
    case GateKind::x:
    case GateKind::rz:
    case GateKind::p: return true;
    case GateKind::cx:
    case GateKind::cz:
    case GateKind::swap: {
      const int h0 = GateProgram::qubit(head.a, g.q0, g.q1), h1 = GateProgram::qubit(head.b, g.q0, g.q1);
      const bool same_pair = (l0 == h0 && l1 == h1) || (head.kind != GateKind::cx && l0 == h1 && l1 == h0);
      if (!same_pair) return false;
      // The same gate must be last on both qubits, and the head first on both.
      const int other = h0 == q ? h1 : h0;
      if (stacks_[other].size == 0 || stacks_[other].top().seq != t.seq) return false;
      if (tail && program_of(t.g).tail[t.g.q0 == other ? 0 : 1].index != tail->index) return false;
      return program_of(g).head[slot == 0 ? 1 : 0].index == head.index;
    }
    default: return false;
  }
}

void NativePeephole::add(const Gate& g) {
  if (g.kind == GateKind::measure) return add_native(g);
  // A rotation of angle 0 in the decomposition is for the rewrites to drop: never held whole.
  bool open_up = g.kind != GateKind::parity_step && has_angle(g.kind) && g.angle.is_zero();
  const int slots = is_two_qubit(g.kind) ? 2 : 1;
  bool pairs[2] = {false, false};
  for (int s = 0; s < slots; ++s) open_up |= pairs[s] = pairs_with_top(g, s);
  if (!open_up) return push(Slot{g, seq_++, true});
  for (int s = 0; s < slots; ++s) {
    const int q = s == 0 ? g.q0 : g.q1;
    if (pairs[s] && stacks_[q].size > 0 && stacks_[q].top().block) open(q);
  }
  const std::vector<Gate> natives = decompose(g);
  for (const Gate& n : natives) add_native(n);
}

// The logical gate on top of q's stack becomes native gates. On top of its other qubit too, they all
// take its place; otherwise those before its last gate on q go out (after everything held before it)
// and that last gate is held, where the rewrites reach it.
void NativePeephole::open(int q) {
  const Slot t = stacks_[q].top();
  const bool two = slots2(t);
  const int a = t.g.q0, b = two ? t.g.q1 : a;
  if (!two || stacks_[a == q ? b : a].top().seq == t.seq) {
    // On top of both its qubits: its native gates take its place, and what is held below stays
    // within reach of a cascade.
    const std::vector<Gate> natives = decompose(t.g);
    stacks_[a].pop_top();
    if (two) stacks_[b].pop_top();
    for (const Gate& n : natives) push(Slot{n, seq_++, false});
    return;
  }
  // Under another gate on its other qubit: the gates held below it go out first, then its native
  // gates but its last one on q, which is held (those after it act on the other qubit alone, before
  // what is held there). A last gate on q that acts on both qubits cannot pair with anything here.
  while (stacks_[a].bottom().seq != t.seq) emit_bottom(a);
  while (stacks_[b].bottom().seq != t.seq) emit_bottom(b);
  const std::vector<Gate> natives = decompose(t.g);
  const int k = program_of(t.g).tail[t.g.q0 == q ? 0 : 1].index;
  stacks_[a].pop_bottom();
  stacks_[b].pop_bottom();
  const bool hold_k = !is_two_qubit(natives[k].kind);
  for (int i = 0; i < static_cast<int>(natives.size()); ++i)
    if (i != k || !hold_k) send(natives[i]);
  if (hold_k) push(Slot{natives[k], seq_++, false});
}

void NativePeephole::add_native(const Gate& g) {
  if ((g.kind == GateKind::rz || g.kind == GateKind::p) && g.angle.is_zero()) {
    ++removed_;
    return;
  }
  if (g.kind != GateKind::measure && try_cancel(g)) return;
  push(Slot{g, seq_++, false});
}

bool NativePeephole::try_cancel(const Gate& g) {
  Stack& s0 = stacks_[g.q0];
  if (s0.size == 0) return false;
  Slot& p = s0.top();
  if (p.block || p.g.kind != g.kind) return false;
  if (is_two_qubit(g.kind) && (stacks_[g.q1].size == 0 || stacks_[g.q1].top().seq != p.seq)) return false;
  switch (pair_rewrite(p.g, g)) {
    case PairRewrite::none: return false;
    case PairRewrite::merged: ++removed_; return true;
    case PairRewrite::merged_to_zero: s0.pop_top(); break;
    case PairRewrite::cancel:
      s0.pop_top();
      if (is_two_qubit(g.kind)) stacks_[g.q1].pop_top();
      break;
  }
  removed_ += 2;
  return true;
}

void NativePeephole::push(const Slot& s) {
  const bool two = slots2(s);
  while (stacks_[s.g.q0].size == kDepth) emit_bottom(s.g.q0);
  if (two)
    while (stacks_[s.g.q1].size == kDepth) emit_bottom(s.g.q1);
  stacks_[s.g.q0].push(s);
  if (two) stacks_[s.g.q1].push(s);
}

void NativePeephole::emit_bottom(int q) {
  // As PeepholePass::emit_bottom: a two-qubit entry after the older ones held on its other qubit.
  {
    const Slot& b = stacks_[q].bottom();
    const bool two = slots2(b);
    const int other = two ? (b.g.q0 == q ? b.g.q1 : b.g.q0) : q;
    if (!two || stacks_[other].bottom().seq == b.seq) {  // most often: ready at once
      const Slot s = b;
      if (two) stacks_[other].pop_bottom();
      stacks_[q].pop_bottom();
      return emit(s);
    }
  }
  work_.assign(1, q);
  while (!work_.empty()) {
    const int x = work_.back();
    const Slot b = stacks_[x].bottom();
    if (slots2(b)) {
      const int other = b.g.q0 == x ? b.g.q1 : b.g.q0;
      if (stacks_[other].bottom().seq != b.seq) {
        work_.push_back(other);
        continue;
      }
      stacks_[other].pop_bottom();
    }
    stacks_[x].pop_bottom();
    work_.pop_back();
    emit(b);
  }
}

void NativePeephole::emit(const Slot& s) {
  if (!s.block) return send(s.g);
  const Program& P = program_of(s.g);
  metrics_.replay(P.steps, s.g.q0, s.g.q1);
  noise_.replay(P.steps, P.cost, s.g.q0, s.g.q1);
  if (!written_) return;
  for (const Gate& n : decompose(s.g)) written_->put(n);
  written_->flush_if_full();
}

void NativePeephole::send(const Gate& native) {
  metrics_.gate(native);
  noise_.gate(native);
  if (!written_) return;
  written_->put(native);
  written_->flush_if_full();
}

void NativePeephole::finish() {
  release_oldest_first(stacks_, [this](int q) { emit_bottom(q); });
  metrics_.finish();
  noise_.finish();
  if (written_) {
    written_->flush();
    writer_->finish();
  }
}

}  // namespace qftplan
