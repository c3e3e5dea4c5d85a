// Tests of the YAML device format: the documented example, the catalogue of malformed files in
// tests/data/bad_devices/ (exact message, file and position for each), file-level errors, and the
// write/parse round trip.

#include <gtest/gtest.h>

#include <chrono>
#include <cmath>
#include <filesystem>
#include <limits>
#include <set>
#include <string>
#include <vector>

#include "qftplan/device_yaml.hpp"
#include "qftplan/input_error.hpp"
#include "qftplan/lattices.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

namespace fs = std::filesystem;
using testing::source_dir;

/// Runs `f`, which must throw InputError, and returns the error.
template <class F>
InputError input_error_of(F&& f) {
  try {
    f();
  } catch (const InputError& e) {
    return e;
  }
  ADD_FAILURE() << "no InputError thrown";
  return InputError("none");
}

// The example of the format as documented (README "Device files").
const char* const kDocumentedExample = R"(name: harbor-lab-7q            # required, free text
qubits: 7                      # required: ids are 0 .. qubits-1
couplers:                      # required: undirected pairs of qubit ids
  - [0, 1]
  - {pair: [1, 2], error: 0.012, duration_ns: 340}   # a coupler with its own calibration
calibration:                   # optional defaults for every qubit and coupler
  error_1q: 0.0003             # probability of error per one-qubit gate
  error_2q: 0.008              # per two-qubit gate
  error_readout: 0.02
  duration_1q_ns: 40
  duration_2q_ns: 300
  t1_us: 110
  t2_us: 80
qubit_calibration:             # optional per-qubit overrides
  - {id: 3, error_1q: 0.001, error_readout: 0.05, t1_us: 40, t2_us: 30, duration_1q_ns: 50}
positions:                     # optional, for drawings
  - {id: 0, at: [0.0, 0.0]}
  - {id: 2, at: [2.5, -1]}
native_2q: cz                  # optional: cx (default) or cz
)";

TEST(DeviceYaml, ParsesTheDocumentedExample) {
  const Device d = parse_device_yaml(kDocumentedExample, "example.yaml");
  EXPECT_EQ(d.name(), "harbor-lab-7q");
  EXPECT_EQ(d.qubit_count(), 7);
  ASSERT_EQ(d.coupler_count(), 2);
  EXPECT_TRUE(d.coupled(0, 1));
  EXPECT_TRUE(d.coupled(2, 1));
  EXPECT_EQ(d.native_2q(), TwoQubitGate::cz);
  // Coupler [1, 2] has its own values, [0, 1] takes the defaults.
  EXPECT_EQ(d.coupler_calibration(1, 2).error, 0.012);
  EXPECT_EQ(d.coupler_calibration(1, 2).duration_ns, 340);
  EXPECT_EQ(d.coupler_calibration(0, 1).error, 0.008);
  EXPECT_EQ(d.coupler_calibration(0, 1).duration_ns, 300);
  // Qubit 3 is overridden, qubit 4 is not.
  const auto q3 = d.qubit_calibration(3), q4 = d.qubit_calibration(4);
  EXPECT_EQ(q3.error_1q, 0.001);
  EXPECT_EQ(q3.error_readout, 0.05);
  EXPECT_EQ(q3.t1_us, 40);
  EXPECT_EQ(q3.t2_us, 30);
  EXPECT_EQ(q3.duration_1q_ns, 50);
  EXPECT_EQ(q4.error_1q, 0.0003);
  EXPECT_EQ(q4.error_readout, 0.02);
  EXPECT_EQ(q4.t1_us, 110);
  EXPECT_EQ(q4.t2_us, 80);
  EXPECT_EQ(q4.duration_1q_ns, 40);
  // Positions: listed ones are set, the others are absent.
  ASSERT_TRUE(d.has_positions());
  EXPECT_EQ(d.position(2), (Point{2.5, -1}));
  EXPECT_EQ(d.position(0), (Point{0, 0}));
  EXPECT_FALSE(d.position(1).has_value());
}

