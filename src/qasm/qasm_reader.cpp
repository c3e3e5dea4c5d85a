// OpenQASM 2 / 3 reader: a hand-written scanner over the whole buffer (no regex, no stream per
// token), because a 1024-qubit QFT in native gates is over a million lines.

#include <algorithm>
#include <array>
#include <atomic>
#include <bit>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <deque>
#include <numbers>
#include <numeric>
#include <string_view>
#include <unordered_map>

#include <fcntl.h>
#include <sys/mman.h>
#include <sys/stat.h>
#include <unistd.h>

#include "qftplan/core/input_error.hpp"
#include "qftplan/core/run_budget.hpp"
#include "qftplan/qasm/qasm_program.hpp"

namespace qftplan {

namespace {

constexpr int kMaxQubits = 1'000'000;           // same bound as the largest device
constexpr std::int64_t kMaxExponent = 1 << 24;  // 2^e kept exact while |e| stays below this
constexpr std::uint32_t kMaxPow2Literal = 20000; // longest power-of-two integer literal kept exact
constexpr int kMaxNesting = 200;                 // parentheses / unary signs / gate calls, against stack overflow
constexpr std::size_t kMaxGates = 100'000'000;   // against exponential inlining of gate definitions

// ---------------------------------------------------------------------------------------------
// Angle arithmetic. A value is either exact, n/d * 2^e * pi^pip with n odd (or zero) and d odd
// and positive, or an approximate double. Exactness survives + - * / ** as long as the numbers
// fit in 64 bits, which covers every angle a QFT needs (pi/2**4095 has n = d = 1).

struct Value {
  bool exact = true;
  std::int64_t n = 0;
  std::int64_t d = 1;
  std::int64_t e = 0;
  int pip = 0;
  double approx = 0;
};

Value inexact(double x) {
  Value v;
  v.exact = false;
  v.approx = x;
  return v;
}

double to_double(const Value& v) {
  if (!v.exact) return v.approx;
  if (v.n == 0) return 0.0;
  double x = static_cast<double>(v.n) / static_cast<double>(v.d);
  x = std::ldexp(x, static_cast<int>(std::clamp<std::int64_t>(v.e, -100000, 100000)));
  for (int i = 0; i < v.pip; ++i) x *= std::numbers::pi;
  for (int i = 0; i > v.pip; --i) x /= std::numbers::pi;
  return x;
}

Value normalized(Value v) {
  if (!v.exact) return v;
  if (v.n == 0) {
    v.d = 1;
    v.e = 0;
    v.pip = 0;
    return v;
  }
  const int tz = std::countr_zero(static_cast<std::uint64_t>(v.n));
  v.n >>= tz;  // exact: the low bits are zero
  v.e += tz;
  if (v.d != 1) {
    const std::int64_t g = std::gcd(v.n, v.d);
    if (g > 1) {
      v.n /= g;
      v.d /= g;
    }
  }
  if (v.e > kMaxExponent || v.e < -kMaxExponent || v.pip > 8 || v.pip < -8) return inexact(to_double(v));
  return v;
}

Value integer(std::int64_t k) {
  Value v;
  v.n = k;
  return normalized(v);
}

Value negate(Value v) {
  if (v.exact)
    v.n = -v.n;  // n is odd or zero, never INT64_MIN
  else
    v.approx = -v.approx;
  return v;
}

Value mul(const Value& a, const Value& b) {
  if (a.exact && b.exact) {
    if (a.n == 0 || b.n == 0) return Value{};
    // Cross-reduce first so the products stay small.
    const std::int64_t g1 = b.d == 1 ? 1 : std::gcd(a.n, b.d), g2 = a.d == 1 ? 1 : std::gcd(b.n, a.d);
    Value r;
    if (!__builtin_mul_overflow(a.n / g1, b.n / g2, &r.n) && !__builtin_mul_overflow(a.d / g2, b.d / g1, &r.d)) {
      r.e = a.e + b.e;
      r.pip = a.pip + b.pip;
      return normalized(r);
    }
  }
  return inexact(to_double(a) * to_double(b));
}

// Caller guarantees a != 0.
Value reciprocal(const Value& a) {
  if (!a.exact) return inexact(1.0 / a.approx);
  Value r;
  r.n = a.n < 0 ? -a.d : a.d;
  r.d = a.n < 0 ? -a.n : a.n;
  r.e = -a.e;
  r.pip = -a.pip;
  return r;
}

bool is_zero(const Value& v) { return v.exact ? v.n == 0 : v.approx == 0.0; }

Value add(const Value& a, const Value& b) {
  if (a.exact && a.n == 0) return b;
  if (b.exact && b.n == 0) return a;
  if (a.exact && b.exact && a.pip == b.pip) {
    const std::int64_t em = std::min(a.e, b.e);
    const std::int64_t sa = a.e - em, sb = b.e - em;
    if (sa < 62 && sb < 62) {
      std::int64_t na, nb, x, y, s, d;
      if (!__builtin_mul_overflow(a.n, std::int64_t{1} << sa, &na) &&
          !__builtin_mul_overflow(b.n, std::int64_t{1} << sb, &nb) && !__builtin_mul_overflow(na, b.d, &x) &&
          !__builtin_mul_overflow(nb, a.d, &y) && !__builtin_add_overflow(x, y, &s) &&
          !__builtin_mul_overflow(a.d, b.d, &d)) {
        Value r;
        r.n = s;
        r.d = d;
        r.e = em;
        r.pip = a.pip;
        return normalized(r);
      }
    }
  }
  return inexact(to_double(a) + to_double(b));
}

// ---------------------------------------------------------------------------------------------
// Gates the reader knows without a definition.

struct BuiltinGate {
  std::string_view name;
  GateKind kind;
  int params;
  int qubits;
  bool fixed = false;      // a phase gate with a fixed angle (z, s, t, ...)
  Angle angle{};           // that angle
  bool identity = false;   // id: nothing to emit
};

// Up to 8 bytes of a name as one integer (0 for longer names), so keyword and gate-name tests
// are integer compares rather than string compares on the hot path.
constexpr std::uint64_t pack(std::string_view s) {
  if (s.size() > 8) return 0;
  std::uint64_t k = 0;
  for (std::size_t i = 0; i < s.size(); ++i) k |= static_cast<std::uint64_t>(static_cast<unsigned char>(s[i])) << (8 * i);
  return k;
}

const BuiltinGate* find_builtin(std::string_view name) {
  // stdgates.inc (OpenQASM 3) and qelib1.inc (OpenQASM 2) names; u1/cu1/phase/cphase are the
  // older spellings of p/cp, and z, s, sdg, t, tdg are p with a fixed angle (OpenQASM 3 spec,
  // stdgates.inc). swap is not in qelib1.inc but is accepted in both versions.
  static const BuiltinGate table[] = {
      {"h", GateKind::h, 0, 1},
      {"cx", GateKind::cx, 0, 2},
      {"rz", GateKind::rz, 1, 1},
      {"p", GateKind::p, 1, 1},
      {"cp", GateKind::cp, 1, 2},
      {"swap", GateKind::swap, 0, 2},
      {"cz", GateKind::cz, 0, 2},
      {"x", GateKind::x, 0, 1},
      {"sx", GateKind::sx, 0, 1},
      {"u1", GateKind::p, 1, 1},
      {"cu1", GateKind::cp, 1, 2},
      {"CX", GateKind::cx, 0, 2},
      {"phase", GateKind::p, 1, 1},
      {"cphase", GateKind::cp, 1, 2},
      {"z", GateKind::p, 0, 1, true, Angle(1, 0)},
      {"s", GateKind::p, 0, 1, true, Angle(1, 1)},
      {"sdg", GateKind::p, 0, 1, true, Angle(-1, 1)},
      {"t", GateKind::p, 0, 1, true, Angle(1, 2)},
      {"tdg", GateKind::p, 0, 1, true, Angle(-1, 2)},
      {"id", GateKind::h, 0, 1, false, Angle{}, true},
  };
  static const auto keys = [] {
    std::array<std::uint64_t, std::size(table)> k{};
    for (std::size_t i = 0; i < std::size(table); ++i) k[i] = pack(table[i].name);
    return k;
  }();
  const std::uint64_t key = pack(name);
  if (key == 0) return nullptr;
  for (std::size_t i = 0; i < keys.size(); ++i)
    if (keys[i] == key) return &table[i];
  return nullptr;
}

// Statements of the language that this reader deliberately does not take.
bool is_unsupported_keyword(std::string_view w) {
  static const std::string_view words[] = {
      "reset", "if",     "else",   "opaque", "for",     "while",    "def",    "defcal", "cal",    "const",
      "let",   "input",  "output", "box",    "delay",   "gphase",   "U",      "ctrl",   "negctrl", "inv",
      "pow",   "extern", "int",    "uint",   "float",   "angle",    "bool",   "duration", "stretch", "array",
      "complex", "return", "break", "continue", "switch", "pragma"};
  for (auto k : words)
    if (k == w) return true;
  return false;
}

// A hint only: lets the kernel back a big buffer with 2 MiB pages.
void advise_huge_pages(void* p, std::size_t bytes) {
#ifdef MADV_HUGEPAGE
  constexpr std::uintptr_t kHuge = std::uintptr_t{2} << 20;
  const auto b = (reinterpret_cast<std::uintptr_t>(p) + kHuge - 1) & ~(kHuge - 1);
  const auto e = (reinterpret_cast<std::uintptr_t>(p) + bytes) & ~(kHuge - 1);
  if (e > b) ::madvise(reinterpret_cast<void*>(b), e - b, MADV_HUGEPAGE);
#else
  (void)p;
  (void)bytes;
#endif
}

struct Pos {
  int line = 0;
  const char* line_start = nullptr;
  const char* at = nullptr;
};

struct Register {
  int offset = 0;
  int size = 0;
  bool quantum = true;
};

// A user `gate` definition; its body is re-read from the buffer at every call.
struct UserGate {
  std::string name;
  std::size_t order = 0;  // definition order: a body sees only gates defined before it
  std::vector<std::string> params;
  std::vector<std::string> args;
  Pos body;  // just after '{'
  std::uint64_t size = 0;  // gates one call emits (counted when defined, capped past kMaxGates)
};

// Where the statements being read live: top level, or inside a gate body (checked once at the
// definition with `eval` false, then evaluated at every call).
struct Scope {
  const UserGate* gate = nullptr;
  const std::vector<Value>* params = nullptr;
  const std::vector<int>* qubits = nullptr;
  bool eval = true;
  int call_line = 0;
};

// One gate operand: a single qubit or a whole register (broadcast).
struct Operand {
  int first = 0;
  int count = 1;
  bool reg = false;
  Pos pos;
};

// Lets the maps below be searched with a string_view without building a string.
struct NameHash {
  using is_transparent = void;
  std::size_t operator()(std::string_view s) const { return std::hash<std::string_view>{}(s); }
};
using NameEq = std::equal_to<>;

// Character classes without the locale (std::isalpha and friends are calls into the C library).
inline bool is_digit(unsigned char c) { return c >= '0' && c <= '9'; }
inline bool is_alpha(unsigned char c) { return (c | 0x20) >= 'a' && (c | 0x20) <= 'z'; }
inline bool ident_start(unsigned char c) { return is_alpha(c) || c == '_' || c >= 0x80; }
inline bool ident_char(unsigned char c) { return is_alpha(c) || is_digit(c) || c == '_' || c >= 0x80; }

class Reader {
 public:
  Reader(const char* data, std::size_t size, const std::string& source, const std::atomic<bool>* interrupt)
      : begin_(data), p_(data), end_(data + size), line_start_(data), source_(source), interrupt_(interrupt) {}

