#include "qftplan/qasm/qasm_writer.hpp"

#include <algorithm>
#include <charconv>
#include <cstring>

#include <fmt/format.h>

#include "qftplan/core/decimal_digits.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/sinks/native_gates.hpp"

namespace qftplan {

std::unique_ptr<GateSink> as_written(QasmVersion version, GateSink& next) {
  if (version == QasmVersion::v2) return std::make_unique<SwapExpander>(next);
  return nullptr;
}

void rename_as_written(QasmVersion version, std::map<std::string, long long>& counts) {
  if (version != QasmVersion::v2) return;
  for (const auto& [from, to] : {std::pair<std::string, std::string>{"cp", "cu1"}, {"p", "u1"}})
    if (auto it = counts.find(from); it != counts.end()) {
      counts[to] += it->second;
      counts.erase(it);
    }
}

namespace {
constexpr std::size_t kFlushBytes = 1 << 20;

std::string join(const std::vector<int>& v) {
  std::string s;
  for (std::size_t i = 0; i < v.size(); ++i) {
    if (i) s += ',';
    s += std::to_string(v[i]);
  }
  return s;
}

char* put(char* p, std::string_view s) { return std::copy(s.begin(), s.end(), p); }

// Free text (a device name) inside a one-line comment: a line break would end the comment and
// inject the rest into the circuit (found by the plan fuzzer), so control characters become \xNN.
std::string one_line(const std::string& text) {
  std::string s;
  for (char c : text) {
    const auto u = static_cast<unsigned char>(c);
    if (u < 0x20 || u == 0x7f) s += fmt::format("\\x{:02x}", u);
    else s += c;
  }
  return s;
}
}  // namespace

QasmVersion parse_qasm_version(const std::string& text) {
  if (text == "qasm3") return QasmVersion::v3;
  if (text == "qasm2") return QasmVersion::v2;
  throw InputError("unknown format '" + text + "' (valid: qasm3, qasm2)");
}

std::string describe_transform(const QftSpec& spec) {
  std::string s = spec.inverse ? "inverse QFT" : "QFT";
  s += fmt::format(" on {} qubit{}", spec.qubits, spec.qubits == 1 ? "" : "s");
  if (spec.block_length) s += fmt::format(", block construction (blocks of {})", *spec.block_length);
  else if (spec.approx_degree) s += fmt::format(", approximate (degree {})", *spec.approx_degree);
  else s += ", exact";
  return s;
}

std::optional<QftSpec> parse_transform(std::string_view text) {
  QftSpec spec;
  const auto take = [&text](std::string_view word) {
    if (!text.starts_with(word)) return false;
    text.remove_prefix(word.size());
    return true;
  };
  const auto number = [&text](int& out) {
    const auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), out);
    if (ec != std::errc() || out < 1) return false;
    text.remove_prefix(static_cast<std::size_t>(end - text.data()));
    return true;
  };
  spec.inverse = take("inverse ");
  if (!take("QFT on ") || !number(spec.qubits) || !(take(" qubits, ") || take(" qubit, "))) return std::nullopt;
  if (take("exact")) return text.empty() ? std::optional(spec) : std::nullopt;
  int degree = 0;
  if (take("block construction (blocks of ")) {
    if (!number(degree) || !take(")") || !text.empty()) return std::nullopt;
    spec.block_length = degree;
    return spec;
  }
  if (!take("approximate (degree ") || !number(degree) || !take(")") || !text.empty()) return std::nullopt;
  spec.approx_degree = degree;
  return spec;
}

