// The "check" command: proves that an OpenQASM file implements a QFT on a device.

#include "check_command.hpp"

#include <cstdio>
#include <filesystem>
#include <optional>

#include <CLI/CLI.hpp>
#include <fmt/format.h>

#include "cli_common.hpp"
#include "cli_options.hpp"
#include "qftplan/check/qft_checker.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_program.hpp"

namespace qftplan::cli {

CLI::App* add_check_command(CLI::App& app, CheckArgs& a) {
  auto* check = app.add_subcommand("check", "prove that an OpenQASM file implements a QFT on a device");
  check->add_option("file", a.file, "OpenQASM 2 or 3 file")->required();
  check->add_option("--device", a.device, "built-in spec or YAML file")->required();
  add_calibration_option(check, a.calibration);
  check->add_option("--qubits,-n", a.qubits, "register size n (default: the file's '// transform:' comment)");
  check->add_option("--approx", a.approx, "approximation degree: none or M (default: the file's '// transform:' comment)");
  check->add_option("--block-length", a.block_length,
                    "expect the block construction (plan --network blockwise) with blocks of M qubits (default: the "
                    "file's '// transform:' comment)");
  check->add_flag("--inverse", a.inverse, "expect the inverse QFT (default: as the file's '// transform:' comment says)");
  check->add_flag("--forward", a.forward, "expect the forward QFT (default: as the file's '// transform:' comment says)");
  check->add_option("--initial", a.initial, "placement (default: the file's '// placement:' comment)");
  check->add_option("--final", a.final_, "final placement (default: the file's '// final_placement:' comment)");
  return check;
}

namespace {

// Files from this size on are streamed through the structural proof instead of being held whole
// (issue 15: the exact 8192-qubit file is 1.9 GB and 10^8 gates).
constexpr std::uintmax_t kStreamFromBytes = std::uintmax_t{256} << 20;

// The request for a file whose header comments are `header`: the options win, the header fills in.
CheckRequest settle_request(const CheckArgs& a, const QasmProgram& header) {
  if (a.inverse && a.forward) throw InputError("--inverse contradicts --forward");
  // The transform: what the options say, the rest from the file's header (a mismatch is named).
  std::optional<std::optional<int>> degree;
  if (!a.approx.empty()) degree = parse_approx_degree(a.approx);
  std::optional<bool> inverse;
  if (a.inverse || a.forward) inverse = a.inverse;
  if (a.qubits != kQubitsFromHeader && a.qubits < 1) throw InputError("--qubits must be at least 1");
  if (a.block_length < 0) throw InputError("--block-length must be at least 1");
  if (a.block_length > 0 && !a.approx.empty()) throw InputError("--block-length and --approx name two different transforms");
  const CheckTransform transform =
      check_transform(header, a.qubits == kQubitsFromHeader ? std::nullopt : std::optional(a.qubits), degree, inverse,
                      a.block_length > 0 ? std::optional(a.block_length) : std::nullopt);
  if (!transform.mismatch.empty())
    std::fprintf(stderr, "qftplan: warning: %s; checking against the options\n", transform.mismatch.c_str());
  CheckRequest req;
  req.interrupt = &g_interrupted;
  req.spec = transform.spec;
  const int n = req.spec.qubits;
  if (n < 1) throw InputError("--qubits must be at least 1");
  if (!a.initial.empty()) req.placement = parse_id_list(a.initial, "--initial");
  else if (header.placement) req.placement = *header.placement;
  else throw InputError(a.file, 0, 0, "no '// placement:' header comment; give --initial");
  if (!a.final_.empty()) req.final_placement = parse_id_list(a.final_, "--final");
  else if (header.final_placement) req.final_placement = *header.final_placement;
  else throw InputError(a.file, 0, 0, "no '// final_placement:' header comment; give --final");
  for (const auto* v : {&req.placement, &req.final_placement})
    if (static_cast<int>(v->size()) != n)
      throw InputError(fmt::format("a qubit map lists {} qubits but --qubits is {}", v->size(), n));
  return req;
}

}  // namespace

int run_check(const CheckArgs& a) {
  install_stop_handlers();  // Ctrl-C stops reading and proving (exit 130)
  const Device dev = load_device(a.device, a.calibration);
  std::error_code ec;
  const auto bytes = std::filesystem::file_size(a.file, ec);
  CheckResult res;
  if (!ec && bytes >= kStreamFromBytes) {
    res = check_qft_file_streaming(
        dev, a.file, [&a](const QasmProgram& header) { return settle_request(a, header); }, &g_interrupted);
  } else {
    const QasmProgram prog = load_qasm_file(a.file, &g_interrupted);
    res = check_qft_circuit(dev, prog, settle_request(a, prog));
  }
  // Three verdicts (README "Check a circuit"): proved (0), wrong with a counterexample (1), cannot prove (4).
  if (res.outcome == CheckOutcome::wrong) {
    std::fprintf(stderr, "%s\n", format_input_error(a.file, res.line, 0, res.message).c_str());
    return kExitFailed;
  }
  if (res.outcome == CheckOutcome::cannot_prove) {
    std::fprintf(stderr, "%s\n", format_input_error(a.file, res.line, 0, res.message).c_str());
    return kExitCannotProve;
  }
  std::printf("%s: %s\n", a.file.c_str(), res.message.c_str());
  return 0;
}

}  // namespace qftplan::cli
