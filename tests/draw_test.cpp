// `qftplan draw`: the device picture, and a plan report re-planned to count blocks per coupler.

#include <gtest/gtest.h>

#include <array>
#include <filesystem>
#include <cmath>
#include <limits>
#include <numeric>
#include <regex>
#include <set>
#include <tuple>

#include <fmt/format.h>

#include "qftplan/core/input_error.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/report/report.hpp"
#include "qftplan/svg/plan_drawing.hpp"
#include "qftplan/svg/svg_document.hpp"
#include "qftplan/svg/svg_layout.hpp"
#include "svg_probe.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

using testing::read_file;
using testing::run_qftplan;
using testing::source_dir;
using testing::temp_dir;
using testing::write_file;

std::string topo_path(const std::string& name) { return (source_dir() / "topologies" / name).string(); }

TEST(CouplerLoads, AFusedBlockCountsOnceInEitherSpelling) {
  const Device dev = load_device("line:4");
  CouplerLoadSink s(dev, true);
  s.gate(make_gate(GateKind::h, 0));
  s.gate(make_gate(GateKind::cp_swap, 0, 1));  // fused
  s.gate(make_gate(GateKind::cp, 2, 1));        // written as cp then swap: one block
  s.gate(make_gate(GateKind::swap, 1, 2));
  s.gate(make_gate(GateKind::cp, 2, 3));        // a cp, then a swap elsewhere: two blocks
  s.gate(make_gate(GateKind::swap, 0, 1));
  s.gate(make_gate(GateKind::swap, 0, 1));      // a plain swap
  EXPECT_EQ(s.loads(), (std::vector<long long>{3, 1, 1}));
  EXPECT_EQ(s.total(), 5);
  CouplerLoadSink plain(dev, false);  // every two-qubit gate is a block
  plain.gate(make_gate(GateKind::cp, 2, 1));
  plain.gate(make_gate(GateKind::swap, 1, 2));
  EXPECT_EQ(plain.total(), 2);
}

struct Setting {
  std::string device;
  int qubits;
  std::optional<int> degree;
  bool inverse;
  std::string strategy;
};

// Loads recomputed from a report add up to the report's blocks, for every strategy.
TEST(DrawnPlan, LoadsAddUpToTheReportsBlocks) {
  for (const auto& s : std::vector<Setting>{{"grid:4x4", 12, std::nullopt, false, "chain"},
                                            {"grid:4x4", 12, 3, true, "chain"},
                                            {topo_path("harbor-noisy-20.yaml"), 10, std::nullopt, false, "auto"},
                                            {"heavy-hex:2x2", 30, std::nullopt, false, "auto"},
                                            {"heavy-hex:1x2", 16, std::nullopt, false, "routed"},
                                            {"heavy-hex:3x3", 64, 4, false, "auto"}}) {
    SCOPED_TRACE(s.device + " n=" + std::to_string(s.qubits) + " " + s.strategy);
    const Device dev = load_device(s.device);
    PlanOptions opt;
    opt.spec.qubits = s.qubits;
    opt.spec.approx_degree = s.degree;
    opt.spec.inverse = s.inverse;
    opt.strategy = s.strategy;
    const PlanReport r = plan_qft(dev, opt);
    const DrawnPlan d = drawn_plan_from_report(dev, nlohmann::json::parse(report_to_json_text(r)), "report.json");
    EXPECT_EQ(std::accumulate(d.coupler_blocks.begin(), d.coupler_blocks.end(), 0LL), r.two_qubit_blocks);
    EXPECT_EQ(d.placement, r.placement);
    EXPECT_EQ(d.final_placement, r.final_placement);
  }
}

// On a chain the exact QFT needs n(n-1)/2 blocks (one per controlled rotation: Nielsen & Chuang
// 2000, section 5.1; fused with SWAPs as in Fowler, Devitt and Hollenberg 2004), all of them on the
// chain's couplers and none elsewhere. The parity network (ours) adds a closing ladder of n-1 CX,
// each drawn as a block.
TEST(DrawnPlan, ChainPlanLoadsSitOnTheChain) {
  for (NetworkChoice net : {NetworkChoice::anchored, NetworkChoice::parity}) {
  const Device dev = load_device("grid:4x4");
  PlanOptions opt;
  opt.spec.qubits = 11;
  opt.strategy = "chain";
  opt.network = net;
  const PlanReport r = plan_qft(dev, opt);
  const DrawnPlan d = drawn_plan_from_report(dev, report_to_json(r), "r.json");
  long long on_chain = 0;
  for (std::size_t p = 0; p + 1 < d.chain.size(); ++p) {
    const int c = dev.coupler_index(d.chain[p], d.chain[p + 1]);
    ASSERT_GE(c, 0);
    EXPECT_GT(d.coupler_blocks[c], 0);
    on_chain += d.coupler_blocks[c];
  }
  EXPECT_EQ(on_chain, 11 * 10 / 2 + (net == NetworkChoice::parity ? 10 : 0));
  EXPECT_EQ(on_chain, r.two_qubit_blocks);
  }
}

