#pragma once
/// \file survey_run.hpp
/// Running the cases of a survey on a pool of threads: one row of figures per case, failures
/// included, in the order of the cases whatever the number of threads.

#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "qftplan/survey/survey_request.hpp"

namespace qftplan {

/// The outcome of one survey case (README "Surveys" lists the columns).
struct SurveyRow {
  long long index = 0;                  ///< position in the whole survey
  long long of = 0;                     ///< number of cases in the whole survey
  std::string survey;                   ///< survey_fingerprint of the request
  std::string series;                   ///< the entry's label (device name or family pattern)
  std::string device;                   ///< the device planned on (a family's fitted member)
  int device_qubits = 0;                ///< qubits of that device
  int qubits = 0;                       ///< register size n
  std::string asked_strategy;           ///< the --strategy value of this case
  std::string asked_approx;             ///< the --approx value of this case: none, M or auto
  std::string asked_network = "auto";   ///< the --network value of this case (network: the one planned)
  bool inverse = false;                 ///< the inverse QFT
  bool ok = false;                      ///< planned; otherwise `reason` says why not
  bool cut_short = false;               ///< planned, but the time limit cut a search short
  std::string reason;                   ///< why not planned, or what the time limit cut short
  std::string strategy;                 ///< strategy used (empty when failed)
  std::string network;                  ///< network or routing used (empty when failed)
  std::optional<int> approx_degree;     ///< degree planned; absent when exact
  std::optional<int> block_length;      ///< blocks of the block construction (--network blockwise); absent otherwise
  long long swaps = 0;                  ///< SWAPs, fused ones included
  long long blocks = 0;                 ///< two-qubit blocks (a fused cp+swap is one)
  long long rotations = 0;              ///< controlled phases kept
  long long depth_2q = 0;               ///< layers of two-qubit blocks
  long long cx_count = 0;               ///< native two-qubit gates
  long long cx_depth = 0;               ///< layers of native two-qubit gates
  std::optional<double> esp;            ///< absent when the device carries no calibration
  std::optional<double> log_esp;        ///< natural log of esp (finite when esp underflows)
  std::optional<double> esp_total;      ///< gates x idling (x readout when measured); absent without calibration
  std::optional<double> log_esp_total;  ///< natural log of esp_total
  std::optional<double> duration_ns;    ///< ASAP schedule length with the calibrated (or default) gate times
  long long lower_bound_blocks = 0;     ///< from the plan report (kept rotations)
  long long lower_bound_depth_2q = 0;   ///< from the plan report (n-1 when a rotation is kept)
  std::optional<double> blocks_ratio;   ///< blocks / lower_bound_blocks; absent when the bound is 0
  std::optional<double> depth_2q_ratio; ///< depth_2q / lower_bound_depth_2q; absent when the bound is 0
  std::optional<double> elapsed_ms;     ///< wall time of the run; absent with --no-timing
  /// Every field equal.
  bool operator==(const SurveyRow&) const = default;
};

/// Runs one case. Never throws for a case that cannot be planned or is invalid for its device:
/// such a case is a row with ok = false and the reason.
SurveyRow run_survey_case(const SurveyRequest& request, const SurveyCase& c);

/// Called after each finished case with the number done so far and the total (serialised: never
/// called from two threads at once).
using SurveyTick = std::function<void(long long done, long long total)>;

/// Runs `cases` on `jobs` threads (at least 1) and returns their rows in the order of `cases`.
/// Every row gets `of` = `total_cases` and the request's fingerprint.
std::vector<SurveyRow> run_survey(const SurveyRequest& request, const std::vector<SurveyCase>& cases,
                                  long long total_cases, int jobs, const SurveyTick& tick = {});

/// The number of threads used when --jobs is not given: every hardware thread (at least 1).
int default_survey_jobs();

}  // namespace qftplan
