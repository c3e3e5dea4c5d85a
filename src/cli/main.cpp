// The qftplan command line: parses options, calls the library, prints. The only file that knows
// about CLI11.

#include <signal.h>

#include <atomic>
#include <algorithm>
#include <chrono>
#include <cctype>
#include <cmath>
#include <csignal>
#include <cerrno>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <iostream>
#include <new>
#include <memory>
#include <optional>
#include <string>

#include <CLI/CLI.hpp>
#include <fmt/format.h>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/core/atomic_file.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/core/run_budget.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/device/device_summary.hpp"
#include "qftplan/device/device_yaml.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_program.hpp"
#include "qftplan/qasm/qasm_writer.hpp"
#include "qftplan/report/circuit_header.hpp"
#include "qftplan/report/report.hpp"
// survey, merge, draw (issue 6)
#include "qftplan/survey/survey_merge.hpp"
#include "qftplan/survey/survey_output.hpp"
#include "qftplan/survey/survey_plots.hpp"
#include "qftplan/survey/survey_progress.hpp"
#include "qftplan/survey/survey_request.hpp"
#include "qftplan/survey/survey_run.hpp"
#include "qftplan/survey/survey_table.hpp"
#include "qftplan/svg/plan_drawing.hpp"

namespace {

using namespace qftplan;

constexpr int kExitFailed = 1;   // check found the circuit wrong, or the request cannot be planned
constexpr int kExitBadInput = 2;
constexpr int kExitTimeLimit = 3;  // --time-limit ran out (the best plan found, if any, is still written)

// Set by SIGINT/SIGTERM; the searches and the circuit stream poll it through the RunBudget, so the
// run unwinds normally and AtomicFile destructors remove the temporaries.
std::atomic<bool> g_interrupted{false};
std::atomic<int> g_signal{0};

extern "C" void on_stop_signal(int sig) {
  g_signal.store(sig);
  g_interrupted.store(true);
}

// For commands that write files: stop cleanly on Ctrl-C, and let a file-size limit (ulimit -f) fail
// the write with EFBIG instead of killing the process with its temporaries left behind.
void install_stop_handlers() {
  struct sigaction sa {};
  sa.sa_handler = on_stop_signal;
  sa.sa_flags = SA_RESTART;  // a write interrupted by the signal resumes; the flag does the stopping
  sigemptyset(&sa.sa_mask);
  sigaction(SIGINT, &sa, nullptr);
  sigaction(SIGTERM, &sa, nullptr);
  std::signal(SIGXFSZ, SIG_IGN);
}

// "--time-limit 2.5": positive seconds.
std::optional<double> parse_time_limit(const std::string& text) {
  if (text.empty()) return std::nullopt;
  std::size_t used = 0;
  double v = 0;
  try {
    v = std::stod(text, &used);
  } catch (const std::exception&) {
    used = 0;
  }
  if (used != text.size() || !std::isfinite(v) || v <= 0)
    throw InputError("--time-limit expects a positive number of seconds, got '" + text + "'");
  return v;
}

// An output destination: "-" is standard output; anything else a file written atomically.
struct Destination {
  std::unique_ptr<AtomicFile> file;
  StdoutOutput out;
  TextOutput& sink() { return file ? static_cast<TextOutput&>(*file) : out; }
  explicit Destination(const std::string& path) {
    if (path != "-") file = std::make_unique<AtomicFile>(path);
  }
  /// Flushes and syncs a file (the step that fails on a full disk); commit() then only renames.
  void flush() {
    if (file) file->flush();
  }
  void commit() {
    if (file) file->commit();
  }
};

struct DeviceArgs {
  std::string device;
  bool summary = false;
};

int run_device(const DeviceArgs& a) {
  const Device dev = load_device(a.device);
  if (a.summary) std::fputs(format_summary(summarize(dev)).c_str(), stdout);
  else std::fputs(device_to_yaml(dev).c_str(), stdout);
  return 0;
}

struct PlanArgs {
  std::string device;
  int qubits = 0;
  std::string approx = "none";
  bool inverse = false;
  std::string gates;
  std::string placement;
  std::string format = "qasm3";
  std::string output;
  std::string report;
  std::uint64_t seed = 1;
  bool measure = false;
  bool explain = false;
  std::string time_limit;
  double effort = 1;
  std::string strategy = "auto";
  std::string objective = "esp";
  std::string end_order = "free";
  std::string network = "auto";
  bool placement_given = false;  // --placement was on the command line (even empty)
};

// Two outputs that would be one file: both would commit and the last would win. Standard output
// ("-") and devices such as /dev/null can take several writers.
bool same_output_file(const std::string& a, const std::string& b) {
  if (a.empty() || b.empty() || a == "-" || b == "-") return false;
  std::error_code ec;
  const auto ca = std::filesystem::weakly_canonical(a, ec);
  if (ec || ca != std::filesystem::weakly_canonical(b, ec) || ec) return false;
  const auto st = std::filesystem::status(ca, ec);
  return !std::filesystem::exists(st) || std::filesystem::is_regular_file(st);
}

int run_plan(const PlanArgs& a) {
  const auto t0 = std::chrono::steady_clock::now();
  install_stop_handlers();
  // The time limit counts from here, device loading included; every search polls it.
  const RunBudget budget(parse_time_limit(a.time_limit), &g_interrupted, BudgetClock::from_environment());
  if (same_output_file(a.output, a.report))
    throw InputError("--output and --report name the same file '" + a.output + "'");
  const Device dev = load_device(a.device);
  PlanOptions opt;
  opt.budget = &budget;
  opt.spec.qubits = a.qubits;
  if (a.approx == "auto") opt.auto_approx = true;
  else opt.spec.approx_degree = parse_approx_degree(a.approx);
  opt.spec.inverse = a.inverse;
  if (!a.gates.empty()) opt.gates = parse_gate_set(a.gates);
  if (a.placement_given) opt.placement = parse_id_list(a.placement, "--placement");
  opt.search.seed = a.seed;
  // --effort scales the work budgets of the chain and placement searches (not the time limit).
  if (!(a.effort >= 0.01 && a.effort <= 1000))
    throw InputError(fmt::format("--effort {} is outside 0.01 .. 1000", a.effort));
  opt.search.work_budget = static_cast<long long>(static_cast<double>(opt.search.work_budget) * a.effort);
  opt.placement_search.work_budget =
      std::max(1LL, static_cast<long long>(static_cast<double>(opt.placement_search.work_budget) * a.effort));
  opt.strategy = a.strategy;
  opt.objective = parse_objective(a.objective);
  opt.end_order = parse_end_order(a.end_order);
  opt.network = parse_network_choice(a.network);
  opt.measure = a.measure;
  const QasmVersion version = parse_qasm_version(a.format);
  opt.format = version;

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
  if (!circuit_dest && !report_dest) std::fputs(format_plan_summary(r).c_str(), stdout);
  if (a.explain) std::fputs(format_plan_explanation(r).c_str(), a.output == "-" || a.report == "-" ? stderr : stdout);
  if (!plan.cut_short.empty()) {
    std::fprintf(stderr, "qftplan: warning: the time limit of %s s ran out during %s; the plan is the best found so far\n",
                 a.time_limit.c_str(), plan.cut_short.c_str());
    return kExitTimeLimit;
  }
  return 0;
}

struct CheckArgs {
  std::string file;
  std::string device;
  int qubits = 0;
  std::string approx = "none";
  bool inverse = false;
  std::string initial;
  std::string final_;
};

int run_check(const CheckArgs& a) {
  install_stop_handlers();  // Ctrl-C stops reading and proving (exit 130)
  const Device dev = load_device(a.device);
  const QasmProgram prog = load_qasm_file(a.file, &g_interrupted);
  CheckRequest req;
  req.interrupt = &g_interrupted;
  req.spec.qubits = a.qubits;
  req.spec.approx_degree = parse_approx_degree(a.approx);
  req.spec.inverse = a.inverse;
  if (a.qubits < 1) throw InputError("--qubits must be at least 1");
  if (!a.initial.empty()) req.placement = parse_id_list(a.initial, "--initial");
  else if (prog.placement) req.placement = *prog.placement;
  else throw InputError(a.file, 0, 0, "no '// placement:' header comment; give --initial");
  if (!a.final_.empty()) req.final_placement = parse_id_list(a.final_, "--final");
  else if (prog.final_placement) req.final_placement = *prog.final_placement;
  else throw InputError(a.file, 0, 0, "no '// final_placement:' header comment; give --final");
  for (const auto* v : {&req.placement, &req.final_placement})
    if (static_cast<int>(v->size()) != a.qubits)
      throw InputError(fmt::format("a qubit map lists {} qubits but --qubits is {}", v->size(), a.qubits));
  const CheckResult res = check_qft_circuit(dev, prog, req);
  if (!res.ok) {
    std::fprintf(stderr, "%s\n", format_input_error(a.file, res.line, 0, res.message).c_str());
    return kExitFailed;
  }
  std::printf("%s: %s\n", a.file.c_str(), res.message.c_str());
  return 0;
}

// ---- survey, merge, draw (issue 6): tables, CSV/JSON lines, charts and pictures of plans --------

// Files written at the end of a survey or merge: each to a temporary, then all renamed together,
// so that a failure leaves none of them half-written. "-" is standard output.
class OutputSet {
 public:
  void add(const std::string& path, std::string text) {
    if (path.empty()) return;
    for (const auto& [p, t] : items_)
      if (same_output_file(p, path)) throw InputError("two outputs name the same file '" + path + "'");
    items_.emplace_back(path, std::move(text));
  }
  bool uses_stdout() const {
    for (const auto& [p, t] : items_)
      if (p == "-") return true;
    return false;
  }
  void write_all() {
    std::vector<std::unique_ptr<AtomicFile>> files;
    for (const auto& [p, t] : items_) {
      if (p == "-") continue;
      files.push_back(std::make_unique<AtomicFile>(p));
      files.back()->write(t);
    }
    for (auto& f : files) f->flush();
    for (auto& f : files) f->commit();
    for (const auto& [p, t] : items_)
      if (p == "-") std::fputs(t.c_str(), stdout);
  }

