// `qftplan survey --network LIST` (issue 19, item 5): degrees and chain networks compared in one survey.
// Every planned row's CX count equals the `cx` statements of the OpenQASM file `qftplan plan` writes for
// the same settings (and n^2 - 1 for the exact parity network, the published count); a network that
// does not apply to a run is a failed row with plan's own message; the chart draws one series per
// (network, degree) in one panel, each named in the legend.

#include <gtest/gtest.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <map>
#include <set>
#include <sstream>

#include <nlohmann/json.hpp>

#include "qftplan/survey/survey_output.hpp"
#include "svg_probe.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

using testing::read_file;
using testing::run_qftplan;
using testing::temp_dir;

std::string quoted(const std::filesystem::path& p) { return "'" + p.string() + "'"; }

// The fields of a CSV line without quoted fields (none of this survey's fields holds a comma except
// the reason, which is quoted and read separately below): enough for the header and the figures.
std::vector<std::string> split_csv_line(const std::string& line) {
  std::vector<std::string> out;
  std::string field;
  bool quotes = false;
  for (std::size_t i = 0; i < line.size(); ++i) {
    const char c = line[i];
    if (quotes) {
      if (c == '"' && i + 1 < line.size() && line[i + 1] == '"') field += '"', ++i;
      else if (c == '"') quotes = false;
      else field += c;
    } else if (c == '"') {
      quotes = true;
    } else if (c == ',') {
      out.push_back(field), field.clear();
    } else if (c != '\r') {
      field += c;
    }
  }
  out.push_back(field);
  return out;
}

std::vector<std::map<std::string, std::string>> csv_records(const std::string& text) {
  std::istringstream in(text);
  std::string line;
  std::getline(in, line);
  const auto header = split_csv_line(line);
  std::vector<std::map<std::string, std::string>> rows;
  while (std::getline(in, line)) {
    if (line.empty() || line == "\r") continue;
    const auto f = split_csv_line(line);
    EXPECT_EQ(f.size(), header.size()) << line;
    std::map<std::string, std::string> m;
    for (std::size_t i = 0; i < header.size() && i < f.size(); ++i) m[header[i]] = f[i];
    rows.push_back(m);
  }
  return rows;
}

// Gate statements named `cx` in an OpenQASM 3 file: a gate call is the gate's name, its operands and
// a semicolon, one statement per line as qftplan writes them (OpenQASM 3 specification, "Gates",
// gate applications; cx is a gate of the standard library stdgates.inc).
long long cx_statements(const std::filesystem::path& qasm) {
  std::ifstream in(qasm);
  std::string line;
  long long n = 0;
  while (std::getline(in, line)) {
    const auto at = line.find_first_not_of(" \t");
    if (at != std::string::npos && line.compare(at, 3, "cx ") == 0) ++n;
  }
  return n;
}

// The text of attribute `name` of an element ("" when absent).
std::string attribute_text(const std::string& element, const std::string& name) {
  const std::string key = " " + name + "=\"";
  const auto at = element.find(key);
  if (at == std::string::npos) return {};
  const auto from = at + key.size();
  return element.substr(from, element.find('"', from) - from);
}

const std::vector<std::string> kNetworks = {"insertion", "parity-insertion", "leapfrog", "auto"};
const std::vector<std::string> kDegrees = {"3", "6", "none"};
const std::vector<int> kSizes = {16, 32, 48, 64};

class SurveyNetworks : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    dir_ = new std::filesystem::path(temp_dir());
    const auto r = run_qftplan("survey line:* --qubits 16:64:16 --approx 3,6,none --network "
                               "insertion,parity-insertion,leapfrog,auto --jobs 2 --no-timing --csv " +
                               quoted(*dir_ / "s.csv") + " --jsonl " + quoted(*dir_ / "s.jsonl") + " --svg " +
                               quoted(*dir_ / "s.svg"));
    EXPECT_EQ(r.status, 0) << r.err;
    table_ = new std::string(r.out);
  }
  static void TearDownTestSuite() {
    std::filesystem::remove_all(*dir_);
    delete dir_;
    delete table_;
  }
  static std::vector<std::map<std::string, std::string>> rows() { return csv_records(read_file(*dir_ / "s.csv")); }
  static std::filesystem::path* dir_;
  static std::string* table_;
};
std::filesystem::path* SurveyNetworks::dir_ = nullptr;
std::string* SurveyNetworks::table_ = nullptr;

