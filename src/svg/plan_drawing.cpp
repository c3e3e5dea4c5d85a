#include "qftplan/svg/plan_drawing.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>
#include <unordered_map>

#include <fmt/format.h>

#include "qftplan/core/input_error.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/svg/svg_document.hpp"
#include "qftplan/svg/svg_layout.hpp"
#include "qftplan/svg/svg_palette.hpp"

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

std::string describe_spec(int n, const std::optional<int>& degree, bool inverse) {
  return fmt::format("{} on {} qubit{}, {}", inverse ? "inverse QFT" : "QFT", n, n == 1 ? "" : "s",
                     degree ? fmt::format("approximate of degree {}", *degree) : std::string("exact"));
}

}  // namespace

DrawnPlan drawn_plan(const Device& device, const PreparedPlan& plan, const PlanReport& report) {
  // Blocks are counted on the planner's own stream, where every block is one gate (a fused cp+SWAP,
  // a parity step, a detour's SWAPs).
  CouplerLoadSink loads(device, false);
  plan.circuit->emit(loads);
  loads.finish();
  const PlannedCircuit& c = *plan.circuit;
  DrawnPlan out;
  out.title = describe_spec(plan.spec.qubits, plan.spec.approx_degree, plan.spec.inverse);
  out.method = report.network == report.strategy
                   ? fmt::format("{} strategy", report.strategy)
                   : fmt::format("{} strategy, {} network", report.strategy, report.network);
  out.strategy = report.strategy;
  if (c.region_is_line()) out.chain = c.region();
  out.detours = c.detours();
  out.placement = report.placement;
  out.final_placement = report.final_placement;
  out.coupler_blocks = loads.loads();
  out.blocks = report.two_qubit_blocks;
  return out;
}

