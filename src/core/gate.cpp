#include "qftplan/core/gate.hpp"

namespace qftplan {

std::string_view gate_name(GateKind k) {
  switch (k) {
    case GateKind::h: return "h";
    case GateKind::x: return "x";
    case GateKind::sx: return "sx";
    case GateKind::rz: return "rz";
    case GateKind::p: return "p";
    case GateKind::cx: return "cx";
    case GateKind::cz: return "cz";
    case GateKind::cp: return "cp";
    case GateKind::swap: return "swap";
    case GateKind::cp_swap: return "cp_swap";
    case GateKind::measure: return "measure";
    case GateKind::parity_step: return "parity_step";
    case GateKind::p_if: return "p_if";
  }
  return "?";
}

}  // namespace qftplan
