// The statement reader of the OpenQASM reader: user gate definitions and gate calls (built-in
// and user gates, with broadcast over registers).

#include <bit>
#include <string>

#include "qasm_statement_reader.hpp"

namespace qftplan::qasm_detail {

void StatementReader::define_gate() {
  skip_ws();
  const Pos name_at = here();
  UserGate g;
  g.name = std::string(expect_ident("a gate name"));
  g.order = user_gates_.size();
  if (user_gates_.count(g.name)) fail(name_at, "gate " + g.name + " is already defined");
  auto add_name = [&](std::vector<std::string>& list, std::string_view nm, const Pos& at) {
    for (const auto& other : g.params)
      if (other == nm) fail(at, "name '" + std::string(nm) + "' used twice in the definition of " + g.name);
    for (const auto& other : g.args)
      if (other == nm) fail(at, "name '" + std::string(nm) + "' used twice in the definition of " + g.name);
    list.emplace_back(nm);
  };
  if (accept('(')) {
    if (!accept(')')) {
      do {
        skip_ws();
        const Pos at = here();
        add_name(g.params, expect_ident("a parameter name"), at);
      } while (accept(','));
      expect(')');
    }
  }
  do {
    skip_ws();
    const Pos at = here();
    add_name(g.args, expect_ident("a qubit argument name"), at);
  } while (accept(','));
  expect('{');
  g.body = here();
  // Check the body once now, so unknown gates and wrong arities are reported even when the
  // gate is never used; calls then re-read it with values.
  Scope sc;
  sc.gate = &g;
  sc.eval = false;
  defining_ = &g;
  defining_size_ = 0;
  body_statements(sc);
  defining_ = nullptr;
  g.size = defining_size_;
  user_gates_.emplace(g.name, std::move(g));
}

void StatementReader::body_statements(const Scope& sc) {
  for (;;) {
    skip_ws();
    if (p_ >= end_) fail_here("missing '}' at the end of gate " + sc.gate->name);
    if (*p_ == '}') {
      ++p_;
      return;
    }
    const Pos at = here();
    const auto w = ident();
    if (w.empty()) fail_here("expected a gate but found " + found());
    if (w == "barrier") {
      barrier(sc);
      continue;
    }
    if (w == "measure" || w == "gate" || w == "qreg" || w == "qubit" || w == "creg" || w == "bit")
      fail(at, "'" + std::string(w) + "' is not allowed inside a gate definition");
    gate_call(w, at, sc);
  }
}

void StatementReader::gate_call(std::string_view name, const Pos& at, const Scope& sc) {
  const UserGate* user = nullptr;
  const BuiltinGate* builtin = nullptr;
  if (!user_gates_.empty()) {
    auto it = user_gates_.find(name);
    // Inside a body only earlier definitions count, so `gate h a { h a; }` means the built-in h.
    if (it != user_gates_.end() && (!sc.gate || it->second.order < sc.gate->order)) user = &it->second;
  }
  if (!user) builtin = find_builtin(name);
  if (!user && !builtin) {
    if (defining_ && name == defining_->name) fail(at, "gate " + std::string(name) + " is used in its own definition");
    if (is_unsupported_keyword(name)) fail(at, "'" + std::string(name) + "' is not supported by this reader");
    fail(at, "unknown gate '" + std::string(name) + "'");
  }
  const int want_params = user ? static_cast<int>(user->params.size()) : builtin->params;
  const int want_qubits = user ? static_cast<int>(user->args.size()) : builtin->qubits;

  // Parameters: a user gate keeps every value, a built-in one needs only the first (its angle).
  std::vector<Value> many;
  Value first;
  Pos first_at;
  const char* first_end = nullptr;
  int got_params = 0;
  Angle angle{};
  bool angle_read = false;
  if (accept('(')) {
    if (builtin && want_params == 1 && sc.eval && pi_over_pow2_argument(angle)) {
      angle_read = true;
      got_params = 1;
    } else if (!accept(')')) {
      do {
        skip_ws();
        const Pos e_at = here();
        Value v = expression(sc);
        if (got_params == 0) {
          first = v;
          first_at = e_at;
          first_end = p_;
        }
        if (user) many.push_back(v);
        ++got_params;
      } while (accept(','));
      expect(')');
    }
  }
  if (got_params != want_params)
    fail(at, "gate " + std::string(name) + " takes " + std::to_string(want_params) + " parameter" +
                 (want_params == 1 ? "" : "s") + ", got " + std::to_string(got_params));
  if (builtin && want_params == 1 && sc.eval && !angle_read) angle = to_angle(first, first_at, first_end);

  // Qubits (scratch lists per nesting depth, to avoid an allocation per statement).
  if (depth_ >= scratch_.size()) scratch_.emplace_back();
  std::vector<Operand>& ops = scratch_[depth_];
  operand_list(sc, ops, false);
  expect(';');
  if (static_cast<int>(ops.size()) != want_qubits)
    fail(at, "gate " + std::string(name) + " takes " + std::to_string(want_qubits) + " qubit" +
                 (want_qubits == 1 ? "" : "s") + ", got " + std::to_string(ops.size()));
  const int reps = broadcast(ops);
  const int line = sc.gate ? sc.call_line : at.line;
  if (builtin)
    call_builtin(*builtin, name, ops, reps, angle, sc, line);
  else
    call_user_broadcast(*user, name, at, ops, reps, many, sc, line);
}

// The evaluator gives the same Angle for these shapes (exact pi * 2^-k: as_angle in
// qasm_value.cpp); this only skips its recursive descent and exact arithmetic, a third of the
// reading time of a long file.
bool StatementReader::pi_over_pow2_argument(Angle& out) {
  skip_ws();
  const char* const start = p_;
  auto digits = [&](std::int64_t& v) {  // 1 to 4 decimal digits, no leading zero unless "0"
    const char* b = p_;
    v = 0;
    while (p_ < end_ && is_digit(static_cast<unsigned char>(*p_)) && p_ - b < 5) v = v * 10 + (*p_++ - '0');
    const auto len = p_ - b;
    return len >= 1 && len <= 4 && !(len > 1 && *b == '0');
  };
  auto give_up = [&] {
    p_ = start;
    return false;
  };
  const bool neg = p_ < end_ && *p_ == '-';
  if (neg) ++p_;
  if (end_ - p_ < 3 || p_[0] != 'p' || p_[1] != 'i') return give_up();
  p_ += 2;
  std::uint32_t k = 0;
  if (*p_ == '/') {
    ++p_;
    std::int64_t v = 0;
    if (!digits(v)) return give_up();
    if (end_ - p_ >= 2 && p_[0] == '*' && p_[1] == '*') {
      if (v != 2) return give_up();
      p_ += 2;
      if (!digits(v)) return give_up();
      k = static_cast<std::uint32_t>(v);
    } else {
      if (v < 2 || !std::has_single_bit(static_cast<std::uint64_t>(v))) return give_up();
      k = static_cast<std::uint32_t>(std::countr_zero(static_cast<std::uint64_t>(v)));
    }
  }
  if (p_ >= end_ || *p_ != ')') return give_up();
  ++p_;
  out = Angle(neg ? -1 : 1, k);
  return true;
}

// Inline: called once per gate statement, from gate_call only.
inline int StatementReader::broadcast(const std::vector<Operand>& ops) {
  int count = 1;
  const Operand* first_reg = nullptr;
  for (const auto& op : ops) {
    if (!op.reg) continue;
    if (first_reg && op.count != count)
      fail(op.pos, "registers of different sizes (" + std::to_string(count) + " and " + std::to_string(op.count) +
                       ") in one statement");
    first_reg = &op;
    count = op.count;
  }
  return count;
}

// Inline: called once per gate statement, from gate_call only.
inline void StatementReader::call_builtin(const BuiltinGate& g, std::string_view name, const std::vector<Operand>& ops,
                                   int reps, Angle angle, const Scope& sc, int line) {
  if (g.fixed) angle = g.angle;
  if (!sc.eval && !g.identity) count_in_definition(static_cast<std::uint64_t>(reps));
  for (int i = 0; i < reps; ++i) {
    const int q0 = ops[0].first + (ops[0].reg ? i : 0);
    const int q1 = g.qubits == 2 ? ops[1].first + (ops[1].reg ? i : 0) : -1;
    if (q0 == q1) fail(ops[1].pos, "gate " + std::string(name) + " is applied to the same qubit twice");
    if (!sc.eval || g.identity) continue;
    emit(Gate{g.kind, q0, q1, has_angle(g.kind) ? angle : Angle{}}, line);
  }
}

void StatementReader::call_user_broadcast(const UserGate& g, std::string_view name, const Pos& at,
                                          const std::vector<Operand>& ops, int reps, const std::vector<Value>& params,
                                          const Scope& sc, int line) {
  // A call's size is known from the definition: refuse one that would pass the limit before
  // expanding it (nested definitions can double at every level).
  const std::uint64_t call_size = std::min<std::uint64_t>(g.size, kMaxGates + 1) * static_cast<std::uint64_t>(reps);
  if (!sc.eval) count_in_definition(call_size);
  else if (emitted_ + call_size > limit_)
    fail(at, "gate " + std::string(name) + " expands to more than " + std::to_string(limit_) + " gates in all");

  std::vector<int> qs(ops.size());
  for (int i = 0; i < reps; ++i) {
    for (std::size_t k = 0; k < ops.size(); ++k) {
      qs[k] = ops[k].first + (ops[k].reg ? i : 0);
      for (std::size_t j = 0; j < k; ++j)
        if (qs[j] == qs[k]) fail(ops[k].pos, "gate " + std::string(name) + " is applied to the same qubit twice");
    }
    if (!sc.eval) continue;
    call_user(g, params, qs, line);
  }
}

void StatementReader::call_user(const UserGate& g, const std::vector<Value>& params, const std::vector<int>& qubits,
                                int line) {
  // Re-read the body from the buffer with the values bound.
  const char* save_p = p_;
  const int save_line = line_;
  const char* save_ls = line_start_;
  p_ = g.body.at;
  line_ = g.body.line;
  line_start_ = g.body.line_start;
  Scope sc;
  sc.gate = &g;
  sc.params = &params;
  sc.qubits = &qubits;
  sc.eval = true;
  sc.call_line = line;
  if (depth_ + 1 > static_cast<std::size_t>(kMaxNesting))
    throw InputError(source_, line, 0, "gate definitions nested more than " + std::to_string(kMaxNesting) + " deep");
  ++depth_;
  body_statements(sc);
  --depth_;
  p_ = save_p;
  line_ = save_line;
  line_start_ = save_ls;
}

}  // namespace qftplan::qasm_detail
