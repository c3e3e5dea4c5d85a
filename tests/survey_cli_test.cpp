// `qftplan survey` and `qftplan merge` end to end: every CSV row equals a single `qftplan plan` of the
// same settings, failed runs are rows, shards merge into the unsharded run byte for byte, the order
// does not depend on --jobs, progress stays off when standard error is not a terminal.

#include <gtest/gtest.h>

#include <cstdlib>
#include <filesystem>
#include <map>

#include <nlohmann/json.hpp>

#include "svg_probe.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

using testing::read_file;
using testing::run_qftplan;
using testing::source_dir;
using testing::temp_dir;
using testing::write_file;

std::string quoted(const std::filesystem::path& p) { return "'" + p.string() + "'"; }
std::string topo(const std::string& name) { return quoted(source_dir() / "topologies" / name); }

// A CSV reader following RFC 4180 (Shafranovich, 2005, section 2): CRLF or LF line ends, fields in
// double quotes may hold commas, quotes (doubled) and line breaks.
std::vector<std::vector<std::string>> parse_csv(const std::string& text) {
  std::vector<std::vector<std::string>> rows;
  std::vector<std::string> row;
  std::string field;
  bool quoted_field = false, in_quotes = false, any = false;
  for (std::size_t i = 0; i < text.size(); ++i) {
    const char c = text[i];
    if (in_quotes) {
      if (c == '"' && i + 1 < text.size() && text[i + 1] == '"') field += '"', ++i;
      else if (c == '"') in_quotes = false;
      else field += c;
      continue;
    }
    if (c == '"' && field.empty() && !quoted_field) {
      in_quotes = quoted_field = true;
      any = true;
    } else if (c == ',') {
      row.push_back(field), field.clear(), quoted_field = false, any = true;
    } else if (c == '\r' && i + 1 < text.size() && text[i + 1] == '\n') {
      continue;
    } else if (c == '\n') {
      row.push_back(field), rows.push_back(row), row.clear(), field.clear(), quoted_field = false, any = false;
    } else {
      field += c, any = true;
    }
  }
  if (any || !field.empty()) row.push_back(field), rows.push_back(row);
  return rows;
}

// Rows as maps from column name to text.
std::vector<std::map<std::string, std::string>> csv_records(const std::string& text) {
  const auto rows = parse_csv(text);
  std::vector<std::map<std::string, std::string>> out;
  if (rows.empty()) return out;
  for (std::size_t r = 1; r < rows.size(); ++r) {
    EXPECT_EQ(rows[r].size(), rows[0].size()) << "row " << r;
    std::map<std::string, std::string> m;
    for (std::size_t c = 0; c < rows[0].size() && c < rows[r].size(); ++c) m[rows[0][c]] = rows[r][c];
    out.push_back(m);
  }
  return out;
}

// Python's csv module (a general-purpose parser of the same format) reads the file into the same
// fields, when Debian's python3 is there.
void expect_python_csv_agrees(const std::filesystem::path& csv_path) {
  if (!std::filesystem::exists("/usr/bin/python3")) return;
  const auto dir = temp_dir();
  const auto out = dir / "fields.json";
  const std::string cmd = "/usr/bin/python3 -c 'import csv,json,sys; json.dump(list(csv.reader(open(sys.argv[1], newline=\"\"))), "
                          "open(sys.argv[2], \"w\"))' " + quoted(csv_path) + " " + quoted(out);
  ASSERT_EQ(std::system(cmd.c_str()), 0);
  const auto theirs = nlohmann::json::parse(read_file(out)).get<std::vector<std::vector<std::string>>>();
  EXPECT_EQ(theirs, parse_csv(read_file(csv_path)));
  std::filesystem::remove_all(dir);
}

class SurveyRun : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    dir_ = new std::filesystem::path(temp_dir());
    csv_ = new std::string(read_or_run());
  }
  static void TearDownTestSuite() {
    std::filesystem::remove_all(*dir_);
    delete dir_;
    delete csv_;
  }
  // Line, grid and heavy-hexagon families, a calibrated bundled chip (too small for 24), two
  // approximation settings and both directions.
  static std::string args() {
    return "survey line:* grid:* heavy-hex:* " + topo("harbor-noisy-20.yaml") +
           " --qubits 3,8:24:8 --approx none,3 --direction both --jobs 2";
  }
  static std::string read_or_run() {
    const auto csv = *dir_ / "s.csv";
    const auto r = run_qftplan(args() + " --csv " + quoted(csv) + " --svg " + quoted(*dir_ / "s.svg"));
    EXPECT_EQ(r.status, 0) << r.err;
    table_ = new std::string(r.out);
    err_ = new std::string(r.err);
    return read_file(csv);
  }
  static std::filesystem::path* dir_;
  static std::string* csv_;
  static std::string* table_;
  static std::string* err_;
};
std::filesystem::path* SurveyRun::dir_ = nullptr;
std::string* SurveyRun::csv_ = nullptr;
std::string* SurveyRun::table_ = nullptr;
std::string* SurveyRun::err_ = nullptr;

