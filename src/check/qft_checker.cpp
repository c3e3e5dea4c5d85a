// The independent QFT checker: coupler check, a streaming structural proof by path sums, and a
// state-vector comparison against an exact reference for small registers.
//
// Structural proof (path-sum / phase-polynomial method). Every physical qubit holds an affine
// GF(2) function (a parity of variables plus a constant bit) of the input bits and of fresh
// variables created by Hadamards; phase gates add terms to a phase polynomial kept as a map from
// monomials to angles mod 2 pi, a representation that is unique. A circuit with exactly one
// Hadamard per register wire whose end state puts output variables where `final_placement` says
// implements 2^(-n/2) sum_y exp(i phi(x, y)) |y>, so it is the QFT exactly when phi equals the
// QFT's phase polynomial. A term with an input variable can only be created while some qubit
// holds that variable, so at the wire's Hadamard (which must consume the only copy) those terms
// are final and are compared with what the QFT needs right there.

#include <algorithm>
#include <bit>
#include <cmath>
#include <cstdint>
#include <numbers>
#include <optional>
#include <random>
#include <unordered_map>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/check/statevector.hpp"
#include "qftplan/core/run_budget.hpp"

namespace qftplan {

using cplx = std::complex<double>;

namespace {

// ---------------------------------------------------------------------------------------------
// Exact angle arithmetic with overflow detection (Angle::operator+ assumes QFT-sized numerators).

__extension__ typedef __int128 i128;  // GCC/Clang 128-bit integer, for overflow-free products

std::optional<Angle> reduce128(i128 num, std::uint32_t k) {
  if (num == 0) return Angle{};
  while (k > 0 && (num & 1) == 0) {
    num /= 2;
    --k;
  }
  if (k < 62) {
    const i128 turn = static_cast<i128>(1) << (k + 1);
    num %= turn;  // keeps the sign; Angle reduces into (-pi, pi]
    return Angle(static_cast<std::int64_t>(num), k);
  }
  if (num > INT64_MAX || num < -INT64_MAX) return std::nullopt;
  return Angle(static_cast<std::int64_t>(num), k);
}

std::optional<Angle> add_angles(const Angle& a, const Angle& b) {
  if (a.is_zero()) return b;
  if (b.is_zero()) return a;
  const std::uint32_t k = std::max(a.log2_den(), b.log2_den());
  const std::uint32_t sa = k - a.log2_den(), sb = k - b.log2_den();
  if (sa > 62 || sb > 62) return std::nullopt;
  const i128 x = static_cast<i128>(a.num()) * (static_cast<i128>(1) << sa);
  const i128 y = static_cast<i128>(b.num()) * (static_cast<i128>(1) << sb);
  return reduce128(x + y, k);
}

// a * c for an integer c.
std::optional<Angle> scale_angle(const Angle& a, std::int64_t c) {
  if (c == 0 || a.is_zero()) return Angle{};
  std::uint32_t k = a.log2_den();
  // Powers of two in c shrink the denominator; 2 pi multiples vanish.
  while (c % 2 == 0) {
    if (k == 0) return Angle{};
    c /= 2;
    --k;
  }
  return reduce128(static_cast<i128>(a.num()) * c, k);
}

// A sum of angles num * pi / 2^k with any spread of k, kept exactly as a binary fraction of a turn:
// N / 2^K turns with K = 64 * (number of words), the words little-endian. The one-bit phases of the
// output variables need it: in the parity network they gather pi/2 and pi/2^300 alike and cancel
// only at the end, so no partial sum fits one 64-bit numerator.
class WideAngle {
 public:
  void add(const Angle& a) {
    // While the sum fits one exact Angle it stays one (the common case, no allocation).
    if (!wide_) {
      if (const auto s = add_angles(small_, a)) {
        small_ = *s;
        return;
      }
      wide_ = true;
      add_wide(small_);
    }
    add_wide(a);
  }
  bool is_zero() const {
    if (!wide_) return small_.is_zero();
    return std::all_of(w_.begin(), w_.end(), [](std::uint64_t x) { return x == 0; });
  }
  // The same angle as an Angle, when its reduced numerator (or that of its negative) fits.
  std::optional<Angle> narrow() const {
    if (!wide_) return small_;
    return narrow_wide();
  }

