#pragma once
/// \file bench_support.hpp
/// What every qftplan benchmark reports besides its time, for ./tools/bench's table: the gates it
/// handled, the target time of issue 7, and the process's peak memory. tools/bench runs each case
/// in a process of its own, so the peak is that case's.

#include <sys/resource.h>

#include <map>
#include <string>

#include <benchmark/benchmark.h>

namespace qftplan::bench {

/// Peak resident memory of this process so far, in MiB (Linux reports ru_maxrss in KiB).
inline double peak_rss_mib() {
  rusage u{};
  getrusage(RUSAGE_SELF, &u);
  return static_cast<double>(u.ru_maxrss) / 1024.0;
}

/// Total of a report's gate counts.
inline double total_gates(const std::map<std::string, long long>& counts) {
  long long t = 0;
  for (const auto& [name, c] : counts) t += c;
  return static_cast<double>(t);
}

/// Records the counters tools/bench reads. `target_s` is the time the case must stay under (0: a
/// case that is judged another way, such as the doubling series); `bytes` the text written, if any.
inline void record(benchmark::State& state, double gates, double target_s, double bytes = 0) {
  state.counters["gates"] = gates;
  state.counters["target_s"] = target_s;
  state.counters["bytes"] = bytes;
  state.counters["peak_mib"] = peak_rss_mib();
}

/// A scratch folder for the files the benchmarks write (under the system's temporary folder).
std::string scratch_path(const std::string& name);

}  // namespace qftplan::bench
