#pragma once
/// \file survey_request.hpp
/// What a survey runs: devices (fixed ones and fitted families such as "grid:*"), register sizes,
/// approximation degrees, directions, strategies and chain networks, expanded into an ordered list of cases that
/// can be cut into shards.

#include <atomic>
#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "qftplan/core/run_budget.hpp"
#include "qftplan/device/calibration_profile.hpp"
#include "qftplan/device/device.hpp"

namespace qftplan {

/// One device entry of a survey: a fixed device (YAML file or built-in spec) or a family pattern
/// "FAMILY:*" fitted to each register size (see fitted_family_spec).
struct SurveyDeviceEntry {
  std::string text;                       ///< as given on the command line
  std::string label;                      ///< series name: the device's name, or the pattern itself
  std::optional<std::string> family;      ///< "line", "ring", "grid", "heavy-hex", "full" for FAMILY:*
  std::shared_ptr<const Device> device;   ///< the loaded device, for fixed entries
};

/// An --approx setting of a survey: exact, a fixed degree, or the automatic choice.
struct ApproxSetting {
  /// exact: every rotation; degree: keep R_k for k <= degree; automatic: --approx auto.
  enum class Kind { exact, degree, automatic };
  Kind kind = Kind::exact;                ///< which of the three
  int degree = 0;                         ///< for Kind::degree
  /// "none", "M" or "auto", as written on the command line.
  std::string text() const;
  /// Same kind and degree.
  bool operator==(const ApproxSetting&) const = default;
};

/// Everything a survey varies. Cases are the cross product, in the order of expand_survey.
struct SurveyRequest {
  std::vector<SurveyDeviceEntry> devices; ///< device entries, in the order given
  std::vector<int> sizes;                 ///< register sizes, in the order given
  std::vector<ApproxSetting> approx{ApproxSetting{}};  ///< --approx settings, in the order given
  std::vector<bool> directions{false};    ///< false: forward QFT, true: inverse
  std::vector<std::string> strategies{"auto"};  ///< names from plan_strategies()
  std::vector<std::string> networks{"auto"};    ///< --network names (network_choice_name), in the order given
  bool measure = false;                   ///< every run ends in a measurement (plan --measure)
  std::string readout = "auto";           ///< with measure: unitary, semiclassical or auto (plan --readout)
  std::uint64_t seed = 1;                 ///< seed of every randomised search
  std::optional<CalibrationProfile> calibration;  ///< --calibration: applied to every device of the survey
  std::optional<double> time_limit;      ///< seconds per run; a run cut short keeps its best plan
  const std::atomic<bool>* interrupt = nullptr;  ///< set by Ctrl-C: stop the survey; null: never
  BudgetClock clock;                     ///< the clock each run's time limit reads (run_budget.hpp)
};

/// One run of a survey.
struct SurveyCase {
  long long index = 0;                    ///< position in the whole survey (0-based)
  int entry = 0;                          ///< index into SurveyRequest::devices
  int qubits = 0;                         ///< register size n
  ApproxSetting approx;                   ///< the --approx setting
  bool inverse = false;                   ///< inverse QFT
  std::string strategy;                   ///< the --strategy name
  std::string network = "auto";           ///< the --network name
};

/// A slice of a survey: the K-th (1-based) of M.
struct SurveyShard {
  int k = 1;  ///< which slice, 1..m
  int m = 1;  ///< how many slices
};

/// Parses register sizes: comma-separated items, each "N" or "A:B" (A..B) or "A:B:S" (A, A+S, ... <= B).
/// InputError (naming --qubits) on malformed text, sizes below 1, or more than 100,000 sizes.
std::vector<int> parse_size_list(const std::string& text);

/// Parses "none,3,auto" into settings; InputError on anything else.
std::vector<ApproxSetting> parse_approx_list(const std::string& text);

/// Parses a comma-separated list of names (strategies), rejecting empty items.
std::vector<std::string> parse_name_list(const std::string& text, const std::string& what);

/// Checks every name against the strategy registry; SettingError on the "strategy" setting with the
/// registry's one unknown-strategy message otherwise.
void check_strategy_names(const std::vector<std::string>& names);

/// Checks every name with parse_network_choice; SettingError on the "network" setting otherwise.
void check_network_names(const std::vector<std::string>& names);

/// Parses "K/M" with 1 <= K <= M; InputError otherwise.
SurveyShard parse_shard(const std::string& text);

/// Builds an entry from command-line text: "FAMILY:*" becomes a fitted family; anything else is
/// loaded now with load_device (so bad files fail before any run starts).
/// With `calibration`, the profile is applied to the device (family members: when each is built).
SurveyDeviceEntry make_survey_entry(const std::string& text,
                                    const std::optional<CalibrationProfile>& calibration = std::nullopt);

/// The family member used for register size n: line:n, ring:max(n,3), full:n, and for grid and
/// heavy-hex the first of the near-square sizes 1x1, 1x2, 2x2, 2x3, 3x3, ... (R x R, then R x (R+1))
/// with at least n qubits. InputError when the family is unknown or the member would exceed the
/// device size limit.
std::string fitted_family_spec(const std::string& family, int qubits);

/// Every case of the survey in its canonical order: by device entry, then strategy, network,
/// approximation setting, direction, and register size (innermost), each in the order given.
std::vector<SurveyCase> expand_survey(const SurveyRequest& request);

/// The cases of shard K/M: those whose index i has i mod M == K-1 (slices of equal size to within one
/// case, each with its share of small and large runs).
std::vector<SurveyCase> shard_cases(const std::vector<SurveyCase>& all, SurveyShard shard);

/// A fingerprint of the whole survey (device labels, sizes, settings, seed, calibration profile values)
/// as 16 hex digits, so that
/// merge can tell shards of one survey from those of another.
std::string survey_fingerprint(const SurveyRequest& request);

}  // namespace qftplan