 private:
  void add_wide(const Angle& a) {
    if (a.is_zero()) return;
    // a = num / 2^(k+1) turns: make room for k+1 bits, then add num * 2^(K-k-1) mod 2^K.
    const std::uint64_t bits = std::uint64_t{a.log2_den()} + 1;
    const std::size_t need = static_cast<std::size_t>((bits + 63) / 64);
    if (need > w_.size()) w_.insert(w_.begin(), need - w_.size(), 0);
    const std::uint64_t p = 64 * static_cast<std::uint64_t>(w_.size()) - bits;
    const bool negative = a.num() < 0;
    const std::uint64_t mag = negative ? 0 - static_cast<std::uint64_t>(a.num()) : static_cast<std::uint64_t>(a.num());
    const std::size_t i = static_cast<std::size_t>(p / 64);
    const unsigned s = static_cast<unsigned>(p % 64);
    const std::uint64_t lo = mag << s, hi = s ? mag >> (64 - s) : 0;
    if (!negative) {
      std::uint64_t carry = 0;
      for (std::size_t j = i; j < w_.size() && (j <= i + 1 || carry); ++j) {
        const std::uint64_t add = (j == i ? lo : j == i + 1 ? hi : 0);
        const std::uint64_t sum = w_[j] + add;
        const std::uint64_t out = sum + carry;
        carry = (sum < add || out < sum) ? 1 : 0;
        w_[j] = out;
      }
    } else {
      std::uint64_t borrow = 0;
      for (std::size_t j = i; j < w_.size() && (j <= i + 1 || borrow); ++j) {
        const std::uint64_t sub = (j == i ? lo : j == i + 1 ? hi : 0);
        const std::uint64_t before = w_[j];
        w_[j] = before - sub - borrow;
        borrow = (before < sub || (before == sub && borrow)) ? 1 : 0;
      }
    }
  }
  std::optional<Angle> narrow_wide() const {
    if (is_zero()) return Angle{};
    for (int sign : {1, -1}) {
      std::vector<std::uint64_t> v = w_;
      if (sign < 0) {  // two's complement: 2^K - N
        bool carry = true;
        for (auto& x : v) {
          x = ~x + (carry ? 1 : 0);
          carry = carry && x == 0;
        }
      }
      // Drop trailing zero bits, then the value must sit in the low 63 bits.
      std::size_t first = 0;
      while (v[first] == 0) ++first;  // v is not zero
      const std::size_t low = 64 * first + static_cast<std::size_t>(std::countr_zero(v[first]));
      const std::size_t total = 64 * v.size();
      std::uint64_t num = 0;
      bool fits = true;
      for (std::size_t b = low; b < total; ++b)
        if ((v[b / 64] >> (b % 64)) & 1) {
          if (b - low >= 63) {
            fits = false;
            break;
          }
          num |= std::uint64_t{1} << (b - low);
        }
      if (!fits) continue;
      // N / 2^K turns = N pi / 2^(K-1); after dropping `low` bits the exponent is K-1-low.
      const auto k = static_cast<std::int64_t>(total) - 1 - static_cast<std::int64_t>(low);
      if (k < 0 || k > static_cast<std::int64_t>(UINT32_MAX)) continue;
      return Angle(sign * static_cast<std::int64_t>(num), static_cast<std::uint32_t>(k));
    }
    return std::nullopt;
  }

  Angle small_;
  bool wide_ = false;
  std::vector<std::uint64_t> w_;
};

// ---------------------------------------------------------------------------------------------

constexpr int kMaxParity = 4;

// An affine GF(2) function: XOR of up to kMaxParity variables (sorted ids) and a constant bit.
struct Parity {
  std::int32_t v[kMaxParity] = {0, 0, 0, 0};
  std::uint8_t size = 0;
  std::uint8_t c = 0;
};

struct Term {
  Angle angle;
  int line = 0;  // last gate that changed it
};

std::uint64_t pair_key(int a, int b) {
  if (a > b) std::swap(a, b);
  return (static_cast<std::uint64_t>(static_cast<std::uint32_t>(a)) << 32) | static_cast<std::uint32_t>(b);
}

}  // namespace

std::string angle_text(const Angle& a) {
  if (a.log2_den() <= 20) return a.qasm2();
  return a.qasm3();
}

// ---------------------------------------------------------------------------------------------

struct StructuralChecker::Impl {
  const Device* device;
  QftSpec spec;
  int n;
  int d;
  int nq;  // device qubits
  std::vector<int> placement;

