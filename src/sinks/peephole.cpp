#include "qftplan/sinks/peephole.hpp"

#include <algorithm>
#include <stdexcept>

namespace qftplan {

PeepholePass::PeepholePass(int qubits, GateSink& out)
    : top_(qubits, -1), bottom_(qubits, -1), depth_(qubits, 0), out_(out) {}

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
  const std::int32_t t = top_[g.q0];
  if (t < 0) return false;
  const bool two = is_two_qubit(g.kind);
  // Both operands must have the same last gate: nothing on either qubit in between.
  if (two && top_[g.q1] != t) return false;
  Held& p = pool_[t];
  if (p.g.kind != g.kind) return false;
  switch (g.kind) {
    case GateKind::h:
    case GateKind::x:
    case GateKind::cz:    // symmetric: p is the last gate on both of g's qubits, so on the same pair
    case GateKind::swap:
      break;
    case GateKind::cx:
      if (p.g.q0 != g.q0) return false;  // control and target swapped is another gate
      break;
    case GateKind::rz:
    case GateKind::p: {
      Angle sum;
      try {
        sum = p.g.angle + g.angle;
      } catch (const std::overflow_error&) {
        return false;  // denominators 2^62 apart (never in a QFT): keep both as they are
      }
      p.g.angle = sum;
      ++removed_;
      if (sum.is_zero()) {
        drop_top(t);
        ++removed_;
      }
      return true;
    }
    default: return false;
  }
  drop_top(t);
  removed_ += 2;
  return true;
}

void PeepholePass::push(const Gate& g) {
  std::int32_t i = 0;
  if (!free_.empty()) {
    i = free_.back();
    free_.pop_back();
  } else {
    i = static_cast<std::int32_t>(pool_.size());
    pool_.emplace_back();
  }
  Held& h = pool_[i];
  h = Held{g, seq_++, {-1, -1}, {-1, -1}, true};
  const int n = slots(h);
  for (int s = 0; s < n; ++s) {
    const int q = s == 0 ? g.q0 : g.q1;
    const std::int32_t b = top_[q];
    h.below[s] = b;
    if (b >= 0) pool_[b].above[slot_of(pool_[b], q)] = i;
    else bottom_[q] = i;
    top_[q] = i;
    ++depth_[q];
  }
  for (int s = 0; s < n; ++s) {
    const int q = s == 0 ? g.q0 : g.q1;
    while (depth_[q] > kDepth) emit_through(bottom_[q]);
  }
}

void PeepholePass::drop_top(std::int32_t i) {
  Held& h = pool_[i];
  for (int s = 0; s < slots(h); ++s) {
    const int q = s == 0 ? h.g.q0 : h.g.q1;
    const std::int32_t b = h.below[s];
    top_[q] = b;
    if (b >= 0) pool_[b].above[slot_of(pool_[b], q)] = -1;
    else bottom_[q] = -1;
    --depth_[q];
  }
  h.live = false;
  free_.push_back(i);
}

void PeepholePass::emit_through(std::int32_t i) {
  // The held gates below i on its qubits go first, and theirs before them (an explicit stack: the
  // chain can run through many qubits). Entries are distinct: each is earlier than the one above it.
  work_.assign(1, i);
  while (!work_.empty()) {
    const Held& h = pool_[work_.back()];
    const std::int32_t first = h.below[0] >= 0 ? h.below[0] : (slots(h) == 2 ? h.below[1] : -1);
    if (first >= 0) {
      work_.push_back(first);
      continue;
    }
    const std::int32_t x = work_.back();
    work_.pop_back();
    emit_one(x);
  }
}

void PeepholePass::emit_one(std::int32_t i) {
  Held& h = pool_[i];
  out_.put(h.g);
  out_.flush_if_full();
  for (int s = 0; s < slots(h); ++s) {
    const int q = s == 0 ? h.g.q0 : h.g.q1;
    const std::int32_t a = h.above[s];
    bottom_[q] = a;
    if (a >= 0) pool_[a].below[slot_of(pool_[a], q)] = -1;
    else top_[q] = -1;
    --depth_[q];
  }
  h.live = false;
  free_.push_back(i);
}

void PeepholePass::finish() {
  // What is held goes out oldest first (each gate after those it depends on, as in the input).
  std::vector<std::int32_t> held;
  for (std::int32_t i = 0; i < static_cast<std::int32_t>(pool_.size()); ++i)
    if (pool_[i].live) held.push_back(i);
  std::sort(held.begin(), held.end(), [this](std::int32_t a, std::int32_t b) { return pool_[a].seq < pool_[b].seq; });
  for (std::int32_t i : held)
    if (pool_[i].live) emit_through(i);
  out_.flush();
  out_.out().finish();
}

}  // namespace qftplan
