// The insertion network in parity form (parity_qft.hpp, emit_window_parity_qft). The derivation, in
// the terms of parity_qft.hpp (a controlled phase c on bits u, v is c/2 (u + v - (u XOR v)); x: input
// bits, y: output bits; "next" of a wire that has had its Hadamard: the next such wire to its right
// on the chain):
//
// Invariant: every wire past its Hadamard holds y_w XOR y_next(w), the last of them y_w. The window
// wires therefore telescope from the right: a wire c walking left from the window's right end with a
// parity step at each (cx c->w; rz w; cx w->c, the left qubit ending with the sum, the right one with
// the passed wire's content) holds x_c XOR y_w after passing w: the parity its rotation with w needs.
//  - SWAP of a finished wire o leftwards past window wire l (o is l's next): with p the qubit left of
//    l (holding y_p XOR y_l), cx l->p and cx l->o leave p = y_p XOR y_o, l's qubit = y_o XOR y_l (now
//    o's), o's qubit = y_l XOR y_next(o) (now l's): 2 CX (1 at the chain's start).
//  - Fused block of window wire w and c: the parity step above, 2 CX.
//  - Plain controlled phase of the front wire f and c (always c's last meeting, just before its
//    Hadamard): c holds x_c XOR y_g (g: the wire c passed last, f's next, or nothing), f holds
//    y_f XOR y_g; cx c->f, rz, cx c->f puts the rotation on x_c XOR y_f (on f's qubit) and gives f
//    its content back: 2 CX.
//  - Hadamard of c on x_c XOR y_g: naming the output so that the qubit holds y_c XOR y_g (the
//    invariant, c now sitting between f and g), its phase is pi x_c y_c + pi x_c y_g (taken off the
//    rotation of g and c) + pi y_c y_g (cancelled by rz(pi/2) on the qubit and -pi/2 on y_c and y_g
//    at the end) + pi y_g (-pi on y_g at the end). Then cx c->f gives f its y_f XOR y_c: 1 CX. (No CX
//    targets c next to its Hadamard, forwards or backwards: in cz gates the Hadamard would cancel
//    against the CX's own, which the checker's structural proof does not follow.)
// At the end a CX ladder from the right turns the differences into output bits, and the one-bit
// terms go on x at the start and on y at the end, as in the parity network.

#include <cstdint>
#include <stdexcept>
#include <string>
#include <vector>

#include "qftplan/networks/parity_qft.hpp"

namespace qftplan {

using Kind = NetworkOp::Kind;

namespace {

// A sum of angles as a few exact terms: a new term starts where the sum would not fit one exact angle.
struct AngleSum {
  std::vector<Angle> terms;
  void add(const Angle& a) {
    if (a.is_zero()) return;
    if (!terms.empty()) {
      try {
        terms.back() = terms.back() + a;
        return;
      } catch (const std::overflow_error&) {
      }
    }
    terms.push_back(a);
  }
};

// One-bit terms of every wire: sums of pi/2^k (k <= top) counted exactly in units of pi/2^top modulo
// 2 pi while top <= 61 (a 64-bit count), as Angle sums beyond (slower: each addition normalises).
class OneBitTerms {
 public:
  OneBitTerms(int n, int top) : top_(top), fast_(top <= 61), units_(fast_ ? n : 0), sums_(fast_ ? 0 : n) {}
  // Adds sign * pi / 2^k to wire w (k <= top).
  void add(int w, int sign, int k) {
    if (fast_) {
      const std::uint64_t u = std::uint64_t{1} << (top_ - k);
      units_[w] = (sign > 0 ? units_[w] + u : units_[w] - u) & mask();
    } else {
      sums_[w].add(Angle(sign, static_cast<std::uint32_t>(k)));
    }
  }
  std::vector<Angle> terms(int w) const {
    if (!fast_) return sums_[w].terms;
    if (units_[w] == 0) return {};
    return {Angle(static_cast<std::int64_t>(units_[w]), static_cast<std::uint32_t>(top_))};
  }

