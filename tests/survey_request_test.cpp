// Survey requests: size lists, settings, family fitting, case order and shards.

#include <gtest/gtest.h>

#include <algorithm>
#include <set>

#include "qftplan/core/input_error.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/survey/survey_request.hpp"

namespace qftplan {
namespace {

TEST(SurveySizes, RangesStepsAndLists) {
  EXPECT_EQ(parse_size_list("4:16:4"), (std::vector<int>{4, 8, 12, 16}));
  EXPECT_EQ(parse_size_list("4:15:4"), (std::vector<int>{4, 8, 12}));  // the end is a bound, not a member
  EXPECT_EQ(parse_size_list("7"), (std::vector<int>{7}));
  EXPECT_EQ(parse_size_list("2:4"), (std::vector<int>{2, 3, 4}));
  EXPECT_EQ(parse_size_list("3,10:12,5"), (std::vector<int>{3, 10, 11, 12, 5}));
}

TEST(SurveySizes, BadTextNamesTheOptionAndTheItem) {
  for (const std::string bad : {"", "0", "4:2", "4:8:0", "a", "4::2", "1:2:3:4", "-3", "4,,5", "4:9999999"}) {
    try {
      parse_size_list(bad);
      ADD_FAILURE() << "accepted '" << bad << "'";
    } catch (const InputError& e) {
      EXPECT_NE(std::string(e.what()).find("--qubits"), std::string::npos) << e.what();
    }
  }
  EXPECT_THROW(parse_size_list("1:200000"), InputError);  // more than 100,000 sizes
}

TEST(SurveySettings, ApproxListsAndShards) {
  const auto a = parse_approx_list("none,3,auto,3");
  ASSERT_EQ(a.size(), 3u);  // duplicates dropped
  EXPECT_EQ(a[0].text(), "none");
  EXPECT_EQ(a[1].text(), "3");
  EXPECT_EQ(a[2].text(), "auto");
  EXPECT_THROW(parse_approx_list("0"), InputError);
  EXPECT_THROW(parse_approx_list("exact"), InputError);
  EXPECT_EQ(parse_shard("2/5").k, 2);
  EXPECT_EQ(parse_shard("2/5").m, 5);
  for (const std::string bad : {"0/3", "4/3", "3", "1/0", "a/b", "1/2/3", "/2"}) EXPECT_THROW(parse_shard(bad), InputError) << bad;
}

// The fitted member holds the register, and the member before it in the near-square sequence does
// not (qubit counts taken from the lattice generator itself, not from our formula).
TEST(SurveyFamilies, FittedMemberIsTheSmallestThatHoldsTheRegister) {
  for (const std::string family : {"grid", "heavy-hex"}) {
    std::vector<std::string> sequence;
    for (int r = 1; r <= 8; ++r) {
      sequence.push_back(family + ":" + std::to_string(r) + "x" + std::to_string(r));
      sequence.push_back(family + ":" + std::to_string(r) + "x" + std::to_string(r + 1));
    }
    for (int n = 1; n <= 60; ++n) {
      const std::string spec = fitted_family_spec(family, n);
      const auto it = std::find(sequence.begin(), sequence.end(), spec);
      ASSERT_NE(it, sequence.end()) << spec;
      EXPECT_GE(make_lattice(spec).qubit_count(), n) << spec;
      if (it != sequence.begin()) EXPECT_LT(make_lattice(*(it - 1)).qubit_count(), n) << spec;
    }
  }
  EXPECT_EQ(fitted_family_spec("line", 9), "line:9");
  EXPECT_EQ(fitted_family_spec("ring", 2), "ring:3");  // a ring needs three qubits
  EXPECT_EQ(fitted_family_spec("full", 5), "full:5");
  EXPECT_THROW(make_survey_entry("torus:*"), InputError);
  EXPECT_EQ(make_survey_entry("grid:*").label, "grid:*");
  EXPECT_EQ(make_survey_entry("grid:3x3").label, "grid:3x3");
}

SurveyRequest small_request() {
  SurveyRequest r;
  r.devices = {make_survey_entry("line:*"), make_survey_entry("grid:3x3")};
  r.sizes = {4, 6, 8};
  r.approx = parse_approx_list("none,2");
  r.directions = {false, true};
  return r;
}

TEST(SurveyCases, OrderIsDeviceThenSettingsThenSize) {
  const auto cases = expand_survey(small_request());
  ASSERT_EQ(cases.size(), 2u * 2 * 2 * 3);
  for (std::size_t i = 0; i < cases.size(); ++i) EXPECT_EQ(cases[i].index, static_cast<long long>(i));
  EXPECT_EQ(cases[0].qubits, 4);
  EXPECT_EQ(cases[1].qubits, 6);
  EXPECT_FALSE(cases[2].inverse);
  EXPECT_TRUE(cases[3].inverse);
  EXPECT_EQ(cases[6].approx.text(), "2");
  EXPECT_EQ(cases[12].entry, 1);
}

// Shards partition the cases into slices whose sizes differ by at most one (pigeonhole).
TEST(SurveyCases, ShardsPartitionTheSurvey) {
  const auto all = expand_survey(small_request());
  for (int m : {1, 2, 5, 7, 24, 30}) {
    std::set<long long> seen;
    std::size_t smallest = all.size(), largest = 0;
    for (int k = 1; k <= m; ++k) {
      const auto part = shard_cases(all, {k, m});
      smallest = std::min(smallest, part.size());
      largest = std::max(largest, part.size());
      for (const auto& c : part) EXPECT_TRUE(seen.insert(c.index).second) << "index " << c.index << " twice";
    }
    EXPECT_EQ(seen.size(), all.size());
    EXPECT_LE(largest - smallest, 1u);
  }
}

TEST(SurveyCases, FingerprintFollowsTheRequest) {
  SurveyRequest a = small_request(), b = small_request();
  EXPECT_EQ(survey_fingerprint(a), survey_fingerprint(b));
  EXPECT_EQ(survey_fingerprint(a).size(), 16u);
  b.sizes.push_back(10);
  EXPECT_NE(survey_fingerprint(a), survey_fingerprint(b));
  b = small_request();
  b.seed = 2;
  EXPECT_NE(survey_fingerprint(a), survey_fingerprint(b));
}

}  // namespace
}  // namespace qftplan