TEST(DeviceYaml, MinimalFileAndDefaults) {
  const Device d = parse_device_yaml("name: tiny\nqubits: 2\ncouplers: [[1, 0]]\n", "tiny.yaml");
  EXPECT_EQ(d.native_2q(), TwoQubitGate::cx);
  EXPECT_FALSE(d.description().native_2q.has_value());
  EXPECT_FALSE(d.has_calibration());
  EXPECT_FALSE(d.has_positions());
  // Couplers are undirected and normalized to a < b.
  ASSERT_EQ(d.coupler_count(), 1);
  EXPECT_EQ(d.couplers()[0].a, 0);
  EXPECT_EQ(d.couplers()[0].b, 1);
}

TEST(DeviceYaml, DisconnectedDeviceLoads) {
  const Device d = parse_device_yaml("name: islands\nqubits: 5\ncouplers: [[0, 1], [3, 4]]\n", "islands.yaml");
  EXPECT_EQ(d.components().second, 3);
  const Device none = parse_device_yaml("name: none\nqubits: 3\ncouplers: []\n", "none.yaml");
  EXPECT_EQ(none.coupler_count(), 0);
}

TEST(DeviceYaml, AliasesAreFollowed) {
  const Device d = parse_device_yaml(
      "name: shared\nqubits: 3\ncouplers: [&p [0, 1], [1, 2]]\n"
      "positions: [{id: 0, at: &origin [0, 0]}, {id: 2, at: *origin}]\n",
      "alias.yaml");
  EXPECT_EQ(d.position(2), (Point{0, 0}));
  // An alias of a pair already listed is a duplicate coupler like any other.
  const auto e =
      input_error_of([] { parse_device_yaml("name: shared\nqubits: 3\ncouplers: [&p [0, 1], *p]\n", "alias.yaml"); });
  EXPECT_EQ(e.message(), "coupler [0, 1] is listed twice (first on line 3)");
  // A node that contains an alias of itself is refused, not walked forever.
  const auto self =
      input_error_of([] { parse_device_yaml("name: loop\nqubits: 2\ncouplers: &c [*c]\n", "loop.yaml"); });
  EXPECT_EQ(std::string(self.what()), "loop.yaml:3:15: an alias refers to a node that contains it");
}

// ---------------------------------------------------------------------------------------------
// The catalogue of malformed files: every file in tests/data/bad_devices/ with the exact error.

struct BadFile {
  const char* file;
  int line;
  int column;
  const char* message;
};

const char* const kExpectKnown =
    "known keys: name, qubits, couplers, calibration, qubit_calibration, positions, native_2q";

