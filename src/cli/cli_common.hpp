#pragma once
// What the commands of the command line share: exit statuses, the stop flag that Ctrl-C sets,
// output destinations, --time-limit, and turning an exception into a message and a status.
// Free of CLI11, so that the files which only run commands need not parse its header.

#include <atomic>
#include <memory>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "qftplan/core/atomic_file.hpp"

namespace qftplan::cli {

/// Exit status: check found the circuit wrong, or the request cannot be planned.
inline constexpr int kExitFailed = 1;
/// Exit status: bad input (files, specs, options).
inline constexpr int kExitBadInput = 2;
/// Exit status: --time-limit ran out (the best plan found, if any, is still written).
inline constexpr int kExitTimeLimit = 3;
/// Exit status: check could prove the circuit neither right nor wrong.
inline constexpr int kExitCannotProve = 4;

/// Set by SIGINT/SIGTERM once install_stop_handlers() ran; the searches and the circuit stream poll it.
extern std::atomic<bool> g_interrupted;
/// The signal that set g_interrupted (0: none), for the exit status 128 + signal.
extern std::atomic<int> g_signal;

/// For commands that write files: Ctrl-C sets g_interrupted instead of killing the process, and a
/// file-size limit (ulimit -f) fails the write with EFBIG.
void install_stop_handlers();

/// Reads "--time-limit 2.5": positive seconds; empty text means no limit.
std::optional<double> parse_time_limit(const std::string& text);

/// Whether two output paths would be one file (both would commit and the last would win).
bool same_output_file(const std::string& a, const std::string& b);

/// An output destination: "-" is standard output; anything else a file written atomically.
struct Destination {
  std::unique_ptr<AtomicFile> file;
  StdoutOutput out;
  /// Where to write the text.
  TextOutput& sink() { return file ? static_cast<TextOutput&>(*file) : out; }
  /// Opens the destination `path` ("-": standard output).
  explicit Destination(const std::string& path) {
    if (path != "-") file = std::make_unique<AtomicFile>(path);
  }
  /// Flushes and syncs a file (the step that fails on a full disk); commit() then only renames.
  void flush() {
    if (file) file->flush();
  }
  /// Renames a file into place.
  void commit() {
    if (file) file->commit();
  }
};

/// Files written at the end of a command: each to a temporary, then all renamed together, so that
/// a failure leaves none of them half-written. "-" is standard output.
class OutputSet {
 public:
  /// Adds `text` for `path` (nothing when `path` is empty); throws InputError when two paths are one file.
  void add(const std::string& path, std::string text);
  /// Whether one of the outputs is standard output.
  bool uses_stdout() const;
  /// Writes and syncs every file, renames them all, then prints what goes to standard output.
  void write_all();

 private:
  std::vector<std::pair<std::string, std::string>> items_;
};

/// Flushes standard output and checks it: a full disk or a closed stream turns status 0 into
/// kExitBadInput with a message, instead of silently lost text.
int finish_stdout(int rc);

/// Inside a catch block: prints the exception in flight as one "qftplan: ..." line on standard
/// error and returns its exit status (an exception of no known kind is thrown on).
int report_exception();

}  // namespace qftplan::cli