TEST(DrawnPlan, ReportsThatDoNotFitAreRejected) {
  const Device dev = load_device("grid:4x4");
  PlanOptions opt;
  opt.spec.qubits = 6;
  opt.strategy = "chain";
  auto j = report_to_json(plan_qft(dev, opt));
  EXPECT_THROW(drawn_plan_from_report(load_device("grid:5x5"), j, "r.json"), InputError);  // another device
  auto tampered = j;
  tampered["final_placement"][0] = tampered["final_placement"][1].get<int>();
  try {
    drawn_plan_from_report(dev, tampered, "r.json");
    ADD_FAILURE() << "accepted a report whose maps do not match";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("r.json: re-planning gives another plan"), std::string::npos) << e.what();
  }
  auto missing = j;
  missing.erase("placement");
  EXPECT_THROW(drawn_plan_from_report(dev, missing, "r.json"), InputError);
}

// Devices without positions get a deterministic layout with distinct points.
TEST(DrawLayout, ComputedLayoutIsDeterministic) {
  const std::string yaml = "name: petal\nqubits: 7\ncouplers:\n  - [0, 1]\n  - [1, 2]\n  - [2, 3]\n  - [3, 0]\n  - [1, 4]\n  - [4, 5]\n";
  const auto dir = temp_dir();
  write_file(dir / "p.yaml", yaml);
  const Device dev = load_device((dir / "p.yaml").string());
  const auto a = drawing_positions(dev), b = drawing_positions(dev);
  ASSERT_EQ(a.size(), 7u);
  EXPECT_EQ(a, b);
  for (int i = 0; i < 7; ++i)
    for (int k = i + 1; k < 7; ++k) EXPECT_GT(std::hypot(a[i].x - a[k].x, a[i].y - a[k].y), 0.2) << i << " " << k;
  std::filesystem::remove_all(dir);
}

// Proper crossings of two couplers that share no qubit, by the orientation test of two segments
// (Cormen, Leiserson, Rivest and Stein, "Introduction to Algorithms", 3rd ed., 2009, section 33.1).
long long coupler_crossings(const Device& dev, const std::vector<Point>& p) {
  auto side = [](const Point& a, const Point& b, const Point& c) {
    const double v = (b.x - a.x) * (c.y - a.y) - (b.y - a.y) * (c.x - a.x);
    return v > 1e-12 ? 1 : v < -1e-12 ? -1 : 0;
  };
  long long n = 0;
  const auto& cs = dev.couplers();
  for (std::size_t i = 0; i < cs.size(); ++i)
    for (std::size_t k = i + 1; k < cs.size(); ++k) {
      const auto& a = cs[i];
      const auto& b = cs[k];
      if (a.a == b.a || a.a == b.b || a.b == b.a || a.b == b.b) continue;
      if (side(p[a.a], p[a.b], p[b.a]) * side(p[a.a], p[a.b], p[b.b]) < 0 &&
          side(p[b.a], p[b.b], p[a.a]) * side(p[b.a], p[b.b], p[a.b]) < 0)
        ++n;
    }
  return n;
}

// The median coupler length of a layout.
double median_coupler(const Device& dev, const std::vector<Point>& p) {
  std::vector<double> len;
  for (const auto& c : dev.couplers()) len.push_back(std::hypot(p[c.a].x - p[c.b].x, p[c.a].y - p[c.b].y));
  std::nth_element(len.begin(), len.begin() + static_cast<long>(len.size() / 2), len.end());
  return len[len.size() / 2];
}

