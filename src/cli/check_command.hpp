#pragma once
// The "check" command: proves that an OpenQASM file implements a QFT on a device.

#include <string>

namespace CLI {
class App;
}

namespace qftplan::cli {

/// --qubits not given: the register size comes from the file's header.
inline constexpr int kQubitsFromHeader = -1;

/// The options of the check command.
struct CheckArgs {
  std::string file;
  std::string device;
  std::string calibration;  // --calibration FILE (empty: none)
  int qubits = kQubitsFromHeader;  ///< from the file's "// transform:" header unless given
  std::string approx;             ///< empty: from the header (else exact)
  int block_length = 0;           ///< --block-length M (0: from the header)
  bool inverse = false;
  bool forward = false;           ///< --forward: the forward QFT whatever the header says
  std::string initial;
  std::string final_;
};

/// Adds the check command to `app`; parsing fills `a`.
CLI::App* add_check_command(CLI::App& app, CheckArgs& a);

/// Runs the check command; returns the exit status (kExitFailed when the circuit is wrong,
/// kExitCannotProve when it can be proved neither right nor wrong).
int run_check(const CheckArgs& a);

}  // namespace qftplan::cli