const BadFile kBadFiles[] = {
    {"empty.yaml", 0, 0, "the file is empty; expected a device description with name, qubits and couplers"},
    {"comments_only.yaml", 0, 0, "the file is empty; expected a device description with name, qubits and couplers"},
    {"not_a_mapping.yaml", 2, 1,
     "expected a device description (a mapping with name, qubits and couplers), found 'just some text'"},
    {"sequence_root.yaml", 2, 1,
     "expected a device description (a mapping with name, qubits and couplers), found a sequence"},
    {"syntax_error.yaml", 5, 1, "YAML syntax error: end of sequence flow not found"},
    {"deep_nesting.yaml", 4, 10011, "YAML syntax error: nesting is too deep"},
    {"two_documents.yaml", 5, 1, "a device file holds one YAML document, but a second one starts here"},
    {"alias_nest.yaml", 3, 1, nullptr},  // message checked below: unknown key 'lol0'
    {"missing_name.yaml", 2, 1, "missing required key 'name'"},
    {"name_empty.yaml", 2, 7, "'name' must not be empty"},
    {"name_not_text.yaml", 2, 7, "'name' must be text, got a sequence"},
    {"missing_qubits.yaml", 2, 1, "missing required key 'qubits'"},
    {"qubits_fraction.yaml", 3, 9, "'qubits' must be a whole number, got '7.5'"},
    {"qubits_quoted.yaml", 3, 9, "'qubits' must be a whole number, got the quoted text '7'"},
    {"qubits_empty.yaml", 3, 1, "'qubits' must be a whole number, got nothing"},
    {"qubits_zero.yaml", 3, 9, "'qubits' must be at least 1, got 0"},
    {"qubits_negative.yaml", 3, 9, "'qubits' must be at least 1, got -3"},
    {"qubits_too_many.yaml", 3, 9, "'qubits' is 2000000, more than the limit of 1000000"},
    {"qubits_overflow.yaml", 3, 9, "'qubits' is too large: '99999999999999999999999'"},
    {"missing_couplers.yaml", 2, 1, "missing required key 'couplers' (write 'couplers: []' for a chip without any)"},
    {"couplers_not_sequence.yaml", 4, 11,
     "'couplers' must be a sequence of qubit pairs such as [0, 1] (use [] for none), got a mapping"},
    {"coupler_unknown_qubit.yaml", 6, 9, "coupler [3, 7] names qubit 7, but the device's qubits are 0..6"},
    {"coupler_negative_id.yaml", 5, 6, "coupler [-1, 2] names qubit -1, but the device's qubits are 0..2"},
    {"coupler_self_loop.yaml", 6, 5, "coupler [2, 2] joins qubit 2 to itself"},
    {"coupler_duplicate.yaml", 8, 5, "coupler [1, 2] is listed twice (first on line 6)"},
    {"coupler_duplicate_reversed.yaml", 7, 12, "coupler [2, 1] repeats [1, 2] from line 6 (couplers are undirected)"},
    {"coupler_three_ids.yaml", 5, 5, "a coupler must name exactly two qubits, got 3"},
    {"coupler_one_id.yaml", 6, 5, "a coupler must name exactly two qubits, got 1"},
    {"coupler_text_id.yaml", 5, 9, "qubit id must be a whole number, got 'b'"},
    {"coupler_fraction_id.yaml", 5, 9, "qubit id must be a whole number, got '1.5'"},
    {"coupler_empty_item.yaml", 6, 3,
     "a coupler must be a pair such as [0, 1] or a mapping such as {pair: [0, 1], error: 0.01}, got nothing"},
    {"coupler_scalar_item.yaml", 5, 5,
     "a coupler must be a pair such as [0, 1] or a mapping such as {pair: [0, 1], error: 0.01}, got '0-1'"},
    {"coupler_map_without_pair.yaml", 5, 5, "a coupler mapping needs 'pair: [a, b]'"},
    {"coupler_error_above_one.yaml", 5, 27, "'error' must be a probability in [0, 1], got 1.5"},
    {"coupler_duration_negative.yaml", 5, 33, "'duration_ns' must be a positive finite number, got -300"},
    {"calibration_not_mapping.yaml", 5, 14, "'calibration' must be a mapping such as {error_2q: 0.008}, got '0.01'"},
    {"calibration_error_negative.yaml", 7, 13, "'error_2q' must be a probability in [0, 1], got -0.008"},
    {"calibration_readout_percent.yaml", 6, 18, "'error_readout' must be a probability in [0, 1], got 2"},
    {"calibration_rate_text.yaml", 6, 13, "'error_2q' must be a number, got 'low'"},
    {"calibration_duration_zero.yaml", 6, 19, "'duration_2q_ns' must be a positive finite number, got 0"},
    {"calibration_duration_infinite.yaml", 6, 19, "'duration_1q_ns' must be a positive finite number, got .inf"},
    {"calibration_t1_negative.yaml", 6, 10, "'t1_us' must be a positive finite number, got -110"},
    {"calibration_t2_nan.yaml", 7, 10, "'t2_us' must be a positive finite number, got .nan"},
    {"unknown_key.yaml", 3, 1, "unknown key 'qbits'; did you mean 'qubits'?"},
    {"unknown_key_far.yaml", 5, 1, nullptr},  // checked below: lists the known keys
    {"unknown_calibration_key.yaml", 6, 3, "unknown key 'eror_2q' in calibration; did you mean 'error_2q'?"},
    {"unknown_coupler_key.yaml", 5, 20, "unknown key 'fidelity' in coupler; known keys: pair, error, duration_ns"},
    {"unknown_override_key.yaml", 6, 13, "unknown key 'error_2q' in qubit_calibration; did you mean 'error_1q'?"},
    {"duplicate_key.yaml", 5, 1, "key 'qubits' appears twice (first on line 3)"},
    {"native_unknown.yaml", 5, 12, "unknown native_2q 'iswap'; expected cx or cz"},
    {"override_unknown_id.yaml", 7, 10, "qubit_calibration names qubit 3, but the device's qubits are 0..2"},
    {"override_duplicate_id.yaml", 8, 10, "qubit_calibration lists qubit 2 twice (first on line 6)"},
    {"override_without_id.yaml", 6, 5, "a qubit_calibration entry needs 'id'"},
    {"position_unknown_id.yaml", 7, 10, "positions names qubit 5, but the device's qubits are 0..1"},
    {"position_duplicate_id.yaml", 7, 10, "positions lists qubit 1 twice (first on line 6)"},
    {"position_one_coordinate.yaml", 6, 17, "'at' must be a pair of coordinates [x, y], got a list of 1"},
    {"position_infinite.yaml", 6, 17, "coordinates must be finite numbers, got [0, -.inf]"},
};