// Position-free chips (as files of real chips come, with_defects drops the positions) of the two
// planar families: heavy-hexagon and square grid, clean and with dead qubits and broken couplers.
// Both families are planar (drawable without crossings, common practice), so a good layout has
// few; the circles of the drawing never overlap, and no two qubits are nearer than half a coupler.
TEST(DrawLayout, PositionFreeChipsGetFewCrossingsAndNoOverlaps) {
  struct Case {
    std::string spec;
    int dead, broken;
  };
  const std::vector<Case> cases = {{"heavy-hex:3x3", 0, 0}, {"heavy-hex:4x5", 3, 4}, {"grid:8x8", 0, 0}, {"grid:9x7", 4, 3}};
  for (const auto& c : cases) {
    const Device dev = with_defects(make_lattice(c.spec), c.dead, c.broken, 7);
    ASSERT_FALSE(has_all_positions(dev)) << c.spec;
    const auto p = drawing_positions(dev);
    const long long crossings = coupler_crossings(dev, p);
    const double unit = median_coupler(dev, p), closest = closest_pair_distance(p);
    std::printf("%s: %d qubits, %d couplers, %lld crossings, closest %.3f of a coupler\n", c.spec.c_str(), dev.qubit_count(),
                dev.coupler_count(), crossings, closest / unit);
    EXPECT_LE(crossings * 50, dev.coupler_count()) << c.spec;  // at most 2 % of the couplers
    EXPECT_GE(closest, 0.5 * unit) << c.spec;
    // The drawing: no two qubit circles overlap.
    const std::string svg = draw_device_svg(dev, nullptr);
    const auto qg = svg.substr(svg.find("<g id=\"qubits\">"));
    const auto circles = testing::elements(qg.substr(0, qg.find("</g>")), "circle");
    ASSERT_EQ(circles.size(), static_cast<std::size_t>(dev.qubit_count()));
    std::vector<std::array<double, 3>> disc;  // cx, cy, r
    for (const auto& e : circles) disc.push_back({testing::attr(e, "cx"), testing::attr(e, "cy"), testing::attr(e, "r")});
    for (std::size_t i = 0; i < disc.size(); ++i)
      for (std::size_t k = i + 1; k < disc.size(); ++k) {
        const double d = std::hypot(disc[i][0] - disc[k][0], disc[i][1] - disc[k][1]);
        ASSERT_GT(d, disc[i][2] + disc[k][2]) << c.spec << " " << i << " " << k;
      }
  }
}

// A crowded drawing (every qubit of heavy-hex:20x20 labelled, as with a register on most of the
// chip): no placement label and no qubit enters the legend's column, whose left edge is the
// leftmost mark of the legend.
TEST(DrawPlan, NothingEntersTheLegend) {
  const Device dev = make_lattice("heavy-hex:20x20");
  DrawnPlan plan;
  plan.title = "every qubit";
  plan.method = "labels only";
  plan.strategy = "chain";
  for (int q = 0; q < dev.qubit_count(); ++q) plan.placement.push_back(q), plan.final_placement.push_back(dev.qubit_count() - 1 - q);
  const std::string svg = draw_device_svg(dev, &plan);
  auto group = [&](const std::string& id) {
    const auto at = svg.find("<g id=\"" + id + "\">");
    return at == std::string::npos ? std::string() : svg.substr(at, svg.find("</g>", at) - at);
  };
  const std::string legend = group("legend");
  ASSERT_FALSE(legend.empty());
  double legend_x0 = std::numeric_limits<double>::infinity();
  for (const auto& t : testing::elements(legend, "text")) legend_x0 = std::min(legend_x0, testing::attr(t, "x"));
  for (const auto& l : testing::elements(legend, "line")) legend_x0 = std::min(legend_x0, testing::attr(l, "x1"));
  for (const auto& r : testing::elements(legend, "rect")) legend_x0 = std::min(legend_x0, testing::attr(r, "x"));
  for (const auto& c : testing::elements(legend, "circle")) legend_x0 = std::min(legend_x0, testing::attr(c, "cx") - testing::attr(c, "r"));
  ASSERT_TRUE(std::isfinite(legend_x0));
  const auto boxes = testing::elements(group("placement"), "rect");
  ASSERT_EQ(boxes.size(), static_cast<std::size_t>(dev.qubit_count()));
  for (const auto& b : boxes) EXPECT_LT(testing::attr(b, "x") + testing::attr(b, "width"), legend_x0) << b;
  for (const auto& c : testing::elements(group("qubits"), "circle")) EXPECT_LT(testing::attr(c, "cx") + testing::attr(c, "r"), legend_x0) << c;
}

