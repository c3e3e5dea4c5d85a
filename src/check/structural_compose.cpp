// The structural proof of a composition of textbook transforms (the block construction,
// networks/blockwise_qft.hpp): the reference path sum is written out term by term (O(n m) terms),
// and each Hadamard compares the terms of the variable it consumes with it. The method is described
// in structural_state.hpp.
//
// Hadamards that cancel. Where a wire's Hadamard is the last thing a transform does to it and its
// Hadamard in the next transform the first (the lowest wire of a block read back in layer B, then
// first in its pair of layer C), the two meet on the qubit with nothing between them, and an
// optimiser removes both (h h). In the path sum that is summing out the variable between them:
// sum_z (-1)^(z (y + u)) = 2 delta(u = y), so the wire's output of the second transform is its
// input of the first. The proof allows it (fusable(): the variable between them has no term in the
// reference) and decides per wire: a Hadamard on the wire there means both are present; a term that
// needs the second transform's output while the wire has not had the first means both are gone
// (fuse(): the reference's variable is renamed, and terms that meet on one monomial add up).

#include <cstdlib>
#include <string>
#include <vector>

#include "structural_state.hpp"

namespace qftplan {

void StructuralChecker::Impl::add_expected(int a, int b, const Angle& x) {
  const std::uint64_t key = proof::pair_key(a, b);
  auto [it, inserted] = expected.terms.try_emplace(key);
  it->second.add(x);
  if (inserted) {
    expected.partners[a].push_back(b);
    expected.partners[b].push_back(a);
  }
}

void StructuralChecker::Impl::build_expected() {
  expected.partners.assign(occ.size(), {});
  for (int t = 0; t < static_cast<int>(schedule.transforms.size()); ++t) {
    const proof::Transform& tr = schedule.transforms[t];
    for (int w = tr.first; w < tr.first + tr.size; ++w) {
      const Window win = window_in(t, w);
      const int v = var(w, schedule.entry_of(t, w));
      for (int k = win.lo; k <= win.hi; ++k) {
        const Angle magnitude = Angle::pi_over_pow2(static_cast<std::uint32_t>(std::abs(w - k)));
        add_expected(v, var(k, schedule.entry_of(t, k) + 1), tr.inverse ? -magnitude : magnitude);
      }
    }
  }
}

// Wire w's next two transforms may have lost their Hadamards together: the variable between them
// (the first one's output, the second one's input) has no term in the reference.
bool StructuralChecker::Impl::fusable(int w) const {
  if (gen[w] + 2 > static_cast<int>(schedule.of_wire[w].size())) return false;
  const int between = var(w, gen[w] + 1);
  for (int u : expected.partners[between])
    if (const auto it = expected.terms.find(proof::pair_key(between, u)); it != expected.terms.end() && !it->second.is_zero())
      return false;
  return true;
}

// Both Hadamards are gone: the wire keeps its variable through the two transforms, so the second
// one's output is renamed to it in the reference.
void StructuralChecker::Impl::fuse(int w) {
  const int keep = cur[w], from = var(w, gen[w] + 2);
  gen[w] += 2;
  std::vector<int> partners;
  partners.swap(expected.partners[from]);
  for (int u : partners) {
    const auto it = expected.terms.find(proof::pair_key(from, u));
    if (it == expected.terms.end()) continue;
    const WideAngle x = it->second;
    expected.terms.erase(it);
    const std::uint64_t key = proof::pair_key(keep, u);
    auto [to, inserted] = expected.terms.try_emplace(key, x);
    if (!inserted) {
      if (const auto a = x.narrow()) to->second.add(*a);
      else differences_lost = true;
    } else {
      expected.partners[keep].push_back(u);
      expected.partners[u].push_back(keep);
    }
  }
}

// Before v's terms are compared: a partner that does not exist yet but is the second output of a
// wire that can still fuse means that wire's pair is gone (it had no Hadamard there).
void StructuralChecker::Impl::fuse_for(int v) {
  for (bool again = true; again;) {
    again = false;
    for (int u : expected.partners[v]) {
      if (created(u) || !expected.terms.count(proof::pair_key(v, u))) continue;
      const int k = wire_of(u);
      if (!wire_done(k) && gen_of(u) == gen[k] + 2 && fusable(k)) {
        fuse(k);
        again = true;  // the partner lists changed
        break;
      }
    }
  }
}

// The Hadamard on wire w consumes v: its terms in the circuit must be its terms in the reference.
void StructuralChecker::Impl::compare_composed(int w, int v, int line) {
  fuse_for(v);
  const int t = due_transform(w);
  for (int u : expected.partners[v]) {
    const auto e = expected.terms.find(proof::pair_key(v, u));
    if (e == expected.terms.end()) continue;
    const int k = wire_of(u);
    const auto want = e->second.narrow();
    const std::string want_text = want ? angle_text(*want) : "a tiny angle";
    if (!created(u)) {
      suspect("the Hadamard on " + lq(w) + " comes before the Hadamard on " + lq(k) + ", but their controlled phase (" +
                  want_text + ") must come between them" + in_transform(t),
              line);
      continue;
    }
    const proof::Term* term = pairs.find(proof::pair_key(v, u));
    WideAngle diff = e->second;
    if (term) diff.add(-term->angle());
    if (!diff.is_zero()) {
      suspect("controlled phase between " + lqs(w, k) + (term ? " has angle " + angle_text(term->angle()) : " is missing") +
                  ", expected " + want_text + " before the Hadamard on " + lq(w) + in_transform(t) +
                  (term ? at_line(term->line) : ""),
              term && term->line > 0 ? term->line : line);
    } else {
      ++terms_checked;
    }
  }
  for (int u : partners[v]) {
    proof::Term* term = pairs.find(proof::pair_key(v, u));
    if (!term) continue;
    if (!expected.terms.count(proof::pair_key(v, u)))
      suspect("an unexpected controlled phase of " + angle_text(term->angle()) + " between " + lqs(w, wire_of(u)) +
                  " before the Hadamard on " + lq(w) + in_transform(t) + at_line(term->line),
              term->line > 0 ? term->line : line);
    pairs.erase(term);  // final either way: the variable leaves the qubits here
  }
  std::vector<int>().swap(partners[v]);
  for (int u : expected.partners[v]) expected.terms.erase(proof::pair_key(v, u));
  std::vector<int>().swap(expected.partners[v]);
  single[v] = WideAngle{};
}

// Every term the Hadamard consuming v must close is in place with its angle (exact: and no other term
// of v is), seen with the wires that can still fuse in their fused form.
bool StructuralChecker::Impl::closes(int v, bool exact) {
  // A partner wire whose two Hadamards may have cancelled (structural_compose.cpp) is seen in its fused
  // form: its later output is the variable it holds, and terms meeting on that monomial add up.
  auto fused_holder = [&](int u) {
    const int k = wire_of(u);
    return !created(u) && !wire_done(k) && gen_of(u) == gen[k] + 2 && fusable(k) ? cur[k] : -1;
  };
  std::vector<int> merged;  // fused names, compared with the term they merge with
  for (int u : expected.partners[v])
    if (expected.terms.count(proof::pair_key(v, u)) && !created(u))
      if (const int held = fused_holder(u); held >= 0) merged.push_back(held);
  for (int u : expected.partners[v]) {
    const auto e = expected.terms.find(proof::pair_key(v, u));
    if (e == expected.terms.end()) continue;
    WideAngle want = e->second;
    int held = u;
    if (!created(u)) {
      held = fused_holder(u);
      if (held < 0) return false;
      if (const auto also = expected.terms.find(proof::pair_key(v, held)); also != expected.terms.end()) {
        if (const auto a = also->second.narrow()) want.add(*a);
        else return false;
      }
    } else if (std::find(merged.begin(), merged.end(), u) != merged.end()) {
      continue;
    }
    if (const proof::Term* t = pairs.find(proof::pair_key(v, held))) want.add(-t->angle());
    if (!want.is_zero()) return false;
  }
  if (!exact) return true;
  for (int u : partners[v]) {
    const proof::Term* t = pairs.find(proof::pair_key(v, u));
    if (t && !t->angle().is_zero() && !expected.terms.count(proof::pair_key(v, u))) return false;
  }
  return true;
}

// At the end (leftover_term, after the one-variable terms, of which the reference has none): the
// two-variable terms left in the circuit and in the reference (between variables no Hadamard
// consumed) must agree ("" when they do).
std::string StructuralChecker::Impl::composed_leftover(int& line) {
  std::string found;
  pairs.for_each([&](std::uint64_t key, const proof::Term& t) {
    if (!found.empty()) return;
    const auto e = expected.terms.find(key);
    WideAngle diff;
    if (e != expected.terms.end()) diff = e->second;
    diff.add(-t.angle());
    if (!diff.is_zero()) {
      const int a = static_cast<int>(key >> 32), b = static_cast<int>(key & 0xffffffffu);
      line = t.line;
      found = "a controlled phase of " + angle_text(t.angle()) + " is left between " + var_name(a) + " and " +
              var_name(b) + ", which the block construction does not have there" + at_line(t.line);
    }
  });
  if (!found.empty()) return found;
  for (const auto& [key, angle] : expected.terms) {
    if (angle.is_zero() || pairs.find(key)) continue;
    const int a = static_cast<int>(key >> 32), b = static_cast<int>(key & 0xffffffffu);
    line = 0;
    return "the controlled phase between " + var_name(a) + " and " + var_name(b) + " of the block construction is missing";
  }
  return {};
}

}  // namespace qftplan
