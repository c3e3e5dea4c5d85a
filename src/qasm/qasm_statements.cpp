// The statement reader of the OpenQASM reader: statements, register declarations, operands,
// barriers and measurements (gate definitions and calls are in qasm_gate_calls.cpp).

#include <string>

#include "qasm_statement_reader.hpp"

namespace qftplan::qasm_detail {

void StatementReader::statement() {
  const Pos at = here();
  if (*p_ == '}') fail_here("unexpected '}'");
  const auto w = ident();
  if (w.empty()) fail_here("expected a statement but found " + found());
  // Gate names are by far the most common statement: skip the keyword tests for them.
  const std::uint64_t key = pack(w);
  if (key != pack("OPENQASM") && key != pack("include") && key != pack("qreg") && key != pack("creg") &&
      key != pack("qubit") && key != pack("bit") && key != pack("gate") && key != pack("barrier") &&
      key != pack("measure") && key != pack("if") && seen_statement_ && !peek('[') && !peek('=')) {
    gate_call(w, at, Scope{});
    return;
  }
  if (w == "OPENQASM") {
    if (seen_statement_) fail(at, "OPENQASM must be the first statement");
    seen_statement_ = true;
    version_statement();
    return;
  }
  seen_statement_ = true;
  if (w == "include") {
    include_statement();
    return;
  }
  if (w == "qreg" || w == "creg" || w == "qubit" || w == "bit") {
    register_statement(w);
    return;
  }
  if (w == "gate") {
    define_gate();
    return;
  }
  const Scope top;
  if (w == "barrier") {
    barrier(top);
    return;
  }
  if (w == "measure") {
    measure(at);
    return;
  }
  if (w == "if") {
    if_statement(at);
    return;
  }
  // `c[i] = measure q;` starts with a bit register name followed by '[' or '='; no gate call is.
  if (peek('[') || peek('=')) {
    const Register* r = find_register(w);
    if (!r) fail(at, "unknown register '" + std::string(w) + "'");
    if (r->quantum) fail(at, "only measurements into bit registers can be assigned");
    measure_assignment(*r, w, at);
    return;
  }
  gate_call(w, at, top);
}

// include "file"; the file itself is not read: the gates it would define are built in.
void StatementReader::include_statement() {
  skip_ws();
  if (!accept('"')) fail_here("expected a file name in double quotes after include");
  while (p_ < end_ && *p_ != '"' && *p_ != '\n') ++p_;
  if (p_ >= end_ || *p_ != '"') fail_here("unterminated file name");
  ++p_;
  expect(';');
}

// qreg name[N]; creg name[N]; (OpenQASM 2) or qubit[N] name; bit name; (OpenQASM 3).
void StatementReader::register_statement(std::string_view keyword) {
  if (keyword == "qreg" || keyword == "creg") {
    const auto name_at = here();
    const auto name = expect_ident("a register name");
    expect('[');
    skip_ws();
    const Pos size_at = here();
    const auto size = expect_uint("a register size");
    expect(']');
    expect(';');
    declare(name, size, keyword == "qreg", name_at, size_at);
    return;
  }
  std::int64_t size = 1;
  skip_ws();
  Pos size_at = here();
  const bool array = accept('[');
  if (array) {
    skip_ws();
    size_at = here();
    size = expect_uint("a register size");
    expect(']');
  }
  skip_ws();
  const auto name_at = here();
  const auto name = expect_ident("a register name");
  if (accept('=')) fail_here("initialised declarations are not supported");
  expect(';');
  declare(name, size, keyword == "qubit", name_at, size_at);
}

void StatementReader::version_statement() {
  skip_ws();
  const Pos at = here();
  const char* s = p_;
  while (p_ < end_ && (is_digit(static_cast<unsigned char>(*p_)) || *p_ == '.')) ++p_;
  const std::string_view v(s, static_cast<std::size_t>(p_ - s));
  if (v == "2" || v.starts_with("2."))
    version_ = 2;
  else if (v == "3" || v.starts_with("3."))
    version_ = 3;
  else
    fail(at, v.empty() ? "expected a version number after OPENQASM"
                       : "unsupported OpenQASM version " + std::string(v) + " (2.x and 3.x are read)");
  expect(';');
}

const Register* StatementReader::find_register(std::string_view name) {
  // The last name looked up is nearly always the next one (q[3], q[4], ...).
  if (last_reg_ && name == last_reg_name_) return last_reg_;
  auto it = registers_.find(name);
  if (it == registers_.end()) return nullptr;
  last_reg_ = &it->second;
  last_reg_name_ = it->first;
  return last_reg_;
}

void StatementReader::declare(std::string_view name, std::int64_t size, bool quantum, const Pos& name_at,
                              const Pos& size_at) {
  if (size < 1) fail(size_at, "a register needs at least one element");
  if (registers_.count(std::string(name))) fail(name_at, "register '" + std::string(name) + "' is already declared");
  if (quantum) {
    if (physical_used_) fail(name_at, "declared qubit registers cannot be mixed with physical qubits $k");
    if (qubit_total_ + size > kMaxQubits)
      fail(size_at, "more than " + std::to_string(kMaxQubits) + " qubits declared");
    registers_[std::string(name)] = Register{qubit_total_, static_cast<int>(size), true};
    qubit_total_ += static_cast<int>(size);
  } else {
    if (bit_total_ + size > kMaxQubits) fail(size_at, "more than " + std::to_string(kMaxQubits) + " bits declared");
    registers_[std::string(name)] = Register{bit_total_, static_cast<int>(size), false};
    bit_total_ += static_cast<int>(size);
  }
  last_reg_ = nullptr;  // rehashing may move entries
}

Operand StatementReader::operand(bool quantum) {
  skip_ws();
  Operand op;
  op.pos = here();
  if (p_ < end_ && *p_ == '$') {
    if (!quantum) fail_here("expected a bit register but found a physical qubit");
    ++p_;
    if (p_ >= end_ || !is_digit(static_cast<unsigned char>(*p_))) fail(op.pos, "expected a qubit number after '$'");
    const auto k = expect_uint("a qubit number");
    if (qubit_total_ > 0) fail(op.pos, "physical qubits $k cannot be mixed with declared qubit registers");
    if (k >= kMaxQubits) fail(op.pos, "physical qubit $" + std::to_string(k) + " is out of range");
    physical_used_ = true;
    op.first = static_cast<int>(k);
    max_physical_ = std::max(max_physical_, op.first);
    return op;
  }
  const auto name = ident();
  if (name.empty()) fail_here(std::string("expected a ") + (quantum ? "qubit" : "bit") + " but found " + found());
  const Register* r = find_register(name);
  if (!r) fail(op.pos, "unknown register '" + std::string(name) + "'");
  if (r->quantum != quantum)
    fail(op.pos, "'" + std::string(name) + "' is a " + (r->quantum ? "qubit" : "bit") + " register, expected a " +
                     (quantum ? "qubit" : "bit") + " register");
  if (accept('[')) {
    op.first = register_index(*r, name);
    return op;
  }
  op.first = r->offset;
  op.count = r->size;
  op.reg = true;
  return op;
}

int StatementReader::register_index(const Register& r, std::string_view name) {
  skip_ws();
  const Pos idx_at = here();
  const auto i = expect_uint("an index");
  expect(']');
  if (i >= r.size)
    fail(idx_at, "index " + std::to_string(i) + " is out of range for register '" + std::string(name) +
                     "' of size " + std::to_string(r.size));
  return r.offset + static_cast<int>(i);
}

Operand StatementReader::body_operand(const Scope& sc) {
  skip_ws();
  Operand op;
  op.pos = here();
  const auto name = ident();
  if (name.empty()) fail_here("expected a gate argument but found " + found());
  for (std::size_t i = 0; i < sc.gate->args.size(); ++i) {
    if (sc.gate->args[i] == name) {
      op.first = sc.eval ? (*sc.qubits)[i] : static_cast<int>(i);
      if (peek('[')) fail_here("gate arguments cannot be indexed");
      return op;
    }
  }
  fail(op.pos, "'" + std::string(name) + "' is not an argument of gate " + sc.gate->name);
}

void StatementReader::operand_list(const Scope& sc, std::vector<Operand>& ops, bool allow_empty) {
  ops.clear();
  if (allow_empty && peek(';')) return;
  do {
    ops.push_back(sc.gate ? body_operand(sc) : operand(true));
  } while (accept(','));
}

void StatementReader::barrier(const Scope& sc) {
  operand_list(sc, ops_scratch_, true);
  expect(';');
}

void StatementReader::measure(const Pos& at) {
  const Operand q = operand(true);
  Operand b;
  bool target = false;
  skip_ws();
  if (p_ + 1 < end_ && p_[0] == '-' && p_[1] == '>') {
    p_ += 2;
    b = operand(false);
    target = true;
  }
  expect(';');
  emit_measures(q, target ? &b : nullptr, at);
}

void StatementReader::measure_assignment(const Register& r, std::string_view name, const Pos& at) {
  Operand b;
  b.pos = at;
  if (accept('[')) {
    b.first = register_index(r, name);
  } else {
    b.first = r.offset;
    b.count = r.size;
    b.reg = true;
  }
  expect('=');
  const auto w = expect_ident("'measure'");
  if (w != "measure") fail(at, "only measurements can be assigned to bits");
  const Operand q = operand(true);
  expect(';');
  emit_measures(q, &b, at);
}

// OpenQASM 3: `if (c[j]) statement` or `if (c[j] == 1) statement` (the specification's branching
// statement with a bit as its condition); OpenQASM 2: `if (creg == 1) qop;` on a one-bit register
// (Cross et al., arXiv:1707.03429, section 3, which compares a whole register). The statement must be a
// phase gate on one qubit: the conditioned phase of the semi-classical readout.
void StatementReader::if_statement(const Pos& at) {
  expect('(');
  skip_ws();
  const Pos name_at = here();
  const auto name = expect_ident("a bit register");
  const Register* r = find_register(name);
  if (!r) fail(name_at, "unknown register '" + std::string(name) + "'");
  if (r->quantum) fail(name_at, "'" + std::string(name) + "' is a qubit register; a condition tests a bit");
  int bit = r->offset;
  if (accept('[')) {
    bit = register_index(*r, name);
  } else if (r->size != 1) {
    fail(name_at, "this reader conditions on one bit: register '" + std::string(name) + "' has " +
                      std::to_string(r->size) + " bits (name one, c[j], or use one-bit registers)");
  }
  skip_ws();
  if (accept('=')) {
    expect('=');
    skip_ws();
    const Pos v_at = here();
    if (expect_uint("the value 1") != 1) fail(v_at, "this reader conditions only on a bit being 1");
  }
  expect(')');
  skip_ws();
  const Pos gate_at = here();
  const auto gate = ident();
  if (gate.empty() || gate == "if" || gate == "measure" || gate == "{")
    fail(gate_at, "expected a phase gate after the condition but found " + found());
  condition_bit_ = bit;
  try {
    gate_call(gate, gate_at, Scope{});
  } catch (...) {
    condition_bit_ = -1;
    throw;
  }
  condition_bit_ = -1;
  (void)at;
}

void StatementReader::emit_measures(const Operand& q, const Operand* b, const Pos& at) {
  if (b && (q.reg || b->reg) && q.count != b->count)
    fail(at, "measurement of " + std::to_string(q.count) + " qubits into " + std::to_string(b->count) + " bits");
  for (int i = 0; i < q.count; ++i)
    emit(Gate{GateKind::measure, q.first + (q.reg ? i : 0), b ? b->first + (b->reg ? i : 0) : -1, Angle{}}, at.line);
}

}  // namespace qftplan::qasm_detail
