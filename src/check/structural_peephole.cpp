// The structural proof's peephole stage, in front of everything else: a short window of gates in
// which two equal self-inverse gates (x, cx, cz, swap) that meet with nothing between them on their
// qubits cancel. An optimiser inserts or leaves such pairs anywhere; the proof's front end would
// otherwise let them break up an h-cz-h sandwich it holds. Hadamard pairs are left to the front end
// (h h before a cz may be a Hadamard followed by a sandwich). The method: structural_state.hpp.

#include <utility>

#include "structural_state.hpp"

namespace qftplan {

namespace {

constexpr std::size_t kWindow = 64;  // gates held back at most

bool cancels_in_pairs(GateKind k) {
  return k == GateKind::x || k == GateKind::cx || k == GateKind::cz || k == GateKind::swap;
}

}  // namespace

void StructuralChecker::Impl::peephole(const Gate& g, int line) {
  if (failed) return;
  const bool two = is_two_qubit(g.kind);
  // Anything the front end refuses (ranges, couplers, gates after a measurement) goes to it at once.
  const bool valid = g.q0 >= 0 && g.q0 < nq && !measured[g.q0] && device->usable(g.q0) &&
                     (!two || (g.q1 >= 0 && g.q1 < nq && g.q1 != g.q0 && !measured[g.q1] && device->coupled(g.q0, g.q1)));
  if (!valid) {
    drain_window();
    feed(g, line);  // reports the error
    return;
  }
  if (g.kind == GateKind::measure) {
    drain_window();
    feed(g, line);
    return;
  }
  const long a = window_last[g.q0];
  const long b = two ? window_last[g.q1] : a;
  if (cancels_in_pairs(g.kind) && a >= window_start && a == b) {
    Held& prev = window[static_cast<std::size_t>(a - window_start)];
    const bool same = prev.g.kind == g.kind && prev.g.q0 == g.q0 && (!two || prev.g.q1 == g.q1 ||
                                                                    (g.kind != GateKind::cx && prev.g.q1 == g.q0 && prev.g.q0 == g.q1));
    if (prev.alive && same) {
      // The pair is the identity: drop both, and the gates before them on their qubits meet again.
      prev.alive = false;
      gates += 2;  // both were read
      gates_cancelled += 2;
      window_last[prev.g.q0] = prev.prev0;
      if (two) window_last[prev.g.q1] = prev.prev1;
      return;
    }
  }
  window.push_back(Held{g, line, window_last[g.q0], two ? window_last[g.q1] : -1, true});
  const long idx = window_start + static_cast<long>(window.size()) - 1;
  window_last[g.q0] = idx;
  if (two) window_last[g.q1] = idx;
  if (window.size() > kWindow) pop_window();
}

// Feeds the oldest held gate on (it can no longer meet a partner: its qubits' later gates are
// in the window, or it is too old).
void StructuralChecker::Impl::pop_window() {
  const Held h = window.front();
  window.pop_front();
  ++window_start;
  if (h.alive) feed(h.g, h.line);
}

void StructuralChecker::Impl::drain_window() {
  while (!window.empty()) pop_window();
}

}  // namespace qftplan
