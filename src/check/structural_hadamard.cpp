// The structural proof's Hadamard rule. A Hadamard consumes the only copy of a wire's current
// variable (its input, or what an earlier block transform made of it), so every term of the phase
// polynomial with that variable is final right there: the rule compares them with the controlled
// phases the order of the transform demands, then creates the wire's next variable. The method is
// described in structural_state.hpp.

#include <algorithm>
#include <cstdlib>
#include <string>
#include <vector>

#include "structural_state.hpp"

namespace qftplan {

using proof::kMaxParity;

void StructuralChecker::Impl::hadamard(int q, int line) {
  const Parity p = par[q];  // a copy: par[q] is replaced below and p still read
  const int v = consumed_variable(q, p, line);
  if (v < 0) return;
  const int w = wire_of(v);

  // A parity x XOR L (+ c) on the qubit. Name the new output variable y so that the qubit holds
  // y XOR L afterwards (a change of summation variables, v' = y XOR L, triangular in the order of
  // the Hadamards, hence a bijection). The Hadamard's phase pi (x XOR L XOR c)(y XOR L) expands mod 2
  // into x y + x L + L y + (1 + c) L + c y; the x y term is the one every Hadamard makes; the x L
  // terms (pi on x and each variable of L) are terms of x and belong to the closing check below.
  int rest[kMaxParity];
  int rest_size = 0;
  for (int i = 0; i < p.size; ++i)
    if (p.v[i] != v) rest[rest_size++] = p.v[i];
  for (int i = 0; i < rest_size; ++i) add_pair(v, rest[i], Angle(1, 0), line);
  if (failed) return;

  if (composed()) {
    // A wire whose next two Hadamards may have cancelled: this one is the first of them only if the
    // terms it closes are exactly there; otherwise they did, and it belongs to the transform after.
    if (gen[w] + 2 < static_cast<int>(schedule.of_wire[w].size()) && fusable(w) && !closes(v, true)) fuse(w);
    compare_composed(w, v, line);
  } else {
    const Window win = closing_window(w);
    check_closing_phases(w, win, line);
    clear_terms_of(w, win, line);
  }
  create_output(q, p, w, rest, rest_size, line);
}

// The variable the Hadamard on q consumes, or -1 after a failure: the qubit's only variable, or, when
// it holds a parity x XOR L (the parity network), the one variable x that awaits its wire's next
// Hadamard and that no other qubit holds. It must be its wire's current variable, held nowhere else,
// with no phase of its own.
int StructuralChecker::Impl::consumed_variable(int q, const Parity& p, int line) {
  if (p.size == 0) {
    cannot_prove("Hadamard on qubit " + std::to_string(q) + ", which holds " + describe(p) +
                     " rather than one register wire",
                 line);
    return -1;
  }
  auto current = [&](int u) { return !wire_done(wire_of(u)) && u == cur[wire_of(u)]; };
  int v = p.v[0];
  if (p.size > 1) {
    int found = 0;
    for (int i = 0; i < p.size; ++i)
      if (current(p.v[i]) && occ[p.v[i]] == 1) {
        v = p.v[i];
        ++found;
      }
    if (found != 1) {
      cannot_prove("Hadamard on qubit " + std::to_string(q) + ", which holds " + describe(p) +
                       " rather than one register wire",
                   line);
      return -1;
    }
  }
  const int w = wire_of(v);
  if (!current(v)) {
    // An equivalent circuit may undo a Hadamard (h h, h-cx-h): the earlier one was then not the
    // wire's Hadamard of the transform, and what was compared there proves nothing either way.
    if (!composed()) {
      cannot_prove("second Hadamard on the wire of " + lq(w) + " (qubit " + std::to_string(q) + "; the first was" +
                       (h_line[w] > 0 ? " on line " + std::to_string(h_line[w]) : " earlier") +
                       "); the proof follows one Hadamard per wire",
                   line);
    } else {
      cannot_prove("Hadamard number " + std::to_string(gen_of(v) + 1) + " on the wire of " + lq(w) + " (qubit " +
                       std::to_string(q) + "; the previous was" +
                       (h_line[w] > 0 ? " on line " + std::to_string(h_line[w]) : " earlier") +
                       "); the proof follows as many Hadamards per wire as the block transforms it takes part in",
                   line);
    }
    return -1;
  }
  if (occ[v] != 1) {
    cannot_prove("Hadamard on " + lq(w) + " while another qubit still holds a parity containing " +
                     (composed() ? var_name(v) : std::string("its input")),
                 line);
    return -1;
  }
  if (!single[v].is_zero()) {
    const auto got = single[v].narrow();
    if (!got) differences_lost = true;
    differ({w, proof::Difference::kSingle, got.value_or(Angle{}), Angle{}},
           "a phase of " + single_text(single[v]) + " acts on " + (composed() ? var_name(v) : lq(w)) +
               " before its Hadamard; the " +
               transform_name() + " has no such phase" + at_line(line),
           single_line[v] > 0 ? single_line[v] : line);
    single[v] = WideAngle{};  // final (the variable leaves the qubits here) and noted
  }
  return v;
}

// The controlled phases the Hadamard on wire w must close, in the transform that Hadamard belongs to
// (forward: with the outputs of the wires k in [w-reach, w) of the transform; inverse: (w, w+reach]).
auto StructuralChecker::Impl::closing_window(int w) const -> Window { return window_in(due_transform(w), w); }

auto StructuralChecker::Impl::window_in(int t, int w) const -> Window {
  const proof::Transform& tr = schedule.transforms[t];
  const int last = tr.first + tr.size - 1;
  const int lo = tr.inverse ? w + 1 : std::max(tr.first, w - tr.reach);
  const int hi = tr.inverse ? std::min(last, w + tr.reach) : w - 1;
  return Window{t, lo, hi};
}

// Each wire k of the window has had its Hadamard of the transform, and the term between w's consumed
// variable and k's output of the transform has the transform's angle; a difference is noted and the
// proof goes on.
void StructuralChecker::Impl::check_closing_phases(int w, Window win, int line) {
  const int v = cur[w];
  const bool inverse = schedule.transforms[win.t].inverse;
  for (int k = win.lo; k <= win.hi; ++k) {
    const Angle magnitude = Angle::pi_over_pow2(static_cast<std::uint32_t>(std::abs(w - k)));
    const Angle want = inverse ? -magnitude : magnitude;
    const int entry = schedule.entry_of(win.t, k);
    if (gen[k] <= entry) {
      differ({w, k, Angle{}, want}, "the Hadamard on " + lq(w) + " comes before the Hadamard on " + lq(k) +
                  ", but their controlled phase (" + angle_text(want) + ") must come between them" +
                  (inverse ? " (inverse QFT order)" : "") + in_transform(win.t),
              line);
      continue;
    }
    const proof::Term* t = pairs.find(proof::pair_key(v, var(k, entry + 1)));
    if (!t) {
      differ({w, k, Angle{}, want}, "controlled phase between " + lqs(w, k) + " is missing (expected angle " + angle_text(want) +
                  " before the Hadamard on " + lq(w) + in_transform(win.t) + ")",
              line);
      continue;
    }
    if (const Angle got = t->angle(); !(got == want))
      differ({w, k, got, want}, "controlled phase between " + lqs(w, k) + " has angle " + angle_text(got) + ", expected " +
                  angle_text(want) + in_transform(win.t) + at_line(t->line),
              t->line > 0 ? t->line : line);
  }
}

// Every other term with w's consumed variable is a difference (noted); all of the variable's terms
// are final here and are cleared.
void StructuralChecker::Impl::clear_terms_of(int w, Window win, int line) {
  const int v = cur[w];
  const bool inverse = schedule.transforms[win.t].inverse;
  for (int u : partners[v]) {
    proof::Term* t = pairs.find(proof::pair_key(v, u));
    if (!t) continue;
    const int other = wire_of(u);
    const bool made_here = gen_of(u) >= 1 && win.contains(other) && gen_of(u) == schedule.entry_of(win.t, other) + 1;
    if (!made_here) {
      std::string what = "an unexpected controlled phase of " + angle_text(t->angle()) + " between " + lqs(w, other);
      if (gen_of(u) == 0 || (gen_of(u) == gen[other] && !wire_done(other)))
        what += ", applied before either of their Hadamards";
      else if (inverse ? other < w : other > w)
        what += ", applied after the Hadamard on " + lq(other) + " (wrong order)";
      else
        what += " (beyond the approximation degree or duplicated)";
      const int b = gen_of(u) >= 1 ? other : proof::Difference::kInputPair;
      differ({w, b, t->angle(), Angle{}}, what + in_transform(win.t) + at_line(t->line), t->line > 0 ? t->line : line);
    } else {
      ++terms_checked;
    }
    pairs.erase(t);  // final either way: the variable leaves the qubits here
  }
  std::vector<int>().swap(partners[v]);
  single[v] = WideAngle{};
}

// |v> -> sum_y (-1)^(v y) |y>: the new variable y of wire w replaces the consumed one on qubit q,
// which then holds y XOR L (L = rest); a constant 1 on v adds pi * y.
void StructuralChecker::Impl::create_output(int q, const Parity& p, int w, const int* rest, int rest_size,
                                             int line) {
  const int v = cur[w];
  ++gen[w];
  h_line[w] = line;
  ++h_count;
  --occ[v];
  const int y = var(w, gen[w]);
  cur[w] = y;
  ++occ[y];
  // The qubit now holds y XOR L (kept sorted).
  Parity np;
  np.c = 0;
  if (rest_size >= kMaxParity) return cannot_prove("a Hadamard on a parity too wide to track", line);
  // rest is sorted (taken in order from a sorted parity): put y in its place.
  bool placed = false;
  for (int i = 0; i < rest_size; ++i) {
    if (!placed && y < rest[i]) {
      np.v[np.size++] = y;
      placed = true;
    }
    np.v[np.size++] = rest[i];
  }
  if (!placed) np.v[np.size++] = y;
  par[q] = np;
  if (p.c) add_single(y, Angle(1, 0), line);
  // The remaining terms of the parity case: pi L y, and pi L when c = 0.
  for (int i = 0; i < rest_size; ++i) {
    add_pair(rest[i], y, Angle(1, 0), line);
    if (!p.c) add_single(rest[i], Angle(1, 0), line);
  }
}

}  // namespace qftplan
