// The structural proof's path-sum state: the parity each qubit holds and the phase polynomial,
// and the rules of every gate except the Hadamard (structural_hadamard.cpp). The method is
// described in structural_state.hpp.

#include <algorithm>
#include <bit>
#include <cstdint>
#include <string>
#include <utility>

#include "structural_state.hpp"

namespace qftplan {

using proof::kMaxParity;

void StructuralChecker::Impl::apply(const Gate& g, int line) {
  if (failed) return;
  switch (g.kind) {
    case GateKind::h: hadamard(g.q0, line); return;
    case GateKind::x: par[g.q0].c ^= 1; return;
    case GateKind::sx: cannot_prove("sx gates are outside the structural proof", line); return;
    case GateKind::rz:
    case GateKind::p: phase1(g.q0, g.angle, line); return;  // rz and p differ by a global phase
    case GateKind::cx: xor_into(g.q1, g.q0, line); return;
    case GateKind::cz: phase2(g.q0, g.q1, Angle(1, 0), line); return;
    case GateKind::cp: phase2(g.q0, g.q1, g.angle, line); return;
    case GateKind::swap: std::swap(par[g.q0], par[g.q1]); return;
    case GateKind::cp_swap:
      phase2(g.q0, g.q1, g.angle, line);
      std::swap(par[g.q0], par[g.q1]);
      return;
    case GateKind::parity_step:
      xor_into(g.q0, g.q1, line);
      xor_into(g.q1, g.q0, line);
      phase1(g.q0, g.angle, line);
      return;
    case GateKind::measure: return;
    case GateKind::p_if:
      // A file read whole goes to the semi-classical proof (semiclassical_check.cpp); a streamed one
      // (256 MiB and more) cannot be followed here.
      cannot_prove("a phase conditioned on a measured bit is proved only in files read whole (below 256 MiB)", line);
      return;
  }
}

// parity[t] ^= parity[c]
void StructuralChecker::Impl::xor_into(int t, int c, int line) {
  const Parity& a = par[t];
  const Parity& b = par[c];
  Parity r;
  r.c = a.c ^ b.c;
  int i = 0, j = 0, k = 0;
  std::int32_t out[2 * kMaxParity];
  while (i < a.size || j < b.size) {
    if (j >= b.size || (i < a.size && a.v[i] < b.v[j])) {
      out[k++] = a.v[i++];
    } else if (i >= a.size || b.v[j] < a.v[i]) {
      ++occ[b.v[j]];
      out[k++] = b.v[j++];
    } else {
      --occ[a.v[i]];  // x XOR x cancels
      ++i;
      ++j;
    }
  }
  if (k > kMaxParity) {
    cannot_prove("qubit " + std::to_string(t) + " would hold a parity of " + std::to_string(k) +
                     " values (the proof tracks at most " + std::to_string(kMaxParity) + ")",
                 line);
    return;
  }
  r.size = static_cast<std::uint8_t>(k);
  std::copy(out, out + k, r.v);
  par[t] = r;
}

void StructuralChecker::Impl::add_single(int v, const Angle& a, int line) {
  single[v].add(a);
  single_line[v] = line;
}

// Text of a one-bit coefficient for messages.
std::string StructuralChecker::Impl::single_text(const WideAngle& s) {
  const auto a = s.narrow();
  return a ? angle_text(*a) : std::string("more than 62 binary digits of pi");
}

void StructuralChecker::Impl::add_pair(int u, int v, const Angle& a, int line) {
  const auto key = proof::pair_key(u, v);
  auto [t, fresh] = pairs.try_emplace(key);
  if (fresh) {
    partners[u].push_back(v);
    partners[v].push_back(u);
    t->set(a, line);
    return;
  }
  auto s = proof::add_angles(t->angle(), a);
  if (!s) {
    cannot_prove("phase sum with denominators too far apart", line);
    return;
  }
  if (s->is_zero()) {
    pairs.erase(t);  // the partner lists keep a stale entry; lookups skip it
    return;
  }
  t->set(*s, line);
}

// Adds coefficient * theta for the monomial given as a mask over `vars`.
void StructuralChecker::Impl::add_monomial(const int* vars, unsigned mask, std::int64_t coef, const Angle& theta,
                                            int line) {
  auto a = proof::scale_angle(theta, coef);
  if (!a) {
    cannot_prove("phase coefficient too large", line);
    return;
  }
  if (a->is_zero()) return;
  const int deg = std::popcount(mask);
  if (deg == 1) {
    add_single(vars[std::countr_zero(mask)], *a, line);
  } else if (deg == 2) {
    const int i = std::countr_zero(mask);
    const int j = std::countr_zero(mask & (mask - 1));
    add_pair(vars[i], vars[j], *a, line);
  } else {
    cannot_prove("a phase gate creates a term of degree " + std::to_string(deg) + " (only up to 2 is tracked)",
                 line);
  }
}

// Multilinear expansion of a parity over the variable list `vars`: x1 XOR ... XOR xs =
// sum over nonempty T of (-2)^(|T|-1) prod_T x (inclusion-exclusion). coef is indexed by mask.
void StructuralChecker::Impl::expand(unsigned pmask, std::int64_t scale, std::int64_t* coef) {
  for (unsigned t = pmask; t; t = (t - 1) & pmask) {
    const int s = std::popcount(t);
    coef[t] += scale * ((s % 2 == 1) ? (std::int64_t{1} << (s - 1)) : -(std::int64_t{1} << (s - 1)));
  }
}

// Phase theta * (parity of q).
void StructuralChecker::Impl::phase1(int q, const Angle& theta, int line) {
  if (theta.is_zero()) return;
  const Parity& p = par[q];
  if (p.size == 0) return;  // a constant: global phase
  if (p.size == 1) {
    // theta * (x XOR 1) = theta - theta * x
    add_single(p.v[0], p.c ? -theta : theta, line);
    return;
  }
  std::int64_t coef[1 << kMaxParity] = {};
  expand((1u << p.size) - 1, p.c ? -1 : 1, coef);
  for (unsigned m = 1; m < (1u << p.size); ++m)
    if (coef[m]) add_monomial(p.v, m, coef[m], theta, line);
}

// Phase theta * (parity of a) * (parity of b).
void StructuralChecker::Impl::phase2(int qa, int qb, const Angle& theta, int line) {
  if (theta.is_zero()) return;
  const Parity& a = par[qa];
  const Parity& b = par[qb];
  if (a.size == 1 && b.size == 1 && a.c == 0 && b.c == 0 && a.v[0] != b.v[0]) {
    add_pair(a.v[0], b.v[0], theta, line);  // the common case: cp on two single values
    return;
  }
  // Variables of both parities, and each parity as a mask over them.
  int vars[2 * kMaxParity];
  int nv = 0;
  auto index_of = [&](int v) {
    for (int i = 0; i < nv; ++i)
      if (vars[i] == v) return i;
    vars[nv] = v;
    return nv++;
  };
  unsigned ma = 0, mb = 0;
  for (int i = 0; i < a.size; ++i) ma |= 1u << index_of(a.v[i]);
  for (int i = 0; i < b.size; ++i) mb |= 1u << index_of(b.v[i]);
  std::int64_t ca[1 << (2 * kMaxParity)] = {}, cb[1 << (2 * kMaxParity)] = {};
  std::int64_t total[1 << (2 * kMaxParity)] = {};
  expand(ma, 1, ca);
  expand(mb, 1, cb);
  // (ca0 + sa*A)(cb0 + sb*B) with A, B the parities and s = 1 - 2c; constants drop out.
  const std::int64_t sa = a.c ? -1 : 1, sb = b.c ? -1 : 1;
  if (a.c)
    for (unsigned t = mb; t; t = (t - 1) & mb) total[t] += sb * cb[t];
  if (b.c)
    for (unsigned t = ma; t; t = (t - 1) & ma) total[t] += sa * ca[t];
  for (unsigned s = ma; s; s = (s - 1) & ma)
    for (unsigned t = mb; t; t = (t - 1) & mb) total[s | t] += sa * sb * ca[s] * cb[t];  // x*x = x
  for (unsigned m = 1; m < (1u << nv); ++m)
    if (total[m]) add_monomial(vars, m, total[m], theta, line);
}

}  // namespace qftplan
