// libFuzzer entry point of the qasm-check target; the work is in fuzz_inputs.cpp (qasm_check_input), shared with the
// regression tests. Exceptions other than the expected ones escape and abort: libFuzzer saves the input.
#include <cstddef>
#include <cstdint>
#include <string_view>

#include "fuzz_inputs.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  qftplan::fuzz::qasm_check_input(std::string_view(reinterpret_cast<const char*>(data), size));
  return 0;
}
