#include "qftplan/report/report.hpp"

#include <string>
#include <string_view>

#include <fmt/format.h>

#include "qftplan/qasm/qasm_writer.hpp"

namespace qftplan {

namespace {

// The block construction's figures (core/blockwise_error.hpp).
nlohmann::ordered_json blockwise_to_json(const BlockwiseFigures& b) {
  const auto sampled = [&b](double v) { return b.sampled ? nlohmann::ordered_json(v) : nlohmann::ordered_json(nullptr); };
  nlohmann::ordered_json x;
  x["block_length"] = b.block_length;
  x["blocks"] = b.blocks;
  x["exact"] = b.exact;
  x["method"] = b.exact ? "exact" : b.sampled ? "sampled" : "enumeration";
  x["inputs"] = b.inputs;
  x["frobenius_distance"] = b.frobenius;
  x["frobenius_standard_error"] = sampled(b.frobenius_standard_error);
  x["column_threshold"] = b.threshold;
  x["columns_above"] = b.fraction_above;
  x["columns_above_standard_error"] = sampled(b.fraction_above_standard_error);
  x["worst_column"] = b.worst_column;
  return x;
}

}  // namespace

nlohmann::ordered_json report_to_json(const PlanReport& r) {
  nlohmann::ordered_json j;
  j["schema_version"] = kReportSchemaVersion;
  j["qubits"] = r.qubits;
  j["device"] = r.device;
  j["device_qubits"] = r.device_qubits;
  j["strategy"] = r.strategy;
  j["network"] = r.network;
  j["approx_degree"] = r.approx_degree ? nlohmann::ordered_json(*r.approx_degree) : nlohmann::ordered_json(nullptr);
  j["block_length"] = r.block_length ? nlohmann::ordered_json(*r.block_length) : nlohmann::ordered_json(nullptr);
  j["inverse"] = r.inverse;
  j["gates"] = r.gates;
  j["native_2q"] = r.native_2q;
  j["placement"] = r.placement;
  j["final_placement"] = r.final_placement;
  j["chain"] = r.chain;
  j["two_qubit_blocks"] = r.two_qubit_blocks;
  j["swaps"] = r.swaps;
  j["rotations"] = r.rotations;
  j["depth_2q"] = r.depth_2q;
  j["depth"] = r.depth;
  j["depth_2q_unfused"] = r.depth_2q_unfused;
  j["lower_bound_blocks"] = r.lower_bound_blocks;
  j["lower_bound_depth_2q"] = r.lower_bound_depth_2q;
  j["blocks_over_bound"] = r.lower_bound_blocks > 0 ? nlohmann::ordered_json(double(r.two_qubit_blocks) / r.lower_bound_blocks)
                                                    : nlohmann::ordered_json(nullptr);
  j["depth_2q_over_bound"] = r.lower_bound_depth_2q > 0
                                 ? nlohmann::ordered_json(double(r.depth_2q) / r.lower_bound_depth_2q)
                                 : nlohmann::ordered_json(nullptr);
  j["end_order"] = r.end_order;
  j["end_swaps"] = r.end_swaps;
  j["seed"] = r.seed;
  j["cx_count"] = r.cx_count;
  j["cx_depth"] = r.cx_depth;
  j["cx_bound"] = r.cx_bound ? nlohmann::ordered_json(*r.cx_bound) : nlohmann::ordered_json(nullptr);
  j["cx_bound_ratio"] = r.cx_bound_ratio ? nlohmann::ordered_json(*r.cx_bound_ratio) : nlohmann::ordered_json(nullptr);
  j["gate_counts"] = r.gate_counts;
  j["peephole_removed"] = r.peephole_removed ? nlohmann::ordered_json(*r.peephole_removed) : nlohmann::ordered_json(nullptr);
  j["esp"] = r.noise.esp;
  j["log_esp"] = r.noise.log_esp;
  j["esp_idle"] = r.noise.esp_idle;
  j["esp_readout"] = r.measured ? nlohmann::ordered_json(r.noise.esp_readout) : nlohmann::ordered_json(nullptr);
  j["esp_total"] = r.noise.esp_total;
  j["log_esp_total"] = r.noise.log_esp_total;
  j["duration_ns"] = r.noise.duration_ns;
  j["idle_ns"] = r.noise.idle_ns;
  j["calibrated"] = r.calibrated;
  j["approx_error_bound"] = r.approx_error_bound;
  j["approx_distance"] = r.approx.distance ? nlohmann::ordered_json(*r.approx.distance) : nlohmann::ordered_json(nullptr);
  j["approx_infidelity"] = r.approx.infidelity;
  j["readout_success"] = r.approx.readout_success;
  j["readout_standard_error"] = r.approx.method == ReadoutMethod::sampled ? nlohmann::ordered_json(r.approx.readout_standard_error)
                                                                         : nlohmann::ordered_json(nullptr);
  j["readout_method"] = readout_method_name(r.approx.method);
  j["blockwise"] = r.approx.blockwise ? blockwise_to_json(*r.approx.blockwise) : nlohmann::ordered_json(nullptr);
  if (r.degree_choice) {
    nlohmann::ordered_json d;
    d["chosen"] = r.degree_choice->chosen ? nlohmann::ordered_json(*r.degree_choice->chosen) : nlohmann::ordered_json(nullptr);
    d["chosen_block_length"] = r.degree_choice->chosen_block_length ? nlohmann::ordered_json(*r.degree_choice->chosen_block_length)
                                                                    : nlohmann::ordered_json(nullptr);
    auto& list = d["considered"] = nlohmann::ordered_json::array();
    for (const auto& c : r.degree_choice->considered)
      list.push_back({{"degree", c.degree ? nlohmann::ordered_json(*c.degree) : nlohmann::ordered_json(nullptr)},
                      {"block_length", c.block_length ? nlohmann::ordered_json(*c.block_length) : nlohmann::ordered_json(nullptr)},
                      {"esp_total", std::exp(c.log_esp)},
                      {"approx_error_bound", c.approx.error_bound},
                      {"approx_distance", c.approx.distance ? nlohmann::ordered_json(*c.approx.distance)
                                                            : nlohmann::ordered_json(nullptr)},
                      {"readout_success", c.approx.readout_success},
                      {"readout_method", readout_method_name(c.approx.method)},
                      {"frobenius_distance", c.approx.blockwise ? nlohmann::ordered_json(c.approx.blockwise->frobenius)
                                                                : nlohmann::ordered_json(nullptr)},
                      {"fidelity_bound", c.fidelity_bound},
                      {"score", c.score}});
    j["approx_choice"] = d;
  } else {
    j["approx_choice"] = nullptr;
  }
  nlohmann::ordered_json pc;
  pc["method"] = r.placement_choice.method;
  pc["chains_scored"] = r.placement_choice.chains_scored;
  auto& best = pc["best"] = nlohmann::ordered_json::array();
  for (const auto& c : r.placement_choice.best) best.push_back({{"chain", c.chain}, {"esp_total", std::exp(c.log_esp)}});
  j["placement_choice"] = pc;
  auto& alts = j["alternatives"] = nlohmann::ordered_json::array();
  for (const auto& a : r.alternatives) {
    nlohmann::ordered_json x;
    x["strategy"] = a.strategy;
    x["ok"] = a.ok;
    if (a.ok) {
      x["network"] = a.network;
      x["cx_count"] = a.cx_count;
      x["depth_2q"] = a.depth_2q;
      x["cx_depth"] = a.cx_depth;
      x["swaps"] = a.swaps;
      x["esp"] = std::exp(a.log_esp);
      x["esp_total"] = std::exp(a.log_esp_total);
      x["readout_success"] = std::exp(a.log_readout_success);
      x["duration_ns"] = a.duration_ns;
    } else {
      x["reason"] = a.reason;
    }
    alts.push_back(x);
  }
  if (r.readout) {
    // Both readout forms of a measured plan as compared (--readout); null where one was not planned.
    const auto esp = [](const std::optional<double>& l) {
      return l ? nlohmann::ordered_json(std::exp(*l)) : nlohmann::ordered_json(nullptr);
    };
    nlohmann::ordered_json ro;
    ro["chosen"] = r.readout->chosen;
    ro["reason"] = r.readout->reason;
    ro["unitary_esp_total"] = esp(r.readout->unitary_log_esp_total);
    ro["semiclassical_esp_total"] = esp(r.readout->semiclassical_log_esp_total);
    ro["unitary_note"] = r.readout->unitary_note;
    ro["semiclassical_note"] = r.readout->semiclassical_note;
    j["readout"] = ro;
  } else {
    j["readout"] = nullptr;
  }
  j["elapsed_ms"] = r.elapsed_ms;
  return j;
}

std::string report_to_json_text(const PlanReport& r) { return report_to_json(r).dump(2) + "\n"; }

namespace {
// "1 qubit", "35 qubits": a count with its noun in the right number.
std::string count_of(long long n, std::string_view noun) {
  return fmt::format("{} {}{}", n, noun, n == 1 ? "" : "s");
}

// "x2.24" against a reference figure; both zero (a 1-qubit register) compare as equal.
std::string ratio_text(long long a, long long ref) {
  if (ref == 0) return a == 0 ? "same" : "more";
  return fmt::format("x{:.2f}", static_cast<double>(a) / static_cast<double>(ref));
}

// "unitary esp_total 0.41, semiclassical esp_total 0.52": both readout forms, or why one is absent.
std::string readout_figures(const ReadoutChoice& c) {
  const auto one = [](const char* name, const std::optional<double>& l, const std::string& note) {
    return l ? fmt::format("{} esp_total {:.4g}", name, std::exp(*l)) : fmt::format("{}: {}", name, note);
  };
  return one("unitary", c.unitary_log_esp_total, c.unitary_note) + ", " +
         one("semiclassical", c.semiclassical_log_esp_total, c.semiclassical_note);
}

std::string short_list(const std::vector<int>& v) {
  if (v.size() <= 16) return fmt::format("{}", fmt::join(v, " "));
  return fmt::format("{} ... {} ({} entries)", fmt::join(v.begin(), v.begin() + 8, " "),
                     fmt::join(v.end() - 4, v.end(), " "), v.size());
}
}  // namespace

std::string format_plan_summary(const PlanReport& r) {
  QftSpec spec{r.qubits, r.approx_degree, r.inverse, r.block_length};
  std::string s;
  s += fmt::format("{} on {} ({})\n", describe_transform(spec), r.device, count_of(r.device_qubits, "qubit"));
  s += fmt::format("  strategy        {} ({} network)\n", r.strategy, r.network);
  s += fmt::format("  placement       {}\n", short_list(r.placement));
  s += fmt::format("  final placement {}\n", short_list(r.final_placement));
  s += fmt::format("  blocks          {}, {} with a SWAP, {}\n", count_of(r.two_qubit_blocks, "two-qubit block"), r.swaps,
                   count_of(r.rotations, "rotation"));
  s += fmt::format("  depth           {}, {} in all ({} gates)\n", count_of(r.depth_2q, "two-qubit layer"),
                   count_of(r.depth, "layer"), r.gates);
  s += fmt::format("  native {}       {} in {}\n", r.native_2q, count_of(r.cx_count, "gate"), count_of(r.cx_depth, "layer"));
  if (r.calibrated) {
    s += fmt::format("  ESP             {:.4g} total = {:.4g} gates x {:.4g} idling", r.noise.esp_total, r.noise.esp,
                     r.noise.esp_idle);
    if (r.measured) s += fmt::format(" x {:.4g} readout", r.noise.esp_readout);
    s += fmt::format("\n  duration        {:.0f} ns ({:.0f} ns of idle qubit time)\n", r.noise.duration_ns, r.noise.idle_ns);
  }
  if (r.readout) s += fmt::format("  readout         {} ({})\n", r.readout->chosen, readout_figures(*r.readout));
  if (r.end_order == "same")
    s += fmt::format("  end order       same as the start ({} SWAP{} added)\n", r.end_swaps, r.end_swaps == 1 ? "" : "s");
  if (r.approx.blockwise && r.approx.blockwise->exact) {
    s += fmt::format("  approximation   none: {} block{} of at most {} (the construction is the exact QFT)\n",
                     r.approx.blockwise->blocks, r.approx.blockwise->blocks == 1 ? "" : "s", r.approx.blockwise->block_length);
  } else if (r.approx.blockwise) {
    const auto& b = *r.approx.blockwise;
    const auto pm = [&b](double se) { return b.sampled ? fmt::format(" +- {:.2g}", se) : std::string(); };
    s += fmt::format("  approximation   {} blocks of {}: Frobenius distance {:.3g}{} (normalised), average-gate infidelity {:.3g}\n",
                     b.blocks, b.block_length, b.frobenius, pm(b.frobenius_standard_error), r.approx.infidelity);
    s += fmt::format("  inputs          {:.3g}%{} of columns farther than {:.3g} from the QFT's (worst seen {:.3g}; bound {:.3g})\n",
                     100 * b.fraction_above, b.sampled ? fmt::format(" +- {:.2g}", 100 * b.fraction_above_standard_error) : "",
                     b.threshold, b.worst_column, r.approx_error_bound);
    s += fmt::format("  readout success {:.6g}{} ({}, {} input{})\n", r.approx.readout_success, pm(r.approx.readout_standard_error),
                     readout_method_name(r.approx.method), b.inputs, b.inputs == 1 ? "" : "s");
  } else if (r.approx_degree) {
    s += "  approximation   ";
    if (r.approx.distance) s += fmt::format("distance {:.3g} (operator norm), ", *r.approx.distance);
    s += fmt::format("bound {:.3g}, average-gate infidelity {:.3g}\n", r.approx_error_bound, r.approx.infidelity);
    s += fmt::format("  readout success {:.6g} ({})\n", r.approx.readout_success, readout_method_name(r.approx.method));
  }
  if (r.lower_bound_depth_2q > 0)
    s += fmt::format("  vs lower bound  blocks x{:.2f}, two-qubit depth x{:.2f}\n",
                     double(r.two_qubit_blocks) / std::max<long long>(1, r.lower_bound_blocks),
                     double(r.depth_2q) / r.lower_bound_depth_2q);
  for (const auto& a : r.alternatives) {
    if (a.strategy == r.strategy) continue;
    if (a.ok)
      s += fmt::format("  vs {:<12} {} CX ({}), two-qubit depth {} ({})\n", a.strategy, a.cx_count,
                       ratio_text(a.cx_count, r.cx_count), a.depth_2q, ratio_text(a.depth_2q, r.depth_2q));
    else
      s += fmt::format("  vs {:<12} {}\n", a.strategy, a.reason);
  }
  s += fmt::format("  planned in      {:.1f} ms\n", r.elapsed_ms);
  return s;
}

std::string format_plan_explanation(const PlanReport& r) {
  std::string s;
  if (r.readout) {
    const auto& c = *r.readout;
    s += fmt::format("readout: {} chosen ({})\n", c.chosen, c.reason);
    const auto row = [&](const char* name, const std::optional<double>& l, const std::string& note) {
      s += l ? fmt::format("  {:<13}  esp_total {:<10.4g}{}\n", name, std::exp(*l), c.chosen == name ? "  <- chosen" : "")
             : fmt::format("  {:<13}  {}\n", name, note);
    };
    row("unitary", c.unitary_log_esp_total, c.unitary_note);
    row("semiclassical", c.semiclassical_log_esp_total, c.semiclassical_note);
  }
  const auto& pc = r.placement_choice;
  s += fmt::format("placement: {} ({} chain{} scored)\n", pc.method, pc.chains_scored, pc.chains_scored == 1 ? "" : "s");
  for (std::size_t i = 0; i < pc.best.size(); ++i) {
    const auto& c = pc.best[i];
    const char* tag = i == 0 ? "chosen   " : i == 1 ? "runner-up" : "         ";
    s += fmt::format("  {}  esp_total {:<10.4g}  chain {}\n", tag, std::exp(c.log_esp), short_list(c.chain));
  }
  if (r.degree_choice) {
    const auto& d = *r.degree_choice;
    // A degree, "exact", or a block length of the block construction ("blocks 8").
    auto name = [](const std::optional<int>& m, const std::optional<int>& blocks) {
      return blocks ? fmt::format("blocks {}", *blocks) : m ? std::to_string(*m) : std::string("exact");
    };
    s += fmt::format("approximation degree: {} chosen\n", name(d.chosen, d.chosen_block_length));
    // The first column widens for block lengths ("blocks 12").
    bool any_blocks = false;
    for (const auto& c : d.considered) any_blocks = any_blocks || c.block_length.has_value();
    const int width = any_blocks ? 9 : 6;
    s += fmt::format("  {:<{}}   esp_total    x readout    = score        distance     bound\n", "degree", width);
    std::optional<double> exact_log;
    for (const auto& c : d.considered)
      if (!c.degree && !c.block_length) exact_log = c.log_score;
    bool frobenius = false;
    for (const auto& c : d.considered) {
      const bool mark = c.degree == d.chosen && c.block_length == d.chosen_block_length;
      // The block construction's distance is the normalised Frobenius one (marked F), not the operator norm.
      std::string dist = c.approx.distance ? fmt::format("{:.3g}", *c.approx.distance) : std::string("-");
      if (c.approx.blockwise && !c.approx.blockwise->exact) dist = fmt::format("{:.3g} F", c.approx.blockwise->frobenius), frobenius = true;
      s += fmt::format("  {:<{}}   {:<11.4g}  {:<11.6g}  {:<11.4g}  {:<11}  {:.3g}{}\n", name(c.degree, c.block_length), width,
                       std::exp(c.log_esp), c.approx.readout_success, c.score, dist, c.approx.error_bound,
                       mark ? "  <- chosen" : "");
    }
    if (frobenius) s += "  (F: normalised Frobenius distance of the block construction, arXiv:2505.00701)\n";
    if (exact_log) {
      for (const auto& c : d.considered)
        if (c.degree == d.chosen && c.block_length == d.chosen_block_length)
          s += fmt::format("  chosen against exact: {:.4g}x the score\n", std::exp(c.log_score - *exact_log));
    } else {
      s += "  exact not scored (too large to plan twice)\n";
    }
  }
  return s;
}

}  // namespace qftplan