QasmWriter::QasmWriter(QasmVersion version, const CircuitHeader& h, TextOutput& out)
    : version_(version), out_(out), buf_(kFlushBytes) {
  // The text tables: every qubit of the device (up to a million: 16 MB at most), and the angles
  // +-pi/2^k for the k a register of the size limit uses.
  const int qubits = std::max(h.device_qubits, 0);
  qubit_text_.resize(static_cast<std::size_t>(qubits) * kSlot);
  for (int q = 0; q < qubits; ++q) {
    char* slot = &qubit_text_[static_cast<std::size_t>(q) * kSlot];
    char* end = slot + 1;
    if (version_ == QasmVersion::v3) {
      *end++ = '$';
      end = write_decimal(end, static_cast<std::uint32_t>(q));
    } else {
      end = put(put(end, "q["), std::to_string(q));
      *end++ = ']';
    }
    slot[0] = static_cast<char>(end - slot - 1);
  }
  if (version_ == QasmVersion::v3) {
    constexpr std::uint32_t kAngles = 16400;
    angle_text_.resize(2 * kAngles * kSlot);
    for (std::uint32_t k = 0; k < kAngles; ++k)
      for (int sign = 0; sign < 2; ++sign) {
        char* slot = &angle_text_[(2 * k + sign) * kSlot];
        slot[0] = static_cast<char>(Angle(sign ? -1 : 1, k).write_qasm3(slot + 1) - slot - 1);
      }
  }
  if (version_ == QasmVersion::v3) append("OPENQASM 3.0;\ninclude \"stdgates.inc\";\n");
  else append("OPENQASM 2.0;\ninclude \"qelib1.inc\";\n");
  append("// written by qftplan " QFTPLAN_VERSION_STRING "\n");
  append("// device: " + one_line(h.device_name) + "\n");
  append("// transform: " + describe_transform(h.spec) + "\n");
  append("// strategy: " + h.strategy + "\n");
  append("// placement: " + join(h.placement) + "\n");
  append("// final_placement: " + join(h.final_placement) + "\n");
  append("// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end\n");
  if (h.conditioned)
    append(std::string("// readout: semiclassical; final_placement[k] is measured into ") +
           (version_ == QasmVersion::v3 ? "c[k]" : "register ck") +
           " (output bit k, weight 2^k) as soon as its corrections are done\n");
  if (version_ == QasmVersion::v2) append(fmt::format("qreg q[{}];\n", h.device_qubits));
  bit_registers_ = h.conditioned && version_ == QasmVersion::v2;
  if (h.measured_bits > 0) {
    if (version_ == QasmVersion::v3) append(fmt::format("bit[{}] c;\n", h.measured_bits));
    else if (!bit_registers_) append(fmt::format("creg c[{}];\n", h.measured_bits));
    // OpenQASM 2's `if (creg == int)` tests a whole register (Cross et al., arXiv:1707.03429, section
    // 3): a phase conditioned on one bit needs that bit alone in a register.
    else for (int b = 0; b < h.measured_bits; ++b) append(fmt::format("creg c{}[1];\n", b));
  }
}

void QasmWriter::flush() {
  out_.write(std::string_view(buf_.data(), len_));
  bytes_ += static_cast<long long>(len_);
  len_ = 0;
}

char* QasmWriter::room(std::size_t n) {
  if (buf_.size() - len_ < n) {
    flush();
    if (buf_.size() < n) buf_.resize(n);
  }
  return buf_.data() + len_;
}

void QasmWriter::append(std::string_view text) {
  char* p = room(text.size());
  std::copy(text.begin(), text.end(), p);
  len_ += text.size();
}

char* QasmWriter::qubit(char* p, int q) const {
  if (q >= 0 && static_cast<std::size_t>(q) * kSlot < qubit_text_.size()) {
    // A fixed-size copy of the whole slot (the room asked for covers it), then the true length.
    const char* slot = &qubit_text_[static_cast<std::size_t>(q) * kSlot];
    std::memcpy(p, slot + 1, kSlot - 1);
    return p + slot[0];
  }
  if (version_ == QasmVersion::v3) {
    *p++ = '$';
    return write_decimal(p, static_cast<std::uint32_t>(q));
  }
  *p++ = 'q';
  *p++ = '[';
  p = write_decimal(p, static_cast<std::uint32_t>(q));
  *p++ = ']';
  return p;
}