// The runs come in the documented order (network outside degree outside size), each naming the
// network asked for beside the one planned.
TEST_F(SurveyNetworks, RowsNameTheNetworkAskedForInOrder) {
  const auto rs = rows();
  ASSERT_EQ(rs.size(), kNetworks.size() * kDegrees.size() * kSizes.size());
  std::size_t i = 0;
  for (const auto& w : kNetworks)
    for (const auto& a : kDegrees)
      for (const int n : kSizes) {
        const auto& r = rs[i++];
        EXPECT_EQ(r.at("asked_network"), w);
        EXPECT_EQ(r.at("asked_approx"), a);
        EXPECT_EQ(r.at("qubits"), std::to_string(n));
        // A named network is planned as named, never replaced by another (issue 19, targets).
        if (r.at("status") == "ok" && w != "auto") EXPECT_EQ(r.at("network"), w) << w << " " << a << " " << n;
      }
  // The JSON lines carry the same field.
  std::istringstream jl(read_file(*dir_ / "s.jsonl"));
  std::string line;
  std::size_t k = 0;
  while (std::getline(jl, line)) {
    const auto j = nlohmann::json::parse(line);
    EXPECT_EQ(j.at("asked_network").get<std::string>(), rs[k++].at("asked_network"));
  }
  EXPECT_EQ(k, rs.size());
}

// The check: every planned row's CX count equals `qftplan plan` run by hand with the same
// settings, counted independently as the `cx` statements of the OpenQASM file it writes; the exact
// QFT on the parity network takes n^2 - 1 CNOTs (Klaver, Rombouts, Fellner, Messinger, Ender, Ludwig,
// Lechner, "SWAP-less Implementation of Quantum Algorithms", arXiv:2408.10907, 2024).
TEST_F(SurveyNetworks, CxCountsEqualTheCxStatementsOfSinglePlans) {
  int planned = 0;
  for (const auto& r : rows()) {
    if (r.at("status") != "ok") continue;
    ++planned;
    const auto qasm = *dir_ / "p.qasm";
    const std::string cmd = "plan --device " + r.at("device") + " --qubits " + r.at("qubits") + " --approx " +
                            r.at("asked_approx") + " --network " + r.at("asked_network") + " --output " + quoted(qasm) +
                            " --report -";
    SCOPED_TRACE(cmd);
    const auto p = run_qftplan(cmd);
    ASSERT_EQ(p.status, 0) << p.err;
    const auto rep = nlohmann::json::parse(p.out);
    EXPECT_EQ(rep.at("network").get<std::string>(), r.at("network"));
    EXPECT_EQ(std::to_string(cx_statements(qasm)), r.at("cx_count"));
    EXPECT_EQ(std::to_string(rep.at("cx_depth").get<long long>()), r.at("cx_depth"));
    if (r.at("network") == "parity" && r.at("asked_approx") == "none") {
      const long long n = std::stoll(r.at("qubits"));
      EXPECT_EQ(std::stoll(r.at("cx_count")), n * n - 1);  // auto's choice today; pinned by name below
    }
  }
  EXPECT_EQ(planned, 36);  // 48 runs less the 12 refused ones below
}

// The parity network asked for by name, exact QFT: n^2 - 1 CNOTs (Klaver et al., arXiv:2408.10907,
// 2024, as above), in the survey row and in the OpenQASM file plan writes.
TEST(SurveyNetworkCounts, ParityNetworkRowsTakeNSquaredLessOneCx) {
  const auto dir = temp_dir();
  const auto r = run_qftplan("survey line:* --qubits 16,64 --network parity --jobs 1 --no-timing --csv " +
                             quoted(dir / "s.csv"));
  ASSERT_EQ(r.status, 0) << r.err;
  const auto rs = csv_records(read_file(dir / "s.csv"));
  ASSERT_EQ(rs.size(), 2u);
  for (const auto& row : rs) {
    const long long n = std::stoll(row.at("qubits"));
    EXPECT_EQ(row.at("network"), "parity");
    EXPECT_EQ(std::stoll(row.at("cx_count")), n * n - 1);
    const auto p = run_qftplan("plan --device line:" + row.at("qubits") + " --qubits " + row.at("qubits") +
                               " --network parity --output " + quoted(dir / "p.qasm"));
    ASSERT_EQ(p.status, 0) << p.err;
    EXPECT_EQ(cx_statements(dir / "p.qasm"), n * n - 1);
  }
  std::filesystem::remove_all(dir);
}

