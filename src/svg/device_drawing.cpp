#include "qftplan/svg/device_drawing.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <utility>
#include <vector>

#include <fmt/format.h>

#include "drawing_frame.hpp"
#include "drawing_labels.hpp"
#include "qftplan/svg/plan_drawing.hpp"
#include "qftplan/svg/svg_document.hpp"
#include "qftplan/svg/svg_layout.hpp"
#include "qftplan/svg/svg_palette.hpp"

namespace qftplan {
namespace {

// The median (the upper one of an even count); 0 for none.
double median(std::vector<double> v) {
  if (v.empty()) return 0;
  std::nth_element(v.begin(), v.begin() + static_cast<long>(v.size() / 2), v.end());
  return v[v.size() / 2];
}

// Two significant digits for the legend's error range.
std::string short_number(double v) {
  if (v == 0) return "0";
  return fmt::format("{:.2g}", v);
}

// The heading: the device's name, a line on the device, and a line on the plan when there is one.
struct Heading {
  std::string sub;        // qubits, couplers, native gate, where the positions come from
  std::string plan_line;  // the plan's title, method and blocks; empty without a plan
};

// "; 2 qubits and 5 couplers out of service" ("; 1 coupler out of service"), or empty.
std::string out_of_service_note(const Device& device) {
  if (!device.has_parts_out_of_service()) return {};
  const int q = device.qubit_count() - device.usable_qubit_count();
  const int c = device.coupler_count() - device.usable_coupler_count();
  const std::string qubits = q > 0 ? fmt::format("{} qubit{}", q, q == 1 ? "" : "s") : "";
  const std::string couplers = c > 0 ? fmt::format("{} coupler{}", c, c == 1 ? "" : "s") : "";
  return "; " + qubits + (q > 0 && c > 0 ? " and " : "") + couplers + " out of service";
}

// Parts out of service: a pale grey, dotted line for a coupler, and a pale grey circle struck
// through for a qubit, so that they read apart from the parts in service in grey scale too.
constexpr const char* kOutOfServiceStroke = "#b4b4b4";
constexpr const char* kOutOfServiceFill = "#ececec";

SvgPaint out_of_service_coupler_paint(double coupler_w) {
  SvgPaint p{"none", kOutOfServiceStroke, std::max(1.0, coupler_w * 0.6)};
  p.dash = fmt::format("{} {}", svg_number(p.stroke_width * 1.2), svg_number(p.stroke_width * 2.4));
  return p;
}

// A qubit out of service at (x, y): a grey disc with a stroke from lower left to upper right.
void out_of_service_qubit(SvgDocument& doc, double x, double y, double r) {
  doc.circle(x, y, r, SvgPaint{kOutOfServiceFill, kOutOfServiceStroke, 1.3});
  const double d = r * 0.7;
  doc.line(x - d, y + d, x + d, y - d, SvgPaint{"none", "#8c8c8c", std::max(1.0, r * 0.18)});
}

// The heading's text; measured before the page is sized, which must hold it.
Heading heading_of(const Device& device, const DrawnPlan* plan) {
  Heading h;
  h.sub = fmt::format("{} qubits, {} couplers, native {}{}{}", device.qubit_count(), device.coupler_count(),
                      two_qubit_gate_name(device.native_2q()), out_of_service_note(device),
                      has_all_positions(device) ? "" : "; positions computed (the device gives none)");
  if (plan) h.plan_line = fmt::format("{}; {}; {} two-qubit blocks", plan->title, plan->method, plan->blocks);
  return h;
}

// Scale: a typical coupler about 76 px long, the drawing at most about 1800 px across; the page
// holds the drawing with a margin, the heading above it and the legend to its right.
DrawingFrame frame_drawing(const Device& device, const Heading& heading, bool with_plan) {
  DrawingFrame fr;
  fr.pos = drawing_positions(device);
  const auto& pos = fr.pos;
  std::vector<double> lengths;
  for (const auto& c : device.couplers())
    lengths.push_back(std::hypot(pos[c.a].x - pos[c.b].x, pos[c.a].y - pos[c.b].y));
  fr.unit = median(lengths);
  if (!(fr.unit > 0)) fr.unit = 1;
  double minx = std::numeric_limits<double>::infinity(), maxx = -minx, miny = minx, maxy = -minx;
  for (const auto& p : pos) minx = std::min(minx, p.x), maxx = std::max(maxx, p.x), miny = std::min(miny, p.y), maxy = std::max(maxy, p.y);
  if (device.qubit_count() == 0) minx = maxx = miny = maxy = 0;
  fr.scale = 76 / fr.unit;
  const double extent = std::max(maxx - minx, maxy - miny) * fr.scale;
  if (extent > 1800) fr.scale *= 1800 / extent;
  fr.unit_px = fr.unit * fr.scale;
  fr.node_r = std::clamp(fr.unit_px * 0.19, 2.5, 13.0);
  // Never two circles over each other: at most 45 % of the closest pair's distance.
  fr.node_r = std::min(fr.node_r, 0.45 * closest_pair_distance(pos) * fr.scale);
  const double pad = std::max(46.0, fr.unit_px * 0.75);
  fr.head = with_plan ? 96 : 78;
  fr.legend_w = 250;
  const double draw_w = (maxx - minx) * fr.scale, draw_h = (maxy - miny) * fr.scale;
  // Wide enough for the heading lines (about 0.58 em per character).
  const double text_w = 40 + 12.5 * 0.58 * static_cast<double>(std::max(heading.sub.size(), heading.plan_line.size()));
  fr.width = std::max({pad * 2 + draw_w + fr.legend_w, 640.0, text_w});
  fr.height = std::max(fr.head + pad * 2 + draw_h, 420.0);
  fr.ox = pad - minx * fr.scale;
  fr.oy = fr.head + pad - miny * fr.scale;
  return fr;
}

// Coupler shading by two-qubit error: a log scale when the errors span more than a factor 3.
struct ErrorShading {
  std::vector<double> err;  // by coupler
  double emin = std::numeric_limits<double>::infinity(), emax = 0;
  bool shaded = false;      // calibrated errors to shade by; otherwise every coupler is grey
  bool log_scale = false;

