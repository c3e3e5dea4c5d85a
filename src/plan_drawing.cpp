#include "qftplan/plan_drawing.hpp"

#include <algorithm>
#include <cmath>
#include <fstream>
#include <limits>
#include <sstream>

#include <fmt/format.h>

#include "qftplan/end_order.hpp"
#include "qftplan/input_error.hpp"
#include "qftplan/native_gates.hpp"
#include "qftplan/plan.hpp"
#include "qftplan/svg_document.hpp"
#include "qftplan/svg_layout.hpp"
#include "qftplan/svg_palette.hpp"

namespace qftplan {

CouplerLoadSink::CouplerLoadSink(const Device& device, bool join_split_blocks)
    : dev_(device), loads_(static_cast<std::size_t>(device.coupler_count()), 0), join_(join_split_blocks) {}

void CouplerLoadSink::gate(const Gate& g) {
  if (!is_two_qubit(g.kind)) {
    last_cp_a_ = last_cp_b_ = -1;
    return;
  }
  const int a = std::min(g.q0, g.q1), b = std::max(g.q0, g.q1);
  // The logical gate set writes a fused block as cp then swap on the same pair: one block.
  const bool second_half = join_ && g.kind == GateKind::swap && a == last_cp_a_ && b == last_cp_b_;
  if (!second_half) {
    const int c = dev_.coupler_index(a, b);
    if (c >= 0) ++loads_[static_cast<std::size_t>(c)];
    ++total_;
  }
  if (g.kind == GateKind::cp) last_cp_a_ = a, last_cp_b_ = b;
  else last_cp_a_ = last_cp_b_ = -1;
}

namespace {

// Typed access to the fields of a plan report, with errors naming the report.
struct ReportFields {
  const nlohmann::json& j;
  const std::string& name;

