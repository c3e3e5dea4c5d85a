#pragma once
// Private to the checker: the state of the structural proof (StructuralChecker::Impl), shared by
// its three parts:
//   structural_checker.cpp  set-up, the streaming front end (ranges, couplers, measurements,
//                           the Hadamard frame), the end-of-circuit checks;
//   phase_polynomial.cpp    the path-sum state: parities per qubit and the phase polynomial;
//   structural_hadamard.cpp the Hadamard rule, where the QFT's controlled phases are compared.
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
//
// Verdicts. A difference found at a Hadamard is only a suspicion at first: a later gate the proof
// cannot follow (a second Hadamard on a wire, a parity too wide) could mean the Hadamard was not
// the wire's QFT Hadamard after all. So the proof notes the first difference and goes on. It
// calls the circuit wrong only when it followed every gate exactly to the end and the end state is
// in canonical form (each qubit a constant or one variable, no two alike): the state is then
// exactly 2^(-n/2) sum_y exp(i phi(x, y)) |y> up to where the outputs sit, the multilinear phase
// polynomial is unique mod 2 pi (Moebius inversion), and a differing coefficient is a difference
// of the unitaries. Anything else is "lost track" (cannot prove), for simulation to decide.
//
// Variables: 0..n-1 are the inputs of the wires (processing index); each Hadamard of wire w creates
// the next variable of that wire, g n + w after its g-th Hadamard. The textbook transform (and its
// approximations) gives each wire one Hadamard, so n..2n-1 are its outputs. A composition of block
// transforms (the block construction) gives a wire one Hadamard in each transform it takes part in:
// the schedule below says which, and at each Hadamard the rule compares the consumed variable's terms
// with the transform that Hadamard belongs to. The composition's path sum is then matched term by
// term, variable by variable, which proves it the same operator (the proof stays sound: two path sums
// alike in every term are one linear map).

#include <cstdint>
#include <deque>
#include <string>
#include <unordered_map>
#include <utility>
#include <vector>

#include "exact_angles.hpp"
#include "pair_table.hpp"
#include "qftplan/check/qft_checker.hpp"

namespace qftplan {

namespace proof {

/// The widest parity a qubit may hold before the proof gives up ("cannot prove").
constexpr int kMaxParity = 4;

/// An affine GF(2) function: XOR of up to kMaxParity variables (sorted ids) and a constant bit.
struct Parity {
  std::int32_t v[kMaxParity] = {0, 0, 0, 0};
  std::uint8_t size = 0;
  std::uint8_t c = 0;
};

/// A term of wire a's input that differs from the QFT (identity labelling of the outputs): with
/// the output of wire b (b >= 0), a phase on the input alone (b == kSingle), or with the input of
/// another wire (b == kInputPair). `got` is the circuit's coefficient, `want` the QFT's.
struct Difference {
  static constexpr int kSingle = -1;
  static constexpr int kInputPair = -2;
  int a = 0;
  int b = 0;
  Angle got;
  Angle want;
};

/// One textbook transform of a schedule: the QFT (or its inverse) of the wires first .. first+size-1 in
/// processing order, keeping controlled phases up to distance `reach`.
struct Transform {
  int first = 0;
  int size = 0;
  bool inverse = false;
  int reach = 0;
};

/// The transforms a circuit must be, in order, and per wire the transforms it takes part in.
struct Schedule {
  std::vector<Transform> transforms;
  std::vector<std::vector<int>> of_wire;  ///< per wire: its transforms, in order
  std::vector<std::vector<int>> entry;    ///< per transform, per member (from `first`): its wire's Hadamards before it
  int generations = 1;                    ///< most Hadamards of a wire
  /// The textbook transform (one transform on every wire), or the block construction's layers.
  static Schedule of(const QftSpec& spec);
  /// The generation of wire w on entering transform t.
  int entry_of(int t, int w) const { return entry[t][w - transforms[t].first]; }
};

/// At most this many differences are kept for the final comparison (beyond: lost track).
constexpr std::size_t kMaxDifferences = 1 << 16;

/// The key of the degree-2 monomial of variables a and b (order-free).
inline std::uint64_t pair_key(int a, int b) {
  if (a > b) std::swap(a, b);
  return (static_cast<std::uint64_t>(static_cast<std::uint32_t>(a)) << 32) | static_cast<std::uint32_t>(b);
}

}  // namespace proof

/// The structural proof's state and rules (see the comment at the top of this header).
struct StructuralChecker::Impl {
  using Parity = proof::Parity;
  using WideAngle = proof::WideAngle;