  QasmProgram run() {
    // Skip a UTF-8 byte order mark.
    if (end_ - p_ >= 3 && std::memcmp(p_, "\xEF\xBB\xBF", 3) == 0) p_ += 3, line_start_ = p_;
    // About one gate per 16 bytes of text at most; reserving up front avoids regrowth copies, and
    // huge pages cut the page faults of first touch (most of the time on big files).
    prog_.gates.reserve(static_cast<std::size_t>((end_ - begin_) / 16));
    prog_.gate_lines.reserve(prog_.gates.capacity());
    advise_huge_pages(prog_.gates.data(), prog_.gates.capacity() * sizeof(Gate));
    advise_huge_pages(prog_.gate_lines.data(), prog_.gate_lines.capacity() * sizeof(int));
    for (;;) {
      skip_ws();
      if (p_ >= end_) break;
      statement();
    }
    prog_.version = version_ == 0 ? 3 : version_;
    prog_.qubit_count = std::max(qubit_total_, max_physical_ + 1);
    return std::move(prog_);
  }

 private:
  // ----- positions and errors -----

  Pos here() const { return {line_, line_start_, p_}; }

  [[noreturn]] void fail(const Pos& pos, const std::string& msg) const {
    // Columns count characters, not bytes (a line may hold a UTF-8 pi).
    int col = 1;
    for (const char* c = pos.line_start; c < pos.at && c < end_; ++c)
      if ((static_cast<unsigned char>(*c) & 0xC0) != 0x80) ++col;
    throw InputError(source_, pos.line, col, msg);
  }
  [[noreturn]] void fail_here(const std::string& msg) const { fail(here(), msg); }