  [[noreturn]] void fail(const std::string& message) const { throw InputError(name, 0, 0, message); }
  const nlohmann::json& at(const char* key) const {
    const auto it = j.find(key);
    if (it == j.end()) fail(fmt::format("not a plan report: missing field '{}' (write one with qftplan plan --report)", key));
    return *it;
  }
  std::string text(const char* key) const {
    const auto& v = at(key);
    if (!v.is_string()) fail(fmt::format("field '{}' must be text", key));
    return v.get<std::string>();
  }
  long long integer(const char* key) const {
    const auto& v = at(key);
    if (!v.is_number_integer()) fail(fmt::format("field '{}' must be a whole number", key));
    return v.get<long long>();
  }
  std::vector<int> ids(const char* key, int device_qubits) const {
    const auto& v = at(key);
    if (!v.is_array()) fail(fmt::format("field '{}' must be an array of qubit ids", key));
    std::vector<int> out;
    for (const auto& x : v) {
      if (!x.is_number_integer() || x.get<long long>() < 0 || x.get<long long>() >= device_qubits)
        fail(fmt::format("field '{}' holds {}, not a qubit id of the device (0..{})", key, x.dump(), device_qubits - 1));
      out.push_back(x.get<int>());
    }
    return out;
  }
};

std::string describe_spec(int n, const std::optional<int>& degree, bool inverse) {
  return fmt::format("{} on {} qubit{}, {}", inverse ? "inverse QFT" : "QFT", n, n == 1 ? "" : "s",
                     degree ? fmt::format("approximate of degree {}", *degree) : std::string("exact"));
}

}  // namespace

DrawnPlan drawn_plan_from_report(const Device& device, const nlohmann::json& report, const std::string& name) {
  const ReportFields f{report, name};
  if (!report.is_object()) f.fail("not a plan report: expected a JSON object");
  const std::string dev_name = f.text("device");
  if (dev_name != device.name())
    f.fail(fmt::format("the report is of a plan on device '{}', not on '{}'", dev_name, device.name()));
  const long long n = f.integer("qubits");
  if (n < 1 || n > device.qubit_count()) f.fail(fmt::format("field 'qubits' is {}, outside 1..{}", n, device.qubit_count()));
  std::optional<int> degree;
  if (const auto& d = f.at("approx_degree"); !d.is_null()) {
    if (!d.is_number_integer() || d.get<long long>() < 1) f.fail("field 'approx_degree' must be null or a degree >= 1");
    degree = d.get<int>();
  }
  const auto& inv = f.at("inverse");
  if (!inv.is_boolean()) f.fail("field 'inverse' must be true or false");
  const std::string strategy = f.text("strategy");
  const std::string network = f.text("network");
  const auto placement = f.ids("placement", device.qubit_count());
  const auto final_placement = f.ids("final_placement", device.qubit_count());
  if (static_cast<long long>(placement.size()) != n || static_cast<long long>(final_placement.size()) != n)
    f.fail(fmt::format("fields 'placement' and 'final_placement' must list {} qubits", n));

  // Re-plan with the report's settings. A chain plan is pinned to the report's placement; other
  // strategies choose their own start, which is deterministic for the default seed.
  PlanOptions opt;
  opt.spec.qubits = static_cast<int>(n);
  opt.spec.approx_degree = degree;
  opt.spec.inverse = inv.get<bool>();
  opt.gates = GateSet::logical;
  opt.strategy = strategy;
  if (strategy == "chain") opt.placement = placement;
  if (const auto it = report.find("end_order"); it != report.end()) {
    if (!it->is_string()) f.fail("field 'end_order' must be text");
    opt.end_order = parse_end_order(it->get<std::string>());
  }
  // The logical gate set writes a fused block as cp then swap; the sink counts such a pair once.
  // A routed plan may also place a cp and then a swap on one pair as two blocks, so its blocks are
  // counted from its own gate list, where every block is one gate.
  CouplerLoadSink split_loads(device, true), routed_loads(device, false);
  PlanReport r;
  bool routed = false;
  try {
    const PreparedPlan plan = prepare_plan(device, opt);
    routed = plan.routed.has_value();
    r = execute_plan(device, opt, plan, routed ? nullptr : &split_loads);
    if (routed)
      for (const auto& g : plan.routed->gates) routed_loads.gate(g);
  } catch (const std::exception& e) {
    f.fail(fmt::format("cannot re-plan the report's settings on {}: {}", device.name(), e.what()));
  }
  if (r.placement != placement || r.final_placement != final_placement || r.network != network)
    f.fail(fmt::format("re-planning gives another plan than the report's ({} network, placement {}); was the report "
                       "made with another --seed or other options?",
                       r.network, fmt::join(r.placement, ",")));

  DrawnPlan out;
  out.title = describe_spec(static_cast<int>(n), degree, opt.spec.inverse);
  out.method = r.network == strategy ? fmt::format("{} strategy", strategy)
                                     : fmt::format("{} strategy, {} network", strategy, r.network);
  out.chain = r.chain;
  out.placement = placement;
  out.final_placement = final_placement;
  out.coupler_blocks = routed ? routed_loads.loads() : split_loads.loads();
  out.blocks = r.two_qubit_blocks;
  return out;
}

DrawnPlan read_drawn_plan(const Device& device, const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path, 0, 0, "cannot open the plan report");
  std::ostringstream s;
  s << in.rdbuf();
  const std::string text = s.str();
  nlohmann::json j;
  try {
    j = nlohmann::json::parse(text);
  } catch (const nlohmann::json::parse_error& e) {
    // Turn the byte offset into a line and column.
    const std::size_t at = std::min<std::size_t>(e.byte > 0 ? e.byte - 1 : 0, text.size());
    int line = 1, col = 1;
    for (std::size_t i = 0; i < at; ++i) {
      if (text[i] == '\n') ++line, col = 1;
      else ++col;
    }
    throw InputError(path, line, col, "not valid JSON (expected the report of qftplan plan --report)");
  }
  return drawn_plan_from_report(device, j, path);
}

namespace {

struct Frame {
  double scale = 1, ox = 0, oy = 0;  // px = ox + scale * x
  double node_r = 10;
  double unit_px = 64;               // a typical coupler's length in px
};

double median(std::vector<double> v) {
  if (v.empty()) return 0;
  std::nth_element(v.begin(), v.begin() + static_cast<long>(v.size() / 2), v.end());
  return v[v.size() / 2];
}

std::string short_number(double v) {
  if (v == 0) return "0";
  return fmt::format("{:.2g}", v);
}

}  // namespace

