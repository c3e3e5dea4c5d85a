#include "qftplan/survey/survey_output.hpp"

#include <fstream>
#include <sstream>

#include <fmt/format.h>

#include "qftplan/core/input_error.hpp"

namespace qftplan {
namespace {

// Shortest text that reads back as the same double (fmt's default), so a value survives a trip
// through JSON lines and back into CSV unchanged.
std::string number(double v) { return fmt::format("{}", v); }

template <class T>
std::string optional_text(const std::optional<T>& v) {
  if (!v) return {};
  if constexpr (std::is_floating_point_v<T>) return number(*v);
  else return std::to_string(*v);
}

// RFC 4180, section 2, rules 6 and 7: fields holding a comma, a double quote or a line break are
// enclosed in double quotes, and a double quote inside is written twice.
std::string csv_field(const std::string& s) {
  if (s.find_first_of(",\"\r\n") == std::string::npos) return s;
  std::string out = "\"";
  for (const char c : s) {
    if (c == '"') out += '"';
    out += c;
  }
  return out + "\"";
}

// "ok", "time-limit" (planned, a search cut short) or "failed".
std::string status_text(const SurveyRow& r) { return !r.ok ? "failed" : r.cut_short ? "time-limit" : "ok"; }

template <class T>
nlohmann::ordered_json optional_json(const std::optional<T>& v) {
  return v ? nlohmann::ordered_json(*v) : nlohmann::ordered_json(nullptr);
}

}  // namespace

std::vector<std::string> survey_csv_columns(SurveyTiming timing) {
  std::vector<std::string> c = {"index", "series", "device", "device_qubits", "qubits", "asked_strategy", "asked_approx",
                                "inverse", "status", "strategy", "asked_network", "network", "approx_degree", "block_length", "swaps", "blocks",
                                "rotations", "depth_2q", "cx_count", "cx_depth", "esp", "log_esp",
                                "esp_total", "log_esp_total", "duration_ns",
                                "lower_bound_blocks", "lower_bound_depth_2q", "blocks_ratio", "depth_2q_ratio"};
  if (timing == SurveyTiming::include) c.push_back("elapsed_ms");
  c.push_back("reason");
  return c;
}

std::string survey_csv(const std::vector<SurveyRow>& rows, SurveyTiming timing) {
  std::string out;
  const auto columns = survey_csv_columns(timing);
  for (std::size_t i = 0; i < columns.size(); ++i) {
    if (i) out += ',';
    out += columns[i];
  }
  // RFC 4180 section 2 rule 1: lines end with CRLF.
  out += "\r\n";
  for (const auto& r : rows) {
    std::vector<std::string> f;
    f.push_back(std::to_string(r.index));
    f.push_back(r.series);
    f.push_back(r.device);
    f.push_back(std::to_string(r.device_qubits));
    f.push_back(std::to_string(r.qubits));
    f.push_back(r.asked_strategy);
    f.push_back(r.asked_approx);
    f.push_back(r.inverse ? "true" : "false");
    f.push_back(status_text(r));
    f.push_back(r.strategy);
    f.push_back(r.asked_network);
    f.push_back(r.network);
    const auto when_ok = [&](long long v) { return r.ok ? std::to_string(v) : std::string(); };
    f.push_back(optional_text(r.approx_degree));
    f.push_back(optional_text(r.block_length));
    f.push_back(when_ok(r.swaps));
    f.push_back(when_ok(r.blocks));
    f.push_back(when_ok(r.rotations));
    f.push_back(when_ok(r.depth_2q));
    f.push_back(when_ok(r.cx_count));
    f.push_back(when_ok(r.cx_depth));
    f.push_back(optional_text(r.esp));
    f.push_back(optional_text(r.log_esp));
    f.push_back(optional_text(r.esp_total));
    f.push_back(optional_text(r.log_esp_total));
    f.push_back(optional_text(r.duration_ns));
    f.push_back(when_ok(r.lower_bound_blocks));
    f.push_back(when_ok(r.lower_bound_depth_2q));
    f.push_back(optional_text(r.blocks_ratio));
    f.push_back(optional_text(r.depth_2q_ratio));
    if (timing == SurveyTiming::include) f.push_back(optional_text(r.elapsed_ms));
    f.push_back(r.reason);
    for (std::size_t i = 0; i < f.size(); ++i) {
      if (i) out += ',';
      out += csv_field(f[i]);
    }
    out += "\r\n";
  }
  return out;
}

nlohmann::ordered_json survey_row_to_json(const SurveyRow& r, SurveyTiming timing) {
  nlohmann::ordered_json j;
  j["schema_version"] = kSurveyRowSchemaVersion;
  j["survey"] = r.survey;
  j["index"] = r.index;
  j["of"] = r.of;
  j["series"] = r.series;
  j["device"] = r.device;
  j["device_qubits"] = r.device_qubits;
  j["qubits"] = r.qubits;
  j["asked_strategy"] = r.asked_strategy;
  j["asked_approx"] = r.asked_approx;
  j["inverse"] = r.inverse;
  j["status"] = status_text(r);
  const auto when_ok = [&](long long v) { return r.ok ? nlohmann::ordered_json(v) : nlohmann::ordered_json(nullptr); };
  j["strategy"] = r.ok ? nlohmann::ordered_json(r.strategy) : nlohmann::ordered_json(nullptr);
  j["asked_network"] = r.asked_network;
  j["network"] = r.ok ? nlohmann::ordered_json(r.network) : nlohmann::ordered_json(nullptr);
  j["approx_degree"] = optional_json(r.approx_degree);
  j["block_length"] = optional_json(r.block_length);
  j["swaps"] = when_ok(r.swaps);
  j["blocks"] = when_ok(r.blocks);
  j["rotations"] = when_ok(r.rotations);
  j["depth_2q"] = when_ok(r.depth_2q);
  j["cx_count"] = when_ok(r.cx_count);
  j["cx_depth"] = when_ok(r.cx_depth);
  j["esp"] = optional_json(r.esp);
  j["log_esp"] = optional_json(r.log_esp);
  j["esp_total"] = optional_json(r.esp_total);
  j["log_esp_total"] = optional_json(r.log_esp_total);
  j["duration_ns"] = optional_json(r.duration_ns);
  j["lower_bound_blocks"] = when_ok(r.lower_bound_blocks);
  j["lower_bound_depth_2q"] = when_ok(r.lower_bound_depth_2q);
  j["blocks_ratio"] = optional_json(r.blocks_ratio);
  j["depth_2q_ratio"] = optional_json(r.depth_2q_ratio);
  if (timing == SurveyTiming::include) j["elapsed_ms"] = optional_json(r.elapsed_ms);
  j["reason"] = r.reason.empty() ? nlohmann::ordered_json(nullptr) : nlohmann::ordered_json(r.reason);
  return j;
}

std::string survey_jsonl(const std::vector<SurveyRow>& rows, SurveyTiming timing) {
  std::string out;
  for (const auto& r : rows) out += survey_row_to_json(r, timing).dump() + "\n";
  return out;
}

namespace {

// Reads typed fields of one JSON-lines record, naming the file, line and field on a mismatch.
class RecordReader {
 public:
  RecordReader(const nlohmann::json& j, const std::string& file, int line) : j_(j), file_(file), line_(line) {}

