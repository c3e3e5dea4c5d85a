#include "qftplan/qasm_writer.hpp"

#include <charconv>

#include <fmt/format.h>

#include "qftplan/input_error.hpp"

namespace qftplan {

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
  if (spec.approx_degree) s += fmt::format(", approximate (degree {})", *spec.approx_degree);
  else s += ", exact";
  return s;
}

QasmWriter::QasmWriter(QasmVersion version, const CircuitHeader& h, TextOutput& out) : version_(version), out_(out) {
  buf_.reserve(kFlushBytes + 4096);
  if (version_ == QasmVersion::v3) buf_ += "OPENQASM 3.0;\ninclude \"stdgates.inc\";\n";
  else buf_ += "OPENQASM 2.0;\ninclude \"qelib1.inc\";\n";
  buf_ += "// written by qftplan " QFTPLAN_VERSION_STRING "\n";
  buf_ += "// device: " + one_line(h.device_name) + "\n";
  buf_ += "// transform: " + describe_transform(h.spec) + "\n";
  buf_ += "// strategy: " + h.strategy + "\n";
  buf_ += "// placement: " + join(h.placement) + "\n";
  buf_ += "// final_placement: " + join(h.final_placement) + "\n";
  buf_ += "// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end\n";
  if (version_ == QasmVersion::v2) buf_ += fmt::format("qreg q[{}];\n", h.device_qubits);
  if (h.measured_bits > 0) {
    if (version_ == QasmVersion::v3) buf_ += fmt::format("bit[{}] c;\n", h.measured_bits);
    else buf_ += fmt::format("creg c[{}];\n", h.measured_bits);
  }
}

void QasmWriter::qubit(int q) {
  char tmp[16];
  auto [p, ec] = std::to_chars(tmp, tmp + sizeof tmp, q);
  if (version_ == QasmVersion::v3) {
    buf_ += '$';
    buf_.append(tmp, p);
  } else {
    buf_ += "q[";
    buf_.append(tmp, p);
    buf_ += ']';
  }
}

void QasmWriter::flush_if_full() {
  if (buf_.size() >= kFlushBytes) {
    out_.write(buf_);
    bytes_ += static_cast<long long>(buf_.size());
    buf_.clear();
  }
}

void QasmWriter::gate(const Gate& g) {
  const bool v3 = version_ == QasmVersion::v3;
  auto angle = [&](const Angle& a) {
    buf_ += '(';
    if (v3) a.append_qasm3(buf_);
    else a.append_qasm2(buf_);
    buf_ += ") ";
  };
  auto two = [&](const char* name, int a, int b) {
    buf_ += name;
    qubit(a);
    buf_ += ", ";
    qubit(b);
    buf_ += ";\n";
  };
  switch (g.kind) {
    case GateKind::h: buf_ += "h "; qubit(g.q0); buf_ += ";\n"; break;
    case GateKind::x: buf_ += "x "; qubit(g.q0); buf_ += ";\n"; break;
    case GateKind::sx: buf_ += "sx "; qubit(g.q0); buf_ += ";\n"; break;
    case GateKind::rz: buf_ += "rz"; angle(g.angle); qubit(g.q0); buf_ += ";\n"; break;
    case GateKind::p: buf_ += v3 ? "p" : "u1"; angle(g.angle); qubit(g.q0); buf_ += ";\n"; break;
    case GateKind::cx: two("cx ", g.q0, g.q1); break;
    case GateKind::cz: two("cz ", g.q0, g.q1); break;
    case GateKind::cp:
    case GateKind::cp_swap:
      buf_ += v3 ? "cp" : "cu1";
      angle(g.angle);
      qubit(g.q0);
      buf_ += ", ";
      qubit(g.q1);
      buf_ += ";\n";
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
    case GateKind::measure:
      if (v3) {
        buf_ += fmt::format("c[{}] = measure ", g.q1);
        qubit(g.q0);
        buf_ += ";\n";
      } else {
        buf_ += "measure ";
        qubit(g.q0);
        buf_ += fmt::format(" -> c[{}];\n", g.q1);
      }
      break;
  }
  flush_if_full();
}

void QasmWriter::finish() {
  out_.write(buf_);
  bytes_ += static_cast<long long>(buf_.size());
  buf_.clear();
}

}  // namespace qftplan
