#pragma once
// Helpers shared by the tests: paths, running the command-line program, temporary folders.

#include <cstdint>
#include <filesystem>
#include <string>

#include "qftplan/device/device.hpp"

// The sanitizer build (tools/test's robustness stage: clang with AddressSanitizer).
#if defined(__SANITIZE_ADDRESS__)
#define QFTPLAN_TEST_SANITIZED 1
#elif defined(__has_feature)
#if __has_feature(address_sanitizer)
#define QFTPLAN_TEST_SANITIZED 1
#endif
#endif

namespace qftplan::testing {

/// True in the sanitizer build. There the sweeps over many sizes, seeds or option sets run a sample of
/// them (each kind of case at least once): the sanitizers look for memory errors and undefined behaviour
/// along code paths, which the sample takes; the Release run of the same suite takes the whole sweep.
#ifdef QFTPLAN_TEST_SANITIZED
inline constexpr bool kSanitized = true;
#else
inline constexpr bool kSanitized = false;
#endif

/// In a sweep, whether case `i` runs: every case in Release, every `every`-th (and the first) under the
/// sanitizers.
constexpr bool sampled(int i, int every) { return !kSanitized || i % every == 0; }

/// The repository root (for topologies/ and tests/data/).
std::filesystem::path source_dir();
/// Result of running the qftplan program.
struct RunResult {
  int status = -1;       ///< exit status
  std::string out;       ///< standard output
  std::string err;       ///< standard error
};
/// Runs the built `qftplan` with the given shell-quoted argument string.
RunResult run_qftplan(const std::string& args);
/// Runs it with the budget's counting clock (run_budget.hpp: every reading of the clock advances it by
/// `tick_seconds`), so that a `--time-limit` cuts after the same work on any machine.
RunResult run_qftplan_counting_clock(const std::string& args, double tick_seconds = 0.001);
/// A fresh empty folder under the system temporary folder, removed at exit of the test process.
std::filesystem::path temp_dir();
/// Writes `text` to `path`.
void write_file(const std::filesystem::path& path, const std::string& text);
/// Reads a whole file.
std::string read_file(const std::filesystem::path& path);

}  // namespace qftplan::testing

namespace qftplan::testing {

/// A device named `name` with `qubits` qubits and the given couplers (no positions, no calibration).
Device device_from_edges(const std::string& name, int qubits, const std::vector<std::pair<int, int>>& edges);

/// A defective chip as real files describe them: the built-in lattice `spec` with `dead_qubits` qubits
/// and `broken_couplers` couplers removed at random (seeded), the remaining qubits renumbered in a
/// random order, no positions and no calibration. With `largest_component`, only the largest connected
/// piece is kept. Deterministic for a seed.
Device make_defective_chip(const std::string& spec, int dead_qubits, int broken_couplers, std::uint64_t seed,
                           bool largest_component = true);

/// The number of qubits of the longest simple path of `d`, by plain depth-first enumeration of every
/// simple path from every start (exponential; for graphs of up to ~20 qubits). Independent of the
/// library's searches: no ordering, no pruning, no bounds.
int brute_force_longest(const Device& d);

}  // namespace qftplan::testing