fs::path bad_dir() { return source_dir() / "tests" / "data" / "bad_devices"; }

class BadDeviceFile : public ::testing::TestWithParam<BadFile> {};

TEST_P(BadDeviceFile, GivesTheExactErrorWithPosition) {
  const BadFile& c = GetParam();
  const std::string path = (bad_dir() / c.file).string();
  const auto start = std::chrono::steady_clock::now();
  const InputError e = input_error_of([&] { load_device_file(path); });
  EXPECT_EQ(e.file(), path);
  EXPECT_EQ(e.line(), c.line);
  EXPECT_EQ(e.column(), c.column);
  if (c.message) {
    EXPECT_EQ(e.message(), c.message);
  }
  // One line, prefixed with the position.
  EXPECT_EQ(std::string(e.what()), format_input_error(path, c.line, c.column, e.message()));
  EXPECT_EQ(std::string(e.what()).find('\n'), std::string::npos);
  // Includes alias_nest.yaml, whose aliases would expand to 2^30 values if copied.
  EXPECT_LT(std::chrono::steady_clock::now() - start, std::chrono::seconds(5));
}

INSTANTIATE_TEST_SUITE_P(Catalogue, BadDeviceFile, ::testing::ValuesIn(kBadFiles),
                         [](const ::testing::TestParamInfo<BadFile>& info) {
                           std::string name = info.param.file;
                           name = name.substr(0, name.find('.'));
                           return name;
                         });

TEST(DeviceYaml, CatalogueCoversEveryBadFile) {
  std::set<std::string> listed;
  for (const auto& c : kBadFiles) listed.insert(c.file);
  int files = 0;
  for (const auto& entry : fs::directory_iterator(bad_dir())) {
    ++files;
    EXPECT_TRUE(listed.count(entry.path().filename().string())) << entry.path() << " has no expected error";
  }
  EXPECT_EQ(files, static_cast<int>(listed.size()));
}

