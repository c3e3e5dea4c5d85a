#pragma once
// The "help" command: prints the options of a command, the overview, or the manual page.

#include <string>

namespace CLI {
class App;
}

namespace qftplan::cli {

/// The options of the help command.
struct HelpArgs {
  std::string topic;
  bool man = false;
};

/// Adds the help command to `app`; parsing fills `a`. Add it last: it describes every command added before.
CLI::App* add_help_command(CLI::App& app, HelpArgs& a);

/// Runs the help command on the commands of `app`; returns the exit status.
int run_help(const CLI::App& app, const HelpArgs& a);

}  // namespace qftplan::cli