ChainBand chain_band(const Device& device, const DrawnPlan& plan) {
  ChainBand band;
  if (plan.chain.size() < 2) return band;  // a routed plan has no line
  std::vector<bool> dangling(static_cast<std::size_t>(device.qubit_count()), false);
  for (const auto& [a, b, via] : plan.detours)
    if (a >= 0 && a < device.qubit_count()) dangling[a] = true;
  std::vector<bool> taken(static_cast<std::size_t>(device.coupler_count()), false);
  auto add = [&](int a, int b) {
    const int c = a >= 0 && b >= 0 ? device.coupler_index(std::min(a, b), std::max(a, b)) : -1;
    if (c < 0 || taken[c]) return;
    taken[c] = true;
    (dangling[a] || dangling[b] ? band.hops : band.main).push_back(c);
  };
  for (std::size_t p = 0; p + 1 < plan.chain.size(); ++p)
    if (device.coupled(plan.chain[p], plan.chain[p + 1])) add(plan.chain[p], plan.chain[p + 1]);
  // A gate between uncoupled line neighbours steps through the spine qubit both hang from.
  for (const auto& [a, b, via] : plan.detours) add(a, via), add(via, b);
  std::sort(band.main.begin(), band.main.end());
  std::sort(band.hops.begin(), band.hops.end());
  return band;
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

// An axis-aligned box in px.
struct Box {
  double x0 = 0, y0 = 0, x1 = 0, y1 = 0;
};

bool overlap(const Box& a, const Box& b, double margin) {
  return a.x0 < b.x1 + margin && b.x0 < a.x1 + margin && a.y0 < b.y1 + margin && b.y0 < a.y1 + margin;
}

double distance(const Box& b, double x, double y) {
  const double dx = std::max({b.x0 - x, 0.0, x - b.x1}), dy = std::max({b.y0 - y, 0.0, y - b.y1});
  return std::hypot(dx, dy);
}

// Whether the segment (x1, y1)-(x2, y2) passes through the box (Liang and Barsky's clipping test).
bool crosses(const Box& b, double x1, double y1, double x2, double y2) {
  double t0 = 0, t1 = 1;
  const double dx = x2 - x1, dy = y2 - y1;
  const double p[4] = {-dx, dx, -dy, dy}, q[4] = {x1 - b.x0, b.x1 - x1, y1 - b.y0, b.y1 - y1};
  for (int i = 0; i < 4; ++i) {
    if (p[i] == 0) {
      if (q[i] < 0) return false;
      continue;
    }
    const double t = q[i] / p[i];
    if (p[i] < 0) t0 = std::max(t0, t);
    else t1 = std::min(t1, t);
    if (t0 > t1) return false;
  }
  return true;
}

// Width of a bold label of `chars` characters: about 0.62 em a character in DejaVu Sans Bold (its
// letters and digits run 0.34 to 0.72 em), plus 2 px each side.
double label_width(std::size_t chars, double fs) { return fs * 0.62 * static_cast<double>(chars) + 4; }

// One register qubit's label, and where it went.
struct Label {
  int qubit = -1;
  std::vector<std::pair<std::string, std::string>> lines;  // text, colour
  double w = 0, h = 0;
  Box box;
  bool leader = false;  // set off beyond the first ring: a thin line leads back to the qubit
};

// Ids of boxes filed by the square cells of a grid they touch, so that a query only sees boxes near it.
class Buckets {
 public:
  explicit Buckets(double cell) : cell_(std::max(cell, 1.0)) {}
  void insert(const Box& b, int id) {
    for (long long cx = key(b.x0); cx <= key(b.x1); ++cx)
      for (long long cy = key(b.y0); cy <= key(b.y1); ++cy) cells_[cx * kStride + cy].push_back(id);
  }
  // Ids of every box filed in a cell that `b` touches, ascending, each once.
  std::vector<int> query(const Box& b) const {
    std::vector<int> out;
    for (long long cx = key(b.x0); cx <= key(b.x1); ++cx)
      for (long long cy = key(b.y0); cy <= key(b.y1); ++cy)
        if (const auto it = cells_.find(cx * kStride + cy); it != cells_.end()) out.insert(out.end(), it->second.begin(), it->second.end());
    std::sort(out.begin(), out.end());
    out.erase(std::unique(out.begin(), out.end()), out.end());
    return out;
  }

 private:
  static constexpr long long kStride = 1 << 20;
  long long key(double v) const { return static_cast<long long>(std::floor(v / cell_)) + kStride / 2; }
  double cell_;
  std::unordered_map<long long, std::vector<int>> cells_;
};

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

  // 1. The plan's band under its couplers: the chain, or a spine's main chain (wide) and its hops
  // to dangling qubits (narrow). Routed plans have none.
  const double coupler_w = std::clamp(fr.node_r * 0.5, 1.2, 5.0);
  const ChainBand band = plan ? chain_band(device, *plan) : ChainBand{};
  SvgPaint main_band{"none", kHighlightColour, coupler_w * 3.4};
  main_band.opacity = 0.38;
  main_band.linecap = "round";
  // Hops: the band cut into short stripes, so they read apart from the main chain in grey scale too,
  // even on a short coupler.
  SvgPaint hop_band = main_band;
  hop_band.linecap = "butt";
  hop_band.dash = fmt::format("{} {}", svg_number(coupler_w * 1.6), svg_number(coupler_w * 1.2));
  hop_band.opacity = 0.5;
  if (!band.main.empty() || !band.hops.empty()) {
    doc.begin_group("chain");
    for (const int c : band.main) {
      const auto& cp = device.couplers()[c];
      doc.line(X(cp.a), Y(cp.a), X(cp.b), Y(cp.b), main_band);
    }
    for (const int c : band.hops) {
      const auto& cp = device.couplers()[c];
      doc.line(X(cp.a), Y(cp.a), X(cp.b), Y(cp.b), hop_band);
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
      f.middle = true;
      doc.text(X(q), Y(q), std::to_string(q), f);
    }
  }
  doc.end_group();

  // Boxes of the block counts, at the couplers' middles (drawn last, over everything).
  const double load_fs = std::clamp(fr.unit_px * 0.16, 7.0, 11.0);
  std::vector<std::pair<int, Box>> loads;
  if (plan && !plan->coupler_blocks.empty())
    for (int c = 0; c < device.coupler_count(); ++c) {
      if (plan->coupler_blocks[c] <= 0) continue;
      const auto& cp = device.couplers()[c];
      const double mx = (X(cp.a) + X(cp.b)) / 2, my = (Y(cp.a) + Y(cp.b)) / 2;
      const double w = load_fs * 0.62 * static_cast<double>(std::to_string(plan->coupler_blocks[c]).size()) + 5,
                   h = load_fs + 3;
      loads.push_back({c, Box{mx - w / 2, my - h / 2, mx + w / 2, my + h / 2}});
    }

  // 4. Placement labels. Each goes to the best of 16 directions times 4 distances around its qubit:
  // never over a qubit, a block count, another label or the edge of the drawing; then as few
  // couplers under it as may be, near its qubit, nearer to it than to any other qubit, and away
  // from its neighbours. Most constrained qubits choose first; every rule is deterministic.
  if (plan) {
    const double fs = std::clamp(fr.unit_px * 0.17, 7.5, 11.0);
    const Box frame{4, head - 12, width - legend_w, height - 4};
    std::vector<Label> labels;
    for (int q = 0; q < n; ++q) {
      if (in_bit[q] < 0 && out_bit[q] < 0) continue;
      Label l;
      l.qubit = q;
      if (in_bit[q] >= 0) l.lines.push_back({fmt::format("in {}", in_bit[q]), "#0060A0"});
      if (out_bit[q] >= 0) l.lines.push_back({fmt::format("out {}", out_bit[q]), "#B34700"});
      for (const auto& t : l.lines) l.w = std::max(l.w, label_width(t.first.size(), fs));
      l.h = fs * 1.15 * static_cast<double>(l.lines.size()) + 2;
      labels.push_back(std::move(l));
    }
    constexpr int kDirections = 16, kRings = 4;
    struct Spot {
      Box box;
      int ring = 0;
      double fixed_cost = 0;   // couplers crossed, distance, ambiguity and direction
      int fixed_clashes = 0;   // qubits, counts and the frame it touches
      bool unclear = false;    // another qubit about as near: a leader line says whose it is
    };
    // How far a spot's box can reach from its qubit's centre; objects are looked up within it.
    double reach_max = 0;
    for (const auto& l : labels) reach_max = std::max(reach_max, fr.node_r + 3 + (kRings - 1) * fs * 1.1 + l.w + l.h);
    Buckets qubit_cells(reach_max), coupler_cells(reach_max), load_cells(reach_max), label_cells(reach_max);
    for (int q = 0; q < n; ++q) qubit_cells.insert(Box{X(q), Y(q), X(q), Y(q)}, q);
    for (int c = 0; c < device.coupler_count(); ++c) {
      const auto& cp = device.couplers()[c];
      coupler_cells.insert(Box{std::min(X(cp.a), X(cp.b)), std::min(Y(cp.a), Y(cp.b)), std::max(X(cp.a), X(cp.b)),
                               std::max(Y(cp.a), Y(cp.b))},
                           c);
    }
    for (std::size_t i = 0; i < loads.size(); ++i) load_cells.insert(loads[i].second, static_cast<int>(i));
    for (std::size_t i = 0; i < labels.size(); ++i) {
      const int q = labels[i].qubit;
      label_cells.insert(Box{X(q), Y(q), X(q), Y(q)}, static_cast<int>(i));
    }
    auto around = [&](int q, double r) { return Box{X(q) - r, Y(q) - r, X(q) + r, Y(q) + r}; };
    auto spots_of = [&](const Label& l) {
      const int q = l.qubit;
      double dx = 0, dy = 0;
      for (const int nb : device.neighbours(q)) dx += pos[q].x - pos[nb].x, dy += pos[q].y - pos[nb].y;
      if (std::hypot(dx, dy) < 1e-9 * unit) dx = 1, dy = -1;
      const double preferred = std::atan2(dy, dx);
      // A qubit nearer to a spot than its own is within twice the reach; couplers and counts that
      // touch a spot lie within the reach.
      const auto near_qubits = qubit_cells.query(around(q, 2 * reach_max + fr.node_r));
      const auto near_couplers = coupler_cells.query(around(q, reach_max));
      const auto near_loads = load_cells.query(around(q, reach_max));
      std::vector<Spot> spots;
      for (int ring = 0; ring < kRings; ++ring)
        for (int k = 0; k < kDirections; ++k) {
          const double a = 2 * std::numbers::pi * k / kDirections;
          const double ux = std::cos(a), uy = std::sin(a);
          // The box's reach towards the qubit, so that its nearest point clears the circle by 3 px.
          const double reach = l.w / 2 * std::abs(ux) + l.h / 2 * std::abs(uy);
          const double d = fr.node_r + 3 + reach + ring * fs * 1.1;
          const double cx = X(q) + ux * d, cy = Y(q) + uy * d;
          Spot s;
          s.ring = ring;
          s.box = Box{cx - l.w / 2, cy - l.h / 2, cx + l.w / 2, cy + l.h / 2};
          if (s.box.x0 < frame.x0 || s.box.y0 < frame.y0 || s.box.x1 > frame.x1 || s.box.y1 > frame.y1) ++s.fixed_clashes;
          const double own = distance(s.box, X(q), Y(q));
          bool nearer_other = false;
          for (const int o : near_qubits) {
            const double dist = distance(s.box, X(o), Y(o));
            if (dist < fr.node_r + 2) ++s.fixed_clashes;
            if (o != q && dist < own) nearer_other = true;
            if (o != q && dist < own + fr.node_r) s.unclear = true;
          }
          for (const int i : near_loads)
            if (overlap(s.box, loads[i].second, 1.5)) ++s.fixed_clashes;
          int crossed = 0;
          for (const int c : near_couplers) {
            const auto& cp = device.couplers()[c];
            if (crosses(s.box, X(cp.a), Y(cp.a), X(cp.b), Y(cp.b))) ++crossed;
          }
          double turn = std::abs(std::remainder(a - preferred, 2 * std::numbers::pi));
          s.fixed_cost = 6.0 * crossed + 3.0 * ring + (nearer_other ? 8.0 : 0.0) + (s.unclear ? 2.0 : 0.0) +
                         turn / std::numbers::pi;
          spots.push_back(s);
        }
      return spots;
    };
    std::vector<std::vector<Spot>> spots;
    std::vector<std::pair<int, std::size_t>> order;  // (free spots, label), fewest first
    for (std::size_t i = 0; i < labels.size(); ++i) {
      spots.push_back(spots_of(labels[i]));
      const int free = static_cast<int>(std::count_if(spots.back().begin(), spots.back().end(),
                                                      [](const Spot& s) { return s.fixed_clashes == 0; }));
      order.push_back({free, i});
    }
    std::sort(order.begin(), order.end());
    // Greedy, then a few passes that move each label to its best spot given all the others (the
    // total cost only falls, so the passes end; a fixed count of them keeps the run time bounded).
    std::vector<const Spot*> at(labels.size(), nullptr);
    // Labels that can touch each other: their qubits within twice the reach.
    std::vector<std::vector<int>> rivals(labels.size());
    for (std::size_t i = 0; i < labels.size(); ++i)
      rivals[i] = label_cells.query(around(labels[i].qubit, 2 * reach_max + 4));
    auto best_spot = [&](std::size_t i) {
      double best = std::numeric_limits<double>::infinity();
      const Spot* chosen = nullptr;
      for (const auto& s : spots[i]) {
        int clashes = s.fixed_clashes;
        for (const int j : rivals[i])
          if (static_cast<std::size_t>(j) != i && at[j] && overlap(s.box, at[j]->box, 2)) ++clashes;
        const double cost = 1000.0 * clashes + s.fixed_cost;
        if (cost < best) best = cost, chosen = &s;
      }
      return chosen;
    };
    for (const auto& [free, i] : order) at[i] = best_spot(i);
    for (int pass = 0; pass < 4; ++pass) {
      bool moved = false;
      for (const auto& [free, i] : order) {
        const Spot* s = best_spot(i);
        if (s != at[i]) moved = true, at[i] = s;
      }
      if (!moved) break;
    }
    for (std::size_t i = 0; i < labels.size(); ++i) {
      labels[i].box = at[i]->box;
      labels[i].leader = at[i]->ring > 0 || at[i]->unclear;
    }
    doc.begin_group("placement");
    for (const auto& l : labels) {
      if (!l.leader) continue;
      // From the circle's edge to the box's nearest point.
      const double bx = std::clamp(X(l.qubit), l.box.x0, l.box.x1), by = std::clamp(Y(l.qubit), l.box.y0, l.box.y1);
      const double len = std::hypot(bx - X(l.qubit), by - Y(l.qubit));
      if (len <= fr.node_r + 1) continue;
      const double ux = (bx - X(l.qubit)) / len, uy = (by - Y(l.qubit)) / len;
      doc.line(X(l.qubit) + ux * fr.node_r, Y(l.qubit) + uy * fr.node_r, bx, by, SvgPaint{"none", "#8a8a8a", 0.9});
    }
    for (const auto& l : labels) {
      SvgPaint box{"#ffffff"};
      box.opacity = 0.85;
      doc.rect(l.box.x0, l.box.y0, l.w, l.h, box, 2);
      const double cx = (l.box.x0 + l.box.x1) / 2;
      for (std::size_t i = 0; i < l.lines.size(); ++i) {
        SvgFont f{fs, "middle", l.lines[i].second, true};
        f.middle = true;
        doc.text(cx, l.box.y0 + 1 + fs * 1.15 * (static_cast<double>(i) + 0.5), l.lines[i].first, f);
      }
    }
    doc.end_group();
  }
  // 5. Blocks per coupler, at the coupler's middle, over everything else.
  if (!loads.empty()) {
    doc.begin_group("loads");
    for (const auto& [c, b] : loads) {
      SvgPaint box{"#ffffff", "#555555", 0.7};
      doc.rect(b.x0, b.y0, b.x1 - b.x0, b.y1 - b.y0, box, 2.5);
      SvgFont f{load_fs, "middle", "#1a1a1a", true};
      f.middle = true;
      doc.text((b.x0 + b.x1) / 2, (b.y0 + b.y1) / 2, std::to_string(plan->coupler_blocks[c]), f);
    }
    doc.end_group();
  }

  // Legend.
  doc.begin_group("legend");
  const double lx = width - legend_w + 10;
  double ly = head + 14;
  const SvgFont head_font{12.5, "start", "#1a1a1a", true};
  SvgFont body{11.5, "start", "#1a1a1a"};
  body.middle = true;
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
    auto band_sample = [&](const SvgPaint& p, const std::string& text) {
      SvgPaint sample = p;
      sample.stroke_width = 9 * p.stroke_width / main_band.stroke_width;
      if (!sample.dash.empty()) sample.dash = "4 3";
      doc.line(lx + 2, ly, lx + 26, ly, sample);
      doc.line(lx + 2, ly, lx + 26, ly, SvgPaint{"none", ramp_colour(0.5), 2.5});
      doc.text(lx + 36, ly, text, body);
      ly += 24;
    };
    if (!band.hops.empty()) {
      band_sample(main_band, "the spine's main chain");
      band_sample(hop_band, "hop to a dangling qubit");
    } else if (!band.main.empty()) {
      band_sample(main_band, fmt::format("the plan's chain ({} qubits)", plan->chain.size()));
    }
    doc.circle(lx + 14, ly, 8, SvgPaint{"#FCE6D6", kHighlightColour, 2});
    doc.text(lx + 36, ly, "register qubit", body);
    ly += 24;
    doc.rect(lx + 6, ly - 8, 18, 15, SvgPaint{"#ffffff", "#555555", 0.7}, 2.5);
    SvgFont nf{10, "middle", "#1a1a1a", true};
    nf.middle = true;
    doc.text(lx + 15, ly - 0.5, "7", nf);
    doc.text(lx + 36, ly, "blocks on the coupler", body);
    ly += 24;
    SvgFont in_font = body;
    in_font.fill = "#0060A0";
    in_font.bold = true;
    doc.text(lx, ly, "in k", in_font);
    doc.text(lx + 44, ly, "holds input bit k at the start", body);
    ly += 20;
    SvgFont out_font = body;
    out_font.fill = "#B34700";
    out_font.bold = true;
    doc.text(lx, ly, "out k", out_font);
    doc.text(lx + 44, ly, "holds output bit k at the end", body);
    ly += 20;
    const SvgFont note{10.5, "start", "#555555"};
    doc.text(lx, ly + 6, "bit k has weight 2^k", note);
    ly += 18;
    if (plan->strategy == "routed") {
      doc.text(lx, ly + 6, "routed plan: no fixed chain; SWAPs", note);
      doc.text(lx, ly + 20, "move the register over the couplers", note);
      ly += 28;
    }
    ly += 8;
  }
  doc.end_group();
  return doc.str();
}

}  // namespace qftplan
