#include "qftplan/networks/parity_qft.hpp"

#include <algorithm>
#include <stdexcept>
#include <vector>

namespace qftplan {

using Kind = NetworkOp::Kind;

namespace {

// The parity-term weight c of the meeting of wires at distance `dist` (forward QFT) when rotations up
// to distance d are kept: the rotation pi/2^dist if kept, less the pi that the Hadamard of the later
// wire adds for neighbours (dist 1), which is there whether the rotation is kept or not (degree 1).
Angle meeting_weight(int dist, int d) {
  const Angle rotation = dist <= d ? Angle::pi_over_pow2(static_cast<std::uint32_t>(dist)) : Angle{};
  return dist == 1 ? rotation + Angle(-1, 0) : rotation;
}

// The last wire's Hadamard acts on its plain input bit (see the epilogue), so its meeting
// with the wire before it carries the rotation alone: the -pi above is not there to take off.
Angle last_meeting_weight(int d) { return 1 <= d ? Angle::pi_over_pow2(1) : Angle{}; }

// Sum of c/2 over the meetings at distances 1..K that carry a weight, K = min(m, max(d, 1)), m >= 1:
// -pi/4 + sum_{k=2..K} pi/2^(k+1) = -pi/2^(K+1) when the rotations are kept (a closed form: summing
// term by term made the prologue and epilogue O(n^2) angle additions), the lone distance-1 weight's
// half for degree 1.
Angle half_weights(int m, int d) {
  if (d == 0) return meeting_weight(1, 0).half();
  return Angle(-1, static_cast<std::uint32_t>(std::min(m, d)) + 1);
}

// Forward gates of one part of the circuit, then handed on forwards or (inverse) backwards with
// each gate inverted: rz(t) -> rz(-t); parity_step(a, b, t) -> rz(-t) a, parity_step(b, a, 0) (the
// rz commutes with the cx of which a is the control, so this is the exact inverse); h and cx are
// their own inverses.
class Segment {
 public:
  Segment(bool inverse, GateRun& out) : inverse_(inverse), out_(out) {}
  void add(const Gate& g) { gates_.push_back(g); }
  void flush() {
    if (!inverse_) {
      for (const Gate& g : gates_) put(g);
    } else {
      for (auto it = gates_.rbegin(); it != gates_.rend(); ++it) {
        const Gate& g = *it;
        if (g.kind == GateKind::rz) {
          put(make_gate(GateKind::rz, g.q0, -1, -g.angle));
        } else if (g.kind == GateKind::parity_step) {
          if (!g.angle.is_zero()) put(make_gate(GateKind::rz, g.q0, -1, -g.angle));
          put(make_gate(GateKind::parity_step, g.q1, g.q0));
        } else {
          put(g);
        }
      }
    }
    gates_.clear();
  }

