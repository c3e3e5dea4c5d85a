#pragma once
/// \file fuzz_inputs.hpp
/// One input of each fuzz target, as a plain function: the libFuzzer entry points call these, and
/// the test suite replays the seed corpora and every saved crash input (tests/data/regressions/)
/// through the very same code.
///
/// Each function feeds the bytes to the library the way the command line would and then checks
/// invariants that must hold whatever the input. Bad input may only ever raise InputError (or
/// PlanningError for a valid request that cannot be planned); any other exception, and any broken
/// invariant (thrown as InvariantBroken), is a bug. Crashes and sanitizer reports are bugs too.

#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

namespace qftplan::fuzz {

/// An invariant that must hold for every input did not: a bug in qftplan, never bad input.
class InvariantBroken : public std::logic_error {
 public:
  using std::logic_error::logic_error;
};

/// A YAML device file: parse_device_yaml, then the exact YAML round trip and the device self-check.
void device_yaml_input(std::string_view data);

/// A built-in device spec ("grid:3x4"): make_lattice / load_device, then the documented qubit and
/// coupler counts of the family, the round trip and the self-check. Never touches the file system.
void lattice_spec_input(std::string_view data);

/// An OpenQASM 2/3 file: parse_qasm, then check_qft_circuit on a small device named by its
/// "// device:" header (grid:3x3 otherwise); a passed structural proof must agree with simulation.
void qasm_check_input(std::string_view data);

/// A plan request decoded from the bytes: a small device (random graph, optional calibration) and
/// options (register size, degree or auto, inverse, gate set, format, strategy, pin, seed). Every
/// plan must pass the streaming structural proof and, re-read from its OpenQASM text, the checker
/// with state-vector simulation; its report must agree with what the request implies.
void plan_input(std::string_view data);

/// A fuzz target by name: "device-yaml", "lattice-spec", "qasm-check", "plan".
struct Target {
  const char* name;
  void (*run)(std::string_view data);
};

/// Every target, in the order above.
const std::vector<Target>& targets();

}  // namespace qftplan::fuzz
