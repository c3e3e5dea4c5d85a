#include "qftplan/survey/survey_run.hpp"

#include <atomic>
#include <chrono>
#include <exception>
#include <memory>
#include <mutex>
#include <new>
#include <thread>

#include "qftplan/core/input_error.hpp"
#include "qftplan/core/run_budget.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/plan.hpp"

namespace qftplan {

SurveyRow run_survey_case(const SurveyRequest& request, const SurveyCase& c) {
  const auto t0 = std::chrono::steady_clock::now();
  const SurveyDeviceEntry& entry = request.devices.at(static_cast<std::size_t>(c.entry));
  SurveyRow row;
  row.index = c.index;
  row.series = entry.label;
  row.device = entry.label;
  row.qubits = c.qubits;
  row.asked_strategy = c.strategy;
  row.asked_approx = c.approx.text();
  row.asked_network = c.network;
  row.inverse = c.inverse;
  try {
    std::shared_ptr<const Device> dev = entry.device;
    if (!dev) {
      // A fitted family member is built here, in the worker, so large lattices build in parallel.
      const std::string spec = fitted_family_spec(*entry.family, c.qubits);
      row.device = spec;
      dev = std::make_shared<const Device>(request.calibration
                                               ? with_calibration_profile(make_lattice(spec), *request.calibration)
                                               : make_lattice(spec));
    }
    row.device = dev->name();
    row.device_qubits = dev->qubit_count();

    // The same options `qftplan plan` sets for the same flags, so a row equals a single plan.
    PlanSettings settings;
    settings.qubits = c.qubits;
    settings.inverse = c.inverse;
    settings.approx = c.approx.text();
    settings.seed = request.seed;
    settings.strategy = c.strategy;
    // A network that does not apply to this case (exact transform, a strategy without chain networks)
    // is refused by the planner like any other invalid request: the row records why.
    settings.network = c.network;
    settings.measure = request.measure;
    settings.readout = request.readout;
    PlanOptions opt = plan_options(settings);
    // Each run has its own deadline; all share the interruption flag.
    std::optional<RunBudget> budget;
    if (request.time_limit || request.interrupt) budget.emplace(request.time_limit, request.interrupt, request.clock);
    opt.budget = budget ? &*budget : nullptr;
    const PreparedPlan plan = prepare_plan(*dev, opt);
    const PlanReport r = execute_plan(*dev, opt, plan, nullptr);

    row.ok = true;
    if (!plan.cut_short.empty()) {
      row.cut_short = true;
      row.reason = "the time limit ran out during " + plan.cut_short + "; figures of the best plan found";
    }
    row.strategy = r.strategy;
    row.network = r.network;
    row.approx_degree = r.approx_degree;
    row.block_length = r.block_length;
    row.swaps = r.swaps;
    row.blocks = r.two_qubit_blocks;
    row.rotations = r.rotations;
    row.depth_2q = r.depth_2q;
    row.cx_count = r.cx_count;
    row.cx_depth = r.cx_depth;
    if (r.calibrated) {
      row.esp = r.noise.esp;
      row.log_esp = r.noise.log_esp;
      row.esp_total = r.noise.esp_total;
      row.log_esp_total = r.noise.log_esp_total;
    }
    row.duration_ns = r.noise.duration_ns;
    // The bounds are the plan report's (plan.cpp derives them): blocks >= kept rotations, since
    // every controlled phase needs a two-qubit gate on the pair holding its two qubits; depth_2q >=
    // n-1 when rotations of distance 1 are kept, since rotation (i-1, i) must precede H on wire i,
    // which precedes rotation (i, i+1), a chain of n-1 rotations that cannot share a layer.
    row.lower_bound_blocks = r.lower_bound_blocks;
    row.lower_bound_depth_2q = r.lower_bound_depth_2q;
    if (row.lower_bound_blocks > 0)
      row.blocks_ratio = static_cast<double>(row.blocks) / static_cast<double>(row.lower_bound_blocks);
    if (row.lower_bound_depth_2q > 0)
      row.depth_2q_ratio = static_cast<double>(row.depth_2q) / static_cast<double>(row.lower_bound_depth_2q);
  } catch (const Interrupted&) {
    throw;  // Ctrl-C stops the whole survey; it is not a property of this case
  } catch (const PlanningError& e) {
    row.reason = e.what();
  } catch (const InputError& e) {
    row.reason = e.what();
  } catch (const std::bad_alloc&) {
    row.reason = "out of memory";
  } catch (const std::exception& e) {
    row.reason = e.what();
  }
  row.elapsed_ms = std::chrono::duration<double, std::milli>(std::chrono::steady_clock::now() - t0).count();
  return row;
}

std::vector<SurveyRow> run_survey(const SurveyRequest& request, const std::vector<SurveyCase>& cases,
                                  long long total_cases, int jobs, const SurveyTick& tick) {
  const std::string fingerprint = survey_fingerprint(request);
  std::vector<SurveyRow> rows(cases.size());
  std::atomic<std::size_t> next{0};
  std::mutex tick_mutex;
  long long done = 0;
  std::exception_ptr interrupted;
  // Each worker takes the next unclaimed case and writes its row into that case's slot, so the
  // order of the rows is the order of the cases whatever the number of threads.
  auto worker = [&] {
    while (true) {
      if (request.interrupt && request.interrupt->load()) return;
      const std::size_t i = next.fetch_add(1);
      if (i >= cases.size()) return;
      SurveyRow row;
      try {
        row = run_survey_case(request, cases[i]);
      } catch (const Interrupted&) {
        std::lock_guard lock(tick_mutex);
        if (!interrupted) interrupted = std::current_exception();
        return;
      }
      row.of = total_cases;
      row.survey = fingerprint;
      rows[i] = std::move(row);
      std::lock_guard lock(tick_mutex);
      ++done;
      if (tick) tick(done, static_cast<long long>(cases.size()));
    }
  };
  const int threads = static_cast<int>(std::min<std::size_t>(static_cast<std::size_t>(std::max(jobs, 1)),
                                                               std::max<std::size_t>(cases.size(), 1)));
  if (threads <= 1) {
    worker();
  } else {
    std::vector<std::jthread> pool;
    pool.reserve(static_cast<std::size_t>(threads));
    for (int t = 0; t < threads; ++t) pool.emplace_back(worker);
  }
  if (interrupted) std::rethrow_exception(interrupted);
  if (request.interrupt && request.interrupt->load()) throw Interrupted();
  return rows;
}

int default_survey_jobs() {
  const unsigned hw = std::thread::hardware_concurrency();
  return hw == 0 ? 1 : static_cast<int>(hw);
}

}  // namespace qftplan