 private:
  std::uint64_t mask() const { return (std::uint64_t{1} << (top_ + 1)) - 1; }  // 2 pi = 2^(top+1) units
  int top_;
  bool fast_;
  std::vector<std::uint64_t> units_;
  std::vector<AngleSum> sums_;
};

// The forward circuit, gate by gate, to `put`; returns the final chain position of every wire.
template <class Put>
std::vector<int> window_circuit(const QftSpec& spec, const QftNetwork& network, std::span<const int> chain, Put&& put) {
  const int n = spec.qubits, d = spec.max_distance();
  std::vector<int> pos = network.initial_positions(), at(n);
  for (int w = 0; w < n; ++w) at[pos[w]] = w;
  auto q = [&](int wire) { return chain[pos[wire]]; };
  auto cx = [&](int from, int to) { put(make_gate(GateKind::cx, q(from), q(to))); };
  auto rz = [&](int wire, const Angle& a) {
    if (!a.is_zero()) put(make_gate(GateKind::rz, q(wire), -1, a));
  };
  // The rz of a pass or an in-place meeting: minus half the rotation; for the partner's pass, whose
  // rotation has pi less (c - pi: its one-bit terms get -pi/2 each below), also plus pi/2, one angle
  // where it fits. (Halves are not defined modulo 2 pi: the three terms must use the same c.)
  std::vector<Angle> parity_rz(d + 1);
  std::vector<std::vector<Angle>> partner_rz(d + 1);
  for (int dist = 1; dist <= d; ++dist) {
    parity_rz[dist] = -Angle::pi_over_pow2(static_cast<std::uint32_t>(dist) + 1);
    AngleSum t;
    t.add(parity_rz[dist]);
    t.add(Angle(1, 1));
    partner_rz[dist] = t.terms;
  }
  // The distance of a meeting of neighbours `earlier` (left) and `later` (right), checked.
  auto meeting = [&](int earlier, int later, const char* what) {
    const int dist = later - earlier;
    if (pos[later] != pos[earlier] + 1 || dist < 1 || dist > d)
      throw std::logic_error(std::string("parity insertion: ") + what + " out of place");
    return dist;
  };
  OneBitTerms in(n, d + 1), out(n, d + 1);  // one-bit terms of x (start) and y (end)
  // Step k is the meeting with the Hadamard's partner: the last pass before the in-place meeting.
  auto is_partner = [](std::span<const NetworkOp> ops, std::size_t k) {
    return ops[k].kind == Kind::cp_swap && k + 2 < ops.size() && ops[k + 1].kind == Kind::cp &&
           ops[k + 2].kind == Kind::h;
  };

  // Every rotation's one-bit terms are known from the steps before any gate is written.
  network.for_each_chunk([&](std::span<const NetworkOp> ops) {
    for (std::size_t k = 0; k < ops.size(); ++k) {
      const NetworkOp& op = ops[k];
      if (op.kind == Kind::cp || op.kind == Kind::cp_swap) {
        const int half = op.j - op.i + 1;  // the rotation pi/2^dist halved
        in.add(op.j, 1, half);
        out.add(op.i, 1, half);
        if (is_partner(ops, k)) {  // -pi halved
          in.add(op.j, -1, 1);
          out.add(op.i, -1, 1);
        }
      }
      if (op.kind == Kind::h && k > 1 && ops[k - 2].kind == Kind::cp_swap) {
        const int g = ops[k - 2].i;  // the Hadamard's partner: the wire passed last
        out.add(op.i, -1, 1);
        out.add(g, -1, 1);
        out.add(g, -1, 0);
      }
    }
  });
  for (int w = 0; w < n; ++w)
    for (const Angle& a : in.terms(w)) rz(w, a);

  network.for_each_chunk([&](std::span<const NetworkOp> ops) {
    int front = -1;  // the wire c met in place just before its Hadamard
    bool passed = false;  // c has a Hadamard partner: it passed a wire before that meeting
    for (std::size_t k = 0; k < ops.size(); ++k) {
      const NetworkOp& op = ops[k];
      switch (op.kind) {
        case Kind::swap: {
          // Finished wire op.i moves left past window wire op.j (its left neighbour).
          const int l = op.j, o = op.i;
          if (pos[o] != pos[l] + 1) throw std::logic_error("parity insertion: a SWAP not leftwards");
          if (pos[l] > 0) cx(l, at[pos[l] - 1]);
          cx(l, o);
          break;
        }
        case Kind::cp_swap: {
          const int w = op.i, c = op.j, dist = meeting(w, c, "a block");
          cx(c, w);
          if (is_partner(ops, k))
            for (const Angle& a : partner_rz[dist]) rz(w, a);
          else
            rz(w, parity_rz[dist]);
          cx(w, c);
          passed = true;
          break;
        }
        case Kind::cp: {
          const int f = op.i, c = op.j, dist = meeting(f, c, "a controlled phase");
          cx(c, f);
          rz(f, parity_rz[dist]);
          cx(c, f);
          front = f;
          break;
        }
        case Kind::h: {
          put(make_gate(GateKind::h, q(op.i)));
          if (passed) rz(op.i, Angle(1, 1));
          if (front >= 0) cx(op.i, front);
          front = -1;
          passed = false;
          break;
        }
      }
      if (op.kind == Kind::swap || op.kind == Kind::cp_swap) {
        std::swap(pos[op.i], pos[op.j]);
        at[pos[op.i]] = op.i;
        at[pos[op.j]] = op.j;
      }
    }
  });

  for (int p = n - 2; p >= 0; --p) cx(at[p + 1], at[p]);
  for (int w = 0; w < n; ++w)
    for (const Angle& a : out.terms(w)) rz(w, a);
  return pos;
}

}  // namespace

QubitMaps emit_window_parity_qft(const QftSpec& spec, const QftNetwork& network, std::span<const int> chain,
                                 GateSink& sink) {
  QubitMaps maps = chain_maps(spec, network, chain);
  GateRun out(sink);
  if (!spec.inverse) {
    window_circuit(spec, network, chain, [&](const Gate& g) {
      out.put(g);
      out.flush_if_full();
    });
  } else {
    // Backwards, each gate inverted (rz negated; h and cx are their own inverses).
    std::vector<Gate> gates;
    window_circuit(spec, network, chain, [&](const Gate& g) { gates.push_back(g); });
    for (auto it = gates.rbegin(); it != gates.rend(); ++it) {
      Gate g = *it;
      if (g.kind == GateKind::rz) g.angle = -g.angle;
      out.put(g);
      out.flush_if_full();
    }
  }
  out.flush();
  return maps;
}

long long window_parity_cx(const QftNetwork& network) {
  // What window_circuit writes, from the step counts (the degree choice asks this for every degree of
  // big registers): a SWAP 2 CX (a finished wire only steps left once wires have finished before it,
  // so its left neighbour exists), a block 2, an in-place meeting 2 and 1 after the Hadamard, the
  // ladder n-1. A test compares it with the gates written.
  const int n = network.wires();
  if (n < 2) return 0;
  const auto c = network.step_counts();
  return 2 * (c[static_cast<int>(Kind::swap)] + c[static_cast<int>(Kind::cp_swap)]) + 3 * c[static_cast<int>(Kind::cp)] + n - 1;
}

}  // namespace qftplan