 private:
  std::vector<std::pair<std::string, std::string>> items_;
};

// Options shared by survey and merge: what to write and how.
struct SurveyOutputArgs {
  std::string csv;
  std::string jsonl;
  std::string svg;
  bool no_timing = false;
  bool quiet = false;
};

void add_survey_output_options(CLI::App* cmd, SurveyOutputArgs& o) {
  cmd->add_option("--csv", o.csv, "write one CSV row per run to FILE ('-' for standard output)");
  cmd->add_option("--jsonl", o.jsonl, "write one JSON object per run and line to FILE ('-' for standard output); merge reads these");
  cmd->add_option("--svg", o.svg, "write charts (SWAPs, two-qubit depth, ESP against register size) to FILE");
  cmd->add_flag("--no-timing", o.no_timing, "leave out the wall-time column, so that equal surveys give byte-identical files");
  cmd->add_flag("--quiet,-q", o.quiet, "do not print the table");
}

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

struct SurveyArgs {
  std::vector<std::string> devices;
  std::string qubits;
  std::string approx = "none";
  std::string direction;
  bool inverse = false;
  std::string strategy = "auto";
  int jobs = 0;
  std::uint64_t seed = 1;
  std::string shard;
  std::string time_limit;
  bool no_progress = false;
  SurveyOutputArgs out;
};

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
  for (const auto& s : req.strategies) {
    const auto& table = plan_strategies();
    if (std::none_of(table.begin(), table.end(), [&](const StrategyInfo& i) { return s == i.name; })) {
      std::string known;
      for (const auto& i : table) known += (known.empty() ? "" : ", ") + std::string(i.name);
      throw InputError("--strategy: unknown strategy '" + s + "' (known: " + known + ")");
    }
  }
  req.seed = a.seed;
  req.time_limit = parse_time_limit(a.time_limit);
  req.clock = BudgetClock::from_environment();
  req.interrupt = &g_interrupted;
  for (const auto& d : a.devices) req.devices.push_back(make_survey_entry(d));
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

struct MergeArgs {
  std::vector<std::string> files;
  bool allow_missing = false;
  SurveyOutputArgs out;
};

int run_merge_command(const MergeArgs& a) {
  std::vector<SurveyPart> parts;
  for (const auto& f : a.files) parts.push_back({f, read_survey_jsonl(f)});
  const auto rows = merge_survey_parts(parts, a.allow_missing);
  return write_survey_outputs(rows, a.out, "");
}

struct DrawArgs {
  std::string device;
  std::string plan;
  std::string svg;
};

int run_draw_command(const DrawArgs& a) {
  const Device dev = load_device(a.device);
  std::optional<DrawnPlan> plan;
  if (!a.plan.empty()) plan = read_drawn_plan(dev, a.plan);
  OutputSet out;
  out.add(a.svg, draw_device_svg(dev, plan ? &*plan : nullptr));
  out.write_all();
  return 0;
}

// ---- help TOPIC and the manual page: both read the option tables registered below -------------

struct HelpArgs {
  std::string topic;
  bool man = false;
};

// Text for roff: backslashes and hyphens escaped, no line starting with a control character.
std::string roff(const std::string& text) {
  std::string out;
  for (char c : text) {
    if (c == '\\') out += "\\e";
    else if (c == '-') out += "\\-";
    else out += c;
  }
  std::string safe;
  bool line_start = true;
  for (char c : out) {
    if (line_start && (c == '.' || c == '\'')) safe += "\\&";
    safe += c;
    line_start = c == '\n';
  }
  return safe;
}

// A multi-line description as roff lines: each further line starts a new output line.
std::string roff_lines(const std::string& text) {
  std::string out;
  for (char c : roff(text)) out += c == '\n' ? std::string("\n.br\n") : std::string(1, c);
  return out;
}

// A positional argument's name in the manual: upper case, like the other placeholders.
std::string placeholder(const CLI::Option* o) {
  std::string name = o->get_name(true);
  for (char& c : name) c = static_cast<char>(std::toupper(static_cast<unsigned char>(c)));
  return "\\fI" + roff(name) + "\\fR";
}

// Every visible command (hidden ones have no group), in registration order.
std::vector<const CLI::App*> commands(const CLI::App& app) {
  return app.get_subcommands([](const CLI::App* s) { return !s->get_group().empty(); });
}

// The manual page (man(7) macros), generated from the same CLI11 tables as --help.
std::string make_man_page(const CLI::App& app) {
  std::string s;
  s += ".TH QFTPLAN 1 \"\" \"qftplan " QFTPLAN_VERSION_STRING "\" \"User Commands\"\n";
  s += ".SH NAME\nqftplan \\- " + roff(app.get_description().substr(app.get_description().find(": ") + 2)) + "\n";
  s += ".SH SYNOPSIS\n";
  for (const auto* c : commands(app)) {
    s += ".B qftplan " + roff(c->get_name()) + "\n";
    std::string args;
    for (const auto* o : c->get_options()) {
      if (o->get_name() == "--help") continue;
      std::string item = o->get_positional() && !o->nonpositional()
                             ? placeholder(o)
                             : "\\fB" + roff(o->get_name(false, false)) + "\\fR" +
                                   (o->get_expected_min() == 0 ? "" : " \\fI" + roff(o->get_type_name()) + "\\fR");
      args += o->get_required() ? item + "\n" : "[" + item + "]\n";
    }
    s += args + ".br\n";
  }
  const std::string about = app.get_description().substr(app.get_description().find(": ") + 2);
  s += ".SH DESCRIPTION\nqftplan: " + roff(about) + ".\n";
  s += "Each command is described below with its options; \\fBqftplan help\\fR \\fICOMMAND\\fR prints the same.\n";
  for (const auto* c : commands(app)) {
    s += ".SH \"COMMAND: " + roff(c->get_name()) + "\"\n" + roff(c->get_description()) + ".\n";
    for (const auto* o : c->get_options()) {
      if (o->get_name() == "--help") continue;
      s += ".TP\n";
      if (o->get_positional() && !o->nonpositional()) s += placeholder(o);
      else s += "\\fB" + roff(o->get_name(false, true)) + "\\fR";
      if (o->get_expected_min() != 0 && o->nonpositional()) s += " \\fI" + roff(o->get_type_name()) + "\\fR";
      s += "\n" + roff_lines(o->get_description());
      if (!o->get_default_str().empty()) s += " (default: " + roff(o->get_default_str()) + ")";
      if (o->get_required()) s += " (required)";
      s += "\n";
    }
  }
  s += ".SH \"EXIT STATUS\"\n0 success; 1 the request cannot be planned or \\fBcheck\\fR found the circuit wrong;\n"
       "2 bad input (files, specs, options), with a message naming the file, line and column where known.\n";
  s += ".SH \"SEE ALSO\"\nREADME.md of the qftplan sources: device file format, report fields, the networks.\n";
  return s;
}

int run_help(const CLI::App& app, const HelpArgs& a) {
  if (a.man) {
    std::fputs(make_man_page(app).c_str(), stdout);
    return 0;
  }
  // The formatter directly: App::help() would describe the help command, which is the one selected.
  if (a.topic.empty()) {
    std::fputs(app.get_formatter()->make_help(&app, "qftplan", CLI::AppFormatMode::Normal).c_str(), stdout);
    return 0;
  }
  std::string known;
  for (const auto* c : app.get_subcommands([](const CLI::App*) { return true; })) {
    if (c->get_name() == a.topic) {
      std::fputs(c->get_formatter()->make_help(c, "qftplan " + c->get_name(), CLI::AppFormatMode::Normal).c_str(), stdout);
      return 0;
    }
    known += (known.empty() ? "" : ", ") + c->get_name();
  }
  throw InputError("unknown help topic '" + a.topic + "' (topics: " + known + ")");
}

}  // namespace