  std::string found() const {
    if (p_ >= end_) return "end of file";
    const unsigned char c = static_cast<unsigned char>(*p_);
    if (ident_start(c)) {
      const char* q = p_;
      while (q < end_ && ident_char(static_cast<unsigned char>(*q))) ++q;
      return "'" + std::string(p_, q) + "'";
    }
    if (c < 0x20) return "character code " + std::to_string(c);
    return std::string("'") + static_cast<char>(c) + "'";
  }

  // ----- whitespace, comments and our header comments -----

  void skip_ws() {
    while (p_ < end_) {
      const char c = *p_;
      if (c == ' ' || c == '\t' || c == '\r') {
        ++p_;
      } else if (c == '\n') {
        ++p_;
        ++line_;
        line_start_ = p_;
      } else if (c == '/' && p_ + 1 < end_ && p_[1] == '/') {
        const char* eol = static_cast<const char*>(std::memchr(p_, '\n', static_cast<std::size_t>(end_ - p_)));
        if (!eol) eol = end_;
        if (p_ + 2 < eol && p_[2] == ' ') header_comment(eol);
        p_ = eol;
      } else if (c == '/' && p_ + 1 < end_ && p_[1] == '*') {
        const Pos open = here();
        p_ += 2;
        for (;;) {
          if (p_ + 1 >= end_) fail(open, "unterminated /* comment");
          if (*p_ == '*' && p_[1] == '/') {
            p_ += 2;
            break;
          }
          if (*p_ == '\n') {
            ++line_;
            line_start_ = p_ + 1;
          }
          ++p_;
        }
      } else {
        break;
      }
    }
  }

