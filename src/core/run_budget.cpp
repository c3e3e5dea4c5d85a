#include "qftplan/core/run_budget.hpp"

#include <algorithm>
#include <cmath>
#include <cstdlib>

namespace qftplan {

BudgetClock BudgetClock::from_environment() {
  BudgetClock c;
  if (const char* text = std::getenv("QFTPLAN_TEST_CLOCK_TICK")) {
    char* end = nullptr;
    const double v = std::strtod(text, &end);
    if (end != text && *end == '\0' && std::isfinite(v) && v > 0) c.tick_seconds = v;
  }
  return c;
}

RunBudget::RunBudget(std::optional<double> seconds, const std::atomic<bool>* interrupt, BudgetClock clock)
    : seconds_(seconds), interrupt_(interrupt), tick_(clock.tick_seconds) {
  if (seconds_ && !tick_) {
    // Clamp to a century so that absurd limits cannot overflow the clock's representation.
    const double s = std::isfinite(*seconds_) ? std::clamp(*seconds_, 0.0, 3.2e9) : 3.2e9;
    deadline_ = std::chrono::steady_clock::now() +
                std::chrono::duration_cast<std::chrono::steady_clock::duration>(std::chrono::duration<double>(s));
  }
}

StopReason RunBudget::stop_reason() const {
  if (interrupted()) return StopReason::interrupted;
  if (!seconds_) return StopReason::none;
  if (tick_) {
    // The counting clock: reading k is at k ticks after the start.
    const auto k = readings_.fetch_add(1, std::memory_order_relaxed) + 1;
    return static_cast<double>(k) * *tick_ >= *seconds_ ? StopReason::time_limit : StopReason::none;
  }
  if (std::chrono::steady_clock::now() >= deadline_) return StopReason::time_limit;
  return StopReason::none;
}

void throw_if_interrupted(const RunBudget* budget) {
  if (budget && budget->interrupted()) throw Interrupted();
}

void throw_if_exhausted(const RunBudget* budget, const std::string& what) {
  if (!budget) return;
  switch (budget->stop_reason()) {
    case StopReason::none: return;
    case StopReason::interrupted: throw Interrupted();
    case StopReason::time_limit: throw TimeLimitReached("the time limit ran out during " + what);
  }
}

void InterruptCheckSink::gate(const Gate& g) {
  // A relaxed atomic load is cheap, but streams reach billions of gates: look every 4096.
  if ((++count_ & 4095u) == 0) throw_if_interrupted(budget_);
  if (next_) next_->gate(g);
}

void InterruptCheckSink::batch(std::span<const Gate> run) {
  count_ += static_cast<unsigned>(run.size());
  if (count_ >= 4096u) {
    count_ = 0;
    throw_if_interrupted(budget_);
  }
  if (next_) next_->batch(run);
}

void InterruptCheckSink::finish() {
  throw_if_interrupted(budget_);
  if (next_) next_->finish();
}

}  // namespace qftplan
