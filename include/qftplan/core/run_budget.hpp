#pragma once
/// \file run_budget.hpp
/// Cooperative limits on one run: a wall-clock deadline (`--time-limit`) and an interruption flag
/// (Ctrl-C). The search loops poll them and stop cleanly, keeping the best result found so far;
/// nothing is ever killed from outside, so output files are never left half-written.

#include <atomic>
#include <chrono>
#include <optional>
#include <stdexcept>
#include <string>

#include "qftplan/core/gate.hpp"

namespace qftplan {

/// Why a run should stop early.
enum class StopReason { none, time_limit, interrupted };

/// The clock a budget reads: the steady clock (default), or, for tests that must not depend on the
/// machine's speed, a counter that advances `tick_seconds` at every reading, so that a time limit
/// runs out after the same amount of search work on any machine.
struct BudgetClock {
  std::optional<double> tick_seconds;  ///< absent: the steady clock
  /// The clock the environment asks for: `QFTPLAN_TEST_CLOCK_TICK=SECONDS` gives the counting clock
  /// (a test hook of the front ends, DEVELOPERS.md); unset or not a positive number: the steady clock.
  static BudgetClock from_environment();
};

/// A deadline and/or an interruption flag, shared read-only by every search of one run (thread-safe).
class RunBudget {
 public:
  /// No deadline and no flag: never runs out.
  RunBudget() = default;
  /// Runs out `seconds` after construction (when given) or once `*interrupt` is true (when given);
  /// the flag must outlive the budget. A signal handler may set the flag (lock-free atomic).
  RunBudget(std::optional<double> seconds, const std::atomic<bool>* interrupt, BudgetClock clock = {});
  RunBudget(const RunBudget&) = delete;
  RunBudget& operator=(const RunBudget&) = delete;

  /// Why to stop now, or none; interruption wins over the deadline. Reads the clock.
  StopReason stop_reason() const;
  /// True when the run should stop now.
  bool exhausted() const { return stop_reason() != StopReason::none; }
  /// True when the interruption flag is set.
  bool interrupted() const { return interrupt_ && interrupt_->load(std::memory_order_relaxed); }
  /// The time limit in seconds, when there is one.
  std::optional<double> time_limit_seconds() const { return seconds_; }

 private:
  std::chrono::steady_clock::time_point deadline_{};
  std::optional<double> seconds_;
  const std::atomic<bool>* interrupt_ = nullptr;
  std::optional<double> tick_;                         ///< counting clock: seconds per reading
  mutable std::atomic<unsigned long long> readings_{0};  ///< counting clock: readings so far
};

/// A loop-local view of a budget for hot loops: reads the clock only every `stride` polls and
/// remembers once the budget ran out. A null budget never stops. Not shared between threads.
class BudgetPoll {
 public:
  /// `budget` may be null (no limit).
  explicit BudgetPoll(const RunBudget* budget, unsigned stride = 1024) : budget_(budget), stride_(stride) {}
  /// True once the budget has run out (sticky); cheap between clock reads.
  bool stop() {
    if (!budget_ || stopped_) return stopped_;
    if (++count_ < stride_) return false;
    count_ = 0;
    stopped_ = budget_->exhausted();
    return stopped_;
  }
  /// Whether stop() has ever returned true.
  bool stopped() const { return stopped_; }

 private:
  const RunBudget* budget_;
  unsigned stride_;
  unsigned count_ = 0;
  bool stopped_ = false;
};

/// The run was interrupted (Ctrl-C): nothing is kept; the command line exits with status 130.
class Interrupted : public std::runtime_error {
 public:
  Interrupted() : std::runtime_error("interrupted; no output written") {}
};

/// The time limit ran out before any usable result existed (for example before a chain of n
/// qubits was found): the command line exits with status 3.
class TimeLimitReached : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

/// Throws Interrupted when the budget's interruption flag is set (no-op for a null budget).
void throw_if_interrupted(const RunBudget* budget);

/// Throws Interrupted or TimeLimitReached (with `what` naming the phase) when the budget has run
/// out; used inside dry runs that have no partial result worth keeping.
void throw_if_exhausted(const RunBudget* budget, const std::string& what);

/// Forwards every gate to `next` (when given) and throws Interrupted, checked every 4096 gates, when
/// the budget's interruption flag is set: lets Ctrl-C stop a long circuit stream before any output
/// file is committed. The deadline is not checked here: writing the chosen plan is not a search.
class InterruptCheckSink final : public GateSink {
 public:
  /// `budget` may be null (then it only forwards); `next` may be null.
  InterruptCheckSink(const RunBudget* budget, GateSink* next) : budget_(budget), next_(next) {}
  void gate(const Gate& g) override;
  void batch(std::span<const Gate> run) override;
  void finish() override;

 private:
  const RunBudget* budget_;
  GateSink* next_;
  unsigned count_ = 0;
};

}  // namespace qftplan
