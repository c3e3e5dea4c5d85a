#include "qftplan/core/gate_program.hpp"

#include <algorithm>
#include <stdexcept>

namespace qftplan {

MaxPlus2 MaxPlus2::after(const MaxPlus2& first) const {
  MaxPlus2 out;
  for (int i = 0; i < 2; ++i)
    for (int j = 0; j < 2; ++j) {
      long long best = kNone;
      for (int k = 0; k < 2; ++k)
        if (m[i][k] != kNone && first.m[k][j] != kNone) best = std::max(best, m[i][k] + first.m[k][j]);
      out.m[i][j] = best;
    }
  return out;
}

namespace {

// One gate as a max-plus matrix: a two-qubit gate sets both levels to max + `two`; a one-qubit gate
// on slot s adds `one` to that slot only (MetricsSink's rule: one-qubit gates take no two-qubit layer).
MaxPlus2 step_matrix(const ProgramStep& s, long long one, long long two) {
  MaxPlus2 m;
  if (is_two_qubit(s.kind)) {
    m.m[0][0] = m.m[0][1] = m.m[1][0] = m.m[1][1] = two;
  } else {
    m.m[s.a][s.a] = one;
  }
  return m;
}

}  // namespace

GateProgram::GateProgram(std::span<const ProgramStep> steps) {
  if (steps.size() > static_cast<std::size_t>(kMaxSteps)) throw std::logic_error("gate program too long");
  for (const ProgramStep& s : steps) {
    steps_[size_++] = s;
    two_qubit_ = two_qubit_ || is_two_qubit(s.kind);
    levels_ = step_matrix(s, 1, 1).after(levels_);
    levels_2q_ = step_matrix(s, 0, 1).after(levels_2q_);
    auto it = std::find_if(kind_counts_.begin(), kind_counts_.end(), [&](const auto& kc) { return kc.first == s.kind; });
    if (it == kind_counts_.end()) kind_counts_.emplace_back(s.kind, 1);
    else ++it->second;
  }
}

}  // namespace qftplan