  const nlohmann::json& field(const char* name, bool nullable) const {
    const auto it = j_.find(name);
    if (it == j_.end()) fail(fmt::format("missing field '{}'", name));
    if (it->is_null() && !nullable) fail(fmt::format("field '{}' is null", name));
    return *it;
  }
  std::string text(const char* name) const {
    const auto& v = field(name, false);
    if (!v.is_string()) fail(fmt::format("field '{}' must be text", name));
    return v.get<std::string>();
  }
  std::string text_or_empty(const char* name) const {
    const auto& v = field(name, true);
    if (v.is_null()) return {};
    if (!v.is_string()) fail(fmt::format("field '{}' must be text or null", name));
    return v.get<std::string>();
  }
  long long integer(const char* name) const {
    const auto& v = field(name, false);
    if (!v.is_number_integer()) fail(fmt::format("field '{}' must be a whole number", name));
    return v.get<long long>();
  }
  long long integer_or_zero(const char* name) const {
    const auto& v = field(name, true);
    if (v.is_null()) return 0;
    return integer(name);
  }
  std::optional<int> optional_int(const char* name, bool may_be_missing = false) const {
    if (may_be_missing && j_.find(name) == j_.end()) return std::nullopt;
    const auto& v = field(name, true);
    if (v.is_null()) return std::nullopt;
    return static_cast<int>(integer(name));
  }
  std::optional<double> optional_double(const char* name, bool may_be_missing = false) const {
    if (may_be_missing && j_.find(name) == j_.end()) return std::nullopt;
    const auto& v = field(name, true);
    if (v.is_null()) return std::nullopt;
    if (!v.is_number()) fail(fmt::format("field '{}' must be a number or null", name));
    return v.get<double>();
  }
  bool boolean(const char* name) const {
    const auto& v = field(name, false);
    if (!v.is_boolean()) fail(fmt::format("field '{}' must be true or false", name));
    return v.get<bool>();
  }
  [[noreturn]] void fail(const std::string& message) const { throw InputError(file_, line_, 0, message); }