// The check: every row of the CSV equals a single `qftplan plan` with the same settings.
TEST_F(SurveyRun, EveryRowMatchesASinglePlan) {
  const auto rows = csv_records(*csv_);
  ASSERT_EQ(rows.size(), 4u * 4 * 2 * 2);
  int planned = 0;
  for (const auto& row : rows) {
    if (row.at("status") != "ok") continue;
    ++planned;
    std::string dev = row.at("device");
    if (row.at("series") == "harbor-noisy-20") dev = topo("harbor-noisy-20.yaml");
    const std::string cmd = "plan --device " + dev + " --qubits " + row.at("qubits") + " --approx " + row.at("asked_approx") +
                            (row.at("inverse") == "true" ? " --inverse" : "") + " --report -";
    const auto r = run_qftplan(cmd);
    ASSERT_EQ(r.status, 0) << cmd << "\n" << r.err;
    const auto rep = nlohmann::json::parse(r.out);
    SCOPED_TRACE(cmd);
    EXPECT_EQ(rep["device"].get<std::string>(), row.at("device"));
    EXPECT_EQ(rep["strategy"].get<std::string>(), row.at("strategy"));
    EXPECT_EQ(rep["network"].get<std::string>(), row.at("network"));
    EXPECT_EQ(rep["approx_degree"].is_null() ? "" : std::to_string(rep["approx_degree"].get<int>()), row.at("approx_degree"));
    for (const auto& [report_field, column] : std::vector<std::pair<std::string, std::string>>{
             {"swaps", "swaps"}, {"two_qubit_blocks", "blocks"}, {"rotations", "rotations"}, {"depth_2q", "depth_2q"},
             {"cx_count", "cx_count"}, {"cx_depth", "cx_depth"}})
      EXPECT_EQ(std::to_string(rep[report_field].get<long long>()), row.at(column)) << column;
    if (rep["calibrated"].get<bool>()) EXPECT_DOUBLE_EQ(rep["esp"].get<double>(), std::stod(row.at("esp")));
    else EXPECT_EQ(row.at("esp"), "");
  }
  EXPECT_GT(planned, 50);
}

// Figures against published counts, independent of our code: the exact QFT has n(n-1)/2 controlled
// rotations (Nielsen & Chuang 2000, section 5.1), and on a chain the linear-nearest-neighbour
// network takes n(n-1)/2 fused blocks in 2n-3 layers (Fowler, Devitt and Hollenberg, Quantum Inf.
// Comput. 4, 237, 2004). The bounds: blocks >= rotations; depth >= n-1 (derived in plan.cpp).
TEST_F(SurveyRun, FiguresAgreeWithPublishedCounts) {
  for (const auto& row : csv_records(*csv_)) {
    if (row.at("status") != "ok") continue;
    const long long n = std::stoll(row.at("qubits"));
    SCOPED_TRACE(row.at("device") + " n=" + row.at("qubits") + " approx " + row.at("asked_approx"));
    if (row.at("asked_approx") == "none") {
      EXPECT_EQ(std::stoll(row.at("rotations")), n * (n - 1) / 2);
      EXPECT_EQ(std::stoll(row.at("lower_bound_blocks")), n * (n - 1) / 2);
      if (row.at("network") == "reversal" && row.at("strategy") == "chain") {
        EXPECT_EQ(std::stoll(row.at("blocks")), n * (n - 1) / 2);
        EXPECT_EQ(std::stoll(row.at("depth_2q")), 2 * n - 3);
      }
    }
    EXPECT_EQ(std::stoll(row.at("lower_bound_depth_2q")), n - 1);
    EXPECT_GE(std::stoll(row.at("blocks")), std::stoll(row.at("lower_bound_blocks")));
    EXPECT_GE(std::stoll(row.at("depth_2q")), std::stoll(row.at("lower_bound_depth_2q")));
    EXPECT_DOUBLE_EQ(std::stod(row.at("depth_2q_ratio")),
                     static_cast<double>(std::stoll(row.at("depth_2q"))) / static_cast<double>(n - 1));
  }
}