  // `// device: NAME`, `// placement: 4,3,2,1,0`, `// final_placement: ...` (our writer's lines).
  void header_comment(const char* eol) {
    const char* s = p_ + 3;
    auto key = [&](std::string_view k) {
      if (static_cast<std::size_t>(eol - s) >= k.size() && std::memcmp(s, k.data(), k.size()) == 0) {
        s += k.size();
        return true;
      }
      return false;
    };
    const char* e = eol;
    while (e > s && (e[-1] == '\r' || e[-1] == ' ' || e[-1] == '\t')) --e;
    if (key("device:")) {
      while (s < e && (*s == ' ' || *s == '\t')) ++s;
      if (prog_.device_name) fail(here(), "second '// device:' comment");
      prog_.device_name = std::string(s, e);
    } else if (key("placement:")) {
      if (prog_.placement) fail(here(), "second '// placement:' comment");
      prog_.placement = int_list(s, e, "placement");
    } else if (key("final_placement:")) {
      if (prog_.final_placement) fail(here(), "second '// final_placement:' comment");
      prog_.final_placement = int_list(s, e, "final_placement");
    }
  }

  std::vector<int> int_list(const char* s, const char* e, const char* what) {
    std::vector<int> out;
    for (;;) {
      while (s < e && (*s == ' ' || *s == '\t')) ++s;
      int v = 0;
      auto [q, ec] = std::from_chars(s, e, v);
      if (ec != std::errc() || v < 0) fail({line_, line_start_, s}, std::string("bad number in the ") + what + " comment");
      out.push_back(v);
      s = q;
      while (s < e && (*s == ' ' || *s == '\t')) ++s;
      if (s == e) break;
      if (*s != ',') fail({line_, line_start_, s}, std::string("expected ',' in the ") + what + " comment");
      ++s;
    }
    return out;
  }

  // ----- tokens -----

  bool peek(char c) {
    skip_ws();
    return p_ < end_ && *p_ == c;
  }
  bool accept(char c) {
    if (peek(c)) {
      ++p_;
      return true;
    }
    return false;
  }
  void expect(char c) {
    if (!accept(c)) fail_here(std::string("expected '") + c + "' but found " + found());
  }

  std::string_view ident() {
    skip_ws();
    const char* s = p_;
    if (p_ < end_ && ident_start(static_cast<unsigned char>(*p_))) {
      ++p_;
      while (p_ < end_ && ident_char(static_cast<unsigned char>(*p_))) ++p_;
    }
    return {s, static_cast<std::size_t>(p_ - s)};
  }
  std::string_view expect_ident(const char* what) {
    auto w = ident();
    if (w.empty()) fail_here(std::string("expected ") + what + " but found " + found());
    return w;
  }

  // A non-negative decimal integer (sizes, indices, $k).
  std::int64_t expect_uint(const char* what) {
    skip_ws();
    const Pos at = here();
    if (p_ >= end_ || !is_digit(static_cast<unsigned char>(*p_)))
      fail_here(std::string("expected ") + what + " but found " + found());
    std::int64_t v = 0;
    while (p_ < end_ && is_digit(static_cast<unsigned char>(*p_))) {
      if (v < (std::int64_t{1} << 40)) v = v * 10 + (*p_ - '0');
      ++p_;
    }
    if (p_ < end_ && ident_char(static_cast<unsigned char>(*p_))) fail(at, std::string("bad ") + what);
    return v;
  }

  // ----- expressions -----

  Value expression(const Scope& sc) {
    Value v = term(sc);
    for (;;) {
      if (accept('+')) {
        Value r = term(sc);
        v = sc.eval ? add(v, r) : Value{};
      } else if (peek('-')) {
        ++p_;
        Value r = term(sc);
        v = sc.eval ? add(v, negate(r)) : Value{};
      } else {
        return v;
      }
    }
  }

  Value term(const Scope& sc) {
    Value v = unary(sc);
    for (;;) {
      skip_ws();
      if (p_ < end_ && *p_ == '*' && !(p_ + 1 < end_ && p_[1] == '*')) {
        ++p_;
        Value r = unary(sc);
        v = sc.eval ? mul(v, r) : Value{};
      } else if (p_ < end_ && *p_ == '/' && !(p_ + 1 < end_ && (p_[1] == '/' || p_[1] == '*'))) {
        const Pos at = here();
        ++p_;
        Value r = unary(sc);
        if (sc.eval) {
          if (is_zero(r)) fail(at, "division by zero");
          v = mul(v, reciprocal(r));
        }
      } else {
        return v;
      }
    }
  }

  // Unary minus binds looser than the power operator: -2**2 is -4 (OpenQASM 3 precedence table).
  Value unary(const Scope& sc) {
    struct Depth {
      int& d;
      explicit Depth(int& x) : d(++x) {}
      ~Depth() { --d; }
    } depth(expr_depth_);
    if (expr_depth_ > kMaxNesting) fail_here("expression nested too deeply");
    if (accept('-')) return negate(unary(sc));
    if (accept('+')) return unary(sc);
    return power(sc);
  }

