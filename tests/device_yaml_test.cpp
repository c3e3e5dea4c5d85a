// Tests of the YAML device format: the documented example, the catalogue of malformed files in
// tests/data/bad_devices/ (exact message, file and position for each), file-level errors, and the
// write/parse round trip. Section numbers of the YAML 1.2 specification are those of revision 1.2.2,
// from memory; RFC 3629 is the UTF-8 standard.

#include <gtest/gtest.h>

#include <cmath>
#include <filesystem>
#include <limits>
#include <set>
#include <string>
#include <vector>

#include "qftplan/core/input_error.hpp"
#include "qftplan/device/device_yaml.hpp"
#include "qftplan/device/lattices.hpp"
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
    // The missing ']' is reported at the end of the last line, not on a line past the end of the file.
    {"syntax_error.yaml", 4, 26, "YAML syntax error: end of sequence flow not found"},
    // Refused by the raw-text check at the 65th open bracket (column 11 + 64), before yaml-cpp reads them.
    {"deep_nesting.yaml", 4, 75, "flow sequences and mappings are nested more than 64 deep"},
    {"flow_mixed_nesting.yaml", 5, 76, "flow sequences and mappings are nested more than 64 deep"},
    // Raw bytes, checked before parsing. RFC 3629, section 3 (from memory): C0 80 is the overlong form of
    // U+0000, ED A1 8C ED BE B4 an encoded surrogate pair (for U+233B4), F4 90 80 80 would be U+110000;
    // the bytes C0, C1 and F5..FF never appear; a continuation byte is 10xxxxxx.
    {"utf8_invalid_bytes.yaml", 2, 8, "the file is not valid UTF-8: byte 0xff never occurs in UTF-8"},
    {"utf8_overlong.yaml", 2, 8, "the file is not valid UTF-8: an overlong encoding of U+0000"},
    {"utf8_surrogate.yaml", 2, 8, "the file is not valid UTF-8: an encoded surrogate U+D84C, which is not a character"},
    {"utf8_above_max.yaml", 2, 8, "the file is not valid UTF-8: a code point above U+10FFFF"},
    {"utf8_cut_short.yaml", 2, 9, "the file is not valid UTF-8: the character starting with byte 0xe2 is cut short"},
    {"utf8_stray_continuation.yaml", 4, 16,
     "the file is not valid UTF-8: byte 0x80 continues a character that never started"},
    // YAML 1.2, section 5.2: a UTF-16LE byte order mark is FF FE.
    {"utf16.yaml", 1, 1, "the file is UTF-16 or UTF-32 text; device files must be UTF-8"},
    // YAML 1.2, section 5.1: no C0 control but tab, LF and CR anywhere; outside quoted scalars no C1
    // control but NEL either.
    {"raw_nul_byte.yaml", 3, 3, "a NUL byte is not allowed in a YAML file"},
    {"raw_control_character.yaml", 2, 9,
     "control character U+0007 is not allowed in a YAML file (write \\x07 inside double quotes)"},
    {"raw_c1_outside_quotes.yaml", 2, 8,
     "character U+009B is not allowed outside quoted text in YAML (write \\x9b inside double quotes)"},
    // YAML 1.2, section 5.4: a lone CR is a line break, so the error is on line 3.
    {"cr_line_ends.yaml", 3, 9, "'qubits' must be at least 1, got 0"},
    // Every explicit tag is refused, where it is written (a yaml-cpp mark, the tag's first character).
    {"tag_on_sequence.yaml", 5, 5, "YAML tag '!weird' is not allowed in a device file; write the value without it"},
    {"tag_set_mapping.yaml", 5, 14, "YAML tag '!!set' is not allowed in a device file; write the value without it"},
    {"tag_map_on_sequence.yaml", 4, 11, "YAML tag '!!map' is not allowed in a device file; write the value without it"},
    {"tag_on_name.yaml", 2, 7, "YAML tag '!secret' is not allowed in a device file; write the value without it"},
    {"tag_binary_name.yaml", 2, 7, "YAML tag '!!binary' is not allowed in a device file; write the value without it"},
    {"tag_on_number.yaml", 3, 9, "YAML tag '!!int' is not allowed in a device file; write the value without it"},
    // YAML 1.2, section 5.7: "\0" in a double-quoted scalar is the NUL character.
    {"name_nul_escape.yaml", 2, 7, "'name' must not contain a NUL character (\\0)"},
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
    {"coupler_duration_negative.yaml", 5, 33,
     "'duration_ns' must be a positive number of ns, at most 1e9 (one second), got -300"},
    {"coupler_duration_too_long.yaml", 5, 33,
     "'duration_ns' must be a positive number of ns, at most 1e9 (one second), got 1e308"},
    {"coupler_error_nan.yaml", 5, 27, "'error' must be a number, not NaN (got .NaN)"},
    // YAML 1.2, section 10.3.2: "nan" and "inf" are text in the core schema (.nan and .inf are numbers).
    {"coupler_error_word_nan.yaml", 5, 27, "'error' must be a number, got 'nan'"},
    {"coupler_error_overflow.yaml", 5, 27, "'error' must be a probability in [0, 1], got 1e400"},
    {"calibration_not_mapping.yaml", 5, 14, "'calibration' must be a mapping such as {error_2q: 0.008}, got '0.01'"},
    {"calibration_error_negative.yaml", 7, 13, "'error_2q' must be a probability in [0, 1], got -0.008"},
    {"calibration_readout_percent.yaml", 6, 18, "'error_readout' must be a probability in [0, 1], got 2"},
    {"calibration_rate_text.yaml", 6, 13, "'error_2q' must be a number, got 'low'"},
    {"calibration_duration_zero.yaml", 6, 19,
     "'duration_2q_ns' must be a positive number of ns, at most 1e9 (one second), got 0"},
    {"calibration_duration_infinite.yaml", 6, 19,
     "'duration_1q_ns' must be a positive number of ns, at most 1e9 (one second), got .inf"},
    {"calibration_duration_above_limit.yaml", 6, 19,
     "'duration_1q_ns' must be a positive number of ns, at most 1e9 (one second), got 1.5e9"},
    {"calibration_t1_negative.yaml", 6, 10, "'t1_us' must be a positive number (or .inf for no decay), got -110"},
    {"calibration_t1_word_inf.yaml", 5, 22, "'t1_us' must be a number, got 'inf' (YAML writes infinity as .inf)"},
    {"calibration_t2_nan.yaml", 7, 10, "'t2_us' must be a number, not NaN (got .nan)"},
    // T2 <= 2 T1 (pure dephasing cannot be negative; Nielsen and Chuang 2000, section 8.3, from memory).
    {"calibration_t2_above_twice_t1.yaml", 5, 3,
     "calibration has t2_us 90 above 2 x t1_us = 80: physically impossible (T2 <= 2 T1, since pure dephasing cannot "
     "be negative)"},
    // Qubit 2 keeps the device's T2 of 150 us with its own T1 of 50 us.
    {"override_t2_above_twice_t1.yaml", 7, 5,
     "qubit 2 has t2_us 150 above 2 x t1_us = 100: physically impossible (T2 <= 2 T1, since pure dephasing cannot "
     "be negative)"},
    {"unknown_key.yaml", 3, 1, "unknown key 'qbits'; did you mean 'qubits'?"},
    {"unknown_key_far.yaml", 5, 1, nullptr},  // checked below: lists the known keys
    {"unknown_calibration_key.yaml", 6, 3, "unknown key 'eror_2q' in calibration; did you mean 'error_2q'?"},
    {"unknown_coupler_key.yaml", 5, 20, "unknown key 'fidelity' in coupler; known keys: pair, error, duration_ns, disabled"},
    {"unknown_override_key.yaml", 6, 13, "unknown key 'error_2q' in qubit_calibration; did you mean 'error_1q'?"},
    {"duplicate_key.yaml", 5, 1, "key 'qubits' appears twice (first on line 3)"},
    {"native_unknown.yaml", 5, 12, "unknown native_2q 'iswap'; expected cx or cz"},
    {"override_unknown_id.yaml", 7, 10, "qubit_calibration names qubit 3, but the device's qubits are 0..2"},
    {"override_duplicate_id.yaml", 8, 10, "qubit_calibration lists qubit 2 twice (first on line 6)"},
    {"override_without_id.yaml", 6, 5, "a qubit_calibration entry needs 'id'"},
    {"override_fraction_id.yaml", 6, 10, "'id' in qubit_calibration must be a whole number, got '1.5'"},
    {"position_unknown_id.yaml", 7, 10, "positions names qubit 5, but the device's qubits are 0..1"},
    {"position_duplicate_id.yaml", 7, 10, "positions lists qubit 1 twice (first on line 6)"},
    {"position_one_coordinate.yaml", 6, 17, "'at' must be a pair of coordinates [x, y], got a list of 1"},
    {"position_infinite.yaml", 6, 17, "coordinates must be finite numbers, got [0, -.inf]"},
    {"position_nan.yaml", 6, 18, "a coordinate must be a number, not NaN (got .nan)"},
    {"position_fraction_id.yaml", 6, 10, "'id' in positions must be a whole number, got '0.5'"},
};

