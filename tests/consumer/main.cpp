// Plans an exact QFT through the installed library and prints a few report fields, one per line
// ("name value"), for tests/consumer/run_consumer_test.cmake to compare.

#include <cstdio>
#include <exception>

#include "qftplan/device/device_source.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/report/report.hpp"

int main() {
  try {
    const qftplan::Device dev = qftplan::load_device("line:8");
    qftplan::PlanOptions opt;
    opt.spec.qubits = 8;
    const qftplan::PlanReport r = qftplan::plan_qft(dev, opt);
    // nlohmann_json comes with the package (report.hpp uses it).
    const auto json = qftplan::report_to_json(r);
    std::printf("cx_count %lld\n", r.cx_count);
    std::printf("network %s\n", r.network.c_str());
    std::printf("schema_version %d\n", json.at("schema_version").get<int>());
  } catch (const std::exception& e) {
    std::fprintf(stderr, "consumer: %s\n", e.what());
    return 1;
  }
  return 0;
}