TEST_F(SurveyRun, RunsThatCannotBePlannedAreRowsWithTheirReason) {
  int failed = 0;
  for (const auto& row : csv_records(*csv_)) {
    if (row.at("status") == "ok") continue;
    ++failed;
    EXPECT_EQ(row.at("series"), "harbor-noisy-20");
    EXPECT_EQ(row.at("qubits"), "24");
    EXPECT_NE(row.at("reason").find("fewer than the 24 requested"), std::string::npos) << row.at("reason");
    EXPECT_EQ(row.at("swaps"), "");
  }
  EXPECT_EQ(failed, 4);  // two degrees x two directions
  EXPECT_NE(table_->find("failed: device harbor-noisy-20 has 20 qubits"), std::string::npos) << *table_;
  EXPECT_NE(table_->find("64 runs: 60 planned, 4 failed"), std::string::npos) << *table_;
}

TEST_F(SurveyRun, CsvReadsTheSameWithPythonsCsvModule) { expect_python_csv_agrees(*dir_ / "s.csv"); }

// Progress goes to standard error only when it is a terminal; here it is a file.
TEST_F(SurveyRun, NoProgressWhenStandardErrorIsNotATerminal) { EXPECT_EQ(*err_, ""); }

TEST_F(SurveyRun, ChartsAreWellFormedAndNameEverySeries) {
  const std::string svg = read_file(*dir_ / "s.svg");
  for (const std::string name : {"line:*", "grid:*", "heavy-hex:*", "harbor-noisy-20", "CX count (native two-qubit gates)",
                                 "Native two-qubit depth against register size", "Estimated success probability"})
    EXPECT_NE(svg.find(name), std::string::npos) << name;
  // Each setting (two degrees times two directions) has its own panel in each of the three groups,
  // titled by the setting; the series are the device entries alone.
  std::vector<std::string> group_svg;
  for (std::size_t at = svg.find("<g class=\"chart-group\">"); at != std::string::npos; at = svg.find("<g class=\"chart-group\">", at + 1))
    group_svg.push_back(svg.substr(at, svg.find("<g class=\"chart-group\">", at + 1) - at));
  ASSERT_EQ(group_svg.size(), 3u);
  for (const auto& g : group_svg) {
    std::size_t panels = 0;
    for (std::size_t at = g.find("<g class=\"chart\">"); at != std::string::npos; at = g.find("<g class=\"chart\">", at + 1)) ++panels;
    EXPECT_EQ(panels, 4u);
    for (const std::string setting : {">forward, exact<", ">inverse, exact<", ">forward, degree 3<", ">inverse, degree 3<"})
      EXPECT_NE(g.find(setting), std::string::npos) << setting;
    // The panels share their axes: every panel's y ticks read the same.
    std::vector<std::string> yticks;
    for (std::size_t at = g.find("<g class=\"y-ticks\">"); at != std::string::npos; at = g.find("<g class=\"y-ticks\">", at + 1)) {
      std::string labels;
      for (const auto& t : testing::elements(g.substr(at, g.find("</g>", at) - at), "text")) labels += testing::text_of(t) + " ";
      yticks.push_back(labels);
    }
    ASSERT_EQ(yticks.size(), 4u);
    for (const auto& y : yticks) EXPECT_EQ(y, yticks[0]);
  }
  EXPECT_EQ(svg.find("grid:*, degree 3, inverse"), std::string::npos);
  // An independent XML parser (libxml2's xmllint) accepts the file, when installed.
  if (std::filesystem::exists("/usr/bin/xmllint"))
    EXPECT_EQ(std::system(("/usr/bin/xmllint --noout " + quoted(*dir_ / "s.svg")).c_str()), 0);
}

// Shards 1/3, 2/3, 3/3 merged give the unsharded CSV, JSON lines and table byte for byte (without
// the wall-time column, which no two runs share).
TEST(SurveyShards, MergedShardsEqualTheWholeSurvey) {
  const auto dir = temp_dir();
  const std::string base = "survey line:* ring:* " + topo("harbor-hex-21.yaml") + " --qubits 4:16:3 --approx none,auto --no-timing";
  const auto whole = run_qftplan(base + " --jobs 2 --csv " + quoted(dir / "whole.csv") + " --jsonl " + quoted(dir / "whole.jsonl"));
  ASSERT_EQ(whole.status, 0) << whole.err;
  std::string shard_files;
  for (int k = 1; k <= 3; ++k) {
    const auto f = dir / ("part" + std::to_string(k) + ".jsonl");
    const auto r = run_qftplan(base + " --jobs 1 --shard " + std::to_string(k) + "/3 --quiet --jsonl " + quoted(f));
    ASSERT_EQ(r.status, 0) << r.err;
    shard_files += " " + quoted(f);
  }
  // Given in another order than 1, 2, 3: the merge sorts by index.
  const auto merged = run_qftplan("merge " + quoted(dir / "part3.jsonl") + " " + quoted(dir / "part1.jsonl") + " " +
                                  quoted(dir / "part2.jsonl") + " --no-timing --csv " + quoted(dir / "merged.csv") +
                                  " --jsonl " + quoted(dir / "merged.jsonl"));
  ASSERT_EQ(merged.status, 0) << merged.err;
  EXPECT_EQ(read_file(dir / "merged.csv"), read_file(dir / "whole.csv"));
  EXPECT_EQ(read_file(dir / "merged.jsonl"), read_file(dir / "whole.jsonl"));
  EXPECT_EQ(merged.out, whole.out);

  // A shard left out is an error naming what is missing, unless asked to merge what is there.
  const auto partial = run_qftplan("merge " + quoted(dir / "part1.jsonl") + " " + quoted(dir / "part2.jsonl") + " --quiet");
  EXPECT_EQ(partial.status, 2);
  EXPECT_NE(partial.err.find("missing rows include 2, 5"), std::string::npos) << partial.err;
  EXPECT_EQ(run_qftplan("merge " + quoted(dir / "part1.jsonl") + " --allow-missing --quiet").status, 0);

  // Shards of another survey do not mix.
  const auto other = dir / "other.jsonl";
  ASSERT_EQ(run_qftplan("survey line:* --qubits 4:16:3 --shard 1/3 --quiet --jsonl " + quoted(other)).status, 0);
  const auto mixed = run_qftplan("merge " + quoted(dir / "part2.jsonl") + " " + quoted(other) + " --quiet");
  EXPECT_EQ(mixed.status, 2);
  EXPECT_NE(mixed.err.find("merge only shards of one survey"), std::string::npos) << mixed.err;
  std::filesystem::remove_all(dir);
}