  Value power(const Scope& sc) {
    Value base = primary(sc);
    skip_ws();
    const Pos at = here();
    bool pow_op = false;
    if (p_ + 1 < end_ && p_[0] == '*' && p_[1] == '*') {
      p_ += 2;
      pow_op = true;
    } else if (p_ < end_ && *p_ == '^') {
      // OpenQASM 2 writes powers with '^'; in OpenQASM 3 it is bitwise xor.
      if (version_ == 3) fail_here("'^' is not an arithmetic operator in OpenQASM 3 (use '**')");
      ++p_;
      pow_op = true;
    }
    if (!pow_op) return base;
    Value ex = unary(sc);  // right-associative, and 2**-3 is allowed
    if (!sc.eval) return Value{};
    return raise(base, ex, at);
  }

  Value raise(const Value& a, const Value& b, const Pos& at) {
    if (b.exact && b.n == 0) return integer(1);
    if (b.exact && b.pip == 0 && b.d == 1 && b.e >= 0 && b.e < 21 && b.n > -(1 << 21) && b.n < (1 << 21)) {
      const std::int64_t k = b.n * (std::int64_t{1} << b.e);
      if (k >= -(1 << 20) && k <= (1 << 20) && a.exact) {
        if (a.n == 0) {
          if (k < 0) fail(at, "division by zero");
          return Value{};
        }
        const Value base = k < 0 ? reciprocal(a) : a;
        const std::int64_t m = k < 0 ? -k : k;
        if ((base.n == 1 || base.n == -1) && base.d == 1) {
          // A signed power of two (times a power of pi): exact for any exponent.
          Value r;
          r.n = (m % 2 == 1) ? base.n : 1;
          r.e = base.e * m;
          r.pip = static_cast<int>(std::clamp<std::int64_t>(base.pip * m, -1000, 1000));
          return normalized(r);
        }
        if (m <= 64) {
          Value r = integer(1);
          for (std::int64_t i = 0; i < m; ++i) r = mul(r, base);
          return r;
        }
      }
    }
    return inexact(std::pow(to_double(a), to_double(b)));
  }

  Value primary(const Scope& sc) {
    skip_ws();
    const Pos at = here();
    if (p_ >= end_) fail_here("expected an expression but found end of file");
    const unsigned char c = static_cast<unsigned char>(*p_);
    if (c == '(') {
      ++p_;
      Value v = expression(sc);
      expect(')');
      return v;
    }
    if (is_digit(c) || (c == '.' && p_ + 1 < end_ && is_digit(static_cast<unsigned char>(p_[1]))))
      return number();
    // pi and tau as UTF-8 letters.
    if (c == 0xCF && p_ + 1 < end_ && (static_cast<unsigned char>(p_[1]) == 0x80 || static_cast<unsigned char>(p_[1]) == 0x84) &&
        !(p_ + 2 < end_ && ident_char(static_cast<unsigned char>(p_[2])))) {
      const bool tau = static_cast<unsigned char>(p_[1]) == 0x84;
      p_ += 2;
      Value v;
      v.n = 1;
      v.pip = 1;
      v.e = tau ? 1 : 0;
      return v;
    }
    if (ident_start(c)) {
      const auto w = ident();
      if (w == "pi" || w == "tau") {
        Value v;
        v.n = 1;
        v.pip = 1;
        v.e = w == "tau" ? 1 : 0;
        return v;
      }
      if (w == "euler") return inexact(std::numbers::e);
      if (sc.gate) {
        for (std::size_t i = 0; i < sc.gate->params.size(); ++i)
          if (sc.gate->params[i] == w) return sc.eval ? (*sc.params)[i] : Value{};
      }
      static const std::string_view functions[] = {"sin", "cos", "tan", "exp", "ln", "sqrt"};
      for (std::size_t f = 0; f < std::size(functions); ++f) {
        if (w != functions[f]) continue;
        if (!peek('(')) fail_here("expected '(' after " + std::string(w));
        const Value arg = primary(sc);
        if (!sc.eval) return Value{};
        const double x = to_double(arg);
        switch (f) {
          case 0: return inexact(std::sin(x));
          case 1: return inexact(std::cos(x));
          case 2: return inexact(std::tan(x));
          case 3: return inexact(std::exp(x));
          case 4:
            if (!(x > 0)) fail(at, "ln of a non-positive number");
            return inexact(std::log(x));
          default:
            if (x < 0) fail(at, "sqrt of a negative number");
            return inexact(std::sqrt(x));
        }
      }
      fail(at, "unknown identifier '" + std::string(w) + "' in an expression");
    }
    fail_here("expected an expression but found " + found());
  }

