// The "survey" and "merge" commands (issue 6): tables, CSV, JSON lines and charts of many plans.

#include "survey_command.hpp"

#include <algorithm>
#include <chrono>
#include <cstdio>

#include <CLI/CLI.hpp>
#include <fmt/format.h>

#include "cli_common.hpp"
#include "cli_options.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/survey/survey_merge.hpp"
#include "qftplan/survey/survey_output.hpp"
#include "qftplan/survey/survey_plots.hpp"
#include "qftplan/survey/survey_progress.hpp"
#include "qftplan/survey/survey_request.hpp"
#include "qftplan/survey/survey_run.hpp"
#include "qftplan/survey/survey_table.hpp"

namespace qftplan::cli {

namespace {

// The output options of survey and merge, which write the same files from the same rows.
void add_survey_output_options(CLI::App* cmd, SurveyOutputArgs& o) {
  cmd->add_option("--csv", o.csv, "write one CSV row per run to FILE ('-' for standard output)");
  cmd->add_option("--jsonl", o.jsonl, "write one JSON object per run and line to FILE ('-' for standard output); merge reads these");
  cmd->add_option("--svg", o.svg, "write charts (SWAPs, two-qubit depth, ESP against register size) to FILE");
  cmd->add_flag("--no-timing", o.no_timing, "leave out the wall-time column, so that equal surveys give byte-identical files");
  cmd->add_flag("--quiet,-q", o.quiet, "do not print the table");
}

// Writes what `o` asks for; `footer` follows the table (wall time, shard).
int write_survey_outputs(const std::vector<SurveyRow>& rows, const SurveyOutputArgs& o, const std::string& footer) {
  const SurveyTiming timing = o.no_timing ? SurveyTiming::omit : SurveyTiming::include;
  OutputSet out;
  if (!o.csv.empty()) out.add(o.csv, survey_csv(rows, timing));
  if (!o.jsonl.empty()) out.add(o.jsonl, survey_jsonl(rows, timing));
  if (!o.svg.empty()) out.add(o.svg, survey_svg(rows));
  // The table goes to standard output unless a file took it.
  if (!o.quiet && !out.uses_stdout()) std::fputs((format_survey_table(rows, timing) + footer).c_str(), stdout);
  out.write_all();
  return 0;
}

}  // namespace

CLI::App* add_survey_command(CLI::App& app, SurveyArgs& a) {
  auto* survey = app.add_subcommand("survey", "plan every combination of devices, register sizes and settings in parallel; table, CSV, JSON lines, charts");
  survey->add_option("devices", a.devices,
                     "devices: YAML files, built-in specs, or FAMILY:* (line, ring, grid, heavy-hex, full) for the "
                     "smallest member that holds each register size")
      ->required();
  add_calibration_option(survey, a.calibration);
  survey->add_option("--qubits,-n", a.qubits, "register sizes: N, A:B, A:B:STEP, comma-separated (4:64:4)")->required();
  survey->add_option("--approx", a.approx, "approximation settings, comma-separated: none, M, auto")->capture_default_str();
  survey->add_flag("--inverse", a.inverse, "survey the inverse QFT (same as --direction inverse)");
  survey->add_option("--direction", a.direction, "forward, inverse or both (default: forward)");
  survey->add_option("--strategy", a.strategy, "planning strategies, comma-separated (see qftplan help plan)")
      ->capture_default_str();
  survey->add_option("--network", a.network,
                     "chain networks, comma-separated (as plan --network); several are compared in one chart, and a "
                     "run the network does not apply to is a failed row with the reason")
      ->capture_default_str();
  survey->add_flag("--measure", a.measure, "every run ends with a measurement of every register qubit (as plan --measure)");
  survey->add_option("--readout", a.readout, "with --measure: unitary, semiclassical or auto (as plan --readout)")
      ->capture_default_str();
  survey->add_option("--jobs,-j", a.jobs, "threads (default: every core)");
  add_seed_option(survey, a.seed);
  survey->add_option("--shard", a.shard, "run only slice K of M (K/M, 1 <= K <= M): runs K-1, K-1+M, K-1+2M, ...");
  survey->add_option("--time-limit", a.time_limit,
                     "stop each run's searches after SECONDS and keep its best plan (status time-limit)");
  survey->add_flag("--no-progress", a.no_progress, "no progress line (it is drawn only when standard error is a terminal)");
  add_survey_output_options(survey, a.out);
  return survey;
}

int run_survey_command(const SurveyArgs& a) {
  install_stop_handlers();
  SurveyRequest req;
  req.sizes = parse_size_list(a.qubits);
  req.approx = parse_approx_list(a.approx);
  std::string direction = a.direction.empty() ? (a.inverse ? "inverse" : "forward") : a.direction;
  if (a.inverse && direction != "inverse")
    throw InputError("--inverse contradicts --direction " + a.direction);
  if (direction == "forward") req.directions = {false};
  else if (direction == "inverse") req.directions = {true};
  else if (direction == "both") req.directions = {false, true};
  else throw InputError("--direction expects forward, inverse or both, got '" + a.direction + "'");
  req.strategies = parse_name_list(a.strategy, "--strategy");
  check_strategy_names(req.strategies);
  req.networks = parse_name_list(a.network, "--network");
  check_network_names(req.networks);
  req.seed = a.seed;
  req.measure = a.measure;
  req.readout = a.readout;
  req.time_limit = parse_time_limit(a.time_limit);
  req.clock = BudgetClock::from_environment();
  req.interrupt = &g_interrupted;
  if (!a.calibration.empty()) req.calibration = load_calibration_profile(a.calibration);
  for (const auto& d : a.devices) req.devices.push_back(make_survey_entry(d, req.calibration));
  if (a.jobs < 0) throw InputError("--jobs must be at least 1 (0 or absent: every core)");
  const int jobs = a.jobs == 0 ? default_survey_jobs() : a.jobs;

  const auto all = expand_survey(req);
  const auto cases = a.shard.empty() ? all : shard_cases(all, parse_shard(a.shard));
  const auto t0 = std::chrono::steady_clock::now();
  SurveyProgress progress(stderr, !a.no_progress && is_terminal(2));
  std::vector<SurveyRow> rows;
  try {
    rows = run_survey(req, cases, static_cast<long long>(all.size()), jobs,
                      [&](long long done, long long total) { progress.update(done, total); });
  } catch (...) {
    progress.finish();
    throw;
  }
  progress.finish();
  const double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  std::string footer;
  if (!a.out.no_timing)
    footer = fmt::format("wall time {:.2f} s on {} thread{}\n", seconds, jobs, jobs == 1 ? "" : "s");
  if (!a.shard.empty())
    footer += fmt::format("shard {} of the survey's {} runs (merge the shards' --jsonl files)\n", a.shard, all.size());
  return write_survey_outputs(rows, a.out, footer);
}

CLI::App* add_merge_command(CLI::App& app, MergeArgs& a) {
  auto* merge = app.add_subcommand("merge", "merge the --jsonl files of survey shards into the table, CSV, JSON lines and charts of one run");
  merge->add_option("files", a.files, "JSON-lines files written by qftplan survey --jsonl")->required();
  merge->add_flag("--allow-missing", a.allow_missing, "merge even when some runs of the survey are in none of the files");
  add_survey_output_options(merge, a.out);
  return merge;
}

int run_merge_command(const MergeArgs& a) {
  std::vector<SurveyPart> parts;
  for (const auto& f : a.files) parts.push_back({f, read_survey_jsonl(f)});
  const auto rows = merge_survey_parts(parts, a.allow_missing);
  return write_survey_outputs(rows, a.out, "");
}

}  // namespace qftplan::cli