TEST(SurveyShards, OrderDoesNotDependOnTheNumberOfThreads) {
  const auto dir = temp_dir();
  const std::string base = "survey grid:* heavy-hex:* --qubits 2:14 --direction both --no-timing --quiet --csv ";
  ASSERT_EQ(run_qftplan(base + quoted(dir / "j1.csv") + " --jobs 1").status, 0);
  ASSERT_EQ(run_qftplan(base + quoted(dir / "j3.csv") + " --jobs 3").status, 0);
  EXPECT_EQ(read_file(dir / "j1.csv"), read_file(dir / "j3.csv"));
  std::filesystem::remove_all(dir);
}

TEST(SurveyInput, BadInputExitsTwoWithAMessage) {
  struct Case {
    std::string args, message;
  };
  for (const auto& c : std::vector<Case>{
           {"survey line:* --qubits 4:2", "--qubits: '4:2' ends before it starts"},
           {"survey line:* --qubits 4 --shard 3/2", "--shard: '3/2' is not K/M"},
           {"survey line:* --qubits 4 --approx 0", "--approx 0 is outside 1 .. 16384"},
           {"survey line:* --qubits 4 --strategy chian", "unknown strategy 'chian'"},
           {"survey torus:* --qubits 4", "unknown family 'torus'"},
           {"survey /nonexistent/chip.yaml --qubits 4", "/nonexistent/chip.yaml"},
           {"survey line:* --qubits 4 --direction sideways", "--direction expects forward, inverse or both"},
       }) {
    const auto r = run_qftplan(c.args);
    EXPECT_EQ(r.status, 2) << c.args;
    EXPECT_NE(r.err.find(c.message), std::string::npos) << c.args << "\n" << r.err;
  }
  // A broken line of JSON lines names file, line and column.
  const auto dir = temp_dir();
  const auto f = dir / "broken.jsonl";
  ASSERT_EQ(run_qftplan("survey line:* --qubits 3:4 --quiet --jsonl " + quoted(f)).status, 0);
  write_file(f, read_file(f) + "{\"survey\": oops}\n");
  const auto r = run_qftplan("merge " + quoted(f));
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.err.find(f.string() + ":3:"), std::string::npos) << r.err;
  std::filesystem::remove_all(dir);
}

// With standard error on a terminal (a pseudo-terminal from script(1), when installed) the
// progress line appears there.
TEST(SurveyProgressLine, DrawnWhenStandardErrorIsATerminal) {
  if (!std::filesystem::exists("/usr/bin/script")) GTEST_SKIP() << "script(1) not installed";
  const auto dir = temp_dir();
  const auto log = dir / "typescript";
  const std::string inner = std::string("'") + QFTPLAN_BINARY + "' survey line:* --qubits 2:40 --quiet --jobs 1";
  const std::string cmd = "/usr/bin/script -qec \"" + inner + "\" " + quoted(log) + " >/dev/null 2>&1 </dev/null";
  ASSERT_EQ(std::system(cmd.c_str()), 0);
  const std::string seen = read_file(log);
  EXPECT_NE(seen.find("survey "), std::string::npos) << seen;
  EXPECT_NE(seen.find("/39 runs"), std::string::npos) << seen;
  std::filesystem::remove_all(dir);
}

}  // namespace
}  // namespace qftplan
