// The "help" command: the options of one command, the overview, or (--man) the manual page, all
// read from the option tables that --help uses.

#include "help_command.hpp"

#include <cctype>
#include <cstdio>

#include <CLI/CLI.hpp>

#include "qftplan/core/input_error.hpp"

namespace qftplan::cli {

namespace {

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

}  // namespace

CLI::App* add_help_command(CLI::App& app, HelpArgs& a) {
  auto* help = app.add_subcommand("help", "print the options of a command, or (--man) the manual page, from the tables --help uses");
  help->add_option("topic", a.topic, "a command name (see the list above); none: the overview");
  help->add_flag("--man", a.man, "write the manual page qftplan(1) in man(7) format to standard output");
  return help;
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

}  // namespace qftplan::cli