std::string draw_device_svg(const Device& device, const DrawnPlan* plan) {
  const int n = device.qubit_count();
  const auto pos = drawing_positions(device);

  // Scale: a typical coupler about 76 px long, the drawing at most about 1800 px across.
  std::vector<double> lengths;
  for (const auto& c : device.couplers())
    lengths.push_back(std::hypot(pos[c.a].x - pos[c.b].x, pos[c.a].y - pos[c.b].y));
  double unit = median(lengths);
  if (!(unit > 0)) unit = 1;
  double minx = std::numeric_limits<double>::infinity(), maxx = -minx, miny = minx, maxy = -minx;
  for (const auto& p : pos) minx = std::min(minx, p.x), maxx = std::max(maxx, p.x), miny = std::min(miny, p.y), maxy = std::max(maxy, p.y);
  if (n == 0) minx = maxx = miny = maxy = 0;
  Frame fr;
  fr.scale = 76 / unit;
  const double extent = std::max(maxx - minx, maxy - miny) * fr.scale;
  if (extent > 1800) fr.scale *= 1800 / extent;
  fr.unit_px = unit * fr.scale;
  fr.node_r = std::clamp(fr.unit_px * 0.19, 2.5, 13.0);
  const bool ids_inside = fr.node_r >= 7;
  const std::string sub = fmt::format("{} qubits, {} couplers, native {}{}", n, device.coupler_count(),
                                      two_qubit_gate_name(device.native_2q()),
                                      has_all_positions(device) ? "" : "; positions computed (the device gives none)");
  const std::string plan_line =
      plan ? fmt::format("{}; {}; {} two-qubit blocks", plan->title, plan->method, plan->blocks) : std::string();
  const double pad = std::max(46.0, fr.unit_px * 0.75), head = plan ? 96 : 78, legend_w = 250;
  const double draw_w = (maxx - minx) * fr.scale, draw_h = (maxy - miny) * fr.scale;
  // Wide enough for the heading lines (about 0.58 em per character).
  const double text_w = 40 + 12.5 * 0.58 * static_cast<double>(std::max(sub.size(), plan_line.size()));
  const double width = std::max({pad * 2 + draw_w + legend_w, 640.0, text_w});
  const double height = std::max(head + pad * 2 + draw_h, 420.0);
  fr.ox = pad - minx * fr.scale;
  fr.oy = head + pad - miny * fr.scale;
  auto X = [&](int q) { return fr.ox + fr.scale * pos[q].x; };
  auto Y = [&](int q) { return fr.oy + fr.scale * pos[q].y; };

  SvgDocument doc(width, height, plan ? device.name() + ": " + plan->title : device.name());
  doc.rect(0, 0, width, height, SvgPaint{"#ffffff"});
  doc.text(20, 30, device.name(), SvgFont{18, "start", "#1a1a1a", true});
  doc.text(20, 52, sub, SvgFont{12.5, "start", "#444444"});
  if (plan) doc.text(20, 72, plan_line, SvgFont{12.5, "start", "#444444"});

  // Coupler shading by two-qubit error: a log scale when the errors span more than a factor 3.
  std::vector<double> err(static_cast<std::size_t>(device.coupler_count()));
  double emin = std::numeric_limits<double>::infinity(), emax = 0;
  for (int c = 0; c < device.coupler_count(); ++c) {
    err[c] = device.coupler_calibration(c).error;
    emin = std::min(emin, err[c]), emax = std::max(emax, err[c]);
  }
  const bool shaded = device.has_calibration() && emax > 0;
  const bool log_scale = shaded && emin > 0 && emax / emin > 3;
  auto shade_t = [&](double e) {
    if (!shaded || emax <= emin) return 0.5;
    if (log_scale) return (std::log(e) - std::log(emin)) / (std::log(emax) - std::log(emin));
    return (e - emin) / (emax - emin);
  };

  // 1. The plan's chain, as a wide translucent band under its couplers.
  const double coupler_w = std::clamp(fr.node_r * 0.5, 1.2, 5.0);
  if (plan && plan->chain.size() >= 2) {
    doc.begin_group("chain");
    SvgPaint band{"none", kHighlightColour, coupler_w * 3.4};
    band.opacity = 0.38;
    band.linecap = "round";
    band.linejoin = "round";
    // Runs of consecutive chain qubits joined by couplers; a line that steps over a gap (a spine
    // reaching a dangling qubit through its neighbour) is not drawn across the gap.
    std::vector<SvgPoint> pts{{X(plan->chain[0]), Y(plan->chain[0])}};
    for (std::size_t i = 1; i <= plan->chain.size(); ++i) {
      if (i == plan->chain.size() || !device.coupled(plan->chain[i - 1], plan->chain[i])) {
        if (pts.size() >= 2) doc.polyline(pts, band);
        pts.clear();
      }
      if (i < plan->chain.size()) pts.push_back({X(plan->chain[i]), Y(plan->chain[i])});
    }
    doc.end_group();
  }
  // 2. Couplers.
  doc.begin_group("couplers");
  for (int c = 0; c < device.coupler_count(); ++c) {
    const auto& cp = device.couplers()[c];
    SvgPaint p{"none", shaded ? ramp_colour(shade_t(err[c])) : "#8a8a8a", coupler_w};
    p.linecap = "round";
    doc.line(X(cp.a), Y(cp.a), X(cp.b), Y(cp.b), p);
  }
  doc.end_group();
  // 3. Qubits: register qubits (start or end of the plan) ringed in the highlight colour.
  std::vector<int> in_bit(static_cast<std::size_t>(n), -1), out_bit(static_cast<std::size_t>(n), -1);
  if (plan) {
    for (std::size_t k = 0; k < plan->placement.size(); ++k) in_bit[plan->placement[k]] = static_cast<int>(k);
    for (std::size_t k = 0; k < plan->final_placement.size(); ++k) out_bit[plan->final_placement[k]] = static_cast<int>(k);
  }
  doc.begin_group("qubits");
  for (int q = 0; q < n; ++q) {
    const bool reg = in_bit[q] >= 0 || out_bit[q] >= 0;
    SvgPaint p{reg ? "#FCE6D6" : "#ffffff", reg ? kHighlightColour : "#3a3a3a", reg ? 2.0 : 1.3};
    if (device.degree(q) == 0) p.dash = "2 2", p.stroke = "#9a9a9a";  // an isolated (dead) qubit
    doc.circle(X(q), Y(q), fr.node_r, p);
    if (ids_inside) {
      SvgFont f{std::min(fr.node_r * 0.95, q >= 100 ? fr.node_r * 0.78 : 12.0), "middle", "#1a1a1a"};
      f.baseline = "central";
      doc.text(X(q), Y(q), std::to_string(q), f);
    }
  }
  doc.end_group();
  // 4. Blocks per coupler, at the coupler's middle.
  if (plan && !plan->coupler_blocks.empty()) {
    doc.begin_group("loads");
    const double fs = std::clamp(fr.unit_px * 0.16, 7.0, 11.0);
    for (int c = 0; c < device.coupler_count(); ++c) {
      const long long load = plan->coupler_blocks[c];
      if (load <= 0) continue;
      const auto& cp = device.couplers()[c];
      const double mx = (X(cp.a) + X(cp.b)) / 2, my = (Y(cp.a) + Y(cp.b)) / 2;
      const std::string t = std::to_string(load);
      const double w = fs * 0.62 * static_cast<double>(t.size()) + 5, h = fs + 3;
      SvgPaint box{"#ffffff", "#555555", 0.7};
      doc.rect(mx - w / 2, my - h / 2, w, h, box, 2.5);
      SvgFont f{fs, "middle", "#1a1a1a", true};
      f.baseline = "central";
      doc.text(mx, my, t, f);
    }
    doc.end_group();
  }
  // 5. Placement labels, set off away from the qubit's neighbours (into empty space).
  if (plan) {
    doc.begin_group("placement");
    const double fs = std::clamp(fr.unit_px * 0.17, 7.5, 11.0);
    for (int q = 0; q < n; ++q) {
      if (in_bit[q] < 0 && out_bit[q] < 0) continue;
      double dx = 0, dy = 0;
      for (const int nb : device.neighbours(q)) dx += pos[q].x - pos[nb].x, dy += pos[q].y - pos[nb].y;
      double len = std::hypot(dx, dy);
      if (len < 1e-9 * unit) dx = 1, dy = -1, len = std::sqrt(2.0);
      dx /= len, dy /= len;
      const double d = fr.node_r + fs * 1.5;
      const double cx = X(q) + dx * d, cy = Y(q) + dy * d;
      std::vector<std::pair<std::string, std::string>> lines;
      if (in_bit[q] >= 0) lines.push_back({fmt::format("in {}", in_bit[q]), "#0060A0"});
      if (out_bit[q] >= 0) lines.push_back({fmt::format("out {}", out_bit[q]), "#B34700"});
      double w = 0;
      for (const auto& l : lines) w = std::max(w, fs * 0.6 * static_cast<double>(l.first.size()) + 4);
      const double h = fs * 1.15 * static_cast<double>(lines.size()) + 2;
      SvgPaint box{"#ffffff"};
      box.opacity = 0.85;
      doc.rect(cx - w / 2, cy - h / 2, w, h, box, 2);
      for (std::size_t i = 0; i < lines.size(); ++i) {
        SvgFont f{fs, "middle", lines[i].second, true};
        f.baseline = "central";
        doc.text(cx, cy - h / 2 + 1 + fs * 1.15 * (static_cast<double>(i) + 0.5), lines[i].first, f);
      }
    }
    doc.end_group();
  }

  // Legend.
  doc.begin_group("legend");
  const double lx = width - legend_w + 10;
  double ly = head + 14;
  const SvgFont head_font{12.5, "start", "#1a1a1a", true};
  SvgFont body{11.5, "start", "#1a1a1a"};
  body.baseline = "middle";
  if (shaded) {
    doc.text(lx, ly, log_scale ? "two-qubit error (log scale)" : "two-qubit error", head_font);
    ly += 10;
    std::vector<std::pair<double, std::string>> stops;
    for (int i = 0; i <= 8; ++i) stops.push_back({i / 8.0, ramp_colour(i / 8.0)});
    doc.linear_gradient("error-ramp", stops);
    doc.rect(lx, ly, 200, 12, SvgPaint{"url(#error-ramp)", "#555555", 0.6});
    ly += 12;
    SvgFont tick{10.5, "middle", "#333333"};
    const double mid = log_scale ? std::sqrt(emin * emax) : (emin + emax) / 2;
    if (emax > emin) {
      doc.text(lx, ly + 13, short_number(emin), SvgFont{10.5, "start", "#333333"});
      doc.text(lx + 100, ly + 13, short_number(mid), tick);
      doc.text(lx + 200, ly + 13, short_number(emax), SvgFont{10.5, "end", "#333333"});
    } else {
      doc.text(lx + 100, ly + 13, fmt::format("every coupler {}", short_number(emax)), tick);
    }
    ly += 34;
  } else {
    doc.line(lx, ly, lx + 28, ly, SvgPaint{"none", "#8a8a8a", 3});
    doc.text(lx + 36, ly, "coupler (no error calibrated)", body);
    ly += 26;
  }
  if (plan) {
    if (plan->chain.size() >= 2) {
      SvgPaint band{"none", kHighlightColour, 9};
      band.opacity = 0.38;
      band.linecap = "round";
      doc.line(lx + 2, ly, lx + 26, ly, band);
      doc.line(lx + 2, ly, lx + 26, ly, SvgPaint{"none", ramp_colour(0.5), 2.5});
      doc.text(lx + 36, ly, "the plan's chain", body);
      ly += 24;
    }
    doc.circle(lx + 14, ly, 8, SvgPaint{"#FCE6D6", kHighlightColour, 2});
    doc.text(lx + 36, ly, "register qubit", body);
    ly += 24;
    doc.rect(lx + 6, ly - 8, 18, 15, SvgPaint{"#ffffff", "#555555", 0.7}, 2.5);
    SvgFont nf{10, "middle", "#1a1a1a", true};
    nf.baseline = "central";
    doc.text(lx + 15, ly, "7", nf);
    doc.text(lx + 36, ly, "blocks on the coupler", body);
    ly += 24;
    SvgFont in_font = body;
    in_font.fill = "#0060A0";
    in_font.bold = true;
    doc.text(lx, ly, "in k", in_font);
    doc.text(lx + 36, ly, "holds input bit k at the start", body);
    ly += 20;
    SvgFont out_font = body;
    out_font.fill = "#B34700";
    out_font.bold = true;
    doc.text(lx, ly, "out k", out_font);
    doc.text(lx + 36, ly, "holds output bit k at the end", body);
    ly += 20;
    doc.text(lx, ly + 6, "bit k has weight 2^k", SvgFont{10.5, "start", "#555555"});
    ly += 26;
  }
  doc.end_group();
  return doc.str();
}

}  // namespace qftplan