TEST(DrawCommand, DrawsAPlanAndRefusesBadReports) {
  const auto dir = temp_dir();
  const std::string chip = "'" + topo_path("harbor-noisy-20.yaml") + "'";
  const auto report = dir / "r.json", svg = dir / "d.svg";
  ASSERT_EQ(run_qftplan("plan --device " + chip + " --qubits 9 --report '" + report.string() + "'").status, 0);
  const auto r = run_qftplan("draw " + chip + " --plan '" + report.string() + "' --svg '" + svg.string() + "'");
  ASSERT_EQ(r.status, 0) << r.err;
  const std::string text = read_file(svg);
  for (const std::string want : {"harbor-noisy-20", ">in 0<", ">out 8<", "two-qubit error (log scale)", "QFT on 9 qubits, exact"})
    EXPECT_NE(text.find(want), std::string::npos) << want;
  if (std::filesystem::exists("/usr/bin/xmllint"))
    EXPECT_EQ(std::system(("/usr/bin/xmllint --noout '" + svg.string() + "'").c_str()), 0);
  if (std::filesystem::exists("/usr/bin/rsvg-convert"))
    EXPECT_EQ(std::system(("/usr/bin/rsvg-convert -o '" + (dir / "d.png").string() + "' '" + svg.string() + "'").c_str()), 0);

  // A report with SWAPs at the end (--end-order same) is re-planned the same way.
  const auto same = dir / "same.json";
  ASSERT_EQ(run_qftplan("plan --device grid:3x3 --qubits 6 --approx 2 --end-order same --report '" + same.string() + "'").status, 0);
  const auto rs = run_qftplan("draw grid:3x3 --plan '" + same.string() + "' --svg -");
  EXPECT_EQ(rs.status, 0) << rs.err;
  EXPECT_NE(rs.out.find("<svg"), std::string::npos);

  // A device alone, uncalibrated.
  EXPECT_EQ(run_qftplan("draw heavy-hex:1x1 --svg '" + (dir / "h.svg").string() + "'").status, 0);
  EXPECT_NE(read_file(dir / "h.svg").find("coupler (no error calibrated)"), std::string::npos);

  // Malformed JSON: file, line and column; nothing written.
  write_file(dir / "bad.json", "{\n  \"qubits\": 4,\n  oops\n}\n");
  const auto bad = run_qftplan("draw " + chip + " --plan '" + (dir / "bad.json").string() + "' --svg '" + (dir / "x.svg").string() + "'");
  EXPECT_EQ(bad.status, 2);
  EXPECT_NE(bad.err.find("bad.json:3:"), std::string::npos) << bad.err;
  EXPECT_FALSE(std::filesystem::exists(dir / "x.svg"));
  // A report of another device.
  const auto other = run_qftplan("draw grid:5x5 --plan '" + report.string() + "' --svg '" + (dir / "x.svg").string() + "'");
  EXPECT_EQ(other.status, 2);
  EXPECT_NE(other.err.find("not on 'grid:5x5'"), std::string::npos) << other.err;
  std::filesystem::remove_all(dir);
}

// ---- Reading the drawing back ------------------------------------------------------------------

struct Rect {
  double x0, y0, x1, y1;
};
struct Circle {
  double cx, cy, r;
};

// The contents of the group with this id (our drawing's groups hold no nested groups).
std::string group(const std::string& svg, const std::string& id) {
  const std::string open = "<g id=\"" + id + "\">";
  const auto at = svg.find(open);
  if (at == std::string::npos) return {};
  const auto end = svg.find("</g>", at);
  return svg.substr(at + open.size(), end - at - open.size());
}

using testing::attr;
using testing::elements;
using testing::text_of;

std::vector<Rect> rects(const std::string& svg) {
  std::vector<Rect> out;
  for (const auto& e : elements(svg, "rect"))
    out.push_back({attr(e, "x"), attr(e, "y"), attr(e, "x") + attr(e, "width"), attr(e, "y") + attr(e, "height")});
  return out;
}

std::vector<Circle> circles(const std::string& svg) {
  std::vector<Circle> out;
  for (const auto& e : elements(svg, "circle")) out.push_back({attr(e, "cx"), attr(e, "cy"), attr(e, "r")});
  return out;
}

bool overlap(const Rect& a, const Rect& b) { return a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1; }

// Distance from a point to a box (0 inside): plane geometry, common practice.
double distance(const Rect& b, double x, double y) {
  return std::hypot(std::max({b.x0 - x, 0.0, x - b.x1}), std::max({b.y0 - y, 0.0, y - b.y1}));
}

