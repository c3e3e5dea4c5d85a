#include "test_support.hpp"

#include <sys/wait.h>

#include <algorithm>
#include <atomic>
#include <cstdlib>
#include <fstream>
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

Device make_defective_chip(const std::string& spec, int dead_qubits, int broken_couplers, std::uint64_t seed,
                           bool largest_component) {
  const Device clean = make_lattice(spec);
  std::mt19937_64 rng(seed);
  const int N = clean.qubit_count();
  std::vector<int> order(N);
  for (int q = 0; q < N; ++q) order[q] = q;
  std::shuffle(order.begin(), order.end(), rng);
  std::vector<bool> dead(N, false);
  for (int i = 0; i < dead_qubits && i < N; ++i) dead[order[i]] = true;
  std::vector<std::pair<int, int>> pairs;
  for (const auto& c : clean.couplers())
    if (!dead[c.a] && !dead[c.b]) pairs.emplace_back(c.a, c.b);
  std::shuffle(pairs.begin(), pairs.end(), rng);
  pairs.resize(pairs.size() - std::min<std::size_t>(pairs.size(), static_cast<std::size_t>(std::max(0, broken_couplers))));
  // Keep the live qubits (of the largest piece when asked), renumbered in a random order.
  std::vector<bool> keep(N);
  for (int q = 0; q < N; ++q) keep[q] = !dead[q];
  if (largest_component) {
    DeviceDescription tmp;
    tmp.name = "tmp";
    tmp.qubits = N;
    for (const auto& [a, b] : pairs) tmp.couplers.push_back({a, b, {}, {}});
    const auto [comp, count] = Device(tmp).components();
    std::vector<int> size(count, 0);
    for (int q = 0; q < N; ++q)
      if (keep[q]) ++size[comp[q]];
    const int big = static_cast<int>(std::max_element(size.begin(), size.end()) - size.begin());
    for (int q = 0; q < N; ++q) keep[q] = keep[q] && comp[q] == big;
  }
  std::vector<int> live;
  for (int q = 0; q < N; ++q)
    if (keep[q]) live.push_back(q);
  std::shuffle(live.begin(), live.end(), rng);
  std::vector<int> id(N, -1);
  for (std::size_t i = 0; i < live.size(); ++i) id[live[i]] = static_cast<int>(i);
  DeviceDescription d;
  d.name = spec + "-defective-" + std::to_string(seed);
  d.qubits = static_cast<int>(live.size());
  for (const auto& [a, b] : pairs)
    if (id[a] >= 0 && id[b] >= 0) d.couplers.push_back({std::min(id[a], id[b]), std::max(id[a], id[b]), {}, {}});
  std::sort(d.couplers.begin(), d.couplers.end(),
            [](const Coupler& x, const Coupler& y) { return std::pair(x.a, x.b) < std::pair(y.a, y.b); });
  return Device(std::move(d));
}

}  // namespace qftplan::testing
