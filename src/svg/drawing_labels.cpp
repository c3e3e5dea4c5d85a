#include "drawing_labels.hpp"

#include <algorithm>
#include <cmath>
#include <iterator>
#include <limits>
#include <numbers>
#include <string>
#include <unordered_map>
#include <utility>

#include <fmt/format.h>

namespace qftplan {
namespace {

// Candidate spots around a qubit: directions times distances (rings).
constexpr int kDirections = 16, kRings = 4;

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

// A place a label could go.
struct Spot {
  Box box;
  int ring = 0;
  double fixed_cost = 0;   // couplers crossed, distance, ambiguity and direction
  int fixed_clashes = 0;   // qubits, counts and the frame it touches
  bool unclear = false;    // another qubit about as near: a leader line says whose it is
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

// A square of half-side r around qubit q.
Box around(const DrawingFrame& fr, int q, double r) { return Box{fr.x(q) - r, fr.y(q) - r, fr.x(q) + r, fr.y(q) + r}; }

// The labels of the register qubits, in qubit order, sized for font size fs.
std::vector<Label> make_labels(const RegisterBits& bits, double fs) {
  std::vector<Label> labels;
  for (std::size_t q = 0; q < bits.in_bit.size(); ++q) {
    if (bits.in_bit[q] < 0 && bits.out_bit[q] < 0) continue;
    Label l;
    l.qubit = static_cast<int>(q);
    if (bits.in_bit[q] >= 0) l.lines.push_back({fmt::format("in {}", bits.in_bit[q]), "#0060A0"});
    if (bits.out_bit[q] >= 0) l.lines.push_back({fmt::format("out {}", bits.out_bit[q]), "#B34700"});
    for (const auto& t : l.lines) l.w = std::max(l.w, label_width(t.first.size(), fs));
    l.h = fs * 1.15 * static_cast<double>(l.lines.size()) + 2;
    labels.push_back(std::move(l));
  }
  return labels;
}

// How far a spot's box can reach from its qubit's centre, over every label.
double farthest_reach(const std::vector<Label>& labels, const DrawingFrame& fr, double fs) {
  double reach = 0;
  for (const auto& l : labels) reach = std::max(reach, fr.node_r + 3 + (kRings - 1) * fs * 1.1 + l.w + l.h);
  return reach;
}

// Everything a spot can run into, filed by where it lies (objects are looked up within the farthest
// reach of any spot): qubits, couplers, block counts, and the labels' own qubits (to find the
// labels that can touch each other).
struct Surroundings {
  Surroundings(const Device& device_, const DrawingFrame& fr_, const std::vector<CountBox>& counts_,
               const std::vector<Label>& labels, double fs_)
      : device(device_), fr(fr_), counts(counts_), edge{4, fr_.head - 12, fr_.width - fr_.legend_w, fr_.height - 4},
        fs(fs_), reach_max(farthest_reach(labels, fr_, fs_)), qubits(reach_max), couplers(reach_max),
        count_cells(reach_max), label_qubits(reach_max) {
    for (int q = 0; q < device.qubit_count(); ++q) qubits.insert(Box{fr.x(q), fr.y(q), fr.x(q), fr.y(q)}, q);
    for (int c = 0; c < device.coupler_count(); ++c) {
      const auto& cp = device.couplers()[c];
      couplers.insert(Box{std::min(fr.x(cp.a), fr.x(cp.b)), std::min(fr.y(cp.a), fr.y(cp.b)),
                          std::max(fr.x(cp.a), fr.x(cp.b)), std::max(fr.y(cp.a), fr.y(cp.b))},
                      c);
    }
    for (std::size_t i = 0; i < counts.size(); ++i) count_cells.insert(counts[i].box, static_cast<int>(i));
    for (std::size_t i = 0; i < labels.size(); ++i) {
      const int q = labels[i].qubit;
      label_qubits.insert(Box{fr.x(q), fr.y(q), fr.x(q), fr.y(q)}, static_cast<int>(i));
    }
  }