TEST(DeviceYaml, MessagesWithoutFixedText) {
  const auto far = input_error_of([] { load_device_file((bad_dir() / "unknown_key_far.yaml").string()); });
  EXPECT_EQ(far.message(), std::string("unknown key 'vendor'; ") + kExpectKnown);
  const auto nest = input_error_of([] { load_device_file((bad_dir() / "alias_nest.yaml").string()); });
  EXPECT_EQ(nest.message(), std::string("unknown key 'lol0'; ") + kExpectKnown);
}

TEST(DeviceYaml, KeySuggestions) {
  const auto msg = [](const std::string& text) {
    return input_error_of([&] { parse_device_yaml(text, "k.yaml"); }).message();
  };
  EXPECT_EQ(msg("nmae: x\nqubits: 1\ncouplers: []\n"), "unknown key 'nmae'; did you mean 'name'?");
  EXPECT_EQ(msg("name: x\nQubits: 1\ncouplers: []\n"), "unknown key 'Qubits'; did you mean 'qubits'?");
  EXPECT_EQ(msg("name: x\nqubits: 1\ncoupler: []\n"), "unknown key 'coupler'; did you mean 'couplers'?");
  EXPECT_EQ(msg("name: x\nqubits: 1\ncouplers: []\ncalib: {}\n"), "unknown key 'calib'; did you mean 'calibration'?");
  EXPECT_EQ(msg("name: x\nqubits: 1\ncouplers: []\nnative: cz\n"), "unknown key 'native'; did you mean 'native_2q'?");
  EXPECT_EQ(msg("name: x\nqubits: 2\ncouplers: [{pair: [0, 1], duration: 300}]\n"),
            "unknown key 'duration' in coupler; did you mean 'duration_ns'?");
  EXPECT_EQ(msg("name: x\nqubits: 2\ncouplers: []\npositions: [{id: 0, xy: [0, 0]}]\n"),
            "unknown key 'xy' in positions; known keys: id, at");
  // Keys are quoted back on one line, however they are written.
  EXPECT_EQ(msg("name: x\nqubits: 1\ncouplers: []\n\"two\\nlines\": 1\n"),
            std::string("unknown key 'two lines'; ") + kExpectKnown);
}

TEST(DeviceYaml, SourceNameInMessages) {
  const auto e = input_error_of([] { parse_device_yaml("name: x\nqubits: 0\ncouplers: []\n", "<stdin>"); });
  EXPECT_EQ(std::string(e.what()), "<stdin>:2:9: 'qubits' must be at least 1, got 0");
}

TEST(DeviceYaml, MissingFileDirectoryAndOversizeFile) {
  const auto dir = testing::temp_dir();
  const std::string missing = (dir / "nosuch.yaml").string();
  const auto e1 = input_error_of([&] { load_device_file(missing); });
  EXPECT_EQ(std::string(e1.what()), missing + ": no such file");
  EXPECT_EQ(e1.line(), 0);

  const auto e2 = input_error_of([&] { load_device_file(dir.string()); });
  EXPECT_EQ(std::string(e2.what()), dir.string() + ": is a directory, not a device file");

  // A sparse file just over the 128 MiB limit: refused from its size, before reading.
  const auto big = dir / "big.yaml";
  testing::write_file(big, "name: big\n");
  fs::resize_file(big, (std::uintmax_t{128} << 20) + 1);
  const auto e3 = input_error_of([&] { load_device_file(big.string()); });
  EXPECT_EQ(e3.message(), "the file is 134217729 bytes, more than the limit of 128 MiB");

  const auto e4 = input_error_of([] { load_device_file(""); });
  EXPECT_EQ(std::string(e4.what()), "no device file given (the path is empty)");
  fs::remove_all(dir);
}

// ---------------------------------------------------------------------------------------------
// Writing and the round trip parse(write(d)) == d.

void expect_round_trip(const Device& d) {
  const std::string text = device_to_yaml(d);
  const Device back = parse_device_yaml(text, "round-trip.yaml");
  EXPECT_TRUE(back == d) << "round trip changed " << d.name() << ":\n" << text;
  // Writing is deterministic: a second pass gives the same text.
  EXPECT_EQ(device_to_yaml(back), text);
}

