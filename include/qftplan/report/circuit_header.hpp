#pragma once
/// \file circuit_header.hpp
/// The header comment of an emitted circuit file, made from a plan: the one builder every front end
/// (command line, Python module, fuzzers, benchmarks, tests) uses.

#include "qftplan/device/device.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_writer.hpp"

namespace qftplan {

/// What the file's header records for `plan` on `device`: the device, the strategy and its network
/// ("chain (anchored network)"; a strategy that is its own network, such as "routed", alone), the
/// transform, the qubit maps, and the measured bits when `options.measure`.
CircuitHeader circuit_header(const Device& device, const PlanOptions& options, const PreparedPlan& plan);

}  // namespace qftplan