  // Integer or decimal literal; kept exact when it is n/5^k * 2^e with 64-bit n.
  Value number() {
    const Pos at = here();
    const char* s = p_;
    while (p_ < end_ && is_digit(static_cast<unsigned char>(*p_))) ++p_;
    const char* int_end = p_;
    const char* frac_begin = p_;
    const char* frac_end = p_;
    bool decimal = false;
    if (p_ < end_ && *p_ == '.') {
      decimal = true;
      ++p_;
      frac_begin = p_;
      while (p_ < end_ && is_digit(static_cast<unsigned char>(*p_))) ++p_;
      frac_end = p_;
    }
    std::int64_t exp10 = 0;
    if (p_ < end_ && (*p_ == 'e' || *p_ == 'E')) {
      const char* q = p_ + 1;
      bool neg = false;
      if (q < end_ && (*q == '+' || *q == '-')) neg = *q++ == '-';
      if (q >= end_ || !is_digit(static_cast<unsigned char>(*q))) fail(at, "bad number");
      decimal = true;
      while (q < end_ && is_digit(static_cast<unsigned char>(*q))) {
        if (exp10 < 100000) exp10 = exp10 * 10 + (*q - '0');
        ++q;
      }
      if (neg) exp10 = -exp10;
      p_ = q;
    }
    if (p_ < end_ && ident_char(static_cast<unsigned char>(*p_))) fail(at, "bad number");
    const char* tok_end = p_;

    if (!decimal) return integer_literal(std::string_view(s, static_cast<std::size_t>(int_end - s)));

    // Digits of the mantissa without leading zeros and without trailing fraction zeros.
    while (frac_end > frac_begin && frac_end[-1] == '0') --frac_end;
    std::string digits(s, int_end);
    digits.append(frac_begin, frac_end);
    const std::int64_t scale = exp10 - (frac_end - frac_begin);
    std::size_t lead = 0;
    while (lead < digits.size() && digits[lead] == '0') ++lead;
    digits.erase(0, lead);
    if (digits.empty()) return Value{};
    if (digits.size() <= 18 && scale >= -27 && scale <= 27) {
      std::int64_t m = 0;
      for (char ch : digits) m = m * 10 + (ch - '0');
      std::int64_t five = 1;
      for (std::int64_t i = 0; i < (scale < 0 ? -scale : scale); ++i) five *= 5;
      Value v;
      if (scale >= 0) {
        if (!__builtin_mul_overflow(m, five, &v.n)) {
          v.e = scale;
          return normalized(v);
        }
      } else {
        v.n = m;
        v.d = five;
        v.e = scale;
        return normalized(v);
      }
    }
    double x = 0;
    auto [q, ec] = std::from_chars(s, tok_end, x);
    if (ec == std::errc::result_out_of_range) x = HUGE_VAL;
    else if (ec != std::errc() || q != tok_end) fail(at, "bad number");
    return inexact(x);
  }

  Value integer_literal(std::string_view digits) {
    std::size_t lead = 0;
    while (lead + 1 < digits.size() && digits[lead] == '0') ++lead;
    digits.remove_prefix(lead);
    // Every integer that fits 64 bits is exact (19 digits: the parity network writes numerators
    // such as 2^60 - 1, which a double would round).
    if (digits.size() <= 19) {
      std::int64_t m = 0;
      bool fits = true;
      for (char ch : digits)
        fits = fits && !__builtin_mul_overflow(m, std::int64_t{10}, &m) && !__builtin_add_overflow(m, ch - '0', &m);
      if (fits) return integer(m);
    }
    // Long integers are powers of two in practice (our OpenQASM 2 writer spells pi/2^k with the
    // decimal 2^k): recognise them exactly, caching by spelling.
    auto it = pow2_cache_.find(digits);
    if (it == pow2_cache_.end()) {
      int k = -1;
      double lead17 = 0;
      for (std::size_t i = 0; i < 17; ++i) lead17 = lead17 * 10 + (digits[i] - '0');
      const double est = std::log2(lead17) + static_cast<double>(digits.size() - 17) * std::log2(10.0);
      const long long guess = std::llround(est);
      for (long long cand = guess - 1; cand <= guess + 1 && k < 0; ++cand)
        if (cand >= 0 && cand <= kMaxPow2Literal && pow2_decimal(static_cast<std::uint32_t>(cand)) == digits)
          k = static_cast<int>(cand);
      it = pow2_cache_.emplace(digits, k).first;
    }
    if (it->second >= 0) {
      Value v;
      v.n = 1;
      v.e = it->second;
      return v;
    }
    double x = 0;
    auto [q, ec] = std::from_chars(digits.data(), digits.data() + digits.size(), x);
    if (ec != std::errc()) x = HUGE_VAL;
    return inexact(x);
  }

  // An angle parameter: exact multiple of pi/2^k, or a number within 1e-12 (relative) of one.
  Angle to_angle(const Value& v, const Pos& at, const char* text_end) {
    if (v.exact) {
      if (v.n == 0) return Angle{};
      if (v.pip == 1 && v.d == 1) {
        if (v.e >= 1) return Angle{};  // an even multiple of pi
        return Angle(v.n, static_cast<std::uint32_t>(-v.e));
      }
    }
    const double x = to_double(v);
    if (std::isfinite(x)) {
      if (x == 0.0) return Angle{};
      // Small numerators only: with a 2^-40 relative tolerance, any real number is close to
      // some multiple of pi/2^60 with a huge numerator, which would prove nothing.
      for (int k = 0; k <= 60; ++k) {
        const double t = std::ldexp(x / std::numbers::pi, k);
        if (std::abs(t) > 16777216.0) break;
        const double r = std::nearbyint(t);
        if (r != 0.0 && std::abs(r - t) <= 1e-12 * std::abs(t)) return Angle(static_cast<std::int64_t>(r), k);
      }
    }
    const char* b = at.at;
    const char* e = text_end;
    while (e > b && std::isspace(static_cast<unsigned char>(e[-1]))) --e;
    char buf[64];
    std::snprintf(buf, sizeof buf, "%.17g", x);
    // Readable, but not an angle of the QFT: record the first one and read it as 0.
    if (!prog_.inexact_angle)
      prog_.inexact_angle = QasmProgram::InexactAngle{
          at.line, "angle " + std::string(b, e) + " (= " + buf + ") on line " + std::to_string(at.line) +
                       " is not a multiple of pi/2^k, as every angle of the QFT is"};
    return Angle{};
  }