  const Device& device;
  const DrawingFrame& fr;
  const std::vector<CountBox>& counts;
  Box edge;          // the drawing's edge, which no label may cross
  double fs;         // the labels' font size
  double reach_max;  // how far a spot's box can reach from its qubit's centre
  Buckets qubits, couplers, count_cells, label_qubits;
};

// Every candidate spot of label l, with what it costs and hits apart from the other labels.
std::vector<Spot> candidate_spots(const Label& l, const Surroundings& s) {
  const DrawingFrame& fr = s.fr;
  const int q = l.qubit;
  // The preferred direction points away from the qubit's neighbours.
  double dx = 0, dy = 0;
  for (const int nb : s.device.neighbours(q)) dx += fr.pos[q].x - fr.pos[nb].x, dy += fr.pos[q].y - fr.pos[nb].y;
  if (std::hypot(dx, dy) < 1e-9 * fr.unit) dx = 1, dy = -1;
  const double preferred = std::atan2(dy, dx);
  // A qubit nearer to a spot than its own is within twice the reach; couplers and counts that
  // touch a spot lie within the reach.
  const auto near_qubits = s.qubits.query(around(fr, q, 2 * s.reach_max + fr.node_r));
  const auto near_couplers = s.couplers.query(around(fr, q, s.reach_max));
  const auto near_counts = s.count_cells.query(around(fr, q, s.reach_max));
  std::vector<Spot> spots;
  for (int ring = 0; ring < kRings; ++ring)
    for (int k = 0; k < kDirections; ++k) {
      const double a = 2 * std::numbers::pi * k / kDirections;
      const double ux = std::cos(a), uy = std::sin(a);
      // The box's reach towards the qubit, so that its nearest point clears the circle by 3 px.
      const double reach = l.w / 2 * std::abs(ux) + l.h / 2 * std::abs(uy);
      const double d = fr.node_r + 3 + reach + ring * s.fs * 1.1;
      const double cx = fr.x(q) + ux * d, cy = fr.y(q) + uy * d;
      Spot spot;
      spot.ring = ring;
      spot.box = Box{cx - l.w / 2, cy - l.h / 2, cx + l.w / 2, cy + l.h / 2};
      const Box& e = s.edge;
      if (spot.box.x0 < e.x0 || spot.box.y0 < e.y0 || spot.box.x1 > e.x1 || spot.box.y1 > e.y1) ++spot.fixed_clashes;
      const double own = distance(spot.box, fr.x(q), fr.y(q));
      bool nearer_other = false;
      for (const int o : near_qubits) {
        const double dist = distance(spot.box, fr.x(o), fr.y(o));
        if (dist < fr.node_r + 2) ++spot.fixed_clashes;
        if (o != q && dist < own) nearer_other = true;
        if (o != q && dist < own + fr.node_r) spot.unclear = true;
      }
      for (const int i : near_counts)
        if (overlap(spot.box, s.counts[i].box, 1.5)) ++spot.fixed_clashes;
      int crossed = 0;
      for (const int c : near_couplers) {
        const auto& cp = s.device.couplers()[c];
        if (crosses(spot.box, fr.x(cp.a), fr.y(cp.a), fr.x(cp.b), fr.y(cp.b))) ++crossed;
      }
      double turn = std::abs(std::remainder(a - preferred, 2 * std::numbers::pi));
      spot.fixed_cost = 6.0 * crossed + 3.0 * ring + (nearer_other ? 8.0 : 0.0) + (spot.unclear ? 2.0 : 0.0) +
                        turn / std::numbers::pi;
      spots.push_back(spot);
    }
  // The legend's column is the legend's alone: a spot reaching into it is no spot at all, however
  // crowded the drawing (a clash elsewhere only costs). Should every spot reach in (a label wider
  // than the margin), the spots are moved left of it.
  const double legend_x0 = fr.width - fr.legend_w;
  std::vector<Spot> clear;
  std::copy_if(spots.begin(), spots.end(), std::back_inserter(clear), [&](const Spot& sp) { return sp.box.x1 <= legend_x0; });
  if (!clear.empty()) return clear;
  for (auto& sp : spots) {
    const double shift = sp.box.x1 - legend_x0;
    sp.box.x0 -= shift, sp.box.x1 -= shift, sp.ring = kRings;  // far from its qubit: a leader line
  }
  return spots;
}

// Chooses a spot for every label and sets its box and leader: greedily, fewest free spots first,
// then a few passes that move each label to its best spot given all the others (the total cost
// only falls, so the passes end; a fixed count of them keeps the run time bounded).
void choose_spots(std::vector<Label>& labels, const Surroundings& s) {
  std::vector<std::vector<Spot>> spots;
  std::vector<std::pair<int, std::size_t>> order;  // (free spots, label), fewest first
  for (std::size_t i = 0; i < labels.size(); ++i) {
    spots.push_back(candidate_spots(labels[i], s));
    const int free = static_cast<int>(std::count_if(spots.back().begin(), spots.back().end(),
                                                    [](const Spot& sp) { return sp.fixed_clashes == 0; }));
    order.push_back({free, i});
  }
  std::sort(order.begin(), order.end());
  std::vector<const Spot*> at(labels.size(), nullptr);
  // Labels that can touch each other: their qubits within twice the reach.
  std::vector<std::vector<int>> rivals(labels.size());
  for (std::size_t i = 0; i < labels.size(); ++i)
    rivals[i] = s.label_qubits.query(around(s.fr, labels[i].qubit, 2 * s.reach_max + 4));
  auto best_spot = [&](std::size_t i) {
    double best = std::numeric_limits<double>::infinity();
    const Spot* chosen = nullptr;
    for (const auto& sp : spots[i]) {
      int clashes = sp.fixed_clashes;
      for (const int j : rivals[i])
        if (static_cast<std::size_t>(j) != i && at[j] && overlap(sp.box, at[j]->box, 2)) ++clashes;
      const double cost = 1000.0 * clashes + sp.fixed_cost;
      if (cost < best) best = cost, chosen = &sp;
    }
    return chosen;
  };
  for (const auto& [free, i] : order) at[i] = best_spot(i);
  for (int pass = 0; pass < 4; ++pass) {
    bool moved = false;
    for (const auto& [free, i] : order) {
      const Spot* sp = best_spot(i);
      if (sp != at[i]) moved = true, at[i] = sp;
    }
    if (!moved) break;
  }
  for (std::size_t i = 0; i < labels.size(); ++i) {
    labels[i].box = at[i]->box;
    labels[i].leader = at[i]->ring > 0 || at[i]->unclear;
  }
}

// The placed labels: leader lines first, then every label's box and lines over them.
void draw_labels(SvgDocument& doc, const std::vector<Label>& labels, const DrawingFrame& fr, double fs) {
  doc.begin_group("placement");
  for (const auto& l : labels) {
    if (!l.leader) continue;
    // From the circle's edge to the box's nearest point.
    const double qx = fr.x(l.qubit), qy = fr.y(l.qubit);
    const double bx = std::clamp(qx, l.box.x0, l.box.x1), by = std::clamp(qy, l.box.y0, l.box.y1);
    const double len = std::hypot(bx - qx, by - qy);
    if (len <= fr.node_r + 1) continue;
    const double ux = (bx - qx) / len, uy = (by - qy) / len;
    doc.line(qx + ux * fr.node_r, qy + uy * fr.node_r, bx, by, SvgPaint{"none", "#8a8a8a", 0.9});
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

}  // namespace

void draw_placement_labels(SvgDocument& doc, const Device& device, const DrawingFrame& fr, const RegisterBits& bits,
                           const std::vector<CountBox>& counts) {
  const double fs = std::clamp(fr.unit_px * 0.17, 7.5, 11.0);
  std::vector<Label> labels = make_labels(bits, fs);
  const Surroundings s(device, fr, counts, labels, fs);
  choose_spots(labels, s);
  draw_labels(doc, labels, fr, fs);
}

}  // namespace qftplan
