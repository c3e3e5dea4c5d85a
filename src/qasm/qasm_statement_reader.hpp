#pragma once
// The statement reader of the OpenQASM reader (private to the reader): declarations, gate
// definitions, gate calls (with broadcast), measurements and barriers, building a QasmProgram.
// Its functions live in qasm_statements.cpp (declarations, operands, measurements),
// qasm_gate_calls.cpp (gate definitions and calls) and qasm_reader.cpp (run).

#include <algorithm>
#include <atomic>
#include <cstddef>
#include <cstdint>
#include <deque>
#include <functional>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

#include "qasm_builtin_gates.hpp"
#include "qasm_expression.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/core/run_budget.hpp"
#include "qftplan/qasm/qasm_program.hpp"

namespace qftplan::qasm_detail {

/// Qubits (or bits) a file may declare: the same bound as the largest device.
inline constexpr int kMaxQubits = 1'000'000;
/// Gates a file may produce, against exponential inlining of gate definitions.
inline constexpr std::size_t kMaxGates = 100'000'000;
/// A streamed file keeps no gates: only time bounds it (an 8192-qubit exact QFT is about 10^8 gates).
inline constexpr std::size_t kMaxStreamedGates = 100'000'000'000;

/// A declared qubit or bit register.
struct Register {
  int offset = 0;        ///< index of its first element among the qubits (or bits)
  int size = 0;          ///< elements
  bool quantum = true;   ///< qubit register (false: bit register)
};

/// One gate operand: a single qubit or a whole register (broadcast).
struct Operand {
  int first = 0;     ///< the qubit (or bit), or the register's first
  int count = 1;     ///< elements (1 unless a register)
  bool reg = false;  ///< a whole register
  Pos pos;           ///< where it was written
};

/// Lets the maps below be searched with a string_view without building a string.
struct NameHash {
  using is_transparent = void;  ///< enables heterogeneous lookup
  /// Hash of the name's characters.
  std::size_t operator()(std::string_view s) const { return std::hash<std::string_view>{}(s); }
};
/// Equality for the maps keyed by NameHash.
using NameEq = std::equal_to<>;

/// Reads a whole OpenQASM 2 or 3 buffer into a QasmProgram.
class StatementReader : protected ExpressionReader {
 public:
  /// Reads `size` bytes at `data` (named `source` in messages); polls `interrupt` when given.
  StatementReader(const char* data, std::size_t size, const std::string& source, const std::atomic<bool>* interrupt,
                  QasmGateStream* stream = nullptr)
      : ExpressionReader(data, size, source), stream_(stream), limit_(stream ? kMaxStreamedGates : kMaxGates),
        interrupt_(interrupt) {}

  /// Reads every statement; throws InputError at the first fault.
  QasmProgram run();

 private:
  // ----- statements, declarations, operands, measurements (qasm_statements.cpp) -----
  void statement();
  void include_statement();
  void register_statement(std::string_view keyword);
  void version_statement();
  const Register* find_register(std::string_view name);
  void declare(std::string_view name, std::int64_t size, bool quantum, const Pos& name_at, const Pos& size_at);
  // A qubit (or bit) operand at top level: $k, name[i] or name.
  Operand operand(bool quantum);
  // The element `name[i]` of `r` after its '[', or fails when the index is out of range.
  int register_index(const Register& r, std::string_view name);
  // A qubit operand inside a gate body: one of the gate's argument names.
  Operand body_operand(const Scope& sc);
  void operand_list(const Scope& sc, std::vector<Operand>& ops, bool allow_empty);
  void barrier(const Scope& sc);
  void measure(const Pos& at);
  void measure_assignment(const Register& r, std::string_view name, const Pos& at);
  void emit_measures(const Operand& q, const Operand* b, const Pos& at);
  // if (c[j]) p(t) q;  if (c[j] == 1) ...;  if(cj==1) u1(t) q;  (a phase conditioned on one bit)
  void if_statement(const Pos& at);