// leapfrog, insertion and parity-insertion exist for approximate degrees only: those runs of the exact
// QFT are failed rows whose reason is the message `qftplan plan` gives for the same settings, and the
// survey goes on.
TEST_F(SurveyNetworks, ANetworkThatDoesNotApplyIsAFailedRowWithPlansMessage) {
  int failed = 0;
  for (const auto& r : rows()) {
    const bool applies = r.at("asked_approx") != "none" || r.at("asked_network") == "auto";
    EXPECT_EQ(r.at("status"), applies ? "ok" : "failed") << r.at("asked_network") << " " << r.at("asked_approx");
    if (applies) continue;
    ++failed;
    EXPECT_EQ(r.at("cx_count"), "");
    EXPECT_EQ(r.at("network"), "");
    EXPECT_NE(r.at("reason").find(r.at("asked_network")), std::string::npos) << r.at("reason");
    const auto p = run_qftplan("plan --device line:" + r.at("qubits") + " --qubits " + r.at("qubits") +
                               " --approx none --network " + r.at("asked_network"));
    EXPECT_NE(p.status, 0);
    EXPECT_NE(p.err.find(r.at("reason")), std::string::npos) << p.err << "\nrow: " << r.at("reason");
  }
  EXPECT_EQ(failed, 12);
  EXPECT_NE(table_->find("line:*  (forward, exact, strategy auto, network leapfrog)"), std::string::npos) << *table_;
  EXPECT_NE(table_->find("48 runs: 36 planned, 12 failed"), std::string::npos) << *table_;
}

// The chart compares them all in one panel per quantity: a series per (network, degree) that was
// planned, named by both in the legend, each in its own colour and marker; the three that were never
// planned are named in the subheading instead of vanishing.
TEST_F(SurveyNetworks, OneChartHasASeriesPerNetworkAndDegree) {
  const std::string svg = read_file(*dir_ / "s.svg");
  std::vector<std::string> groups;
  const std::string open = "<g class=\"chart-group\">";
  for (std::size_t at = svg.find(open); at != std::string::npos; at = svg.find(open, at + 1))
    groups.push_back(svg.substr(at, svg.find(open, at + 1) - at));
  ASSERT_EQ(groups.size(), 2u);  // CX count and two-qubit depth (no calibration: no ESP)
  for (const auto& g : groups) {
    std::size_t panels = 0;
    for (std::size_t at = g.find("<g class=\"chart\">"); at != std::string::npos; at = g.find("<g class=\"chart\">", at + 1))
      ++panels;
    EXPECT_EQ(panels, 1u);
    std::set<std::string> texts;
    for (const auto& t : testing::elements(g, "text")) texts.insert(testing::text_of(t));
    int series = 0;
    for (const auto& w : kNetworks)
      for (const auto& a : kDegrees) {
        const std::string name = "network " + w + ", " + (a == "none" ? "exact" : "degree " + a);
        const bool planned = a != "none" || w == "auto";
        EXPECT_EQ(texts.count(name), planned ? 1u : 0u) << name;
        series += planned ? 1 : 0;
      }
    EXPECT_EQ(series, 9);
    // One drawn line per series in the plot area, each through its four register sizes, and no two
    // alike in colour and dash pattern (two series drawn alike would read as one).
    const auto at = g.find("<g class=\"lines\">");
    ASSERT_NE(at, std::string::npos);
    const auto lines = testing::elements(g.substr(at, g.find("<g class=\"markers\">", at) - at), "polyline");
    EXPECT_EQ(lines.size(), 9u);
    std::set<std::pair<std::string, std::string>> looks;
    for (const auto& l : lines) {
      looks.insert({attribute_text(l, "stroke"), attribute_text(l, "stroke-dasharray")});
      const std::string points = attribute_text(l, "points");
      EXPECT_EQ(std::count(points.begin(), points.end(), ','), 4) << points;
    }
    EXPECT_EQ(looks.size(), 9u);
  }
  for (const std::string missing : {"network insertion, exact", "network parity-insertion, exact", "network leapfrog, exact"})
    EXPECT_NE(svg.find("not planned, so not drawn: network insertion, exact; network parity-insertion, exact; "
                       "network leapfrog, exact"),
              std::string::npos)
        << missing;
  if (std::filesystem::exists("/usr/bin/xmllint"))
    EXPECT_EQ(std::system(("/usr/bin/xmllint --noout " + quoted(*dir_ / "s.svg")).c_str()), 0);
}