  const Device* device;
  QftSpec spec;
  int n;
  int nq;  // device qubits
  std::vector<int> placement;

  std::vector<Parity> par;        // per physical qubit
  std::vector<int> occ;           // per variable: how many qubits' parities contain it
  // Per variable: coefficient of the degree-1 monomial (of any spread: WideAngle), and the last
  // gate that changed it.
  std::vector<WideAngle> single;
  std::vector<int> single_line;
  proof::PairTable pairs;  // degree-2 monomials (pair_table.hpp)
  std::vector<std::vector<int>> partners;  // per variable: possible pair partners (may be stale)
  proof::Schedule schedule;
  std::vector<int> gen;           // per wire: its transforms passed (its Hadamards, and two per fused pair)
  std::vector<int> cur;           // per wire: the variable it holds now
  std::vector<int> h_line;        // per wire: the line of its last Hadamard
  std::vector<char> measured;     // per physical qubit

  // The Hadamard frame: an h is not applied at once but noted on its qubit (pend_h), so that the
  // true state is the tracked one with H applied on every qubit whose pend_h is set; a second h
  // clears it. A cz meeting an H in the frame of one of its qubits t is cx c,t in the frame
  // (h t; cz c,t; h t == cx c,t); any other gate on a qubit applies its frame's H first (feed_cz in
  // structural_checker.cpp has the whole rule). So h-cz-h sandwiches are followed however an
  // optimiser has cancelled the Hadamards between them.
  std::vector<char> pend_h;       // H in the qubit's frame: 0 or 1
  std::vector<int> pend_h_line;   // line of the h that set it

  // The peephole window (structural_peephole.cpp): gates held back, and per qubit the index (from
  // the start of the stream) of its last held gate, or below window_start when none.
  struct Held {
    Gate g;
    int line;
    long prev0, prev1;  // the previous held gate on q0 / q1
    bool alive;
  };
  std::deque<Held> window;
  long window_start = 0;
  std::vector<long> window_last;
  long long gates_cancelled = 0;

  bool failed = false;
  bool inconclusive = false;  // failed because the proof lost track (not a refutation)
  std::string suspicion;      // the first difference from the QFT (see "Verdicts" above)
  int suspicion_line = 0;
  // Every difference, to decide at the end whether outputs left inverted (X) explain them.
  std::vector<proof::Difference> differences;
  bool differences_lost = false;  // too many, or a coefficient too wide to keep
  std::string message;
  int fail_line = 0;
  long long gates = 0;
  long long terms_checked = 0;
  int h_count = 0;

  // ----- structural_checker.cpp: set-up, messages, front end, end of circuit -----

  Impl(const Device& dev, const QftSpec& s, std::vector<int> pl);
  void place_inputs();
  void fail(std::string msg, int line, bool cannot_prove = false);
  void cannot_prove(const std::string& why, int line) { fail("cannot prove: " + why, line, true); }
  /// Notes a difference from the QFT (the first one is kept) and lets the proof go on.
  void suspect(std::string msg, int line);
  /// Notes a difference and keeps its record for the end.
  void differ(const proof::Difference& d, std::string msg, int line);

  // Variables and wires (see "Variables" above).
  int var(int w, int g) const { return g * n + w; }
  int wire_of(int v) const { return v % n; }
  int gen_of(int v) const { return v / n; }
  bool created(int v) const { return gen_of(v) <= gen[wire_of(v)]; }
  bool wire_done(int w) const { return gen[w] == static_cast<int>(schedule.of_wire[w].size()); }
  /// The transform whose Hadamard wire w awaits (the wire must not be done).
  int due_transform(int w) const { return schedule.of_wire[w][gen[w]]; }
  bool composed() const { return schedule.transforms.size() > 1; }

