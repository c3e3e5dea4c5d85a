#include "qftplan/survey/survey_request.hpp"

#include <algorithm>
#include <charconv>
#include <cmath>

#include <fmt/format.h>

#include "qftplan/core/input_error.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/plan.hpp"

namespace qftplan {
namespace {

// Guards against a typo such as 4:4000000 producing millions of runs.
constexpr std::size_t kMaxSizes = 100'000;
constexpr long long kMaxCases = 10'000'000;

std::vector<std::string> split(const std::string& text, char sep) {
  std::vector<std::string> parts;
  std::size_t i = 0;
  while (true) {
    const std::size_t j = text.find(sep, i);
    parts.push_back(text.substr(i, j == std::string::npos ? std::string::npos : j - i));
    if (j == std::string::npos) break;
    i = j + 1;
  }
  return parts;
}

// A whole number in 1 .. kMaxDeviceQubits, or nullopt.
std::optional<int> whole(const std::string& s) {
  if (s.empty() || !std::all_of(s.begin(), s.end(), [](char c) { return c >= '0' && c <= '9'; })) return std::nullopt;
  long long v = 0;
  const auto [p, ec] = std::from_chars(s.data(), s.data() + s.size(), v);
  if (ec != std::errc{} || p != s.data() + s.size() || v > kMaxDeviceQubits) return std::nullopt;
  return static_cast<int>(v);
}

}  // namespace

std::string ApproxSetting::text() const {
  switch (kind) {
    case Kind::exact: return "none";
    case Kind::degree: return std::to_string(degree);
    case Kind::automatic: return "auto";
  }
  return "none";
}

std::vector<int> parse_size_list(const std::string& text) {
  std::vector<int> sizes;
  for (const auto& item : split(text, ',')) {
    const auto fields = split(item, ':');
    auto bad = [&](const std::string& why) {
      throw InputError(fmt::format("--qubits: '{}' {} (expected N, A:B or A:B:STEP, comma-separated; sizes 1..{})",
                                   item, why, kMaxDeviceQubits));
    };
    if (fields.size() > 3) bad("has too many ':'");
    std::vector<int> v;
    for (const auto& f : fields) {
      const auto x = whole(f);
      if (!x) bad(f.empty() ? "has an empty field" : "is not a whole number");
      v.push_back(*x);
    }
    const int from = v[0];
    const int to = v.size() >= 2 ? v[1] : v[0];
    const int step = v.size() == 3 ? v[2] : 1;
    if (from < 1) bad("starts below 1");
    if (step < 1) bad("has a step below 1");
    if (to < from) bad("ends before it starts");
    for (long long n = from; n <= to; n += step) {
      if (sizes.size() >= kMaxSizes)
        throw InputError(fmt::format("--qubits: more than {} register sizes", kMaxSizes));
      sizes.push_back(static_cast<int>(n));
    }
  }
  return sizes;
}

std::vector<ApproxSetting> parse_approx_list(const std::string& text) {
  std::vector<ApproxSetting> out;
  for (const auto& item : split(text, ',')) {
    ApproxSetting a;
    if (item == "none") {
      a.kind = ApproxSetting::Kind::exact;
    } else if (item == "auto") {
      a.kind = ApproxSetting::Kind::automatic;
    } else {
      a.kind = ApproxSetting::Kind::degree;
      a.degree = *parse_approx_degree(item);  // the messages of plan's --approx
    }
    if (std::find(out.begin(), out.end(), a) == out.end()) out.push_back(a);
  }
  return out;
}

std::vector<std::string> parse_name_list(const std::string& text, const std::string& what) {
  std::vector<std::string> out;
  for (const auto& item : split(text, ',')) {
    if (item.empty()) throw InputError(fmt::format("{}: empty item in '{}'", what, text));
    if (std::find(out.begin(), out.end(), item) == out.end()) out.push_back(item);
  }
  return out;
}

SurveyShard parse_shard(const std::string& text) {
  const auto parts = split(text, '/');
  std::optional<int> k, m;
  if (parts.size() == 2) {
    k = whole(parts[0]);
    m = whole(parts[1]);
  }
  if (!k || !m || *m < 1 || *k < 1 || *k > *m)
    throw InputError(fmt::format("--shard: '{}' is not K/M with 1 <= K <= M (for example 3/8)", text));
  return {*k, *m};
}

SurveyDeviceEntry make_survey_entry(const std::string& text, const std::optional<CalibrationProfile>& calibration) {
  SurveyDeviceEntry e;
  e.text = text;
  const auto colon = text.find(':');
  if (colon != std::string::npos && text.substr(colon + 1) == "*") {
    const std::string family = text.substr(0, colon);
    const auto& known = lattice_families();
    if (std::find(known.begin(), known.end(), family) == known.end())
      throw InputError(fmt::format("device family pattern '{}': unknown family '{}' (known: {})", text, family,
                                   fmt::join(known, ", ")));
    e.family = family;
    e.label = text;
    return e;
  }
  e.device = std::make_shared<const Device>(calibration ? with_calibration_profile(load_device(text), *calibration)
                                                        : load_device(text));
  e.label = e.device->name();
  return e;
}

std::string fitted_family_spec(const std::string& family, int qubits) {
  const int n = std::max(qubits, 1);
  if (family == "line") return fmt::format("line:{}", n);
  if (family == "ring") return fmt::format("ring:{}", std::max(n, 3));
  if (family == "full") return fmt::format("full:{}", n);
  if (family == "grid" || family == "heavy-hex") {
    // Near-square members in increasing size: R x R, then R x (R+1).
    auto count = [&](long long r, long long c) {
      return family == "grid" ? r * c : 5 * r * c + 4 * r + 4 * c - 1;
    };
    for (long long r = 1;; ++r) {
      for (long long c : {r, r + 1}) {
        const long long q = count(r, c);
        if (q > kMaxDeviceQubits)
          throw InputError(fmt::format("device family {}:*: no member with {} qubits within the limit of {}", family,
                                       n, kMaxDeviceQubits));
        if (q >= n) return fmt::format("{}:{}x{}", family, r, c);
      }
    }
  }
  throw InputError(fmt::format("unknown device family '{}'", family));
}

std::vector<SurveyCase> expand_survey(const SurveyRequest& request) {
  // The readout settings are refused once for the survey, by the one options builder, not per run.
  {
    PlanSettings probe;
    probe.qubits = 1;
    probe.measure = request.measure;
    probe.readout = request.readout;
    plan_options(probe);
  }
  const long long total = static_cast<long long>(request.devices.size()) * request.strategies.size() *
                          request.networks.size() * request.approx.size() * request.directions.size() * request.sizes.size();
  if (total > kMaxCases)
    throw InputError(fmt::format("the survey has {} runs, more than the limit of {}; split it up", total, kMaxCases));
  std::vector<SurveyCase> cases;
  cases.reserve(static_cast<std::size_t>(total));
  for (int e = 0; e < static_cast<int>(request.devices.size()); ++e)
    for (const auto& strategy : request.strategies)
      for (const auto& network : request.networks)
        for (const auto& approx : request.approx)
          for (const bool inverse : request.directions)
            for (const int n : request.sizes) {
              SurveyCase c;
              c.index = static_cast<long long>(cases.size());
              c.entry = e;
              c.qubits = n;
              c.approx = approx;
              c.inverse = inverse;
              c.strategy = strategy;
              c.network = network;
              cases.push_back(std::move(c));
            }
  return cases;
}

std::vector<SurveyCase> shard_cases(const std::vector<SurveyCase>& all, SurveyShard shard) {
  std::vector<SurveyCase> out;
  for (const auto& c : all)
    if (c.index % shard.m == shard.k - 1) out.push_back(c);
  return out;
}

std::string survey_fingerprint(const SurveyRequest& request) {
  // FNV-1a, 64 bits (Fowler, Noll and Vo; parameters as in IETF draft-eastlake-fnv): a stable hash
  // of a canonical description, identical on every host that runs the same survey.
  std::string text = fmt::format("seed={};", request.seed);
  for (const auto& d : request.devices) text += "device=" + d.label + ";";
  for (const int n : request.sizes) text += fmt::format("n={};", n);
  for (const auto& a : request.approx) text += "approx=" + a.text() + ";";
  for (const bool inv : request.directions) text += inv ? "dir=inverse;" : "dir=forward;";
  for (const auto& s : request.strategies) text += "strategy=" + s + ";";
  // Only a network list other than the default enters, so that older surveys keep their fingerprint.
  if (request.networks != std::vector<std::string>{"auto"})
    for (const auto& w : request.networks) text += "network=" + w + ";";
  // The profile's values (not its file name): shards calibrated alike merge, others do not. A survey
  // without a profile keeps the fingerprint it always had.
  if (request.calibration) {
    const CalibrationValues& c = request.calibration->values;
    const std::pair<const char*, const std::optional<double>*> fields[] = {
        {"error_1q", &c.error_1q},         {"error_2q", &c.error_2q}, {"error_readout", &c.error_readout},
        {"duration_1q_ns", &c.duration_1q_ns}, {"duration_2q_ns", &c.duration_2q_ns}, {"t1_us", &c.t1_us},
        {"t2_us", &c.t2_us}};
    for (const auto& [key, value] : fields)
      if (*value) text += fmt::format("calibration.{}={};", key, **value);
  }
  std::uint64_t h = 14695981039346656037ull;
  for (const unsigned char ch : text) {
    h ^= ch;
    h *= 1099511628211ull;
  }
  return fmt::format("{:016x}", h);
}

void check_strategy_names(const std::vector<std::string>& names) {
  for (const auto& name : names) {
    try {
      find_strategy(name);
    } catch (const InputError& e) {
      throw SettingError("strategy", std::string(": ") + e.what());
    }
  }
}

void check_network_names(const std::vector<std::string>& names) {
  for (const auto& name : names) {
    try {
      parse_network_choice(name);
    } catch (const InputError& e) {
      throw SettingError("network", std::string(": ") + e.what());
    }
  }
}

}  // namespace qftplan
