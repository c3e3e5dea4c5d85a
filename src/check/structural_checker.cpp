// The structural proof's set-up, its streaming front end (qubit ranges, couplers, measurements,
// the Hadamard frame) and its end-of-circuit checks; the public StructuralChecker forwards here.
// The method is described in structural_state.hpp.

#include <cstdlib>
#include <string>
#include <unordered_map>
#include <utility>
#include <vector>

#include "block_steps.hpp"
#include "structural_state.hpp"

namespace qftplan {


namespace proof {

Schedule Schedule::of(const QftSpec& spec) {
  Schedule s;
  const int n = spec.qubits;
  if (n < 1) return s;
  if (!spec.block_length) {
    s.transforms.push_back({0, n, spec.inverse, spec.max_distance()});
  } else {
    // The block construction as its description reads (block_steps.hpp). An in-place transform of bits
    // [low, low + size) is the textbook circuit on them, most significant bit first: processing indices
    // n - low - size .. n - 1 - low. The inverse transform runs the layers backwards, each inverted.
    for (const BlockStep& b : block_construction_steps(n, *spec.block_length))
      s.transforms.push_back({n - b.low - b.size, b.size, b.inverse, b.size - 1});
    if (spec.inverse) {
      std::reverse(s.transforms.begin(), s.transforms.end());
      for (Transform& t : s.transforms) t.inverse = !t.inverse;
    }
  }
  s.of_wire.assign(n, {});
  s.entry.assign(s.transforms.size(), {});
  for (int t = 0; t < static_cast<int>(s.transforms.size()); ++t) {
    const Transform& tr = s.transforms[t];
    for (int w = tr.first; w < tr.first + tr.size; ++w) {
      s.entry[t].push_back(static_cast<int>(s.of_wire[w].size()));
      s.of_wire[w].push_back(t);
    }
  }
  s.generations = 0;
  for (const auto& list : s.of_wire) s.generations = std::max(s.generations, static_cast<int>(list.size()));
  return s;
}

}  // namespace proof

StructuralChecker::Impl::Impl(const Device& dev, const QftSpec& s, std::vector<int> pl)
    : device(&dev), spec(s), n(s.qubits), nq(dev.qubit_count()), placement(std::move(pl)) {
  par.assign(nq, Parity{});
  window_last.assign(nq, -1);
  measured.assign(nq, 0);
  pend_h.assign(nq, 0);
  pend_h_line.assign(nq, 0);
  if (n < 1) {
    fail("the QFT needs at least one qubit", 0);
    return;
  }
  schedule = proof::Schedule::of(spec);
  const std::size_t variables = static_cast<std::size_t>(schedule.generations + 1) * static_cast<std::size_t>(n);
  occ.assign(variables, 0);
  single.assign(variables, WideAngle{});
  single_line.assign(variables, 0);
  partners.assign(variables, {});
  gen.assign(n, 0);
  cur.resize(n);
  for (int w = 0; w < n; ++w) cur[w] = var(w, 0);
  if (composed()) build_expected();
  h_line.assign(n, 0);
  place_inputs();
}

// Each qubit of the placement starts holding the input variable of its wire.
void StructuralChecker::Impl::place_inputs() {
  if (static_cast<int>(placement.size()) != n) {
    fail("placement lists " + std::to_string(placement.size()) + " qubits for a " + std::to_string(n) +
             "-qubit QFT",
         0);
    return;
  }
  std::vector<char> used(nq, 0);
  for (int k = 0; k < n; ++k) {
    const int q = placement[k];
    if (q < 0 || q >= nq) {
      fail("placement puts logical qubit " + std::to_string(k) + " on qubit " + std::to_string(q) +
               ", outside the device (" + std::to_string(nq) + " qubits)",
           0);
      return;
    }
    if (used[q]) {
      fail("placement puts two logical qubits on qubit " + std::to_string(q), 0);
      return;
    }
    used[q] = 1;
    const int v = spec.input_wire(k);
    par[q].size = 1;
    par[q].v[0] = v;
    occ[v] = 1;
  }
  pairs.reserve(1024);
}

void StructuralChecker::Impl::fail(std::string msg, int line, bool cannot_prove) {
  if (failed) return;  // the first failure is the one reported
  failed = true;
  inconclusive = cannot_prove;
  message = std::move(msg);
  fail_line = line;
}

void StructuralChecker::Impl::differ(const proof::Difference& d, std::string msg, int line) {
  if (differences.size() < proof::kMaxDifferences) differences.push_back(d);
  else differences_lost = true;
  suspect(std::move(msg), line);
}

void StructuralChecker::Impl::suspect(std::string msg, int line) {
  if (!suspicion.empty()) return;  // the first difference is the one reported
  suspicion = std::move(msg);
  suspicion_line = line;
}

std::string StructuralChecker::Impl::lqs(int w, int k) const {
  return "logical qubits " + std::to_string(logical_of_wire(w)) + " and " + std::to_string(logical_of_wire(k));
}

std::string StructuralChecker::Impl::var_name(int v) const {
  const int w = wire_of(v), g = gen_of(v);
  if (v == cur[w] && wire_done(w)) return "output bit " + std::to_string(output_bit_of_wire(w));
  if (g == 0) return "the input of " + lq(w);
  return "the wire of " + lq(w) + " after its block transform " + std::to_string(schedule.of_wire[w][g - 1] + 1);
}

std::string StructuralChecker::Impl::transform_name() const {
  if (spec.block_length) return "block construction";
  return spec.inverse ? "inverse QFT" : "QFT";
}

std::string StructuralChecker::Impl::in_transform(int t) const {
  if (!composed()) return {};
  const proof::Transform& tr = schedule.transforms[t];
  const int a = logical_of_wire(tr.first), b = logical_of_wire(tr.first + tr.size - 1);
  return ", in block transform " + std::to_string(t + 1) + " of " + std::to_string(schedule.transforms.size()) +
         " (the " + (tr.inverse ? "inverse QFT" : "QFT") + " of logical qubits " + std::to_string(std::min(a, b)) +
         ".." + std::to_string(std::max(a, b)) + ")";
}

std::string StructuralChecker::Impl::describe(const Parity& p) const {
  if (p.size == 0) return p.c ? "|1>" : "|0>";
  std::string s = p.c ? "NOT(" : "";
  for (int i = 0; i < p.size; ++i) {
    if (i) s += " XOR ";
    s += var_name(p.v[i]);
  }
  if (p.c) s += ")";
  return s;
}

// ---------------------------------------------------------------------------------------------
// Streaming front end: ranges, couplers, measurements, the Hadamard frame.

bool StructuralChecker::Impl::check_qubit(int q, int line) {
  if (q < 0 || q >= nq) {
    fail("qubit " + std::to_string(q) + " is outside the device (" + std::to_string(nq) + " qubits)", line);
    return false;
  }
  if (measured[q]) {
    fail("gate on qubit " + std::to_string(q) + " after its measurement", line);
    return false;
  }
  if (!device->usable(q)) {
    fail("gate on qubit " + std::to_string(q) + ", which is out of service (" + device->out_of_service_reason(q) + ")",
         line);
    return false;
  }
  return true;
}

// The gate's qubits exist, are not measured yet, and (two-qubit gates) are distinct and coupled.
bool StructuralChecker::Impl::check_gate_qubits(const Gate& g, int line) {
  if (!check_qubit(g.q0, line)) return false;
  if (!is_two_qubit(g.kind)) return true;
  if (!check_qubit(g.q1, line)) return false;
  if (g.q0 == g.q1) {
    fail(std::string(gate_name(g.kind)) + " on qubit " + std::to_string(g.q0) + " twice", line);
    return false;
  }
  if (!device->coupled(g.q0, g.q1)) {
    const int any = device->any_coupler_index(g.q0, g.q1);
    fail(std::string(gate_name(g.kind)) + " on qubits " + std::to_string(g.q0) + " and " + std::to_string(g.q1) +
             (any < 0 ? ", which have no coupler"
                      : ", whose coupler is out of service (" + device->coupler_out_of_service_reason(any) + ")"),
         line);
    return false;
  }
  return true;
}

void StructuralChecker::Impl::feed(const Gate& g, int line) {
  if (failed) return;
  ++gates;
  if (g.kind == GateKind::measure) {
    if (g.q0 < 0 || g.q0 >= nq) {
      fail("measured qubit " + std::to_string(g.q0) + " is outside the device", line);
      return;
    }
    release(g.q0);
    measured[g.q0] = 1;
    return;
  }
  if (!check_gate_qubits(g, line)) return;
  if (g.kind == GateKind::h) {
    pend_h[g.q0] ^= 1;  // h h is the identity
    pend_h_line[g.q0] = line;
    return;
  }
  if (acts_trivially(g)) return;
  if (g.kind == GateKind::cz) {
    feed_cz(g.q0, g.q1, line);
    return;
  }
  release(g.q0);
  if (is_two_qubit(g.kind)) release(g.q1);
  apply(g, line);
}

// A gate that leaves every state it can meet here unchanged: a controlled phase or a cx whose
// control holds |0> with no Hadamard in its frame, or a zero rotation. Dropping it keeps a
// rewritten circuit in the shapes the front end recognises.
bool StructuralChecker::Impl::acts_trivially(const Gate& g) const {
  auto quiet_zero = [&](int q) { return par[q].size == 0 && par[q].c == 0 && !pend_h[q]; };
  switch (g.kind) {
    case GateKind::rz:
    case GateKind::p: return g.angle.is_zero();
    case GateKind::cp:
      if (g.angle.is_zero()) return true;
      [[fallthrough]];
    case GateKind::cz: return quiet_zero(g.q0) || quiet_zero(g.q1);
    case GateKind::cx: return quiet_zero(g.q0);
    default: return false;
  }
}

// The qubit holds the input of a wire alone and that wire has not had its Hadamard: the one place
// where the QFT's Hadamard of the wire can act.
bool StructuralChecker::Impl::awaits_hadamard(int q) const {
  if (par[q].size != 1) return false;
  const int v = par[q].v[0], w = wire_of(v);
  return !wire_done(w) && v == cur[w];
}

// A cz with no H in either frame may be the wire's Hadamard merged with a sandwich's first h (feed_cz)
// on a qubit that awaits it. In a composition of transforms the wire's Hadamard can only be here when
// the terms it closes are all in place (in an inverse transform the wire meets its partners before its
// Hadamard, so a cz on it is often a phase); the textbook transform keeps the plain rule.
bool StructuralChecker::Impl::hadamard_may_merge(int q) {
  if (!awaits_hadamard(q)) return false;
  if (!composed()) return true;
  return closes(par[q].v[0], false);
}

// Of two qubits, the one whose Hadamard is due first: a qubit awaiting its wire's Hadamard before
// one that is not, and of two awaiting it, the wire whose Hadamard the QFT puts first (the Hadamard
// of wire w must follow those of the wires in closing_window(w): the lower wires of the forward
// transform, the higher ones of the inverse); otherwise the one whose h came first.
int StructuralChecker::Impl::hadamard_due(int a, int b) const {
  const bool wa = awaits_hadamard(a), wb = awaits_hadamard(b);
  if (wa != wb) return wa ? a : b;
  if (wa) {
    // The earlier transform first; within one, the transform's order.
    const int va = wire_of(par[a].v[0]), vb = wire_of(par[b].v[0]);
    const int ta = due_transform(va), tb = due_transform(vb);
    if (ta != tb) return ta < tb ? a : b;
    return (va < vb) != schedule.transforms[ta].inverse ? a : b;
  }
  return pend_h_line[a] <= pend_h_line[b] ? a : b;
}

// A cz seen through the Hadamard frame. With an H in the frame of exactly one qubit t it is
// cx c,t (h t; cz c,t; h t == cx c,t: the frame's H and the one still to come on t, or removed by
// an optimiser together with a Hadamard that meets it). With H in both frames, the one due first
// (hadamard_due) is applied, and the other qubit is the target. With none, and a qubit t awaiting
// its wire's Hadamard (hadamard_may_merge: in a composition, with the terms it closes in place; of
// two such, the one due first), it is that Hadamard followed by cx c,t with an H left in t's frame
// (cz c,t == h t; (h t; cz c,t; h t); h t: the form left where the wire's Hadamard and the
// sandwich's first h cancelled); otherwise it is a phase.
void StructuralChecker::Impl::feed_cz(int a, int b, int line) {
  if (pend_h[a] && pend_h[b]) release(hadamard_due(a, b));
  if (pend_h[b]) return apply(Gate{GateKind::cx, a, b, Angle{}}, line);
  if (pend_h[a]) return apply(Gate{GateKind::cx, b, a, Angle{}}, line);
  const bool ma = hadamard_may_merge(a), mb = hadamard_may_merge(b);
  if (ma || mb) {
    const int t = ma && mb ? hadamard_due(a, b) : ma ? a : b;
    const int c = t == a ? b : a;
    apply(Gate{GateKind::h, t, -1, Angle{}}, line);
    if (failed) return;
    pend_h[t] = 1;
    pend_h_line[t] = line;
    return apply(Gate{GateKind::cx, c, t, Angle{}}, line);
  }
  apply(Gate{GateKind::cz, a, b, Angle{}}, line);
}

// Applies the Hadamard in q's frame, if any.
void StructuralChecker::Impl::release(int q) {
  if (pend_h[q]) apply(Gate{GateKind::h, q, -1, Angle{}}, pend_h_line[q]);
  pend_h[q] = 0;
}

void StructuralChecker::Impl::flush_all() {
  for (int q = 0; q < nq; ++q) release(q);
}

// ---------------------------------------------------------------------------------------------
// End of the circuit.

CheckResult StructuralChecker::Impl::finish(const std::vector<int>& final_placement) {
  drain_window();
  if (!failed) flush_all();
  CheckResult r;
  if (!failed) final_checks(final_placement);
  if (failed) {
    r.ok = false;
    r.outcome = inconclusive ? CheckOutcome::cannot_prove : CheckOutcome::wrong;
    r.message = message;
    r.line = fail_line;
    r.inconclusive = inconclusive;
    if (inconclusive) {
      r.lost_track_line = fail_line;
      r.lost_track_reason = message;
    }
    return r;
  }
  r.ok = true;
  r.structural_proved = true;
  std::string kind = spec.inverse ? "inverse QFT" : "QFT";
  std::string degree;
  if (spec.block_length) {
    kind = std::string(spec.inverse ? "inverse " : "") + "block construction";
    degree = "blocks of " + std::to_string(*spec.block_length) + ", " + std::to_string(schedule.transforms.size()) +
             " block transforms";
  } else {
    degree = spec.effectively_exact() ? "exact" : "approximate, degree " + std::to_string(*spec.approx_degree);
  }
  r.message = "structural proof: the circuit is the " + kind + " on " + std::to_string(n) + " qubits (" + degree +
              "), " + std::to_string(terms_checked) + " controlled phases checked over " + std::to_string(gates) +
              " gates";
  return r;
}

// The verdict at the end (see "Verdicts" in structural_state.hpp): proved, a certain difference,
// or lost track.
void StructuralChecker::Impl::final_checks(const std::vector<int>& fp) {
  // Fewer Hadamards than wires, all followed exactly: for the input |0> the output is spread over
  // at most 2^(Hadamards) basis states, the QFT's over all 2^n. Certain.
  // Pairs of Hadamards an optimiser removed at the end of a wire (structural_compose.cpp).
  // A fusion can make another wire's pair fusable (the two transforms' terms on one monomial cancel).
  for (bool again = composed(); again;) {
    again = false;
    for (int w = 0; w < n; ++w)
      if (!wire_done(w) && fusable(w)) {
        fuse(w);
        again = true;
      }
  }
  for (int w = 0; w < n; ++w)
    if (!wire_done(w)) {
      // One Hadamard a wire, followed exactly: the argument above is certain. Composed transforms
      // can spread the state with fewer Hadamards than they have (a transform and its inverse), so
      // there the count alone proves nothing.
      if (composed())
        return cannot_prove("the wire of " + lq(w) + " gets " + std::to_string(gen[w]) + " of its " +
                                std::to_string(schedule.of_wire[w].size()) + " Hadamards of the block construction",
                            0);
      return fail("the wire of " + lq(w) + " never gets its Hadamard (so for the input |0> at most 2^" +
                      std::to_string(h_count) + " output amplitudes are nonzero; the QFT has 2^" + std::to_string(n) +
                      ")",
                  0);
    }
  // A bad map is a bad request, not a finding about the circuit.
  if (const std::string e = final_placement_problem(fp); e.rfind("final_placement ", 0) == 0) return fail(e, 0);
  int term_line = suspicion_line;
  std::string terms = suspicion.empty() ? leftover_term(term_line) : suspicion;
  const std::string place = final_placement_problem(fp);
  if (terms.empty() && place.empty()) return;
  const std::string problem = terms.empty() ? place : place.empty() ? terms : terms + "; and " + place;
  const int line = terms.empty() ? 0 : term_line;
  // A composition of block transforms sums over the variables between them: two path sums that
  // differ in a term may still be one operator, so a difference there refutes nothing (simulation
  // decides where it can).
  if (composed())
    return cannot_prove(problem + " (in a composition of block transforms a differing term does not prove a "
                                  "different operator)",
                        line);
  if (const int q = non_canonical_qubit(); q >= 0)
    return cannot_prove(problem + ", but the end state is not in a form the proof can compare (qubit " +
                            std::to_string(q) + " holds " + describe(par[q]) + ")",
                        line);
  // Both the phases and the end state differ. A qubit outside the register left in |1> or holding
  // a value is wrong whatever the phases (for the input |0> part of the output lies outside the
  // register). Outputs in other places or inverted (X) change which phases the QFT needs: compare
  // again in their labels.
  if (!terms.empty() && !place.empty()) {
    std::vector<int> tau;
    std::vector<char> inverted;
    const bool ancilla_dirty = place.rfind("qubit ", 0) == 0;
    const bool leftover = suspicion.empty();  // a term on outputs alone: no relabelling explains it
    if (!ancilla_dirty && !(!differences_lost && output_relabelling(fp, tau, inverted) &&
                            (leftover || relabelling_leaves_a_difference(tau, inverted))))
      return cannot_prove(problem + " (the outputs end elsewhere too, and in their places the phases may be right)",
                          line);
  }
  fail(problem, line);
}

// A term the Hadamards did not remove: a phase the QFT does not have ("" when none).
std::string StructuralChecker::Impl::leftover_term(int& line) {
  for (int v = 0; v < static_cast<int>(single.size()); ++v)
    if (!single[v].is_zero()) {
      line = single_line[v];
      return "a phase of " + single_text(single[v]) + " is left on " + var_name(v) + ", which the " + transform_name() + " does not have" +
             at_line(single_line[v]);
    }
  if (composed()) return composed_leftover(line);  // the reference's terms between outputs
  // The term with the smallest key, so that the message does not depend on the table's order.
  std::uint64_t first = proof::PairTable::kEmpty;
  proof::Term term;
  pairs.for_each([&](std::uint64_t key, const proof::Term& t) {
    if (key < first) {
      first = key;
      term = t;
    }
  });
  if (first == proof::PairTable::kEmpty) return {};
  const int a = static_cast<int>(first >> 32), b = static_cast<int>(first & 0xffffffffu);
  line = term.line;
  return "a controlled phase of " + angle_text(term.angle()) + " is left between " + var_name(a) + " and " +
         var_name(b) + ", which the " + transform_name() + " does not have" + at_line(term.line);
}

// Output bit k on final_placement[k], and every other qubit back in |0> ("" when so).
std::string StructuralChecker::Impl::final_placement_problem(const std::vector<int>& fp) const {
  if (static_cast<int>(fp.size()) != n)
    return "final_placement lists " + std::to_string(fp.size()) + " qubits for a " + std::to_string(n) + "-qubit QFT";
  std::vector<char> used(nq, 0);
  for (int k = 0; k < n; ++k) {
    const int q = fp[k];
    if (q < 0 || q >= nq) return "final_placement names qubit " + std::to_string(q) + ", outside the device";
    if (used[q]) return "final_placement names qubit " + std::to_string(q) + " twice";
    used[q] = 1;
    const int want = cur[spec.output_wire(k)];
    const Parity& p = par[q];
    if (!(p.size == 1 && p.v[0] == want && p.c == 0))
      return "output bit " + std::to_string(k) + " should end on qubit " + std::to_string(q) + ", which holds " +
             describe(p);
  }
  for (int q = 0; q < nq; ++q)
    if (!used[q] && (par[q].size != 0 || par[q].c != 0))
      return "qubit " + std::to_string(q) + " is outside the final placement but ends holding " + describe(par[q]) +
             " instead of |0>";
  return {};
}

// A qubit holding a parity of several variables, or a variable some other qubit holds too; -1
// when the end state is canonical (each qubit a constant or a variable of its own).
int StructuralChecker::Impl::non_canonical_qubit() const {
  for (int q = 0; q < nq; ++q)
    if (par[q].size > 1 || (par[q].size == 1 && occ[par[q].v[0]] != 1)) return q;
  return -1;
}

// The QFT's coefficient of (input of wire a) * (output of wire b), outputs labelled by wire.
Angle StructuralChecker::Impl::want(int a, int b) const {
  if (a == b) return Angle(1, 0);  // the Hadamard's own pi x y
  return window_in(0, a).contains(b) ? spec.rotation(std::abs(a - b)) : Angle{};  // one transform
}

// True when the register's final qubits hold the n outputs, each once, some inverted (NOT y), and
// every other qubit is |0>. Per wire w: tau[w] is the wire whose output place y_w ends in, and
// inverted[w] says whether it ends inverted.
bool StructuralChecker::Impl::output_relabelling(const std::vector<int>& fp, std::vector<int>& tau,
                                                 std::vector<char>& inverted) const {
  tau.assign(n, -1);
  inverted.assign(n, 0);
  std::vector<char> used(nq, 0);
  for (int k = 0; k < n; ++k) {
    const Parity& p = par[fp[k]];
    if (p.size != 1 || p.v[0] < n) return false;
    const int w = p.v[0] - n;
    if (tau[w] >= 0) return false;
    tau[w] = spec.output_wire(k);
    inverted[w] = p.c;
    used[fp[k]] = 1;
  }
  for (int q = 0; q < nq; ++q)
    if (!used[q] && (par[q].size != 0 || par[q].c != 0)) return false;
  return true;
}

// The outputs end relabelled (tau) and some inverted: the circuit is the QFT only when its phase
// polynomial is the QFT's in those labels, i.e. for every input a and output y_w the coefficient
// is want(a, tau[w]), negated when y_w is inverted (y -> 1 - y), and the input x_a alone carries
// the sum of want(a, tau[w]) over the inverted w. The circuit's coefficients are known: the
// recorded differences, and want(a, w) for every unrecorded pair. True when one breaks the rule.
bool StructuralChecker::Impl::relabelling_leaves_a_difference(const std::vector<int>& tau,
                                                              const std::vector<char>& inverted) const {
  std::vector<int> moved;  // outputs whose expected coefficients change
  for (int w = 0; w < n; ++w)
    if (tau[w] != w || inverted[w]) moved.push_back(w);
  if (static_cast<double>(n) * static_cast<double>(moved.size()) > 1e8) return false;  // too much work: lost track
  std::unordered_map<std::uint64_t, Angle> pair_got;
  std::vector<Angle> single_got(n);
  for (const auto& d : differences) {
    if (d.b == proof::Difference::kInputPair) return true;  // no relabelling of outputs makes it
    if (d.b == proof::Difference::kSingle) {
      single_got[d.a] = d.got;
      continue;
    }
    if (tau[d.b] == d.b && !inverted[d.b]) return true;  // unchanged expectation, and it differs
    pair_got[proof::pair_key(d.a, d.b)] = d.got;
  }
  for (int a = 0; a < n; ++a) {
    proof::WideAngle single_left;
    single_left.add(single_got[a]);
    for (int w : moved) {
      const Angle target = want(a, tau[w]);
      const auto it = pair_got.find(proof::pair_key(a, w));
      proof::WideAngle diff;  // got - (inverted ? -target : target) must vanish
      diff.add(it == pair_got.end() ? want(a, w) : it->second);
      diff.add(inverted[w] ? target : -target);
      if (!diff.is_zero()) return true;
      if (inverted[w]) single_left.add(-target);
    }
    if (!single_left.is_zero()) return true;
  }
  return false;
}

// ---------------------------------------------------------------------------------------------
// The public class.

StructuralChecker::StructuralChecker(const Device& device, const QftSpec& spec, std::vector<int> placement)
    : impl_(std::make_shared<Impl>(device, spec, std::move(placement))) {}

void StructuralChecker::gate(const Gate& g, int line) { impl_->peephole(g, line); }

CheckResult StructuralChecker::finish(const std::vector<int>& final_placement) { return impl_->finish(final_placement); }

bool StructuralChecker::failed() const { return impl_->failed; }

long long StructuralChecker::gate_count() const { return impl_->gates; }

}  // namespace qftplan