  // Where error e falls on the ramp, 0 to 1.
  double t(double e) const {
    if (!shaded || emax <= emin) return 0.5;
    if (log_scale) return (std::log(e) - std::log(emin)) / (std::log(emax) - std::log(emin));
    return (e - emin) / (emax - emin);
  }
};

// The errors' range, and whether the couplers are shaded and on which scale.
ErrorShading error_shading(const Device& device) {
  ErrorShading s;
  s.err.resize(static_cast<std::size_t>(device.coupler_count()));
  for (int c = 0; c < device.coupler_count(); ++c) {
    s.err[c] = device.coupler_calibration(c).error;
    // The ramp spans the couplers in service (a coupler out of service is drawn apart).
    if (device.coupler_usable(c)) s.emin = std::min(s.emin, s.err[c]), s.emax = std::max(s.emax, s.err[c]);
  }
  s.shaded = device.has_calibration() && s.emax > 0;
  s.log_scale = s.shaded && s.emin > 0 && s.emax / s.emin > 3;
  return s;
}

// The strokes of the plan's band: wide along the chain or a spine's main chain, stripes on hops.
struct BandPaints {
  SvgPaint main;
  SvgPaint hop;
};

// The band's strokes, a few times the width of a coupler.
BandPaints band_paints(double coupler_w) {
  BandPaints b;
  b.main = SvgPaint{"none", kHighlightColour, coupler_w * 3.4};
  b.main.opacity = 0.38;
  b.main.linecap = "round";
  // Hops: the band cut into short stripes, so they read apart from the main chain in grey scale too,
  // even on a short coupler.
  b.hop = b.main;
  b.hop.linecap = "butt";
  b.hop.dash = fmt::format("{} {}", svg_number(coupler_w * 1.6), svg_number(coupler_w * 1.2));
  b.hop.opacity = 0.5;
  return b;
}

// A white page under everything (so that the drawing reads the same on any background) and the heading.
void draw_heading(SvgDocument& doc, const Device& device, const Heading& heading, bool with_plan) {
  doc.rect(0, 0, doc.width(), doc.height(), SvgPaint{"#ffffff"});
  doc.text(20, 30, device.name(), SvgFont{18, "start", "#1a1a1a", true});
  doc.text(20, 52, heading.sub, SvgFont{12.5, "start", "#444444"});
  if (with_plan) doc.text(20, 72, heading.plan_line, SvgFont{12.5, "start", "#444444"});
}

// A straight line along coupler c.
void coupler_line(SvgDocument& doc, const Device& device, const DrawingFrame& fr, int c, const SvgPaint& paint) {
  const auto& cp = device.couplers()[c];
  doc.line(fr.x(cp.a), fr.y(cp.a), fr.x(cp.b), fr.y(cp.b), paint);
}

// The plan's band under its couplers: the chain, or a spine's main chain (wide) and its hops to
// dangling qubits (narrow). Routed plans have none.
void draw_band(SvgDocument& doc, const Device& device, const DrawingFrame& fr, const ChainBand& band,
               const BandPaints& paints) {
  if (band.main.empty() && band.hops.empty()) return;
  doc.begin_group("chain");
  for (const int c : band.main) coupler_line(doc, device, fr, c, paints.main);
  for (const int c : band.hops) coupler_line(doc, device, fr, c, paints.hop);
  doc.end_group();
}

// Every coupler, coloured on the ramp by its error, or grey without calibration.
void draw_couplers(SvgDocument& doc, const Device& device, const DrawingFrame& fr, const ErrorShading& shading,
                   double coupler_w) {
  doc.begin_group("couplers");
  for (int c = 0; c < device.coupler_count(); ++c) {
    if (!device.coupler_usable(c)) continue;
    SvgPaint p{"none", shading.shaded ? ramp_colour(shading.t(shading.err[c])) : "#8a8a8a", coupler_w};
    p.linecap = "round";
    coupler_line(doc, device, fr, c, p);
  }
  doc.end_group();
  if (device.usable_coupler_count() == device.coupler_count()) return;
  doc.begin_group("couplers-out-of-service");
  for (int c = 0; c < device.coupler_count(); ++c)
    if (!device.coupler_usable(c)) coupler_line(doc, device, fr, c, out_of_service_coupler_paint(coupler_w));
  doc.end_group();
}

// Which bits the plan places on each of the device's n qubits (none without a plan).
RegisterBits register_bits(int n, const DrawnPlan* plan) {
  RegisterBits bits{std::vector<int>(static_cast<std::size_t>(n), -1), std::vector<int>(static_cast<std::size_t>(n), -1)};
  if (plan) {
    for (std::size_t k = 0; k < plan->placement.size(); ++k) bits.in_bit[plan->placement[k]] = static_cast<int>(k);
    for (std::size_t k = 0; k < plan->final_placement.size(); ++k)
      bits.out_bit[plan->final_placement[k]] = static_cast<int>(k);
  }
  return bits;
}

// Qubits: register qubits (start or end of the plan) ringed in the highlight colour, dead ones
// dashed; their ids inside when the circles are large enough to hold them.
void draw_qubits(SvgDocument& doc, const Device& device, const DrawingFrame& fr, const RegisterBits& bits) {
  const bool ids_inside = fr.node_r >= 7;
  doc.begin_group("qubits");
  for (int q = 0; q < device.qubit_count(); ++q) {
    if (!device.usable(q)) {
      out_of_service_qubit(doc, fr.x(q), fr.y(q), fr.node_r);
      continue;
    }
    const bool reg = bits.in_bit[q] >= 0 || bits.out_bit[q] >= 0;
    SvgPaint p{reg ? "#FCE6D6" : "#ffffff", reg ? kHighlightColour : "#3a3a3a", reg ? 2.0 : 1.3};
    if (device.degree(q) == 0) p.dash = "2 2", p.stroke = "#9a9a9a";  // an isolated (dead) qubit
    doc.circle(fr.x(q), fr.y(q), fr.node_r, p);
    if (ids_inside) {
      SvgFont f{std::min(fr.node_r * 0.95, q >= 100 ? fr.node_r * 0.78 : 12.0), "middle", "#1a1a1a"};
      f.middle = true;
      doc.text(fr.x(q), fr.y(q), std::to_string(q), f);
    }
  }
  doc.end_group();
}

// Boxes of the block counts, at the middles of the couplers that carry blocks.
std::vector<CountBox> count_boxes(const Device& device, const DrawingFrame& fr, const DrawnPlan* plan, double fs) {
  std::vector<CountBox> counts;
  if (!plan || plan->coupler_blocks.empty()) return counts;
  for (int c = 0; c < device.coupler_count(); ++c) {
    if (plan->coupler_blocks[c] <= 0) continue;
    const auto& cp = device.couplers()[c];
    const double mx = (fr.x(cp.a) + fr.x(cp.b)) / 2, my = (fr.y(cp.a) + fr.y(cp.b)) / 2;
    const double w = fs * 0.62 * static_cast<double>(std::to_string(plan->coupler_blocks[c]).size()) + 5, h = fs + 3;
    counts.push_back({c, Box{mx - w / 2, my - h / 2, mx + w / 2, my + h / 2}});
  }
  return counts;
}

// Blocks per coupler, at the coupler's middle, over everything else.
void draw_counts(SvgDocument& doc, const std::vector<CountBox>& counts, const DrawnPlan& plan, double fs) {
  doc.begin_group("loads");
  for (const auto& [c, b] : counts) {
    SvgPaint box{"#ffffff", "#555555", 0.7};
    doc.rect(b.x0, b.y0, b.x1 - b.x0, b.y1 - b.y0, box, 2.5);
    SvgFont f{fs, "middle", "#1a1a1a", true};
    f.middle = true;
    doc.text((b.x0 + b.x1) / 2, (b.y0 + b.y1) / 2, std::to_string(plan.coupler_blocks[c]), f);
  }
  doc.end_group();
}

// The legend's first entry: the error ramp with its range, or a grey coupler when there is no
// calibration. Returns the y of the next entry.
double legend_errors(SvgDocument& doc, double lx, double ly, const ErrorShading& s) {
  if (!s.shaded) {
    SvgFont body{11.5, "start", "#1a1a1a"};
    body.middle = true;
    doc.line(lx, ly, lx + 28, ly, SvgPaint{"none", "#8a8a8a", 3});
    doc.text(lx + 36, ly, "coupler (no error calibrated)", body);
    return ly + 26;
  }
  doc.text(lx, ly, s.log_scale ? "two-qubit error (log scale)" : "two-qubit error", SvgFont{12.5, "start", "#1a1a1a", true});
  ly += 10;
  std::vector<std::pair<double, std::string>> stops;
  for (int i = 0; i <= 8; ++i) stops.push_back({i / 8.0, ramp_colour(i / 8.0)});
  doc.linear_gradient("error-ramp", stops);
  doc.rect(lx, ly, 200, 12, SvgPaint{"url(#error-ramp)", "#555555", 0.6});
  ly += 12;
  SvgFont tick{10.5, "middle", "#333333"};
  const double mid = s.log_scale ? std::sqrt(s.emin * s.emax) : (s.emin + s.emax) / 2;
  if (s.emax > s.emin) {
    doc.text(lx, ly + 13, short_number(s.emin), SvgFont{10.5, "start", "#333333"});
    doc.text(lx + 100, ly + 13, short_number(mid), tick);
    doc.text(lx + 200, ly + 13, short_number(s.emax), SvgFont{10.5, "end", "#333333"});
  } else {
    doc.text(lx + 100, ly + 13, fmt::format("every coupler {}", short_number(s.emax)), tick);
  }
  return ly + 34;
}

// The legend's entries of a plan, from y = ly down: its band, register qubits, block counts, the
// placement labels, and a note on routed plans.
void legend_plan(SvgDocument& doc, double lx, double ly, const DrawnPlan& plan, const ChainBand& band,
                 const BandPaints& paints) {
  SvgFont body{11.5, "start", "#1a1a1a"};
  body.middle = true;
  auto band_sample = [&](const SvgPaint& p, const std::string& text) {
    SvgPaint sample = p;
    sample.stroke_width = 9 * p.stroke_width / paints.main.stroke_width;
    if (!sample.dash.empty()) sample.dash = "4 3";
    doc.line(lx + 2, ly, lx + 26, ly, sample);
    doc.line(lx + 2, ly, lx + 26, ly, SvgPaint{"none", ramp_colour(0.5), 2.5});
    doc.text(lx + 36, ly, text, body);
    ly += 24;
  };
  if (!band.hops.empty()) {
    band_sample(paints.main, "the spine's main chain");
    band_sample(paints.hop, "hop to a dangling qubit");
  } else if (!band.main.empty()) {
    band_sample(paints.main, fmt::format("the plan's chain ({} qubits)", plan.chain.size()));
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
  if (plan.chain.empty()) {  // a plan without a line of its own (a gate list that moves the register)
    doc.text(lx, ly + 6, plan.strategy + " plan: no fixed chain; SWAPs", note);
    doc.text(lx, ly + 20, "move the register over the couplers", note);
  }
}

// The legend's entries for parts out of service (when there are any). Returns the y of the next entry.
double legend_out_of_service(SvgDocument& doc, const Device& device, double lx, double ly, double coupler_w) {
  if (!device.has_parts_out_of_service()) return ly;
  SvgFont body{11.5, "start", "#1a1a1a"};
  body.middle = true;
  if (device.usable_qubit_count() < device.qubit_count()) {
    out_of_service_qubit(doc, lx + 14, ly, 8);
    doc.text(lx + 36, ly, "qubit out of service", body);
    ly += 24;
  }
  if (device.usable_coupler_count() < device.coupler_count()) {
    SvgPaint p = out_of_service_coupler_paint(coupler_w);
    p.stroke_width = std::max(p.stroke_width, 2.0);
    p.dash = "2.4 4.8";
    doc.line(lx + 2, ly, lx + 26, ly, p);
    doc.text(lx + 36, ly, "coupler out of service", body);
    ly += 24;
  }
  const SvgFont note{10.5, "start", "#555555"};
  doc.text(lx, ly, "(never used by a plan)", note);
  return ly + 22;
}

// The legend, in the column right of the drawing: the coupler colours, parts out of service, then
// the plan's marks.
void draw_legend(SvgDocument& doc, const Device& device, const DrawingFrame& fr, const ErrorShading& shading,
                 const DrawnPlan* plan, const ChainBand& band, const BandPaints& paints, double coupler_w) {
  doc.begin_group("legend");
  const double lx = fr.width - fr.legend_w + 10;
  double ly = legend_errors(doc, lx, fr.head + 14, shading);
  ly = legend_out_of_service(doc, device, lx, ly, coupler_w);
  if (plan) legend_plan(doc, lx, ly, *plan, band, paints);
  doc.end_group();
}

}  // namespace

// Painting order: heading, the plan's band, couplers, qubits, placement labels, block counts (over
// everything they mark), legend.
std::string draw_device_svg(const Device& device, const DrawnPlan* plan) {
  const Heading heading = heading_of(device, plan);
  const DrawingFrame fr = frame_drawing(device, heading, plan != nullptr);
  SvgDocument doc(fr.width, fr.height, plan ? device.name() + ": " + plan->title : device.name());
  draw_heading(doc, device, heading, plan != nullptr);

  const ErrorShading shading = error_shading(device);
  const double coupler_w = std::clamp(fr.node_r * 0.5, 1.2, 5.0);
  const ChainBand band = plan ? chain_band(device, *plan) : ChainBand{};
  const BandPaints paints = band_paints(coupler_w);
  draw_band(doc, device, fr, band, paints);
  draw_couplers(doc, device, fr, shading, coupler_w);
  const RegisterBits bits = register_bits(device.qubit_count(), plan);
  draw_qubits(doc, device, fr, bits);

  // The counts' boxes are known before the labels, which keep off them.
  const double count_fs = std::clamp(fr.unit_px * 0.16, 7.0, 11.0);
  const std::vector<CountBox> counts = count_boxes(device, fr, plan, count_fs);
  if (plan) draw_placement_labels(doc, device, fr, bits, counts);
  if (!counts.empty()) draw_counts(doc, counts, *plan, count_fs);
  draw_legend(doc, device, fr, shading, plan, band, paints, coupler_w);
  return doc.str();
}

}  // namespace qftplan
