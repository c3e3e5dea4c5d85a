// The structural proof's set-up, its streaming front end (qubit ranges, couplers, measurements,
// h-cz-h sandwiches) and its end-of-circuit checks; the public StructuralChecker forwards here.
// The method is described in structural_state.hpp.

#include <string>
#include <utility>
#include <vector>

#include "structural_state.hpp"

namespace qftplan {


StructuralChecker::Impl::Impl(const Device& dev, const QftSpec& s, std::vector<int> pl)
    : device(&dev), spec(s), n(s.qubits), d(s.max_distance()), nq(dev.qubit_count()), placement(std::move(pl)) {
  par.assign(nq, Parity{});
  measured.assign(nq, 0);
  pend_h.assign(nq, 0);
  pend_h_line.assign(nq, 0);
  cz_partner.assign(nq, -1);
  cz_line.assign(nq, 0);
  if (n < 1) {
    fail("the QFT needs at least one qubit", 0);
    return;
  }
  occ.assign(2 * n, 0);
  single.assign(2 * n, WideAngle{});
  single_line.assign(2 * n, 0);
  partners.assign(2 * n, {});
  h_done.assign(n, 0);
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

std::string StructuralChecker::Impl::lqs(int w, int k) const {
  return "logical qubits " + std::to_string(logical_of_wire(w)) + " and " + std::to_string(logical_of_wire(k));
}

std::string StructuralChecker::Impl::var_name(int v) const {
  if (v < n) return "the input of " + lq(v);
  return "output bit " + std::to_string(output_bit_of_wire(v - n));
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
// Streaming front end: ranges, couplers, measurements, sandwiches.

bool StructuralChecker::Impl::check_qubit(int q, int line) {
  if (q < 0 || q >= nq) {
    fail("qubit " + std::to_string(q) + " is outside the device (" + std::to_string(nq) + " qubits)", line);
    return false;
  }
  if (measured[q]) {
    fail("gate on qubit " + std::to_string(q) + " after its measurement", line);
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
    fail(std::string(gate_name(g.kind)) + " on qubits " + std::to_string(g.q0) + " and " + std::to_string(g.q1) +
             ", which have no coupler",
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
    feed_h(g.q0, line);
    return;
  }
  if (g.kind == GateKind::cz && hold_cz(g, line)) return;
  release(g.q0);
  if (is_two_qubit(g.kind)) release(g.q1);
  apply(g, line);
}

// An h either closes a held h-cz sandwich on its qubit or is held itself.
void StructuralChecker::Impl::feed_h(int q, int line) {
  const int c = cz_partner[q];
  if (c >= 0 && pend_h[q]) {
    // h q; cz c,q; h q  ==  cx c,q. A held H on c came before the cz: apply it first.
    const int line_cz = cz_line[q];
    cz_partner[q] = cz_partner[c] = -1;
    pend_h[q] = 0;
    if (pend_h[c]) {
      pend_h[c] = 0;
      apply(Gate{GateKind::h, c, -1, Angle{}}, pend_h_line[c]);
    }
    apply(Gate{GateKind::cx, c, q, Angle{}}, line_cz);
    return;
  }
  // A second H on the qubit is held too (h h is the identity); a third cancels one of them.
  if (c < 0 && pend_h[q]) {
    pend_h[q] = pend_h[q] == 1 ? 2 : 1;
    return;
  }
  release(q);
  pend_h[q] = 1;
  pend_h_line[q] = line;
}

// Holds a cz that meets a held H (it may be the middle of a sandwich); false when it is to be
// applied right away.
bool StructuralChecker::Impl::hold_cz(const Gate& g, int line) {
  // An earlier held cz on either qubit is resolved first (its H's came before it, so they
  // cannot open a sandwich around this cz).
  flush_pair(g.q0);
  flush_pair(g.q1);
  // h h before a cz: the first is a Hadamard of its own, the second may open a sandwich.
  for (int x : {g.q0, g.q1})
    if (pend_h[x] == 2) {
      pend_h[x] = 1;
      apply(Gate{GateKind::h, x, -1, Angle{}}, pend_h_line[x]);
    }
  if (pend_h[g.q0] || pend_h[g.q1]) {
    cz_partner[g.q0] = g.q1;
    cz_partner[g.q1] = g.q0;
    cz_line[g.q0] = cz_line[g.q1] = line;
    return true;
  }
  return false;
}

// Applies whatever is held on qubit q (and the other half of a held cz).
void StructuralChecker::Impl::release(int q) {
  flush_pair(q);
  if (pend_h[q] == 1) apply(Gate{GateKind::h, q, -1, Angle{}}, pend_h_line[q]);
  pend_h[q] = 0;  // two held H's cancel
}

// Applies a held cz on q with the held H's that precede it.
void StructuralChecker::Impl::flush_pair(int q) {
  const int c = cz_partner[q];
  if (c < 0) return;
  cz_partner[q] = cz_partner[c] = -1;
  for (int x : {q, c})
    if (pend_h[x]) {
      pend_h[x] = 0;
      apply(Gate{GateKind::h, x, -1, Angle{}}, pend_h_line[x]);
    }
  apply(Gate{GateKind::cz, q, c, Angle{}}, cz_line[q]);
}

void StructuralChecker::Impl::flush_all() {
  for (int q = 0; q < nq; ++q) release(q);
}

// ---------------------------------------------------------------------------------------------
// End of the circuit.

CheckResult StructuralChecker::Impl::finish(const std::vector<int>& final_placement) {
  if (!failed) flush_all();
  CheckResult r;
  if (!failed) final_checks(final_placement);
  if (failed) {
    r.ok = false;
    r.message = message;
    r.line = fail_line;
    r.inconclusive = inconclusive;
    return r;
  }
  r.ok = true;
  r.structural_proved = true;
  std::string kind = spec.inverse ? "inverse QFT" : "QFT";
  std::string degree = spec.effectively_exact() ? "exact" : "approximate, degree " + std::to_string(*spec.approx_degree);
  r.message = "structural proof: the circuit is the " + kind + " on " + std::to_string(n) + " qubits (" + degree +
              "), " + std::to_string(terms_checked) + " controlled phases checked over " + std::to_string(gates) +
              " gates";
  return r;
}

void StructuralChecker::Impl::final_checks(const std::vector<int>& fp) {
  for (int w = 0; w < n; ++w)
    if (!h_done[w]) return fail("the wire of " + lq(w) + " never gets its Hadamard", 0);
  check_no_terms_left();
  if (failed) return;
  check_final_placement(fp);
}

// The Hadamards removed every term the QFT needs; whatever is left is a phase it does not have.
void StructuralChecker::Impl::check_no_terms_left() {
  for (int v = 0; v < 2 * n; ++v)
    if (!single[v].is_zero())
      return fail("a phase of " + single_text(single[v]) + " is left on " + var_name(v) +
                      ", which the QFT does not have" + at_line(single_line[v]),
                  single_line[v]);
  for (const auto& [key, t] : pairs) {
    const int a = static_cast<int>(key >> 32), b = static_cast<int>(key & 0xffffffffu);
    return fail("a controlled phase of " + angle_text(t.angle) + " is left between " + var_name(a) + " and " +
                    var_name(b) + ", which the QFT does not have" + at_line(t.line),
                t.line);
  }
}

// Output bit k on final_placement[k], and every other qubit back in |0>.
void StructuralChecker::Impl::check_final_placement(const std::vector<int>& fp) {
  if (static_cast<int>(fp.size()) != n)
    return fail("final_placement lists " + std::to_string(fp.size()) + " qubits for a " + std::to_string(n) +
                    "-qubit QFT",
                0);
  std::vector<char> used(nq, 0);
  for (int k = 0; k < n; ++k) {
    const int q = fp[k];
    if (q < 0 || q >= nq) return fail("final_placement names qubit " + std::to_string(q) + ", outside the device", 0);
    if (used[q]) return fail("final_placement names qubit " + std::to_string(q) + " twice", 0);
    used[q] = 1;
    const int want = n + spec.output_wire(k);
    const Parity& p = par[q];
    if (!(p.size == 1 && p.v[0] == want && p.c == 0))
      return fail("output bit " + std::to_string(k) + " should end on qubit " + std::to_string(q) + ", which holds " +
                      describe(p),
                  0);
  }
  for (int q = 0; q < nq; ++q)
    if (!used[q] && (par[q].size != 0 || par[q].c != 0))
      return fail("qubit " + std::to_string(q) + " is outside the final placement but ends holding " +
                      describe(par[q]) + " instead of |0>",
                  0);
}

// ---------------------------------------------------------------------------------------------
// The public class.

StructuralChecker::StructuralChecker(const Device& device, const QftSpec& spec, std::vector<int> placement)
    : impl_(std::make_shared<Impl>(device, spec, std::move(placement))) {}

void StructuralChecker::gate(const Gate& g, int line) { impl_->feed(g, line); }

CheckResult StructuralChecker::finish(const std::vector<int>& final_placement) { return impl_->finish(final_placement); }

bool StructuralChecker::failed() const { return impl_->failed; }

long long StructuralChecker::gate_count() const { return impl_->gates; }

}  // namespace qftplan