  std::vector<Parity> par;        // per physical qubit
  std::vector<int> occ;           // per variable: how many qubits' parities contain it
  // Per variable: coefficient of the degree-1 monomial (of any spread: WideAngle), and the last
  // gate that changed it.
  std::vector<WideAngle> single;
  std::vector<int> single_line;
  std::unordered_map<std::uint64_t, Term> pairs;  // degree-2 monomials
  std::vector<std::vector<int>> partners;         // per variable: possible pair partners (may be stale)
  std::vector<char> h_done;       // per wire
  std::vector<int> h_line;        // per wire
  std::vector<char> measured;     // per physical qubit

  // h-cz-h sandwiches (h t; cz c,t; h t == cx c,t). An H is held back until the next gate on its
  // qubit; a cz meeting a held H is held too (on both its qubits, since either may turn out to be
  // the target), and the next gate on either qubit decides: an h on a qubit with a held H closes
  // the sandwich, anything else releases the held gates unchanged. Two H's held on one qubit (h h)
  // are the identity unless a cz follows: then the first is a Hadamard of its own and the second
  // opens a sandwich.
  std::vector<char> pend_h;       // H's held on the qubit: 0, 1 or 2
  std::vector<int> pend_h_line;   // line of the first
  std::vector<int> cz_partner;    // the other qubit of a held cz, or -1 (kept on both qubits)
  std::vector<int> cz_line;

  bool failed = false;
  bool inconclusive = false;
  std::string message;
  int fail_line = 0;
  long long gates = 0;
  long long terms_checked = 0;
  int h_count = 0;

  Impl(const Device& dev, const QftSpec& s, std::vector<int> pl)
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

  void fail(std::string msg, int line, bool cannot_prove = false) {
    if (failed) return;
    failed = true;
    inconclusive = cannot_prove;
    message = std::move(msg);
    fail_line = line;
  }
  void cannot_prove(const std::string& why, int line) { fail("cannot prove: " + why, line, true); }

  // Names for messages. A wire is called by the logical qubit whose input bit it starts with.
  int logical_of_wire(int w) const { return spec.inverse ? w : n - 1 - w; }
  int output_bit_of_wire(int w) const { return spec.inverse ? n - 1 - w : w; }
  std::string lq(int w) const { return "logical qubit " + std::to_string(logical_of_wire(w)); }
  std::string lqs(int w, int k) const {
    return "logical qubits " + std::to_string(logical_of_wire(w)) + " and " + std::to_string(logical_of_wire(k));
  }
  std::string var_name(int v) const {
    if (v < n) return "the input of " + lq(v);
    return "output bit " + std::to_string(output_bit_of_wire(v - n));
  }
  std::string describe(const Parity& p) const {
    if (p.size == 0) return p.c ? "|1>" : "|0>";
    std::string s = p.c ? "NOT(" : "";
    for (int i = 0; i < p.size; ++i) {
      if (i) s += " XOR ";
      s += var_name(p.v[i]);
    }
    if (p.c) s += ")";
    return s;
  }
  static std::string at_line(int line) { return line > 0 ? " (line " + std::to_string(line) + ")" : ""; }

  // ----- streaming front end: ranges, couplers, measurements, sandwiches -----

  bool check_qubit(int q, int line) {
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

  void feed(const Gate& g, int line) {
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
    if (!check_qubit(g.q0, line)) return;
    if (is_two_qubit(g.kind)) {
      if (!check_qubit(g.q1, line)) return;
      if (g.q0 == g.q1) {
        fail(std::string(gate_name(g.kind)) + " on qubit " + std::to_string(g.q0) + " twice", line);
        return;
      }
      if (!device->coupled(g.q0, g.q1)) {
        fail(std::string(gate_name(g.kind)) + " on qubits " + std::to_string(g.q0) + " and " + std::to_string(g.q1) +
                 ", which have no coupler",
             line);
        return;
      }
    }

    if (g.kind == GateKind::h) {
      const int q = g.q0;
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
      return;
    }
    if (g.kind == GateKind::cz) {
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
        return;
      }
    }
    release(g.q0);
    if (is_two_qubit(g.kind)) release(g.q1);
    apply(g, line);
  }

