// The "plan" command: plans a QFT on a device and writes OpenQASM and/or a JSON report.

#include "plan_command.hpp"

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <memory>
#include <optional>

#include <CLI/CLI.hpp>
#include <fmt/format.h>

#include "cli_common.hpp"
#include "cli_options.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/core/run_budget.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_writer.hpp"
#include "qftplan/report/circuit_header.hpp"
#include "qftplan/report/report.hpp"

namespace qftplan::cli {

CLI::App* add_plan_command(CLI::App& app, PlanArgs& a) {
  auto* plan = app.add_subcommand("plan", "plan a QFT on a device and write OpenQASM and/or a JSON report");
  plan->add_option("--device", a.device, "built-in spec or YAML file")->required();
  add_calibration_option(plan, a.calibration);
  plan->add_option("--qubits,-n", a.qubits, "register size n")->required();
  plan->add_option("--approx", a.approx,
                   "approximation degree: none (exact), M (keep rotations R_k, k <= M; with --network blockwise: blocks "
                   "of M qubits) or auto (best esp_total x readout success)")
      ->capture_default_str();
  plan->add_option("--approx-error", a.approx_error,
                   "EPS: accept the block construction (arXiv:2505.00701) with normalised Frobenius distance <= EPS to "
                   "the QFT: --approx auto then considers it, its block length the shortest that meets EPS; the report "
                   "counts the inputs whose column is farther than EPS");
  plan->add_flag("--inverse", a.inverse, "plan the inverse QFT");
  plan->add_option("--gates", a.gates, "emitted gate set: logical, cx or cz (default: the device's native_2q)");
  plan->add_option("--placement", a.placement, "pin the physical qubit of each input bit: a,b,c,...");
  plan->add_option("--format", a.format, "circuit format: qasm3 or qasm2")->capture_default_str();
  plan->add_option("--output,-o", a.output, "write the circuit to FILE ('-' for standard output)");
  plan->add_option("--report", a.report, "write the JSON report to FILE ('-' for standard output)");
  add_seed_option(plan, a.seed);
  plan->add_flag("--measure", a.measure, "end with a measurement of every register qubit");
  plan->add_flag("--no-peephole", a.no_peephole,
                 "write the native gates as decomposed, without the peephole pass (which removes adjacent h h, x x, "
                 "cx cx and cz cz pairs, merges adjacent rz and drops zero rotations)");
  plan->add_flag("--explain", a.explain, "print the chains considered and the degrees scored");
  plan->add_flag("--quiet,-q", a.quiet, "print no summary (it goes to standard output, or to standard error when a file does)");
  plan->add_option("--time-limit", a.time_limit,
                   "stop every search after SECONDS (from the start) and keep the best plan found; exit status 3");
  plan->add_option("--effort", a.effort,
                   "scale the work budgets of the chain and placement searches (0.01 .. 1000; 10 = ten times longer)")
      ->capture_default_str();
  {
    // One table (plan_strategies) drives this help text and the unknown-strategy error.
    std::string help = "planning strategy:";
    for (const auto& s : plan_strategies()) help += std::string("\n  ") + s.name + ": " + s.description;
    plan->add_option("--strategy", a.strategy, help)->capture_default_str();
  }
  plan->add_option("--objective", a.objective, "what the automatic choices optimise: esp (highest esp_total = gates x idling x readout), depth (native two-qubit depth), duration (schedule length, ns) or cx (native two-qubit gates)")
      ->capture_default_str();
  plan->add_option("--end-order", a.end_order,
                   "free: output bits end where the plan leaves them; same: SWAPs at the end put output bit k on "
                   "the qubit that held input bit k")
      ->capture_default_str();
  plan->add_option("--network", a.network,
                   "chain network: auto (of anchored, parity and the approximate insertion, parity-insertion and "
                   "leapfrog, the fewest native two-qubit gates), reversal, anchored, leapfrog, insertion (half the "
                   "leapfrog CX at degree 3), parity-insertion (a third fewer from degree 5; deeper), parity "
                   "(n^2-1 CX for the exact QFT), or blockwise (the log-depth block construction, arXiv:2505.00701: "
                   "blocks of --approx M qubits; exact on most inputs to about 2^(-M/2), far on a few)")
      ->capture_default_str();
  plan->add_option("--readout", a.readout,
                   "with --measure: unitary (the transform, then a measurement), semiclassical (measure each qubit "
                   "in turn, later phases conditioned on the outcomes: no two-qubit gate; needs feed_forward_ns) "
                   "or auto (the higher esp_total where the device offers feed-forward)")
      ->capture_default_str();
  // An empty --placement still counts as given, so presence is asked of the parser rather than read
  // from the text; the callback runs only when plan itself was parsed.
  plan->final_callback([plan, &a] { a.placement_given = plan->count("--placement") > 0; });
  return plan;
}

int run_plan(const PlanArgs& a) {
  const auto t0 = std::chrono::steady_clock::now();
  install_stop_handlers();
  // The time limit counts from here, device loading included; every search polls it.
  const RunBudget budget(parse_time_limit(a.time_limit), &g_interrupted, BudgetClock::from_environment());
  if (same_output_file(a.output, a.report))
    throw InputError("--output and --report name the same file '" + a.output + "'");
  const Device dev = load_device(a.device, a.calibration);
  // The flags as settings, turned into options by the library's one builder.
  PlanSettings settings;
  settings.qubits = a.qubits;
  settings.approx = a.approx;
  settings.inverse = a.inverse;
  if (!a.gates.empty()) settings.gates = a.gates;
  if (a.placement_given) settings.placement = parse_id_list(a.placement, "--placement");
  settings.seed = a.seed;
  settings.effort = a.effort;
  settings.strategy = a.strategy;
  settings.objective = a.objective;
  settings.end_order = a.end_order;
  settings.network = a.network;
  settings.measure = a.measure;
  settings.peephole = !a.no_peephole;
  settings.readout = a.readout;
  settings.approx_error = a.approx_error;
  const QasmVersion version = parse_qasm_version(a.format);
  settings.format = version;
  PlanOptions opt = plan_options(settings);
  opt.budget = &budget;

  const PreparedPlan plan = prepare_plan(dev, opt);
  std::optional<Destination> circuit_dest, report_dest;
  if (!a.output.empty()) circuit_dest.emplace(a.output);
  if (!a.report.empty()) report_dest.emplace(a.report);

  std::unique_ptr<QasmWriter> writer;
  if (circuit_dest) {
    writer = std::make_unique<QasmWriter>(version, circuit_header(dev, opt, plan), circuit_dest->sink());
  }
  // Ctrl-C while the circuit streams stops it (execute_plan polls opt.budget; the writer's temporary
  // is then removed). With no circuit to write, a plan already streamed while choosing the strategy
  // is not streamed again.
  PlanReport r = execute_plan(dev, opt, plan, writer.get());
  r.elapsed_ms = std::chrono::duration<double, std::milli>(std::chrono::steady_clock::now() - t0).count();
  if (writer) r.output_bytes = writer->bytes();
  if (report_dest) report_dest->sink().write(report_to_json_text(r));
  // Commit only when everything succeeded, so a failure leaves no partial file behind: first flush
  // and sync both files (where a full disk shows), then rename both.
  throw_if_interrupted(&budget);
  if (circuit_dest) circuit_dest->flush();
  if (report_dest) report_dest->flush();
  if (circuit_dest) circuit_dest->commit();
  if (report_dest) report_dest->commit();
  // The summary goes to standard output, or to standard error when a file goes there (issue 15,
  // item 8); --quiet leaves it out.
  const bool stdout_taken = a.output == "-" || a.report == "-";
  if (!a.quiet) std::fputs(format_plan_summary(r).c_str(), stdout_taken ? stderr : stdout);
  if (a.explain) std::fputs(format_plan_explanation(r).c_str(), a.output == "-" || a.report == "-" ? stderr : stdout);
  if (!plan.cut_short.empty()) {
    std::fprintf(stderr, "qftplan: warning: the time limit of %s s ran out during %s; the plan is the best found so far\n",
                 a.time_limit.c_str(), plan.cut_short.c_str());
    return kExitTimeLimit;
  }
  return 0;
}

}  // namespace qftplan::cli