// A comb of our own: a line of eight with four teeth, so no chain holds 12 qubits.
const char* kComb =
    "name: comb-12\nqubits: 12\ncouplers:\n  - [0, 1]\n  - [1, 2]\n  - [2, 3]\n  - [3, 4]\n  - [4, 5]\n  - [5, 6]\n"
    "  - [6, 7]\n  - [1, 8]\n  - [3, 9]\n  - [5, 10]\n  - [6, 11]\n";

struct Drawn {
  Device dev;
  PlanReport report;
  DrawnPlan plan;
  std::string svg;
};

Drawn draw_case(const std::string& device, int qubits, const std::string& strategy) {
  Drawn d{load_device(device), {}, {}, {}};
  PlanOptions opt;
  opt.spec.qubits = qubits;
  opt.strategy = strategy;
  d.report = plan_qft(d.dev, opt);
  d.plan = drawn_plan_from_report(d.dev, report_to_json(d.report), "r.json");
  d.svg = draw_device_svg(d.dev, &d.plan);
  return d;
}

std::vector<std::tuple<std::string, int, std::string>> drawing_cases(const std::filesystem::path& comb) {
  return {{topo_path("harbor-grid-6x6-defect.yaml"), 34, "auto"},
          {topo_path("harbor-noisy-20.yaml"), 12, "auto"},
          {topo_path("harbor-hex-35.yaml"), 35, "auto"},
          {"grid:4x4", 16, "chain"},
          {comb.string(), 12, "spine"},
          {comb.string(), 12, "routed"}};
}

// Placement labels touch no qubit, no block count, no other label and stay on the page; each sits
// next to its own qubit; and the same plan gives the same bytes.
TEST(DrawPlan, LabelsClearQubitsCountsAndEachOther) {
  const auto dir = temp_dir();
  write_file(dir / "comb.yaml", kComb);
  for (const auto& [device, qubits, strategy] : drawing_cases(dir / "comb.yaml")) {
    SCOPED_TRACE(device + " " + strategy);
    const Drawn d = draw_case(device, qubits, strategy);
    const std::string placement = group(d.svg, "placement"), loads = group(d.svg, "loads");
    const auto labels = rects(placement), counts = rects(loads);
    const auto qubits_drawn = circles(group(d.svg, "qubits"));
    ASSERT_EQ(static_cast<int>(qubits_drawn.size()), d.dev.qubit_count());
    const double width = attr(elements(d.svg, "svg")[0], "width"), height = attr(elements(d.svg, "svg")[0], "height");
    std::set<int> labelled(d.plan.placement.begin(), d.plan.placement.end());
    labelled.insert(d.plan.final_placement.begin(), d.plan.final_placement.end());
    ASSERT_EQ(labels.size(), labelled.size());
    for (std::size_t i = 0; i < labels.size(); ++i) {
      const Rect& a = labels[i];
      EXPECT_TRUE(a.x0 >= 0 && a.y0 >= 0 && a.x1 <= width && a.y1 <= height);
      for (std::size_t k = i + 1; k < labels.size(); ++k) EXPECT_FALSE(overlap(a, labels[k])) << i << " " << k;
      for (const auto& c : counts) EXPECT_FALSE(overlap(a, c)) << i;
      for (const auto& q : qubits_drawn) EXPECT_GE(distance(a, q.cx, q.cy), q.r) << i;
    }
    // Each label's first line names a bit of its own qubit, and the label is near that qubit.
    const auto texts = elements(placement, "text");
    std::size_t t = 0;
    for (std::size_t i = 0; i < labels.size(); ++i) {
      ASSERT_LT(t, texts.size());
      const std::string first = text_of(texts[t]);
      int bit = -1, q = -1;
      if (first.starts_with("in ")) bit = std::stoi(first.substr(3)), q = d.plan.placement[bit];
      else bit = std::stoi(first.substr(4)), q = d.plan.final_placement[bit];
      EXPECT_LT(distance(labels[i], qubits_drawn[q].cx, qubits_drawn[q].cy), qubits_drawn[q].r + 50) << first;
      auto holds = [q = q](const std::vector<int>& map) { return std::count(map.begin(), map.end(), q) > 0; };
      t += (holds(d.plan.placement) ? 1 : 0) + (holds(d.plan.final_placement) ? 1 : 0);  // its lines
    }
    EXPECT_EQ(t, texts.size());
    EXPECT_EQ(draw_device_svg(d.dev, &d.plan), d.svg);  // deterministic
  }
  std::filesystem::remove_all(dir);
}

