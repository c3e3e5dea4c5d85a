// Exit statuses, stop handlers, outputs and error messages shared by the commands.

#include "cli_common.hpp"

#include <signal.h>

#include <cerrno>
#include <cmath>
#include <csignal>
#include <cstdio>
#include <cstring>
#include <exception>
#include <filesystem>
#include <new>
#include <stdexcept>

#include "qftplan/core/input_error.hpp"
#include "qftplan/core/run_budget.hpp"

namespace qftplan::cli {

// Set by SIGINT/SIGTERM; the searches and the circuit stream poll it through the RunBudget, so the
// run unwinds normally and AtomicFile destructors remove the temporaries.
std::atomic<bool> g_interrupted{false};
std::atomic<int> g_signal{0};

namespace {

extern "C" void on_stop_signal(int sig) {
  g_signal.store(sig);
  g_interrupted.store(true);
}

}  // namespace

void install_stop_handlers() {
  struct sigaction sa {};
  sa.sa_handler = on_stop_signal;
  sa.sa_flags = SA_RESTART;  // a write interrupted by the signal resumes; the flag does the stopping
  sigemptyset(&sa.sa_mask);
  sigaction(SIGINT, &sa, nullptr);
  sigaction(SIGTERM, &sa, nullptr);
  std::signal(SIGXFSZ, SIG_IGN);
}

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

// Standard output ("-") and devices such as /dev/null can take several writers.
bool same_output_file(const std::string& a, const std::string& b) {
  if (a.empty() || b.empty() || a == "-" || b == "-") return false;
  std::error_code ec;
  const auto ca = std::filesystem::weakly_canonical(a, ec);
  if (ec || ca != std::filesystem::weakly_canonical(b, ec) || ec) return false;
  const auto st = std::filesystem::status(ca, ec);
  return !std::filesystem::exists(st) || std::filesystem::is_regular_file(st);
}

void OutputSet::add(const std::string& path, std::string text) {
  if (path.empty()) return;
  for (const auto& [p, t] : items_)
    if (same_output_file(p, path)) throw InputError("two outputs name the same file '" + path + "'");
  items_.emplace_back(path, std::move(text));
}

bool OutputSet::uses_stdout() const {
  for (const auto& [p, t] : items_)
    if (p == "-") return true;
  return false;
}

void OutputSet::write_all() {
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

int finish_stdout(int rc) {
  if (std::fflush(stdout) != 0 || std::ferror(stdout)) {
    std::fprintf(stderr, "qftplan: write to standard output failed: %s\n", std::strerror(errno));
    return rc == 0 ? kExitBadInput : rc;
  }
  return rc;
}

int report_exception() {
  // Rethrown here so that every command's failures are sorted by one list of handlers.
  try {
    throw;
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
}

}  // namespace qftplan::cli