 private:
  void put(const Gate& g) {
    out_.put(g);
    out_.flush_if_full();
  }
  bool inverse_;
  GateRun& out_;
  std::vector<Gate> gates_;
};

}  // namespace

QubitMaps emit_parity_qft(const QftSpec& spec, const QftNetwork& network, std::span<const int> chain, GateSink& sink) {
  QubitMaps maps = chain_maps(spec, network, chain);
  const int n = spec.qubits, d = spec.max_distance();
  GateRun out(sink);
  Segment seg(spec.inverse, out);
  auto q = [&](const std::vector<int>& pos, int wire) { return chain[pos[wire]]; };

  // rz gates carrying the sum of `terms` on qubit `qubit`, in order; a new gate starts where the
  // sum would not fit one exact angle (pi/2 + pi/2^300 has no 64-bit numerator).
  auto phases = [&](int qubit, std::initializer_list<Angle> terms) {
    Angle sum;
    for (const Angle& t : terms) {
      try {
        sum = sum + t;
      } catch (const std::overflow_error&) {
        seg.add(make_gate(GateKind::rz, qubit, -1, sum));
        sum = t;
      }
    }
    if (!sum.is_zero()) seg.add(make_gate(GateKind::rz, qubit, -1, sum));
  };
  // The last meeting's half weight less the usual distance-1 one (angles are kept modulo 2 pi, so the
  // halves are taken of the weights as stored, as everywhere else).
  const Angle last_correction = last_meeting_weight(d).half() - meeting_weight(1, d).half();
  // The forward circuit's parts, each a function of the positions before it.
  auto prologue = [&](const std::vector<int>& pos) {
    // The input bits' one-bit terms: sum of c/2 over the kept meetings with earlier wires.
    // The last wire's meeting with wire n-2 weighs last_meeting_weight: its half replaces the other's.
    for (int b = 1; b < n; ++b) phases(q(pos, b), {half_weights(b, d), b == n - 1 ? last_correction : Angle{}});
  };
  auto chunk = [&](std::span<const NetworkOp> ops, std::vector<int>& pos) {
    for (const NetworkOp& op : ops) {
      if (op.kind == Kind::h) {
        if (op.i == n - 1 && n >= 2) continue;  // the epilogue's (see there)
        seg.add(make_gate(GateKind::h, q(pos, op.i)));
        // The qubit holds y_b XOR y_(b-1): rz(pi/2) on it, with -pi/2 on y_b and y_(b-1) at the
        // end, cancels the pi y_(b-1) y_b the Hadamard made.
        if (op.i > 0) seg.add(make_gate(GateKind::rz, q(pos, op.i), -1, Angle(1, 1)));
        continue;
      }
      if (op.kind == Kind::cp) throw std::invalid_argument("the parity network has no plain controlled phases");
      const int dist = op.j - op.i;
      // The rz carries -c/2 on the parity y_a XOR x_b; a dropped rotation beyond distance 1 leaves the
      // bare exchange.
      const bool last_pair = op.i == n - 2 && op.j == n - 1;
      const Angle t = -(last_pair ? last_meeting_weight(d) : meeting_weight(dist, d)).half();
      seg.add(make_gate(GateKind::parity_step, q(pos, op.i), q(pos, op.j), t));
      std::swap(pos[op.i], pos[op.j]);
    }
  };
  auto epilogue = [&](const std::vector<int>& pos) {
    // The CX ladder: wire a holds y_a XOR y_(a-1) and its neighbour towards the chain's end y_(a-1).
    for (int a = 1; a + 1 < n; ++a) seg.add(make_gate(GateKind::cx, q(pos, a - 1), q(pos, a)));
    // The last wire: its qubit holds x_(n-1) XOR y_(n-2) and wire n-2's now y_(n-2),
    // so one cx leaves the plain input bit and the Hadamard makes y_(n-1) with no cross term: no
    // rz(pi/2) after it, no -pi/2 on y_(n-1) or y_(n-2), no pi on y_(n-2), and no -pi in the last
    // meeting's weight. The ladder's last cx is this one, moved before the Hadamard: the last wire's
    // qubit then needs no one-qubit layer after it (the total depth drops by two, to 5n - 4).
    if (n >= 2) {
      seg.add(make_gate(GateKind::cx, q(pos, n - 2), q(pos, n - 1)));
      seg.add(make_gate(GateKind::h, q(pos, n - 1)));
    }
    // The output bits' one-bit terms: c/2 over the kept meetings with later wires, -pi/2 as wire b
    // and -pi/2 as wire b-1 of the correction, and pi (= -pi) against the Hadamard's pi y_(b-1), for
    // every wire b but the last. The two pi/2 terms first: they cancel on every wire but the first
    // and the last two.
    for (int a = 0; a < n; ++a) {
      const bool own = a >= 1 && a <= n - 2, next = a <= n - 3;
      // (Wire n-2's later meeting is the last one, as above.)
      phases(q(pos, a), {own ? Angle(-1, 1) : Angle{}, next ? Angle(1, 1) : Angle{},
                         n - 1 - a >= 1 ? half_weights(n - 1 - a, d) : Angle{}, a == n - 2 ? last_correction : Angle{}});
    }
  };

  std::vector<NetworkOp> ops;
  if (!spec.inverse) {
    auto pos = network.initial_positions();
    prologue(pos);
    seg.flush();
    network.for_each_chunk([&](std::span<const NetworkOp> steps) {
      chunk(steps, pos);
      seg.flush();
    });
    epilogue(pos);
    seg.flush();
  } else {
    // Backwards: each part is generated forwards from the positions before it (found by undoing
    // its exchanges) and handed on inverted.
    auto pos = network.final_positions();
    epilogue(pos);
    seg.flush();
    for (int c = network.chunk_count(); c-- > 0;) {
      network.chunk(c, ops);
      for (auto it = ops.rbegin(); it != ops.rend(); ++it)
        if (it->kind != Kind::h) std::swap(pos[it->i], pos[it->j]);
      auto before = pos;
      chunk(ops, before);
      seg.flush();
    }
    prologue(pos);
    seg.flush();
  }
  out.flush();
  return maps;
}

}  // namespace qftplan