// A strategy that builds its own circuit uses no chain network: naming one is refused for that run
// only, with the planner's reason, while the chain strategy of the same survey plans.
TEST(SurveyNetworkRefusals, AStrategyWithoutChainNetworksIsAFailedRow) {
  const auto dir = temp_dir();
  const auto r = run_qftplan("survey line:* --qubits 8 --approx 3 --strategy routed,chain --network insertion --jobs 1 "
                             "--no-timing --csv " + quoted(dir / "s.csv"));
  ASSERT_EQ(r.status, 0) << r.err;
  const auto rs = csv_records(read_file(dir / "s.csv"));
  ASSERT_EQ(rs.size(), 2u);
  EXPECT_EQ(rs[0].at("asked_strategy"), "routed");
  EXPECT_EQ(rs[0].at("status"), "failed");
  EXPECT_NE(rs[0].at("reason").find("insertion names a chain network, which the routed strategy does not use"),
            std::string::npos)
      << rs[0].at("reason");
  EXPECT_EQ(rs[1].at("status"), "ok");
  EXPECT_EQ(rs[1].at("network"), "insertion");
  std::filesystem::remove_all(dir);
}

TEST(SurveyNetworkRefusals, AnUnknownNetworkStopsTheSurveyBeforeAnyRun) {
  const auto r = run_qftplan("survey line:* --qubits 8 --network insertion,teleport --quiet");
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.err.find("--network"), std::string::npos) << r.err;
  EXPECT_NE(r.err.find("teleport"), std::string::npos) << r.err;
  EXPECT_EQ(r.out, "");
}

// The block construction in a survey (issue 19, item 5: degrees and networks in one chart): its rows
// carry the block length the plan report gives (the degree column would say "exact": the construction
// has no degree), the table names it, and the JSON lines read back the same; rows written before the
// field existed read as no block construction.
TEST(SurveyNetworkRows, BlockConstructionRowsCarryTheBlockLength) {
  const auto dir = temp_dir();
  const auto r = run_qftplan("survey line:24 --qubits 24 --approx 3,4 --network blockwise,auto --jobs 1 --no-timing --csv " +
                             quoted(dir / "b.csv") + " --jsonl " + quoted(dir / "b.jsonl"));
  ASSERT_EQ(r.status, 0) << r.err;
  const auto rs = csv_records(read_file(dir / "b.csv"));
  ASSERT_EQ(rs.size(), 4u);
  for (const auto& row : rs) {
    SCOPED_TRACE(row.at("asked_network") + " " + row.at("asked_approx"));
    ASSERT_EQ(row.at("status"), "ok");
    const auto p = run_qftplan("plan --device line:24 --qubits 24 --approx " + row.at("asked_approx") + " --network " +
                               row.at("asked_network") + " --report -");
    ASSERT_EQ(p.status, 0) << p.err;
    const auto rep = nlohmann::json::parse(p.out);
    EXPECT_EQ(rep.at("block_length").is_null() ? "" : std::to_string(rep.at("block_length").get<int>()),
              row.at("block_length"));
    if (row.at("asked_network") == "blockwise") {
      EXPECT_EQ(row.at("block_length"), row.at("asked_approx"));
      EXPECT_EQ(row.at("approx_degree"), "");
    } else {
      EXPECT_EQ(row.at("block_length"), "");
    }
  }
  EXPECT_NE(r.out.find("blocks of 3"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("blocks of 4"), std::string::npos) << r.out;
  const auto back = parse_survey_jsonl(read_file(dir / "b.jsonl"), "b.jsonl");
  ASSERT_EQ(back.size(), 4u);
  EXPECT_EQ(back[0].block_length, std::optional<int>(3));
  EXPECT_FALSE(back[2].block_length.has_value());
  auto j = survey_row_to_json(back[0], SurveyTiming::omit);
  j.erase("block_length");
  EXPECT_FALSE(parse_survey_jsonl(j.dump() + "\n", "old.jsonl").at(0).block_length.has_value());
  std::filesystem::remove_all(dir);
}

// Rows written before surveys took --network have no asked_network: they asked for auto, and merge
// reads them so.
TEST(SurveyNetworkRows, OlderRowsReadAsAuto) {
  SurveyRow row;
  row.survey = "0123456789abcdef";
  row.of = 1;
  row.series = row.device = "line:4";
  row.qubits = 4;
  row.asked_strategy = "auto";
  row.asked_approx = "none";
  row.asked_network = "insertion";
  auto j = survey_row_to_json(row, SurveyTiming::omit);
  EXPECT_EQ(parse_survey_jsonl(j.dump() + "\n", "new.jsonl").at(0).asked_network, "insertion");
  j.erase("asked_network");
  EXPECT_EQ(parse_survey_jsonl(j.dump() + "\n", "old.jsonl").at(0).asked_network, "auto");
}

}  // namespace
}  // namespace qftplan