  // ----- gate definitions and calls (qasm_gate_calls.cpp) -----
  // gate name(params) a, b { body }
  void define_gate();
  // Reads statements up to and including the closing '}'.
  void body_statements(const Scope& sc);
  void gate_call(std::string_view name, const Pos& at, const Scope& sc);
  // The one angle shape our writer emits, [-]pi, [-]pi/2**k or [-]pi/2^j written as digits, right
  // before the closing ')': read it without the expression evaluator (true, ')' consumed). Anything
  // else leaves the position alone (false) for the evaluator.
  bool pi_over_pow2_argument(Angle& out);
  // Number of broadcast repetitions; registers must agree in size.
  int broadcast(const std::vector<Operand>& ops);
  // Emits (or, in a definition, counts) a built-in gate `reps` times over the operands.
  void call_builtin(const BuiltinGate& g, std::string_view name, const std::vector<Operand>& ops, int reps,
                    Angle angle, const Scope& sc, int line);
  // Expands (or, in a definition, counts) a user gate `reps` times over the operands.
  void call_user_broadcast(const UserGate& g, std::string_view name, const Pos& at, const std::vector<Operand>& ops,
                           int reps, const std::vector<Value>& params, const Scope& sc, int line);
  // Expands one call: re-reads the body with the values bound.
  void call_user(const UserGate& g, const std::vector<Value>& params, const std::vector<int>& qubits, int line);
  // Gates a definition's body emits per call, saturating past the limit.
  void count_in_definition(std::uint64_t gates) {
    defining_size_ = std::min<std::uint64_t>(defining_size_ + gates, kMaxGates + 1);
  }

  // Appends one gate (inline: once per gate of the file).
  void emit(const Gate& g0, int line) {
    Gate g = g0;
    // Inside `if (bit)`: only a phase can be conditioned (the semi-classical readout's gate).
    if (condition_bit_ >= 0) {
      if (g.kind != GateKind::p)
        throw InputError(source_, line, 0,
                         "only a phase gate (p, u1) can be conditioned on a bit, not " + std::string(gate_name(g.kind)));
      g = Gate{GateKind::p_if, g.q0, condition_bit_, g.angle};
    }
    if (emitted_ >= limit_) throw InputError(source_, line, 0, "more than " + std::to_string(limit_) + " gates");
    // Ctrl-C while reading a big file (every 65536 gates: an atomic load is cheap, not free).
    if (interrupt_ && (emitted_ & 0xffff) == 0 && interrupt_->load(std::memory_order_relaxed)) throw Interrupted();
    ++emitted_;
    if (stream_) {
      if (emitted_ == 1) stream_->begin(header_program());
      stream_->gate(g, line);
      return;
    }
    prog_.gates.push_back(g);
    prog_.gate_lines.push_back(line);
  }
  // The header comments and version read so far, as a program without gates.
  QasmProgram header_program() const;
  // Streaming: hands the file's pages behind the read position back to the kernel.
  void release_read_pages();

  QasmProgram prog_;
  QasmGateStream* stream_ = nullptr;  // streaming read: gates go here, none are kept
  std::uint64_t emitted_ = 0;         // gates emitted so far
  std::uint64_t limit_;               // the most gates a read may emit
  const char* released_ = nullptr;    // streaming: pages before this are handed back
  bool seen_statement_ = false;
  int qubit_total_ = 0;
  int bit_total_ = 0;
  int condition_bit_ = -1;  // inside `if (bit)`: the bit every emitted gate is conditioned on
  int max_physical_ = -1;
  bool physical_used_ = false;
  std::unordered_map<std::string, Register, NameHash, NameEq> registers_;
  const Register* last_reg_ = nullptr;
  std::string last_reg_name_;
  std::unordered_map<std::string, UserGate, NameHash, NameEq> user_gates_;
  const UserGate* defining_ = nullptr;
  std::uint64_t defining_size_ = 0;
  const std::atomic<bool>* interrupt_;
  std::vector<Operand> ops_scratch_;
  std::deque<std::vector<Operand>> scratch_;  // deque: references stay valid while it grows
  std::size_t depth_ = 0;
};

}  // namespace qftplan::qasm_detail