 private:
  const nlohmann::json& j_;
  const std::string& file_;
  int line_;
};

}  // namespace

std::vector<SurveyRow> parse_survey_jsonl(const std::string& text, const std::string& name) {
  std::vector<SurveyRow> rows;
  std::size_t start = 0;
  int line_no = 0;
  while (start < text.size()) {
    std::size_t end = text.find('\n', start);
    if (end == std::string::npos) end = text.size();
    const std::string line = text.substr(start, end - start);
    start = end + 1;
    ++line_no;
    if (line.find_first_not_of(" \t\r") == std::string::npos) continue;
    nlohmann::json j;
    try {
      j = nlohmann::json::parse(line);
    } catch (const nlohmann::json::parse_error& e) {
      throw InputError(name, line_no, static_cast<int>(e.byte), "not a JSON object (a line of `qftplan survey --jsonl`)");
    }
    if (!j.is_object()) throw InputError(name, line_no, 1, "not a JSON object (a line of `qftplan survey --jsonl`)");
    const RecordReader rd(j, name, line_no);
    SurveyRow r;
    r.survey = rd.text("survey");
    r.index = rd.integer("index");
    r.of = rd.integer("of");
    if (r.index < 0 || r.of < 1 || r.index >= r.of) rd.fail(fmt::format("index {} is not within 0..of-1 (of = {})", r.index, r.of));
    r.series = rd.text("series");
    r.device = rd.text("device");
    r.device_qubits = static_cast<int>(rd.integer("device_qubits"));
    r.qubits = static_cast<int>(rd.integer("qubits"));
    r.asked_strategy = rd.text("asked_strategy");
    r.asked_approx = rd.text("asked_approx");
    r.inverse = rd.boolean("inverse");
    const std::string status = rd.text("status");
    if (status != "ok" && status != "failed" && status != "time-limit")
      rd.fail(fmt::format("status '{}' is not 'ok', 'time-limit' or 'failed'", status));
    r.ok = status != "failed";
    r.cut_short = status == "time-limit";
    r.strategy = rd.text_or_empty("strategy");
    // Rows written before surveys took --network have no such field: they all asked for auto.
    r.asked_network = j.contains("asked_network") ? rd.text("asked_network") : std::string("auto");
    r.network = rd.text_or_empty("network");
    r.approx_degree = rd.optional_int("approx_degree");
    // Rows written before surveys reported the block construction have no such field.
    r.block_length = rd.optional_int("block_length", true);
    r.swaps = rd.integer_or_zero("swaps");
    r.blocks = rd.integer_or_zero("blocks");
    r.rotations = rd.integer_or_zero("rotations");
    r.depth_2q = rd.integer_or_zero("depth_2q");
    r.cx_count = rd.integer_or_zero("cx_count");
    r.cx_depth = rd.integer_or_zero("cx_depth");
    r.esp = rd.optional_double("esp");
    r.log_esp = rd.optional_double("log_esp");
    r.esp_total = rd.optional_double("esp_total");
    r.log_esp_total = rd.optional_double("log_esp_total");
    r.duration_ns = rd.optional_double("duration_ns");
    r.lower_bound_blocks = rd.integer_or_zero("lower_bound_blocks");
    r.lower_bound_depth_2q = rd.integer_or_zero("lower_bound_depth_2q");
    r.blocks_ratio = rd.optional_double("blocks_ratio");
    r.depth_2q_ratio = rd.optional_double("depth_2q_ratio");
    // Written without it by --no-timing.
    r.elapsed_ms = rd.optional_double("elapsed_ms", true);
    r.reason = rd.text_or_empty("reason");
    rows.push_back(std::move(r));
  }
  return rows;
}

std::vector<SurveyRow> read_survey_jsonl(const std::string& path) {
  std::ifstream f(path, std::ios::binary);
  if (!f) throw InputError(path, 0, 0, "cannot open the file");
  std::ostringstream s;
  s << f.rdbuf();
  if (f.bad()) throw InputError(path, 0, 0, "cannot read the file");
  return parse_survey_jsonl(s.str(), path);
}

}  // namespace qftplan