  // Applies whatever is held on qubit q (and the other half of a held cz).
  void release(int q) {
    flush_pair(q);
    if (pend_h[q] == 1) apply(Gate{GateKind::h, q, -1, Angle{}}, pend_h_line[q]);
    pend_h[q] = 0;  // two held H's cancel
  }
  // Applies a held cz on q with the held H's that precede it.
  void flush_pair(int q) {
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
  void flush_all() {
    for (int q = 0; q < nq; ++q) release(q);
  }

  // ----- the path-sum state -----

  void apply(const Gate& g, int line) {
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
        phase1(g.q0, g.angle, line);
        xor_into(g.q1, g.q0, line);
        return;
      case GateKind::measure: return;
    }
  }

  // parity[t] ^= parity[c]
  void xor_into(int t, int c, int line) {
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

  void add_single(int v, const Angle& a, int line) {
    single[v].add(a);
    single_line[v] = line;
  }

  // Text of a one-bit coefficient for messages.
  static std::string single_text(const WideAngle& s) {
    const auto a = s.narrow();
    return a ? angle_text(*a) : std::string("more than 62 binary digits of pi");
  }

  void add_pair(int u, int v, const Angle& a, int line) {
    const auto key = pair_key(u, v);
    auto [it, fresh] = pairs.try_emplace(key);
    if (fresh) {
      partners[u].push_back(v);
      partners[v].push_back(u);
      it->second.angle = a;
      it->second.line = line;
      return;
    }
    auto s = add_angles(it->second.angle, a);
    if (!s) {
      cannot_prove("phase sum with denominators too far apart", line);
      return;
    }
    if (s->is_zero()) {
      pairs.erase(it);  // the partner lists keep a stale entry; lookups skip it
      return;
    }
    it->second.angle = *s;
    it->second.line = line;
  }

  // Adds coefficient * theta for the monomial given as a mask over `vars`.
  void add_monomial(const int* vars, unsigned mask, std::int64_t coef, const Angle& theta, int line) {
    auto a = scale_angle(theta, coef);
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
  static void expand(unsigned pmask, std::int64_t scale, std::int64_t* coef) {
    for (unsigned t = pmask; t; t = (t - 1) & pmask) {
      const int s = std::popcount(t);
      coef[t] += scale * ((s % 2 == 1) ? (std::int64_t{1} << (s - 1)) : -(std::int64_t{1} << (s - 1)));
    }
  }

  // Phase theta * (parity of q).
  void phase1(int q, const Angle& theta, int line) {
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
  void phase2(int qa, int qb, const Angle& theta, int line) {
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

  void hadamard(int q, int line) {
    const Parity p = par[q];
    if (p.size == 0) {
      cannot_prove("Hadamard on qubit " + std::to_string(q) + ", which holds " + describe(p) +
                       " rather than one register wire",
                   line);
      return;
    }
    // The wire whose input this Hadamard consumes: the qubit's only variable, or, when it holds a
    // parity x XOR L (the parity network), the one input x that no other qubit holds.
    int v = p.v[0];
    if (p.size > 1) {
      int found = 0;
      for (int i = 0; i < p.size; ++i)
        if (p.v[i] < n && occ[p.v[i]] == 1) {
          v = p.v[i];
          ++found;
        }
      if (found != 1) {
        cannot_prove("Hadamard on qubit " + std::to_string(q) + ", which holds " + describe(p) +
                         " rather than one register wire",
                     line);
        return;
      }
    }
    if (v >= n) {
      const int w = v - n;
      fail("second Hadamard on the wire of " + lq(w) + " (qubit " + std::to_string(q) + "; the first was" +
               (h_line[w] > 0 ? " on line " + std::to_string(h_line[w]) : " earlier") + ")",
           line);
      return;
    }
    const int w = v;
    if (occ[v] != 1) {
      cannot_prove("Hadamard on " + lq(w) + " while another qubit still holds a parity containing its input", line);
      return;
    }
    if (!single[v].is_zero()) {
      fail("a phase of " + single_text(single[v]) + " acts on " + lq(w) +
               " before its Hadamard; the QFT has no such phase" + at_line(line) ,
           single_line[v] > 0 ? single_line[v] : line);
      return;
    }

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

    // The controlled phases this Hadamard must close (forward: with the outputs of the wires
    // k in [w-d, w); inverse: with the outputs of the wires j in (w, w+d]).
    const int lo = spec.inverse ? w + 1 : std::max(0, w - d);
    const int hi = spec.inverse ? std::min(n - 1, w + d) : w - 1;
    for (int k = lo; k <= hi; ++k) {
      const Angle want = spec.rotation(std::abs(w - k));
      if (!h_done[k]) {
        fail("the Hadamard on " + lq(w) + " comes before the Hadamard on " + lq(k) +
                 ", but their controlled phase (" + angle_text(want) + ") must come between them" +
                 (spec.inverse ? " (inverse QFT order)" : ""),
             line);
        return;
      }
      auto it = pairs.find(pair_key(v, n + k));
      if (it == pairs.end()) {
        fail("controlled phase between " + lqs(w, k) + " is missing (expected angle " +
                 angle_text(want) + " before the Hadamard on " + lq(w) + ")",
             line);
        return;
      }
      if (!(it->second.angle == want)) {
        fail("controlled phase between " + lqs(w, k) + " has angle " +
                 angle_text(it->second.angle) + ", expected " + angle_text(want) + at_line(it->second.line),
             it->second.line > 0 ? it->second.line : line);
        return;
      }
    }
    // Every other term with v is wrong; remove the expected ones as we go.
    for (int u : partners[v]) {
      auto it = pairs.find(pair_key(v, u));
      if (it == pairs.end()) continue;
      const bool expected = u >= n && u - n >= lo && u - n <= hi;
      if (!expected) {
        const int other = u >= n ? u - n : u;
        std::string what = "an unexpected controlled phase of " + angle_text(it->second.angle) + " between " + lqs(w, other);
        if (u < n)
          what += ", applied before either of their Hadamards";
        else if (spec.inverse ? other < w : other > w)
          what += ", applied after the Hadamard on " + lq(other) + " (wrong order)";
        else
          what += " (beyond the approximation degree or duplicated)";
        fail(what + at_line(it->second.line), it->second.line > 0 ? it->second.line : line);
        return;
      }
      ++terms_checked;
      pairs.erase(it);
    }
    std::vector<int>().swap(partners[v]);
    single[v] = WideAngle{};

    // |v> -> sum_y (-1)^(v y) |y>: the new output variable; a constant 1 on v adds pi * y.
    h_done[w] = 1;
    h_line[w] = line;
    ++h_count;
    --occ[v];
    const int y = n + w;
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

  CheckResult finish(const std::vector<int>& final_placement) {
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

  void final_checks(const std::vector<int>& fp) {
    for (int w = 0; w < n; ++w)
      if (!h_done[w]) return fail("the wire of " + lq(w) + " never gets its Hadamard", 0);
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
};

StructuralChecker::StructuralChecker(const Device& device, const QftSpec& spec, std::vector<int> placement)
    : impl_(std::make_shared<Impl>(device, spec, std::move(placement))) {}

void StructuralChecker::gate(const Gate& g, int line) { impl_->feed(g, line); }

CheckResult StructuralChecker::finish(const std::vector<int>& final_placement) { return impl_->finish(final_placement); }

bool StructuralChecker::failed() const { return impl_->failed; }

long long StructuralChecker::gate_count() const { return impl_->gates; }

// ---------------------------------------------------------------------------------------------
// References for the state-vector check.

std::vector<cplx> exact_qft(std::vector<cplx> a, bool inverse) {
  const std::size_t size = a.size();
  if (size == 0 || (size & (size - 1)) != 0) throw std::invalid_argument("exact_qft needs a power-of-two length");
  // Iterative radix-2 FFT with exp(sign * 2 pi i j y / N), sign + for the forward QFT.
  for (std::size_t i = 1, j = 0; i < size; ++i) {
    std::size_t bit = size >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) std::swap(a[i], a[j]);
  }
  const double sign = inverse ? -1.0 : 1.0;
  std::vector<cplx> roots(size / 2);
  for (std::size_t k = 0; k < size / 2; ++k)  // each root computed directly, for accuracy
    roots[k] = std::polar(1.0, sign * 2.0 * std::numbers::pi * static_cast<double>(k) / static_cast<double>(size));
  for (std::size_t len = 2; len <= size; len <<= 1) {
    const std::size_t half = len / 2, step = size / len;
    for (std::size_t i = 0; i < size; i += len)
      for (std::size_t k = 0; k < half; ++k) {
        const cplx u = a[i + k], v = a[i + k + half] * roots[k * step];
        a[i + k] = u + v;
        a[i + k + half] = u - v;
      }
  }
  const double norm = 1.0 / std::sqrt(static_cast<double>(size));
  for (auto& x : a) x *= norm;
  return a;
}

std::vector<cplx> reference_qft(const QftSpec& spec, const std::vector<cplx>& a) {
  const int n = spec.qubits;
  if (a.size() != (std::size_t{1} << n)) throw std::invalid_argument("reference_qft: wrong vector length");
  if (spec.effectively_exact()) return exact_qft(a, spec.inverse);
  // Textbook approximate QFT on processing wires (Nielsen & Chuang 2000, Fig. 5.1, with the
  // rotations beyond the degree dropped, Coppersmith 1994): wire i gets H, then the controlled
  // phases with wires i+1..i+d; the inverse runs the list backwards with negated angles.
  const int d = spec.max_distance();
  StateVector sv(n);
  auto& amp = sv.amplitudes();
  auto wire_index = [&](std::size_t j, bool output) {
    std::size_t idx = 0;
    for (int k = 0; k < n; ++k)
      if (j >> k & 1) idx |= std::size_t{1} << (output ? spec.output_wire(k) : spec.input_wire(k));
    return idx;
  };
  for (std::size_t j = 0; j < a.size(); ++j) amp[wire_index(j, false)] = a[j];
  if (!spec.inverse) {
    for (int i = 0; i < n; ++i) {
      sv.apply(make_gate(GateKind::h, i));
      for (int j = i + 1; j <= std::min(n - 1, i + d); ++j) sv.apply(make_gate(GateKind::cp, i, j, spec.rotation(j - i)));
    }
  } else {
    for (int i = n - 1; i >= 0; --i) {
      for (int j = std::min(n - 1, i + d); j > i; --j) sv.apply(make_gate(GateKind::cp, i, j, spec.rotation(j - i)));
      sv.apply(make_gate(GateKind::h, i));
    }
  }
  std::vector<cplx> out(a.size());
  for (std::size_t y = 0; y < a.size(); ++y) out[y] = amp[wire_index(y, true)];
  return out;
}

// ---------------------------------------------------------------------------------------------

namespace {

constexpr int kMaxSimQubits = 24;
constexpr double kSimBudget = 3e9;  // amplitude updates, a few seconds
constexpr double kTolerance = 1e-9;

struct SimOutcome {
  bool ran = false;
  bool ok = true;
  std::string message;
};

SimOutcome simulate(const Device& device, const QasmProgram& program, const CheckRequest& req) {
  SimOutcome out;
  const QftSpec& spec = req.spec;
  const int n = spec.qubits;
  const int nq = device.qubit_count();

  // Compact the qubits involved to local indices.
  std::vector<int> local(nq, -1);
  int m = 0;
  auto use = [&](int q) {
    if (local[q] < 0) local[q] = m++;
  };
  for (int q : req.placement) use(q);
  for (int q : req.final_placement) use(q);
  std::vector<Gate> gates;
  gates.reserve(program.gates.size());
  for (const auto& g : program.gates) {
    if (g.kind == GateKind::measure) continue;  // trailing (checked before)
    use(g.q0);
    if (is_two_qubit(g.kind)) use(g.q1);
    if (m > kMaxSimQubits) break;
    Gate lg = g;
    lg.q0 = local[g.q0];
    if (is_two_qubit(g.kind)) lg.q1 = local[g.q1];
    gates.push_back(lg);
  }
  if (m > kMaxSimQubits) {
    out.message = "state-vector check skipped: the circuit touches more than " + std::to_string(kMaxSimQubits) + " qubits";
    return out;
  }

  const std::size_t dim = std::size_t{1} << n;
  bool full = n <= 10;
  auto cost = [&](double inputs) { return inputs * (static_cast<double>(gates.size()) + 1) * std::ldexp(1.0, m); };
  if (full && cost(static_cast<double>(dim)) > kSimBudget) full = false;
  const int sampled_random = 8, sampled_basis = 4;
  if (!full && cost(sampled_random + sampled_basis) > kSimBudget) {
    out.message = "state-vector check skipped: " + std::to_string(gates.size()) + " gates on " + std::to_string(m) +
                  " qubits is beyond the simulation budget";
    return out;
  }

  // Logical index -> local physical index, at the start and at the end.
  std::vector<std::size_t> in_map(dim), out_map(dim);
  in_map[0] = out_map[0] = 0;
  for (std::size_t j = 1; j < dim; ++j) {
    const int k = std::countr_zero(j);
    in_map[j] = in_map[j & (j - 1)] | (std::size_t{1} << local[req.placement[k]]);
    out_map[j] = out_map[j & (j - 1)] | (std::size_t{1} << local[req.final_placement[k]]);
  }
  std::vector<char> is_out(std::size_t{1} << m, 0);
  for (std::size_t y = 0; y < dim; ++y) is_out[out_map[y]] = 1;

  // The inputs: every basis state, or 4 basis states and 8 random states (fixed seed).
  std::mt19937_64 rng(20240607);
  std::vector<std::size_t> basis;
  int random_inputs = 0;
  if (full) {
    for (std::size_t j = 0; j < dim; ++j) basis.push_back(j);
  } else {
    basis = {0, 1, dim - 1, static_cast<std::size_t>(rng() % dim)};
    random_inputs = sampled_random;
  }
  const std::size_t inputs = basis.size() + static_cast<std::size_t>(random_inputs);

  StateVector sv(m);
  cplx phase = 0;
  double worst = 0;
  std::normal_distribution<double> gauss;
  for (std::size_t t = 0; t < inputs; ++t) {
    std::vector<cplx> a(dim, 0.0);
    std::string label;
    if (t < basis.size()) {
      a[basis[t]] = 1.0;
      label = "basis input |" + std::to_string(basis[t]) + ">";
    } else {
      double norm = 0;
      for (auto& x : a) {
        x = cplx(gauss(rng), gauss(rng));
        norm += std::norm(x);
      }
      for (auto& x : a) x /= std::sqrt(norm);
      label = "random input #" + std::to_string(t - basis.size() + 1);
    }
    const std::vector<cplx> ref = reference_qft(spec, a);
    auto& amp = sv.amplitudes();
    std::fill(amp.begin(), amp.end(), cplx(0.0, 0.0));
    for (std::size_t j = 0; j < dim; ++j) amp[in_map[j]] = a[j];
    for (const auto& g : gates) sv.apply(g);
    if (t == 0) {
      // One global phase for all inputs: a unitary is fixed up to a single overall phase.
      cplx inner = 0;
      for (std::size_t y = 0; y < dim; ++y) inner += std::conj(ref[y]) * amp[out_map[y]];
      if (std::abs(inner) < 0.5) {
        out.ran = true;
        out.ok = false;
        out.message = "state-vector check: for " + label + " the circuit's output has overlap " +
                      std::to_string(std::abs(inner)) + " with the QFT's";
        return out;
      }
      phase = inner / std::abs(inner);
    }
    double dev = 0, outside = 0;
    for (std::size_t y = 0; y < dim; ++y) dev = std::max(dev, std::abs(amp[out_map[y]] - phase * ref[y]));
    for (std::size_t i = 0; i < amp.size(); ++i)
      if (!is_out[i]) outside += std::norm(amp[i]);
    dev = std::max(dev, std::sqrt(outside));
    worst = std::max(worst, dev);
    if (dev > kTolerance) {
      char buf[32];
      std::snprintf(buf, sizeof buf, "%.3g", dev);
      out.ran = true;
      out.ok = false;
      out.message = "state-vector check: for " + label + " the output differs from the " +
                    std::string(spec.inverse ? "inverse " : "") + "QFT by " + buf + " (tolerance 1e-9)";
      return out;
    }
  }
  out.ran = true;
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.1e", worst);
  out.message = "state-vector check: " +
                (full ? "all " + std::to_string(dim) + " basis inputs (full unitary, one global phase)"
                      : std::to_string(basis.size()) + " basis and " + std::to_string(random_inputs) + " random inputs") +
                " on " + std::to_string(m) + " simulated qubits match within " + buf;
  return out;
}

}  // namespace

CheckResult check_qft_circuit(const Device& device, const QasmProgram& program, const CheckRequest& request) {
  const int n = request.spec.qubits;
  const int nq = device.qubit_count();
  auto failure = [](std::string msg, int line) {
    CheckResult r;
    r.ok = false;
    r.message = std::move(msg);
    r.line = line;
    return r;
  };
  if (n < 1) return failure("the QFT needs at least one qubit", 0);
  auto check_map = [&](const std::vector<int>& map, const char* what) -> std::string {
    if (static_cast<int>(map.size()) != n)
      return std::string(what) + " lists " + std::to_string(map.size()) + " qubits for a " + std::to_string(n) +
             "-qubit QFT";
    std::vector<char> used(nq, 0);
    for (int q : map) {
      if (q < 0 || q >= nq) return std::string(what) + " names qubit " + std::to_string(q) + ", outside the device";
      if (used[q]) return std::string(what) + " names qubit " + std::to_string(q) + " twice";
      used[q] = 1;
    }
    return {};
  };
  if (auto e = check_map(request.placement, "placement"); !e.empty()) return failure(e, 0);
  if (auto e = check_map(request.final_placement, "final_placement"); !e.empty()) return failure(e, 0);

  // a. Qubit ranges, couplers, and measurements only at the end of their qubit.
  auto line_of = [&](std::size_t i) { return i < program.gate_lines.size() ? program.gate_lines[i] : 0; };
  std::vector<char> measured(nq, 0);
  for (std::size_t i = 0; i < program.gates.size(); ++i) {
    const Gate& g = program.gates[i];
    const bool two = is_two_qubit(g.kind);
    if (g.q0 < 0 || g.q0 >= nq || (two && (g.q1 < 0 || g.q1 >= nq)))
      return failure(std::string(gate_name(g.kind)) + " on qubit " + std::to_string(g.q0 < 0 || g.q0 >= nq ? g.q0 : g.q1) +
                         ", but the device has qubits 0.." + std::to_string(nq - 1),
                     line_of(i));
    if (two && !device.coupled(g.q0, g.q1))
      return failure(std::string(gate_name(g.kind)) + " on qubits " + std::to_string(g.q0) + " and " +
                         std::to_string(g.q1) + ", which have no coupler",
                     line_of(i));
    if (g.kind == GateKind::measure) {
      measured[g.q0] = 1;
      continue;
    }
    if (measured[g.q0] || (two && measured[g.q1]))
      return failure("gate on qubit " + std::to_string(measured[g.q0] ? g.q0 : g.q1) +
                         " after its measurement (measurements must come last)",
                     line_of(i));
  }

  // A rotation angle that is no multiple of pi/2^k: the QFT uses none, and neither check can follow
  // it exactly.
  if (program.inexact_angle) {
    CheckResult r = failure("cannot prove: " + program.inexact_angle->message, program.inexact_angle->line);
    r.inconclusive = true;
    return r;
  }

  // b. Structural proof.
  CheckResult structural;
  bool structural_ran = false;
  if (request.structural) {
    StructuralChecker sc(device, request.spec, request.placement);
    for (std::size_t i = 0; i < program.gates.size() && !sc.failed(); ++i) {
      if ((i & 0xffff) == 0 && request.interrupt && request.interrupt->load(std::memory_order_relaxed))
        throw Interrupted();
      sc.gate(program.gates[i], line_of(i));
    }
    structural = sc.finish(request.final_placement);
    structural_ran = true;
    if (!structural.ok && !structural.inconclusive) return structural;
  }

  // c. State-vector comparison.
  SimOutcome sim;
  if (n <= request.statevector_limit) {
    sim = simulate(device, program, request);
    if (sim.ran && !sim.ok) {
      // Simulation decides, but names no line: the line where the proof lost track is the place
      // to look (the circuit is wrong from there on or before).
      if (structural_ran && structural.line > 0)
        return failure(sim.message + "; the structural proof stopped at line " + std::to_string(structural.line) +
                           " (" + structural.message + ")",
                       structural.line);
      return failure(sim.message, 0);
    }
  }

  CheckResult r;
  r.structural_proved = structural_ran && structural.ok;
  r.simulated = sim.ran && sim.ok;
  if (structural_ran && !structural.ok && !r.simulated) {
    structural.message += sim.message.empty() ? "" : "; " + sim.message;
    return structural;  // inconclusive and nothing else decided it
  }
  r.ok = true;
  std::vector<std::string> parts;
  if (structural_ran) parts.push_back(structural.ok ? structural.message : "structural proof inconclusive (" + structural.message + ")");
  if (!sim.message.empty()) parts.push_back(sim.message);
  if (parts.empty()) parts.push_back("coupler check passed (no proof requested)");
  for (std::size_t i = 0; i < parts.size(); ++i) r.message += (i ? "; " : "") + parts[i];
  r.inconclusive = structural_ran && !structural.ok;
  return r;
}

}  // namespace qftplan