TEST(DeviceYaml, RoundTripEveryLatticeKind) {
  for (const char* spec :
       {"line:1", "line:2", "line:17", "ring:3", "ring:10", "ring:33", "grid:1x1", "grid:1x7", "grid:3x4", "grid:6x6",
        "heavy-hex:1x1", "heavy-hex:1x3", "heavy-hex:2x2", "heavy-hex:3x4", "full:1", "full:2", "full:9"})
    expect_round_trip(make_lattice(spec));
}

TEST(DeviceYaml, RoundTripEveryBundledFile) {
  int files = 0;
  for (const auto& entry : fs::directory_iterator(source_dir() / "topologies")) {
    if (entry.path().extension() != ".yaml") continue;
    ++files;
    expect_round_trip(load_device_file(entry.path().string()));
  }
  EXPECT_GE(files, 6);
}

TEST(DeviceYaml, RoundTripAwkwardValues) {
  DeviceDescription d;
  d.name = "odd name: with \"quotes\", a \\ and a\ttab";
  d.qubits = 4;
  d.native_2q = TwoQubitGate::cx;      // written explicitly, kept distinct from "absent"
  d.calibration.error_1q = 0.1 + 0.2;  // 0.30000000000000004
  d.calibration.t1_us = 1.0 / 3.0;
  d.calibration.duration_2q_ns = 1e21;
  Coupler c1;
  c1.a = 2;
  c1.b = 0;  // normalized to [0, 2]
  c1.duration_ns = 123.456789012345;
  Coupler c2;
  c2.a = 1;
  c2.b = 3;
  c2.error = std::numeric_limits<double>::denorm_min();
  d.couplers = {c1, c2};
  QubitOverride o;
  o.id = 2;
  o.t2_us = 5e-7;
  QubitOverride bare;
  bare.id = 3;  // an override with no values
  d.qubit_calibration = {o, bare};
  d.positions = {Point{-0.0, 1e-300}, std::nullopt, Point{-12345.678, 2.5}, std::nullopt};
  expect_round_trip(Device(d));

  // Names that would read back as something else unless quoted.
  for (const char* name : {"null", "7", "true", "a: b", "ends:", "#hash", "- dash", "", "héllo", "x\ny"}) {
    DeviceDescription n;
    n.name = name;
    n.qubits = 1;
    if (n.name.empty()) continue;  // an empty name is refused by the loader
    expect_round_trip(Device(n));
  }
  // "positions: []" (the key present, no entries) is kept apart from no key at all.
  DeviceDescription p;
  p.name = "slots";
  p.qubits = 2;
  p.positions.resize(2);
  expect_round_trip(Device(p));
}

TEST(DeviceYaml, WrittenFormat) {
  const Device d = parse_device_yaml(kDocumentedExample, "example.yaml");
  const std::string text = device_to_yaml(d);
  EXPECT_NE(text.find("name: harbor-lab-7q\n"), std::string::npos) << text;
  EXPECT_NE(text.find("  - [0, 1]\n"), std::string::npos) << text;
  EXPECT_NE(text.find("  - {pair: [1, 2], error: 0.012, duration_ns: 340}\n"), std::string::npos) << text;
  EXPECT_NE(text.find("  - {id: 2, at: [2.5, -1]}\n"), std::string::npos) << text;
  EXPECT_NE(text.find("native_2q: cz\n"), std::string::npos) << text;
  EXPECT_NE(text.find("  error_1q: 0.0003\n"), std::string::npos) << text;
  EXPECT_EQ(device_to_yaml(parse_device_yaml("name: e\nqubits: 2\ncouplers: []\n", "e.yaml")),
            "name: e\nqubits: 2\ncouplers: []\n");
}

}  // namespace
}  // namespace qftplan