  // ----- statements -----

  void statement() {
    const Pos at = here();
    if (*p_ == '}') fail_here("unexpected '}'");
    const auto w = ident();
    if (w.empty()) fail_here("expected a statement but found " + found());
    // Gate names are by far the most common statement: skip the keyword tests for them.
    const std::uint64_t key = pack(w);
    if (key != pack("OPENQASM") && key != pack("include") && key != pack("qreg") && key != pack("creg") &&
        key != pack("qubit") && key != pack("bit") && key != pack("gate") && key != pack("barrier") &&
        key != pack("measure") && seen_statement_ && !peek('[') && !peek('=')) {
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
      skip_ws();
      if (!accept('"')) fail_here("expected a file name in double quotes after include");
      while (p_ < end_ && *p_ != '"' && *p_ != '\n') ++p_;
      if (p_ >= end_ || *p_ != '"') fail_here("unterminated file name");
      ++p_;
      expect(';');
      return;
    }
    if (w == "qreg" || w == "creg") {
      const auto name_at = here();
      const auto name = expect_ident("a register name");
      expect('[');
      skip_ws();
      const Pos size_at = here();
      const auto size = expect_uint("a register size");
      expect(']');
      expect(';');
      declare(name, size, w == "qreg", name_at, size_at);
      return;
    }
    if (w == "qubit" || w == "bit") {
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
      declare(name, size, w == "qubit", name_at, size_at);
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

  void version_statement() {
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

  const Register* find_register(std::string_view name) {
    // The last name looked up is nearly always the next one (q[3], q[4], ...).
    if (last_reg_ && name == last_reg_name_) return last_reg_;
    auto it = registers_.find(name);
    if (it == registers_.end()) return nullptr;
    last_reg_ = &it->second;
    last_reg_name_ = it->first;
    return last_reg_;
  }

  void declare(std::string_view name, std::int64_t size, bool quantum, const Pos& name_at, const Pos& size_at) {
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

  // A qubit (or bit) operand at top level: $k, name[i] or name.
  Operand operand(bool quantum) {
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
      skip_ws();
      const Pos idx_at = here();
      const auto i = expect_uint("an index");
      expect(']');
      if (i >= r->size)
        fail(idx_at, "index " + std::to_string(i) + " is out of range for register '" + std::string(name) +
                         "' of size " + std::to_string(r->size));
      op.first = r->offset + static_cast<int>(i);
      return op;
    }
    op.first = r->offset;
    op.count = r->size;
    op.reg = true;
    return op;
  }

  // A qubit operand inside a gate body: one of the gate's argument names.
  Operand body_operand(const Scope& sc) {
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

  void operand_list(const Scope& sc, std::vector<Operand>& ops, bool allow_empty) {
    ops.clear();
    if (allow_empty && peek(';')) return;
    do {
      ops.push_back(sc.gate ? body_operand(sc) : operand(true));
    } while (accept(','));
  }

  // Number of broadcast repetitions; registers must agree in size.
  int broadcast(const std::vector<Operand>& ops) {
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

  void barrier(const Scope& sc) {
    operand_list(sc, ops_scratch_, true);
    expect(';');
  }

  void emit(const Gate& g, int line) {
    if (prog_.gates.size() >= kMaxGates)
      throw InputError(source_, line, 0, "more than " + std::to_string(kMaxGates) + " gates");
    // Ctrl-C while reading a big file (every 65536 gates: an atomic load is cheap, not free).
    if (interrupt_ && (prog_.gates.size() & 0xffff) == 0 && interrupt_->load(std::memory_order_relaxed))
      throw Interrupted();
    prog_.gates.push_back(g);
    prog_.gate_lines.push_back(line);
  }

  // Gates a definition's body emits per call, saturating past the limit.
  void count_in_definition(std::uint64_t gates) {
    defining_size_ = std::min<std::uint64_t>(defining_size_ + gates, kMaxGates + 1);
  }

  void measure(const Pos& at) {
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

  void measure_assignment(const Register& r, std::string_view name, const Pos& at) {
    Operand b;
    b.pos = at;
    if (accept('[')) {
      skip_ws();
      const Pos idx_at = here();
      const auto i = expect_uint("an index");
      expect(']');
      if (i >= r.size)
        fail(idx_at, "index " + std::to_string(i) + " is out of range for register '" + std::string(name) +
                         "' of size " + std::to_string(r.size));
      b.first = r.offset + static_cast<int>(i);
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

  void emit_measures(const Operand& q, const Operand* b, const Pos& at) {
    if (b && (q.reg || b->reg) && q.count != b->count)
      fail(at, "measurement of " + std::to_string(q.count) + " qubits into " + std::to_string(b->count) + " bits");
    for (int i = 0; i < q.count; ++i)
      emit(Gate{GateKind::measure, q.first + (q.reg ? i : 0), b ? b->first + (b->reg ? i : 0) : -1, Angle{}}, at.line);
  }

  // gate name(params) a, b { body }
  void define_gate() {
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

  // Reads statements up to and including the closing '}'.
  void body_statements(const Scope& sc) {
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

  void gate_call(std::string_view name, const Pos& at, const Scope& sc) {
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

    // Parameters.
    std::vector<Value> many;
    Value first;
    Pos first_at;
    const char* first_end = nullptr;
    int got_params = 0;
    if (accept('(')) {
      if (!accept(')')) {
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
    Angle angle{};
    if (builtin && want_params == 1 && sc.eval) angle = to_angle(first, first_at, first_end);

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

    if (builtin) {
      if (builtin->fixed) angle = builtin->angle;
      if (!sc.eval && !builtin->identity) count_in_definition(static_cast<std::uint64_t>(reps));
      for (int i = 0; i < reps; ++i) {
        const int q0 = ops[0].first + (ops[0].reg ? i : 0);
        const int q1 = want_qubits == 2 ? ops[1].first + (ops[1].reg ? i : 0) : -1;
        if (q0 == q1) fail(ops[1].pos, "gate " + std::string(name) + " is applied to the same qubit twice");
        if (!sc.eval || builtin->identity) continue;
        emit(Gate{builtin->kind, q0, q1, has_angle(builtin->kind) ? angle : Angle{}}, line);
      }
      return;
    }
    // A call's size is known from the definition: refuse one that would pass the limit before
    // expanding it (nested definitions can double at every level).
    const std::uint64_t call_size = std::min<std::uint64_t>(user->size, kMaxGates + 1) * static_cast<std::uint64_t>(reps);
    if (!sc.eval) count_in_definition(call_size);
    else if (prog_.gates.size() + call_size > kMaxGates)
      fail(at, "gate " + std::string(name) + " expands to more than " + std::to_string(kMaxGates) + " gates in all");

    std::vector<int> qs(ops.size());
    for (int i = 0; i < reps; ++i) {
      for (std::size_t k = 0; k < ops.size(); ++k) {
        qs[k] = ops[k].first + (ops[k].reg ? i : 0);
        for (std::size_t j = 0; j < k; ++j)
          if (qs[j] == qs[k]) fail(ops[k].pos, "gate " + std::string(name) + " is applied to the same qubit twice");
      }
      if (!sc.eval) continue;
      call_user(*user, many, qs, line);
    }
  }

  void call_user(const UserGate& g, const std::vector<Value>& params, const std::vector<int>& qubits, int line) {
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

  const char* begin_;
  const char* p_;
  const char* end_;
  int line_ = 1;
  const char* line_start_;
  const std::string& source_;

  QasmProgram prog_;
  int version_ = 0;
  bool seen_statement_ = false;
  int qubit_total_ = 0;
  int bit_total_ = 0;
  int max_physical_ = -1;
  bool physical_used_ = false;
  std::unordered_map<std::string, Register, NameHash, NameEq> registers_;
  const Register* last_reg_ = nullptr;
  std::string last_reg_name_;
  std::unordered_map<std::string, UserGate, NameHash, NameEq> user_gates_;
  const UserGate* defining_ = nullptr;
  std::uint64_t defining_size_ = 0;
  const std::atomic<bool>* interrupt_;
  std::unordered_map<std::string_view, int> pow2_cache_;
  std::vector<Operand> ops_scratch_;
  std::deque<std::vector<Operand>> scratch_;  // deque: references stay valid while it grows
  std::size_t depth_ = 0;
  int expr_depth_ = 0;
};

}  // namespace

QasmProgram parse_qasm(const std::string& text, const std::string& source, const std::atomic<bool>* interrupt) {
  Reader r(text.data(), text.size(), source, interrupt);
  return r.run();
}

QasmProgram load_qasm_file(const std::string& path, const std::atomic<bool>* interrupt) {
  // Map the file instead of copying it: big circuits are tens of megabytes.
  const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
  if (fd < 0) throw InputError(path, 0, 0, std::string("cannot open file: ") + std::strerror(errno));
  struct stat st {};
  if (::fstat(fd, &st) != 0 || !S_ISREG(st.st_mode)) {
    ::close(fd);
    throw InputError(path, 0, 0, "cannot read file: not a regular file");
  }
  const auto size = static_cast<std::size_t>(st.st_size);
  if (size == 0) {
    ::close(fd);
    return parse_qasm(std::string(), path, interrupt);
  }
  void* map = ::mmap(nullptr, size, PROT_READ, MAP_PRIVATE | MAP_POPULATE, fd, 0);
  ::close(fd);
  if (map == MAP_FAILED) throw InputError(path, 0, 0, std::string("cannot read file: ") + std::strerror(errno));
  struct Unmap {
    void* p;
    std::size_t n;
    ~Unmap() { ::munmap(p, n); }
  } unmap{map, size};
  Reader r(static_cast<const char*>(map), size, path, interrupt);
  return r.run();
}

}  // namespace qftplan