fs::path bad_dir() { return source_dir() / "tests" / "data" / "bad_devices"; }

class BadDeviceFile : public ::testing::TestWithParam<BadFile> {};

TEST_P(BadDeviceFile, GivesTheExactErrorWithPosition) {
  const BadFile& c = GetParam();
  const std::string path = (bad_dir() / c.file).string();
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
  // Includes alias_nest.yaml, whose aliases would expand to 2^30 values if copied (that would run into
  // ctest's time-out; the test itself does not time anything, as speed depends on the machine).
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

// The program itself on every catalogue file: exit status 2, nothing on standard output (a NUL in a
// name once cut the output short with status 0), and the one-line message on standard error.
TEST(DeviceYaml, CommandRefusesEveryBadFileWithStatus2) {
  for (const auto& c : kBadFiles) {
    const std::string path = (bad_dir() / c.file).string();
    SCOPED_TRACE(path);
    const InputError e = input_error_of([&] { load_device_file(path); });
    const auto r = testing::run_qftplan("device '" + path + "'");
    EXPECT_EQ(r.status, 2);
    EXPECT_EQ(r.out, "");
    EXPECT_EQ(r.err, "qftplan: " + std::string(e.what()) + "\n");
  }
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
  d.calibration.duration_2q_ns = 1e9;  // the largest duration a file may give
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
  // Words a reader would take for a boolean or null, and numbers, are quoted: the YAML 1.2 core schema
  // (section 10.3.2) and YAML 1.1's yes/no/on/off/y/n for older readers (common practice).
  for (const char* name :
       {"true", "True", "TRUE", "false", "FALSE", "yes", "Yes", "No", "NO",  "on",   "On",   "off",
        "OFF",  "y",    "N",    "null",  "Null",  "~",   "12",  "-3", "1.5", ".inf", ".NaN", "0x1f"}) {
    DeviceDescription n;
    n.name = name;
    n.qubits = 1;
    const Device dev(n);
    EXPECT_EQ(device_to_yaml(dev), "name: \"" + std::string(name) + "\"\nqubits: 1\ncouplers: []\n");
    expect_round_trip(dev);
  }
  for (const char* name : {"yesterday", "online", "nullable", "Harbor", "n2"}) {
    DeviceDescription n;
    n.name = name;
    n.qubits = 1;
    EXPECT_EQ(device_to_yaml(Device(n)), "name: " + std::string(name) + "\nqubits: 1\ncouplers: []\n");
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

// ---------------------------------------------------------------------------------------------
// The raw text: line breaks, characters, flow nesting; tags and NUL characters.

std::string what_of(const std::string& text) {
  return input_error_of([&] { parse_device_yaml(text, "t.yaml"); }).what();
}

TEST(DeviceYaml, FlowNestingIsRefusedCheaply) {
  // 2,000,000 open brackets: yaml-cpp alone took seconds and about 470 MB before refusing them.
  const std::string text = "name: x\nqubits: 2\ncouplers: " + std::string(2'000'000, '[') + "\n";
  EXPECT_EQ(what_of(text), "t.yaml:3:75: flow sequences and mappings are nested more than 64 deep");
  // 64 levels pass the raw-text check; the schema then refuses the pair.
  EXPECT_EQ(what_of("name: x\nqubits: 2\ncouplers: " + std::string(64, '[') + std::string(64, ']') + "\n"),
            "t.yaml:3:12: a coupler must name exactly two qubits, got 1");
  EXPECT_EQ(what_of("name: x\nqubits: 2\ncouplers: [" + std::string(64, '{') + "\n"),
            "t.yaml:3:75: flow sequences and mappings are nested more than 64 deep");
}

TEST(DeviceYaml, BracketsInTextAreNotNesting) {
  // Brackets inside quoted scalars, plain scalars of block context, comments and block scalars are
  // text, not flow collections (YAML 1.2, sections 7.3, 7.3.3, 6.6 and 8.1).
  const std::string b(70, '['), c(70, '{');
  for (const std::string& text : {
           "name: \"" + b + "\"\nqubits: 2\ncouplers: []\n",
           "name: '" + b + " it''s'\nqubits: 2\ncouplers: []\n",
           "name: a" + b + "\nqubits: 2\ncouplers: []\n",
           "name: a " + c + "\nqubits: 2\ncouplers: []\n",
           "# " + b + "\nname: x # " + b + "\nqubits: 2\ncouplers: [] # " + c + "\n",
           "name: |\n  " + b + "\n\n  " + c + "\nqubits: 2\ncouplers: []\n",
           "name: >-\n  " + b + "\n   " + c + "\nqubits: 2\ncouplers: []\n",
           "name: \"x\\\"" + b + "\"\nqubits: 2\ncouplers: []\n",
           "name: \"two\n  lines " + b + "\"\nqubits: 2\ncouplers: []\n",
           "{\"name\":\"" + b + "\",\"qubits\":2,\"couplers\":[[0,1]]}\n",
           "%YAML 1.2\n--- {name: '" + c + "', qubits: 2, couplers: [[0, 1]]}\n...\n",
       }) {
    SCOPED_TRACE(text);
    EXPECT_NO_THROW(parse_device_yaml(text, "t.yaml"));
  }
}

TEST(DeviceYaml, EveryLineBreakIsALineBreak) {
  // YAML 1.2, section 5.4: CRLF, CR and LF are line breaks, and each counts as one.
  const Device lf = parse_device_yaml("name: t\nqubits: 3\ncouplers: [[0, 1],\n  [1, 2]]\n", "t.yaml");
  for (const std::string& br : {"\r", "\r\n"}) {
    std::string text = "name: t" + br + "qubits: 3" + br + "couplers: [[0, 1]," + br + "  [1, 2]]" + br;
    EXPECT_TRUE(parse_device_yaml(text, "t.yaml") == lf);
    EXPECT_EQ(what_of("# c" + br + "name: t" + br + "qubits: 3" + br + "couplers: [[0, 3]]" + br),
              "t.yaml:4:16: coupler [0, 3] names qubit 3, but the device's qubits are 0..2");
  }
  // A UTF-8 byte order mark is allowed (YAML 1.2, section 5.2) and not counted in columns, as yaml-cpp counts.
  EXPECT_EQ(what_of("\xEF\xBB\xBFqubits: 3\n"), "t.yaml:1:1: missing required key 'name'");
  EXPECT_EQ(what_of("\xEF\xBB\xBFname: t\nqubits: x\ncouplers: []\n"),
            "t.yaml:2:9: 'qubits' must be a whole number, got 'x'");
}

TEST(DeviceYaml, CharactersYamlAllows) {
  // YAML 1.2, section 5.1: tab, DEL, C1 controls and U+FFFE are allowed inside quoted scalars (the JSON
  // set), DEL and C1 controls but NEL not outside them; C0 controls but tab and breaks nowhere.
  const Device d = parse_device_yaml("name: \"a\tb\x7f c\xC2\x80 d\xEF\xBF\xBE\"\nqubits: 1\ncouplers: []\n", "t.yaml");
  EXPECT_EQ(d.name(), "a\tb\x7f c\xC2\x80 d\xEF\xBF\xBE");
  EXPECT_EQ(device_to_yaml(d), "name: \"a\\x09b\\x7f c\\x80 d\xEF\xBF\xBE\"\nqubits: 1\ncouplers: []\n");
  expect_round_trip(d);
  EXPECT_EQ(parse_device_yaml("name: a\xC2\x85-b\nqubits: 1\ncouplers: []\n", "t.yaml").name(), "a\xC2\x85-b");
  EXPECT_EQ(
      what_of("name: a\x7f\nqubits: 1\ncouplers: []\n"),
      "t.yaml:1:8: character U+007F is not allowed outside quoted text in YAML (write \\x7f inside double quotes)");
  EXPECT_EQ(what_of("name: t # \xEF\xBF\xBF\nqubits: 1\ncouplers: []\n"),
            "t.yaml:1:11: character U+FFFF is not allowed outside quoted text in YAML (write \\uffff inside double "
            "quotes)");
  EXPECT_EQ(what_of("name: \"a\x1b[31m\"\nqubits: 1\ncouplers: []\n"),
            "t.yaml:1:9: control character U+001B is not allowed in a YAML file (write \\x1b inside double quotes)");
  // Escapes that name no character (YAML 1.2, section 5.7; a surrogate is not a scalar value, RFC 3629 section 3).
  EXPECT_EQ(what_of("name: \"\\ud800\"\nqubits: 1\ncouplers: []\n"),
            "t.yaml:1:14: YAML syntax error: the escape for U+D800 is not a character (a surrogate or above U+10FFFF)");
}

TEST(DeviceYaml, NulCharactersAreRefused) {
  // "\0" and "\x00" are escapes of NUL (YAML 1.2, section 5.7); C0 escapes other than NUL stay allowed.
  EXPECT_EQ(what_of("name: \"\\x00\"\nqubits: 1\ncouplers: []\n"),
            "t.yaml:1:7: 'name' must not contain a NUL character (\\0)");
  EXPECT_EQ(what_of("name: t\nqubits: 1\ncouplers: []\n\"x\\0\": 1\n"),
            "t.yaml:4:1: a key must not contain a NUL character (\\0)");
  EXPECT_EQ(what_of("name: t\nqubits: 2\ncouplers: [[0, \"\\0\"]]\n"),
            "t.yaml:3:16: text must not contain a NUL character (\\0)");
  const Device d = parse_device_yaml("name: \"a\\x01\\x1f\"\nqubits: 1\ncouplers: []\n", "t.yaml");
  EXPECT_EQ(d.name(), "a\x01\x1f");
  EXPECT_EQ(device_to_yaml(d), "name: \"a\\x01\\x1f\"\nqubits: 1\ncouplers: []\n");
}

TEST(DeviceYaml, EveryExplicitTagIsRefused) {
  const auto msg = [](const std::string& tag) {
    return "YAML tag '" + tag + "' is not allowed in a device file; write the value without it";
  };
  // The non-specific tag "!" (YAML 1.2, section 6.9.1) written out, after an anchor, verbatim, on an
  // empty value at the end of the text, on a key.
  EXPECT_EQ(what_of("name: t\nqubits: 2\ncouplers: ! [[0, 1]]\n"), "t.yaml:3:11: " + msg("!"));
  EXPECT_EQ(what_of("name: &n ! t\nqubits: 2\ncouplers: []\n"), "t.yaml:1:7: " + msg("!"));
  EXPECT_EQ(what_of("name: t\nqubits: 2\ncouplers: [&p !pair [0, 1]]\n"), "t.yaml:3:12: " + msg("!pair"));
  EXPECT_EQ(what_of("name: !<tag:example.com,2024:x> t\nqubits: 2\ncouplers: []\n"),
            "t.yaml:1:7: " + msg("!<tag:example.com,2024:x>"));
  EXPECT_EQ(what_of("name: t\nqubits: 2\ncouplers: []\nnative_2q: !cz"), "t.yaml:4:12: " + msg("!cz"));
  EXPECT_EQ(what_of("name: t\nqubits: 2\ncouplers: []\n!!str calibration: {}\n"), "t.yaml:4:1: " + msg("!!str"));
  EXPECT_EQ(what_of("name: t\nqubits: 2\ncouplers: []\ncalibration: !!map\n  t1_us: 40\n"),
            "t.yaml:4:14: " + msg("!!map"));
  // Quoted text without a tag is still text.
  EXPECT_EQ(parse_device_yaml("name: 'x'\nqubits: 2\ncouplers: []\n", "t.yaml").name(), "x");
}

TEST(DeviceYaml, EndOfTextPositionsStayInTheFile) {
  // yaml-cpp marks a missing ']' at line 4 column 1 of this 3-line text: point at the end of line 3.
  EXPECT_EQ(what_of("name: x\nqubits: 2\ncouplers: [\n"),
            "t.yaml:3:12: YAML syntax error: end of sequence flow not found");
  EXPECT_EQ(what_of("name: x\nqubits: 2\ncouplers: [[0, 1]"),
            "t.yaml:3:18: YAML syntax error: end of sequence flow not found");
}

// YAML 1.2 (section 5.7) escapes \N and \_ name U+0085 and U+00A0; yaml-cpp 0.7 decodes them to lone
// Latin-1 bytes. The loaded name is their UTF-8, and the written file reads back to the same device
// (found by the device-yaml fuzzer: the written file was refused as not UTF-8).
TEST(DeviceYaml, NextLineAndNoBreakSpaceEscapesAreUtf8) {
  const Device d = parse_device_yaml("name: \"a\\Nb\\_c\"\nqubits: 2\ncouplers: [[0, 1]]\n", "esc.yaml");
  EXPECT_EQ(d.name(), "a\xC2\x85" "b\xC2\xA0" "c");
  const Device back = parse_device_yaml(device_to_yaml(d), "back.yaml");
  EXPECT_EQ(back.description(), d.description());
}

TEST(DeviceYaml, CalibrationNumbers) {
  const auto dev = [](const std::string& tail) {
    return parse_device_yaml("name: t\nqubits: 3\ncouplers: [[0, 1], [1, 2]]\n" + tail, "t.yaml");
  };
  // An infinite T1 or T2 means no decay: the same calibration as leaving it out (README "Device
  // files"), kept as written so that the device prints back the same.
  const Device inf = dev("calibration: {t1_us: .inf, t2_us: +.Inf, error_2q: 0.01}\n");
  const Device none = dev("calibration: {error_2q: 0.01}\n");
  for (int q = 0; q < 3; ++q) {
    EXPECT_TRUE(std::isinf(inf.qubit_calibration(q).t1_us));
    EXPECT_EQ(inf.qubit_calibration(q).t2_us, none.qubit_calibration(q).t2_us);
  }
  EXPECT_TRUE(parse_device_yaml(device_to_yaml(inf), "again.yaml") == inf);
  // A qubit that does not decay on a chip whose others do.
  const Device one = dev("calibration: {t1_us: 110}\nqubit_calibration: [{id: 2, t1_us: .inf}]\n");
  EXPECT_EQ(one.qubit_calibration(0).t1_us, 110.0);
  EXPECT_TRUE(std::isinf(one.qubit_calibration(2).t1_us));
  EXPECT_EQ(what_of("name: t\nqubits: 1\ncouplers: []\ncalibration: {t2_us: -.inf}\n"),
            "t.yaml:4:22: 't2_us' must be a positive number (or .inf for no decay), got -.inf");
  // A float below the smallest double becomes the nearest double, zero (IEEE 754 rounding to nearest;
  // the smallest subnormal is about 4.94e-324, common practice); one above the largest is infinite.
  EXPECT_EQ(dev("calibration: {error_2q: 1e-400}\n").description().calibration.error_2q, 0.0);
  EXPECT_EQ(dev("calibration: {error_1q: 0.000000000001e-390}\n").description().calibration.error_1q, 0.0);
  EXPECT_EQ(dev("calibration: {error_1q: 3e-324}\n").description().calibration.error_1q,
            std::numeric_limits<double>::denorm_min());
  EXPECT_TRUE(std::isinf(dev("calibration: {t1_us: 1e400}\n").qubit_calibration(1).t1_us));
  EXPECT_EQ(what_of("name: t\nqubits: 1\ncouplers: []\ncalibration: {duration_2q_ns: 1e99999999999999999999}\n"),
            "t.yaml:4:31: 'duration_2q_ns' must be a positive number of ns, at most 1e9 (one second), got "
            "1e99999999999999999999");
  // The duration limit, one second, is allowed.
  EXPECT_EQ(dev("calibration: {duration_2q_ns: 1e9}\n").coupler_calibration(0).duration_ns, 1e9);
  // NaN is refused in every number (a check written as x < 0 || x > 1 would let it through).
  for (const char* field :
       {"calibration: {error_1q: .nan}", "calibration: {duration_1q_ns: .NAN}",
        "qubit_calibration: [{id: 0, t1_us: .nan}]", "qubit_calibration: [{id: 0, error_readout: .NaN}]",
        "couplers: [{pair: [0, 1], duration_ns: .nan}]"}) {
    SCOPED_TRACE(field);
    const std::string m = input_error_of([&] {
                            const std::string rest = std::string(field).starts_with("couplers") ? "" : "couplers: []\n";
                            parse_device_yaml(std::string("name: t\nqubits: 3\n") + field + "\n" + rest, "t.yaml");
                          }).message();
    EXPECT_NE(m.find("must be a number, not NaN (got ."), std::string::npos) << m;
  }
}

}  // namespace
}  // namespace qftplan
