#include "bench_support.hpp"

#include <unistd.h>

#include <filesystem>
#include <system_error>

namespace qftplan::bench {

namespace {

// The process's scratch folder, removed with everything in it when the process ends (a benchmark
// writes files of up to a gigabyte).
struct Scratch {
  std::filesystem::path dir =
      std::filesystem::temp_directory_path() / ("qftplan-bench-" + std::to_string(::getpid()));
  Scratch() { std::filesystem::create_directories(dir); }
  ~Scratch() {
    std::error_code ec;
    std::filesystem::remove_all(dir, ec);
  }
};

}  // namespace

std::string scratch_path(const std::string& name) {
  static const Scratch scratch;
  return (scratch.dir / name).string();
}

}  // namespace qftplan::bench