  // Names for messages. A wire is called by the logical qubit whose input bit it starts with.
  int logical_of_wire(int w) const { return spec.inverse ? w : n - 1 - w; }
  int output_bit_of_wire(int w) const { return spec.inverse ? n - 1 - w : w; }
  std::string lq(int w) const { return "logical qubit " + std::to_string(logical_of_wire(w)); }
  std::string lqs(int w, int k) const;
  std::string var_name(int v) const;
  /// "QFT", "inverse QFT" or "block construction": what the circuit is checked against.
  std::string transform_name() const;
  /// Where a message concerns block transform t of a composed schedule: which one ("" otherwise).
  std::string in_transform(int t) const;
  std::string describe(const Parity& p) const;
  static std::string at_line(int line) { return line > 0 ? " (line " + std::to_string(line) + ")" : ""; }

  void peephole(const Gate& g, int line);
  void pop_window();
  void drain_window();
  bool check_qubit(int q, int line);
  bool check_gate_qubits(const Gate& g, int line);
  void feed(const Gate& g, int line);
  bool acts_trivially(const Gate& g) const;
  bool awaits_hadamard(int q) const;
  bool hadamard_may_merge(int q);
  int hadamard_due(int a, int b) const;
  void feed_cz(int a, int b, int line);
  void release(int q);
  void flush_all();

  CheckResult finish(const std::vector<int>& final_placement);
  void final_checks(const std::vector<int>& fp);
  std::string leftover_term(int& line);
  std::string final_placement_problem(const std::vector<int>& fp) const;
  int non_canonical_qubit() const;
  Angle want(int a, int b) const;
  bool output_relabelling(const std::vector<int>& fp, std::vector<int>& tau, std::vector<char>& inverted) const;
  bool relabelling_leaves_a_difference(const std::vector<int>& tau, const std::vector<char>& inverted) const;

  // ----- phase_polynomial.cpp: the path-sum state -----

  void apply(const Gate& g, int line);
  void xor_into(int t, int c, int line);
  void add_single(int v, const Angle& a, int line);
  static std::string single_text(const WideAngle& s);
  void add_pair(int u, int v, const Angle& a, int line);
  void add_monomial(const int* vars, unsigned mask, std::int64_t coef, const Angle& theta, int line);
  static void expand(unsigned pmask, std::int64_t scale, std::int64_t* coef);
  void phase1(int q, const Angle& theta, int line);
  void phase2(int qa, int qb, const Angle& theta, int line);

  // ----- structural_compose.cpp: composed schedules (the block construction) -----

  /// The reference path sum's terms not yet met: every transform's controlled phases, between the
  /// variable its Hadamard consumes and the outputs of the wires in its window, with fused pairs
  /// renamed (fuse()).
  struct Expected {
    std::unordered_map<std::uint64_t, WideAngle> terms;
    std::vector<std::vector<int>> partners;  // per variable (may be stale)
  } expected;
  void build_expected();
  void add_expected(int a, int b, const Angle& x);
  bool fusable(int w) const;
  void fuse(int w);
  void fuse_for(int v);
  void compare_composed(int w, int v, int line);
  bool closes(int v, bool exact);
  std::string composed_leftover(int& line);

  // ----- structural_hadamard.cpp: the Hadamard rule -----

  /// The wires whose outputs the Hadamard on wire w must meet in a controlled phase: [lo, hi].
  struct Window {
    int t;  // the transform
    int lo;
    int hi;
    bool contains(int k) const { return k >= lo && k <= hi; }
  };
  void hadamard(int q, int line);
  int consumed_variable(int q, const Parity& p, int line);
  Window closing_window(int w) const;
  Window window_in(int t, int w) const;
  void check_closing_phases(int w, Window win, int line);
  void clear_terms_of(int w, Window win, int line);
  void create_output(int q, const Parity& p, int w, const int* rest, int rest_size, int line);
};

}  // namespace qftplan
