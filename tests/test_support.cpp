#include "test_support.hpp"

#include <sys/wait.h>

#include <algorithm>
#include <atomic>
#include <cstdlib>
#include <fstream>
#include <functional>
#include <random>
#include <sstream>
#include <stdexcept>

#include "qftplan/device/lattices.hpp"

namespace qftplan::testing {

std::filesystem::path source_dir() { return QFTPLAN_SOURCE_DIR; }

std::filesystem::path temp_dir() {
  static std::atomic<int> counter{0};
  std::random_device rd;
  auto dir = std::filesystem::temp_directory_path() /
             ("qftplan-test-" + std::to_string(rd()) + "-" + std::to_string(counter++));
  std::filesystem::create_directories(dir);
  return dir;
}

void write_file(const std::filesystem::path& path, const std::string& text) {
  std::ofstream f(path, std::ios::binary);
  f << text;
  if (!f) throw std::runtime_error("cannot write " + path.string());
}

std::string read_file(const std::filesystem::path& path) {
  std::ifstream f(path, std::ios::binary);
  if (!f) throw std::runtime_error("cannot read " + path.string());
  std::ostringstream s;
  s << f.rdbuf();
  return s.str();
}

namespace {

RunResult run_with_prefix(const std::string& prefix, const std::string& args) {
  const auto dir = temp_dir();
  const auto out = dir / "stdout", err = dir / "stderr";
  const std::string cmd = prefix + "'" + QFTPLAN_BINARY + "' " + args + " >'" + out.string() + "' 2>'" +
                          err.string() + "' </dev/null";
  const int raw = std::system(cmd.c_str());
  RunResult r;
  r.status = WIFEXITED(raw) ? WEXITSTATUS(raw) : 128 + WTERMSIG(raw);
  r.out = read_file(out);
  r.err = read_file(err);
  std::filesystem::remove_all(dir);
  return r;
}

}  // namespace

RunResult run_qftplan(const std::string& args) { return run_with_prefix("", args); }

RunResult run_qftplan_counting_clock(const std::string& args, double tick_seconds) {
  return run_with_prefix("QFTPLAN_TEST_CLOCK_TICK=" + std::to_string(tick_seconds) + " ", args);
}

Device device_from_edges(const std::string& name, int qubits, const std::vector<std::pair<int, int>>& edges) {
  DeviceDescription d;
  d.name = name;
  d.qubits = qubits;
  for (const auto& [a, b] : edges) d.couplers.push_back({std::min(a, b), std::max(a, b), {}, {}});
  return Device(std::move(d));
}

Device make_defective_chip(const std::string& spec, int dead_qubits, int broken_couplers, std::uint64_t seed,
                           bool largest_component) {
  return with_defects(make_lattice(spec), dead_qubits, broken_couplers, seed, largest_component);
}

int brute_force_longest(const Device& d) {
  const int N = d.qubit_count();
  std::vector<char> on(static_cast<std::size_t>(N), 0);
  int best = 0;
  std::function<void(int, int)> walk = [&](int v, int len) {
    best = std::max(best, len);
    for (int w : d.neighbours(v))
      if (!on[static_cast<std::size_t>(w)]) {
        on[static_cast<std::size_t>(w)] = 1;
        walk(w, len + 1);
        on[static_cast<std::size_t>(w)] = 0;
      }
  };
  for (int s = 0; s < N; ++s) {
    on[static_cast<std::size_t>(s)] = 1;
    walk(s, 1);
    on[static_cast<std::size_t>(s)] = 0;
  }
  return best;
}

}  // namespace qftplan::testing
