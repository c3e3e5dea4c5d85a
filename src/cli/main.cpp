// The qftplan command line: builds the CLI11 app from the commands' registration functions, parses,
// and runs the one command given. Only src/cli knows about CLI11.

#include <algorithm>
#include <cstdio>
#include <string>
#include <vector>

#include <CLI/CLI.hpp>

#include "check_command.hpp"
#include "cli_common.hpp"
#include "device_command.hpp"
#include "draw_command.hpp"
#include "help_command.hpp"
#include "plan_command.hpp"
#include "survey_command.hpp"

namespace {

using namespace qftplan::cli;

// The long option names of `command`.
std::vector<std::string> option_names(const CLI::App& app, const std::string& command) {
  std::vector<std::string> names;
  for (const auto* sub : app.get_subcommands([](const CLI::App*) { return true; }))
    if (sub->get_name() == command)
      for (const auto* o : sub->get_options())
        for (const auto& n : o->get_lnames()) names.push_back("--" + n);
  return names;
}

// The first "--name" on the command line that `command` does not know, or "".
std::string unknown_option(const CLI::App& app, const std::string& command, int argc, char** argv) {
  const auto names = option_names(app, command);
  for (int i = 1; i < argc; ++i) {
    std::string arg = argv[i];
    if (!arg.starts_with("--")) continue;
    arg = arg.substr(0, arg.find('='));
    if (std::find(names.begin(), names.end(), arg) == names.end()) return arg;
  }
  return {};
}

// The option of `command` closest to `typo` by edit distance (Levenshtein, 1966), when at most two
// edits away; else "".
std::string nearest_option(const CLI::App& app, const std::string& command, const std::string& typo) {
  std::string best;
  std::size_t best_d = 3;
  for (const auto& name : option_names(app, command)) {
    std::vector<std::size_t> row(name.size() + 1);
    for (std::size_t j = 0; j <= name.size(); ++j) row[j] = j;
    for (std::size_t i = 1; i <= typo.size(); ++i) {
      std::size_t diag = row[0];
      row[0] = i;
      for (std::size_t j = 1; j <= name.size(); ++j) {
        const std::size_t up = row[j];
        row[j] = std::min({row[j] + 1, row[j - 1] + 1, diag + (typo[i - 1] == name[j - 1] ? 0 : 1)});
        diag = up;
      }
    }
    if (row[name.size()] < best_d) best_d = row[name.size()], best = name;
  }
  return best;
}

// A parse error (other than --help and --version) as one line on standard error; returns its status.
int report_parse_error(const CLI::App& app, const CLI::ParseError& e, int argc, char** argv) {
  // Everything here is bad input: one line, like every other error.
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
  } else if (const std::string unknown = unknown_option(app, command, argc, argv); !unknown.empty()) {
    msg = "unknown option " + unknown;
    if (const std::string near = nearest_option(app, command, unknown); !near.empty()) msg += "; did you mean " + near + "?";
    msg += " (see qftplan help " + command + ")";
  } else {
    msg += command.empty() ? " (see qftplan --help)" : " (see qftplan help " + command + ")";
  }
  std::fprintf(stderr, "qftplan: %s\n", msg.c_str());
  return kExitBadInput;
}

}  // namespace

int main(int argc, char** argv) {
  // The name is set here, so that usage lines say "qftplan", not the path the program was run by.
  CLI::App app{"qftplan: plan quantum Fourier transforms on qubit chips with nearest-neighbour couplers", "qftplan"};
  app.require_subcommand(1);
  app.set_version_flag("--version", "qftplan " QFTPLAN_VERSION_STRING);

  // The order of registration is the order of --help, of the manual and of the error messages.
  DeviceArgs da;
  const CLI::App* device = add_device_command(app, da);
  PlanArgs pa;
  const CLI::App* plan = add_plan_command(app, pa);
  CheckArgs ca;
  const CLI::App* check = add_check_command(app, ca);
  SurveyArgs sa;
  const CLI::App* survey = add_survey_command(app, sa);
  MergeArgs ma;
  const CLI::App* merge = add_merge_command(app, ma);
  DrawArgs wa;
  const CLI::App* draw = add_draw_command(app, wa);
  // Registered last so that it describes every command above.
  HelpArgs ha;
  const CLI::App* help = add_help_command(app, ha);

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    // --help and --version are ParseErrors with status 0: CLI11 prints them.
    if (e.get_exit_code() == 0) return app.exit(e);
    return report_parse_error(app, e, argc, argv);
  }
  // Output written to standard output is flushed and checked at the end (finish_stdout).
  try {
    if (device->parsed()) return finish_stdout(run_device(da));
    if (plan->parsed()) return finish_stdout(run_plan(pa));
    if (check->parsed()) return finish_stdout(run_check(ca));
    if (help->parsed()) return finish_stdout(run_help(app, ha));
    if (survey->parsed()) return finish_stdout(run_survey_command(sa));
    if (merge->parsed()) return finish_stdout(run_merge_command(ma));
    if (draw->parsed()) return finish_stdout(run_draw_command(wa));
  } catch (...) {
    return report_exception();
  }
  return 0;
}