// Every coupler that carries blocks shows its count, the counts add up to the report's blocks, and
// the band covers every such coupler of a chain or spine plan; routed plans get no band.
TEST(DrawPlan, EveryLoadedCouplerIsCountedAndBanded) {
  const auto dir = temp_dir();
  write_file(dir / "comb.yaml", kComb);
  for (const auto& [device, qubits, strategy] : drawing_cases(dir / "comb.yaml")) {
    SCOPED_TRACE(device + " " + strategy);
    const Drawn d = draw_case(device, qubits, strategy);
    const auto count_texts = elements(group(d.svg, "loads"), "text");
    long long shown = 0;
    for (const auto& e : count_texts) shown += std::stoll(text_of(e));
    EXPECT_EQ(shown, d.report.two_qubit_blocks);
    EXPECT_EQ(static_cast<long long>(count_texts.size()),
              std::count_if(d.plan.coupler_blocks.begin(), d.plan.coupler_blocks.end(), [](long long b) { return b > 0; }));
    const ChainBand band = chain_band(d.dev, d.plan);
    const std::string legend = group(d.svg, "legend");
    if (d.report.strategy == "routed") {
      EXPECT_TRUE(band.main.empty() && band.hops.empty());
      EXPECT_EQ(d.svg.find("<g id=\"chain\">"), std::string::npos);
      EXPECT_EQ(legend.find("chain ("), std::string::npos);
      EXPECT_NE(legend.find("routed plan: no fixed chain"), std::string::npos);
      continue;
    }
    std::set<int> banded(band.main.begin(), band.main.end());
    banded.insert(band.hops.begin(), band.hops.end());
    for (int c = 0; c < d.dev.coupler_count(); ++c)
      if (d.plan.coupler_blocks[c] > 0) EXPECT_TRUE(banded.count(c)) << "coupler " << c << " carries blocks";
    EXPECT_EQ(elements(group(d.svg, "chain"), "line").size(), banded.size());
    if (d.report.strategy == "spine") {
      EXPECT_FALSE(band.hops.empty());
      EXPECT_NE(legend.find("the spine&apos;s main chain"), std::string::npos);
      EXPECT_NE(legend.find("hop to a dangling qubit"), std::string::npos);
      // The coupler a detour steps over to reach the next spine qubit is on the main chain.
      std::set<int> dangling;
      for (const Detour& t : d.plan.detours) dangling.insert(t.a);
      for (const Detour& t : d.plan.detours)
        if (!dangling.count(t.b))
          EXPECT_TRUE(std::count(band.main.begin(), band.main.end(),
                                 d.dev.coupler_index(std::min(t.b, t.via.back()), std::max(t.b, t.via.back()))));
    } else {
      EXPECT_TRUE(band.hops.empty());
      EXPECT_EQ(band.main.size(), d.plan.chain.size() - 1);
      EXPECT_NE(legend.find(fmt::format("the plan&apos;s chain ({} qubits)", d.plan.chain.size())), std::string::npos);
    }
  }
  std::filesystem::remove_all(dir);
}

// Qubit ids sit in the middle of their circles: the baseline kTextMiddleEm below the centre (the
// rendering test SvgDocument.MiddleTextIsCentredWhenRendered checks that offset with librsvg).
TEST(DrawPlan, QubitIdsAreCentredInTheirCircles) {
  const Drawn d = draw_case(topo_path("harbor-noisy-20.yaml"), 12, "auto");
  const std::string qubits = group(d.svg, "qubits");
  const auto cs = circles(qubits);
  const auto ids = elements(qubits, "text");
  ASSERT_EQ(ids.size(), cs.size());
  for (std::size_t q = 0; q < ids.size(); ++q) {
    EXPECT_EQ(text_of(ids[q]), std::to_string(q));
    EXPECT_NEAR(attr(ids[q], "x"), cs[q].cx, 0.011);
    EXPECT_NEAR(attr(ids[q], "y") - cs[q].cy, kTextMiddleEm * attr(ids[q], "font-size"), 0.011) << ids[q];
  }
  EXPECT_EQ(d.svg.find("dominant-baseline"), std::string::npos);
}

}  // namespace
}  // namespace qftplan