int main(int argc, char** argv) {
  // The name is set here, so that usage lines say "qftplan", not the path the program was run by.
  CLI::App app{"qftplan: plan quantum Fourier transforms on qubit chips with nearest-neighbour couplers", "qftplan"};
  app.require_subcommand(1);
  app.set_version_flag("--version", "qftplan " QFTPLAN_VERSION_STRING);

  // Seeds are unsigned: "-1" would wrap around silently.
  const CLI::Validator kNonNegative(
      [](std::string& s) { return !s.empty() && s[0] == '-' ? std::string("must be a non-negative integer") : std::string(); },
      "");  // no text of its own: the option's type already reads UINT

  DeviceArgs da;
  auto* device = app.add_subcommand("device", "print a device (built-in spec or YAML file) as YAML, or its summary");
  device->add_option("device", da.device, "built-in spec (line:N, ring:N, grid:RxC, heavy-hex:RxC, full:N) or YAML file")
      ->required();
  device->add_flag("--summary", da.summary, "print qubits, couplers, degrees, diameter, components, calibration ranges");

  PlanArgs pa;
  auto* plan = app.add_subcommand("plan", "plan a QFT on a device and write OpenQASM and/or a JSON report");
  plan->add_option("--device", pa.device, "built-in spec or YAML file")->required();
  plan->add_option("--qubits,-n", pa.qubits, "register size n")->required();
  plan->add_option("--approx", pa.approx, "approximation degree: none (exact), M (keep rotations R_k, k <= M) or auto (best ESP x fidelity)")
      ->capture_default_str();
  plan->add_flag("--inverse", pa.inverse, "plan the inverse QFT");
  plan->add_option("--gates", pa.gates, "emitted gate set: logical, cx or cz (default: the device's native_2q)");
  plan->add_option("--placement", pa.placement, "pin the physical qubit of each input bit: a,b,c,...");
  plan->add_option("--format", pa.format, "circuit format: qasm3 or qasm2")->capture_default_str();
  plan->add_option("--output,-o", pa.output, "write the circuit to FILE ('-' for standard output)");
  plan->add_option("--report", pa.report, "write the JSON report to FILE ('-' for standard output)");
  plan->add_option("--seed", pa.seed, "seed of every randomised search")->check(kNonNegative)->capture_default_str();
  plan->add_flag("--measure", pa.measure, "end with a measurement of every register qubit");
  plan->add_flag("--explain", pa.explain, "print the chains considered and the degrees scored");
  plan->add_option("--time-limit", pa.time_limit,
                   "stop every search after SECONDS (from the start) and keep the best plan found; exit status 3");
  plan->add_option("--effort", pa.effort,
                   "scale the work budgets of the chain and placement searches (0.01 .. 1000; 10 = ten times longer)")
      ->capture_default_str();
  {
    // One table (plan_strategies) drives this help text and the unknown-strategy error.
    std::string help = "planning strategy:";
    for (const auto& s : plan_strategies()) help += std::string("\n  ") + s.name + ": " + s.description;
    plan->add_option("--strategy", pa.strategy, help)->capture_default_str();
  }
  plan->add_option("--objective", pa.objective, "what --strategy auto optimises: esp, depth or cx")
      ->capture_default_str();
  plan->add_option("--end-order", pa.end_order,
                   "free: output bits end where the plan leaves them; same: SWAPs at the end put output bit k on "
                   "the qubit that held input bit k")
      ->capture_default_str();
  plan->add_option("--network", pa.network,
                   "chain network: auto (of anchored, parity and leapfrog, the fewest native two-qubit gates), "
                   "reversal, anchored, leapfrog, or parity (n^2-1 CX for the exact QFT)")
      ->capture_default_str();

  CheckArgs ca;
  auto* check = app.add_subcommand("check", "prove that an OpenQASM file implements a QFT on a device");
  check->add_option("file", ca.file, "OpenQASM 2 or 3 file")->required();
  check->add_option("--device", ca.device, "built-in spec or YAML file")->required();
  check->add_option("--qubits,-n", ca.qubits, "register size n")->required();
  check->add_option("--approx", ca.approx, "approximation degree: none or M")->capture_default_str();
  check->add_flag("--inverse", ca.inverse, "expect the inverse QFT");
  check->add_option("--initial", ca.initial, "placement (default: the file's '// placement:' comment)");
  check->add_option("--final", ca.final_, "final placement (default: the file's '// final_placement:' comment)");

  // ---- survey, merge, draw (issue 6) ----
  SurveyArgs sa;
  auto* survey = app.add_subcommand("survey", "plan every combination of devices, register sizes and settings in parallel; table, CSV, JSON lines, charts");
  survey->add_option("devices", sa.devices,
                     "devices: YAML files, built-in specs, or FAMILY:* (line, ring, grid, heavy-hex, full) for the "
                     "smallest member that holds each register size")
      ->required();
  survey->add_option("--qubits,-n", sa.qubits, "register sizes: N, A:B, A:B:STEP, comma-separated (4:64:4)")->required();
  survey->add_option("--approx", sa.approx, "approximation settings, comma-separated: none, M, auto")->capture_default_str();
  survey->add_flag("--inverse", sa.inverse, "survey the inverse QFT (same as --direction inverse)");
  survey->add_option("--direction", sa.direction, "forward, inverse or both (default: forward)");
  survey->add_option("--strategy", sa.strategy, "planning strategies, comma-separated (see qftplan help plan)")
      ->capture_default_str();
  survey->add_option("--jobs,-j", sa.jobs, "threads (default: every core)");
  survey->add_option("--seed", sa.seed, "seed of every randomised search")->check(kNonNegative)->capture_default_str();
  survey->add_option("--shard", sa.shard, "run only slice K of M (K/M, 1 <= K <= M): runs K-1, K-1+M, K-1+2M, ...");
  survey->add_option("--time-limit", sa.time_limit,
                     "stop each run's searches after SECONDS and keep its best plan (status time-limit)");
  survey->add_flag("--no-progress", sa.no_progress, "no progress line (it is drawn only when standard error is a terminal)");
  add_survey_output_options(survey, sa.out);

  MergeArgs ma;
  auto* merge = app.add_subcommand("merge", "merge the --jsonl files of survey shards into the table, CSV, JSON lines and charts of one run");
  merge->add_option("files", ma.files, "JSON-lines files written by qftplan survey --jsonl")->required();
  merge->add_flag("--allow-missing", ma.allow_missing, "merge even when some runs of the survey are in none of the files");
  add_survey_output_options(merge, ma.out);

  DrawArgs wa;
  auto* draw = app.add_subcommand("draw", "draw a device as SVG: couplers shaded by error; with --plan the chain, placements and blocks per coupler");
  draw->add_option("device", wa.device, "built-in spec or YAML file")->required();
  draw->add_option("--plan", wa.plan, "a plan report of this device (qftplan plan --report FILE)");
  draw->add_option("--svg", wa.svg, "write the drawing to FILE ('-' for standard output)")->required();

  // Registered last so that it describes every command above.
  HelpArgs ha;
  auto* help = app.add_subcommand("help", "print the options of a command, or (--man) the manual page, from the tables --help uses");
  help->add_option("topic", ha.topic, "a command name (see the list above); none: the overview");
  help->add_flag("--man", ha.man, "write the manual page qftplan(1) in man(7) format to standard output");

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    // --help and --version are ParseErrors with status 0: CLI11 prints them.
    if (e.get_exit_code() == 0) return app.exit(e);
    // Everything else is bad input: one line, like every other error.
    std::string msg = e.what();
    std::replace(msg.begin(), msg.end(), '\n', ' ');
    std::string command;
    for (const auto* c : app.get_subcommands()) command = c->get_name();
    if (command.empty() && argc >= 2 && argv[1][0] == '-') {
      msg = "unknown option '" + std::string(argv[1]) + "' (see qftplan --help)";
    } else if (command.empty() && argc >= 2) {
      std::string known;
      for (const auto* c : app.get_subcommands([](const CLI::App*) { return true; }))
        known += (known.empty() ? "" : ", ") + c->get_name();
      msg = "unknown command '" + std::string(argv[1]) + "' (commands: " + known + ")";
    } else {
      msg += command.empty() ? " (see qftplan --help)" : " (see qftplan help " + command + ")";
    }
    std::fprintf(stderr, "qftplan: %s\n", msg.c_str());
    return kExitBadInput;
  }
  pa.placement_given = plan->count("--placement") > 0;
  // Output written to standard output is flushed and checked at the end: a full disk or a closed
  // stream is an error (exit 2), not silently lost text.
  const auto finish = [](int rc) {
    if (std::fflush(stdout) != 0 || std::ferror(stdout)) {
      std::fprintf(stderr, "qftplan: write to standard output failed: %s\n", std::strerror(errno));
      return rc == 0 ? kExitBadInput : rc;
    }
    return rc;
  };
  try {
    if (device->parsed()) return finish(run_device(da));
    if (plan->parsed()) return finish(run_plan(pa));
    if (check->parsed()) return finish(run_check(ca));
    if (help->parsed()) return finish(run_help(app, ha));
    if (survey->parsed()) return finish(run_survey_command(sa));  // issue 6
    if (merge->parsed()) return finish(run_merge_command(ma));    // issue 6
    if (draw->parsed()) return finish(run_draw_command(wa));      // issue 6
  } catch (const SettingError& e) {
    // The library names the setting; the command line words it as its option.
    std::fprintf(stderr, "qftplan: %s\n", e.worded([](std::string_view name) { return "--" + std::string(name); }).c_str());
    return kExitBadInput;
  } catch (const InputError& e) {
    std::fprintf(stderr, "qftplan: %s\n", e.what());
    return kExitBadInput;
  } catch (const PlanningError& e) {
    // These messages may quote a device name or a path: format_input_error keeps them on one line.
    std::fprintf(stderr, "qftplan: %s\n", format_input_error("", 0, 0, e.what()).c_str());
    return kExitFailed;
  } catch (const Interrupted& e) {
    std::fprintf(stderr, "qftplan: %s\n", e.what());
    return 128 + (g_signal.load() ? g_signal.load() : SIGINT);  // the shell's convention: 130 for Ctrl-C
  } catch (const TimeLimitReached& e) {
    std::fprintf(stderr, "qftplan: %s; no plan was found in time\n", format_input_error("", 0, 0, e.what()).c_str());
    return kExitTimeLimit;
  } catch (const std::bad_alloc&) {
    std::fprintf(stderr, "qftplan: out of memory\n");
    return kExitFailed;
  } catch (const std::exception& e) {
    std::fprintf(stderr, "qftplan: %s\n", format_input_error("", 0, 0, e.what()).c_str());
    return kExitBadInput;
  }
  return 0;
}