char* QasmWriter::angle(char* p, const Angle& a) {
  *p++ = '(';
  if (version_ == QasmVersion::v3) {
    const std::size_t slot_index = 2 * static_cast<std::size_t>(a.log2_den()) + (a.num() == -1 ? 1 : 0);
    if ((a.num() == 1 || a.num() == -1) && slot_index * kSlot < angle_text_.size()) {
      const char* slot = &angle_text_[slot_index * kSlot];
      std::memcpy(p, slot + 1, kSlot - 1);
      p += slot[0];
    } else {
      p = a.write_qasm3(p);
    }
  } else {
    p = std::copy(angle2_.begin(), angle2_.end(), p);  // prepared by gate(), which sized the room
  }
  *p++ = ')';
  *p++ = ' ';
  return p;
}

void QasmWriter::gate(const Gate& g) {
  const bool v3 = version_ == QasmVersion::v3;
  // The longest line a gate makes: three cx lines of OpenQASM 2 (3 x 29 characters), a cp line with
  // its angle and a swap line, or a measurement; OpenQASM 2 angles are measured first.
  std::size_t angle_chars = Angle::kMaxQasm3Chars;
  if (!v3 && has_angle(g.kind)) {
    angle2_.clear();
    g.angle.append_qasm2(angle2_);
    angle_chars = angle2_.size();
  }
  char* const start = room(160 + angle_chars);
  char* p = start;
  auto one = [&](std::string_view name, int a) {
    p = put(p, name);
    p = qubit(p, a);
    p = put(p, ";\n");
  };
  auto two = [&](std::string_view name, int a, int b) {
    p = put(p, name);
    p = qubit(p, a);
    p = put(p, ", ");
    p = qubit(p, b);
    p = put(p, ";\n");
  };
  switch (g.kind) {
    case GateKind::h: one("h ", g.q0); break;
    case GateKind::x: one("x ", g.q0); break;
    case GateKind::sx: one("sx ", g.q0); break;
    case GateKind::rz:
      p = angle(put(p, "rz"), g.angle);
      one("", g.q0);
      break;
    case GateKind::p:
      p = angle(put(p, v3 ? "p" : "u1"), g.angle);
      one("", g.q0);
      break;
    case GateKind::cx: two("cx ", g.q0, g.q1); break;
    case GateKind::cz: two("cz ", g.q0, g.q1); break;
    case GateKind::cp:
    case GateKind::cp_swap:
      p = angle(put(p, v3 ? "cp" : "cu1"), g.angle);
      two("", g.q0, g.q1);
      if (g.kind == GateKind::cp) break;
      [[fallthrough]];
    case GateKind::swap:
      if (v3) {
        two("swap ", g.q0, g.q1);
      } else {
        two("cx ", g.q0, g.q1);
        two("cx ", g.q1, g.q0);
        two("cx ", g.q0, g.q1);
      }
      break;
    case GateKind::parity_step:
      two("cx ", g.q1, g.q0);
      two("cx ", g.q0, g.q1);
      if (!g.angle.is_zero()) {
        p = angle(put(p, "rz"), g.angle);
        one("", g.q0);
      }
      break;
    case GateKind::p_if:
      // OpenQASM 3: `if (bit) statement` (the specification's branching statement); OpenQASM 2:
      // `if (creg == 1) u1(t) q;` on the one-bit register of that bit.
      if (v3) {
        p = put(p, "if (c[");
        p = std::to_chars(p, p + 11, g.q1).ptr;
        p = put(p, "]) p");
      } else {
        p = put(p, "if(c");
        p = std::to_chars(p, p + 11, g.q1).ptr;
        p = put(p, "==1) u1");
      }
      p = angle(p, g.angle);
      one("", g.q0);
      break;
    case GateKind::measure:
      if (v3) {
        p = put(p, "c[");
        p = std::to_chars(p, p + 11, g.q1).ptr;
        p = put(p, "] = measure ");
        p = qubit(p, g.q0);
        p = put(p, ";\n");
      } else {
        p = put(p, "measure ");
        p = qubit(p, g.q0);
        p = put(p, bit_registers_ ? " -> c" : " -> c[");
        p = std::to_chars(p, p + 11, g.q1).ptr;
        p = put(p, bit_registers_ ? "[0];\n" : "];\n");
      }
      break;
  }
  len_ += static_cast<std::size_t>(p - start);
}

void QasmWriter::finish() { flush(); }

}  // namespace qftplan
