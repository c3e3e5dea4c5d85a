#include "qftplan/svg/svg_layout.hpp"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>
#include <queue>
#include <unordered_map>
#include <utility>

namespace qftplan {
namespace {

constexpr int kUnreached = std::numeric_limits<int>::max();
// Pieces up to this size get the stress of every pair; larger ones only of near pairs and pivots.
constexpr std::size_t kAllPairsLimit = 1500;
// Hop radius of the near pairs of a large piece, and the number of pivots.
constexpr int kNearHops = 4;
constexpr std::size_t kPivots = 40;
// Qubit centres end at least this far apart, in median coupler lengths.
constexpr double kMinSpacing = 0.6;

// One connected piece of the device: its qubits (ascending) and its adjacency in local indices.
struct Piece {
  std::vector<int> qubits;
  std::vector<std::vector<int>> adj;
};

// The connected pieces, in order of their lowest qubit. Over every coupler, in service or not: the drawing
// shows the chip as built, parts out of service included.
std::vector<Piece> pieces_of(const Device& device) {
  const int n = device.qubit_count();
  std::vector<std::vector<int>> all(static_cast<std::size_t>(n));
  for (const auto& c : device.couplers()) all[c.a].push_back(c.b), all[c.b].push_back(c.a);
  std::vector<int> piece(static_cast<std::size_t>(n), -1), local(static_cast<std::size_t>(n), -1);
  std::vector<Piece> out;
  for (int s = 0; s < n; ++s) {
    if (piece[s] >= 0) continue;
    Piece p;
    const int id = static_cast<int>(out.size());
    std::queue<int> todo;
    piece[s] = id;
    todo.push(s);
    while (!todo.empty()) {
      const int u = todo.front();
      todo.pop();
      p.qubits.push_back(u);
      for (const int v : all[u])
        if (piece[v] < 0) piece[v] = id, todo.push(v);
    }
    std::sort(p.qubits.begin(), p.qubits.end());
    for (std::size_t i = 0; i < p.qubits.size(); ++i) local[p.qubits[i]] = static_cast<int>(i);
    p.adj.resize(p.qubits.size());
    for (std::size_t i = 0; i < p.qubits.size(); ++i) {
      for (const int v : all[p.qubits[i]])
        if (v != p.qubits[i]) p.adj[i].push_back(local[v]);
      std::sort(p.adj[i].begin(), p.adj[i].end());
      p.adj[i].erase(std::unique(p.adj[i].begin(), p.adj[i].end()), p.adj[i].end());
    }
    out.push_back(std::move(p));
  }
  return out;
}

// Hop counts from local qubit s, up to `limit` hops (kUnreached beyond).
std::vector<int> hops_from(const Piece& p, int s, int limit = kUnreached) {
  std::vector<int> d(p.qubits.size(), kUnreached);
  std::queue<int> todo;
  d[s] = 0;
  todo.push(s);
  while (!todo.empty()) {
    const int u = todo.front();
    todo.pop();
    if (d[u] >= limit) continue;
    for (const int v : p.adj[u])
      if (d[v] == kUnreached) d[v] = d[u] + 1, todo.push(v);
  }
  return d;
}

// Pivots chosen by max-min distance (each the qubit farthest from those chosen; the lowest index on
// ties), starting from the qubit farthest from local qubit 0; their hop rows.
std::vector<std::vector<int>> pivot_rows(const Piece& p) {
  const std::size_t n = p.qubits.size(), k = std::min(kPivots, n);
  std::vector<std::vector<int>> rows;
  const auto from0 = hops_from(p, 0);
  int next = static_cast<int>(std::max_element(from0.begin(), from0.end()) - from0.begin());
  std::vector<int> nearest(n, kUnreached);
  while (rows.size() < k) {
    rows.push_back(hops_from(p, next));
    for (std::size_t i = 0; i < n; ++i) nearest[i] = std::min(nearest[i], rows.back()[i]);
    next = static_cast<int>(std::max_element(nearest.begin(), nearest.end()) - nearest.begin());
    if (nearest[next] == 0) break;  // every qubit is a pivot
  }
  return rows;
}

// Pivot MDS (Brandes and Pich, "Eigensolver methods for progressive multidimensional scaling of
// large data", Graph Drawing 2006): the double-centred squared hop counts to the pivots, C (n x k),
// projected on the two leading eigenvectors of C^T C, found by power iteration from fixed vectors.
std::vector<Point> pivot_mds(const Piece& p, const std::vector<std::vector<int>>& rows) {
  const std::size_t n = p.qubits.size(), k = rows.size();
  std::vector<double> c(n * k);
  std::vector<double> col_mean(k, 0), row_mean(n, 0);
  double all = 0;
  for (std::size_t j = 0; j < k; ++j)
    for (std::size_t i = 0; i < n; ++i) {
      const double d2 = static_cast<double>(rows[j][i]) * rows[j][i];
      c[i * k + j] = d2;
      col_mean[j] += d2 / static_cast<double>(n), row_mean[i] += d2 / static_cast<double>(k);
      all += d2 / static_cast<double>(n * k);
    }
  for (std::size_t i = 0; i < n; ++i)
    for (std::size_t j = 0; j < k; ++j) c[i * k + j] = -0.5 * (c[i * k + j] - col_mean[j] - row_mean[i] + all);
  std::vector<double> ctc(k * k, 0);
  for (std::size_t i = 0; i < n; ++i)
    for (std::size_t a = 0; a < k; ++a)
      for (std::size_t b = 0; b < k; ++b) ctc[a * k + b] += c[i * k + a] * c[i * k + b];
  std::vector<std::vector<double>> vecs;
  for (int e = 0; e < 2; ++e) {
    std::vector<double> v(k), w(k);
    for (std::size_t a = 0; a < k; ++a) v[a] = 1.0 + 0.37 * static_cast<double>((a * 7 + static_cast<std::size_t>(e) * 3) % 11);
    for (int it = 0; it < 200; ++it) {
      for (const auto& u : vecs) {  // deflation: stay orthogonal to the vectors found
        double dot = 0;
        for (std::size_t a = 0; a < k; ++a) dot += u[a] * v[a];
        for (std::size_t a = 0; a < k; ++a) v[a] -= dot * u[a];
      }
      double norm = 0;
      for (std::size_t a = 0; a < k; ++a) {
        w[a] = 0;
        for (std::size_t b = 0; b < k; ++b) w[a] += ctc[a * k + b] * v[b];
        norm += w[a] * w[a];
      }
      norm = std::sqrt(norm);
      if (!(norm > 1e-300)) break;
      for (std::size_t a = 0; a < k; ++a) v[a] = w[a] / norm;
    }
    vecs.push_back(v);
  }
  std::vector<Point> pos(n);
  for (std::size_t i = 0; i < n; ++i) {
    for (std::size_t a = 0; a < k; ++a) pos[i].x += c[i * k + a] * vecs[0][a], pos[i].y += c[i * k + a] * vecs[1][a];
    // A fixed nudge off the line, so that a piece drawn flat (a path, a star) can still unfold.
    pos[i].y += 1e-3 * static_cast<double>(static_cast<int>((i * 2654435761u) % 17) - 8);
  }
  return pos;
}

// Multiplies every coordinate so that the median coupler is one unit long.
void unit_couplers(const Piece& p, std::vector<Point>& pos) {
  std::vector<double> len;
  for (std::size_t i = 0; i < pos.size(); ++i)
    for (const int j : p.adj[i])
      if (static_cast<std::size_t>(j) > i) len.push_back(std::hypot(pos[i].x - pos[j].x, pos[i].y - pos[j].y));
  if (len.empty()) return;
  std::nth_element(len.begin(), len.begin() + static_cast<long>(len.size() / 2), len.end());
  const double m = len[len.size() / 2];
  if (!(m > 1e-12)) return;
  for (auto& q : pos) q.x /= m, q.y /= m;
}

// Stress majorisation (Gansner, Koren and North, "Graph drawing by stress majorization", Graph
// Drawing 2004), the localised update of their section 2.3 in place: each qubit moves to the
// weighted mean of where each partner j would put it at distance d_ij, weights d_ij^-2. Partners:
// every other qubit of a piece up to kAllPairsLimit; in larger pieces those within kNearHops and
// the pivots (which keep the global shape of the pivot MDS start).
void stress_majorise(const Piece& p, const std::vector<std::vector<int>>& rows, std::vector<Point>& pos) {
  const std::size_t n = pos.size();
  std::vector<std::vector<std::pair<int, int>>> partners(n);  // (qubit, hops)
  for (std::size_t i = 0; i < n; ++i) {
    const auto d = hops_from(p, static_cast<int>(i), n <= kAllPairsLimit ? kUnreached : kNearHops);
    for (std::size_t j = 0; j < n; ++j)
      if (j != i && d[j] != kUnreached) partners[i].push_back({static_cast<int>(j), d[j]});
    if (n > kAllPairsLimit)
      for (const auto& row : rows) {
        const int pv = static_cast<int>(std::find(row.begin(), row.end(), 0) - row.begin());
        if (static_cast<std::size_t>(pv) != i && row[i] > kNearHops) partners[i].push_back({pv, row[i]});
      }
  }
  std::size_t pairs = 0;
  for (const auto& v : partners) pairs += v.size();
  // A bounded amount of work: about 20 million pair updates, between 30 and 300 sweeps; it stops
  // early once no qubit moves by more than a thousandth of a coupler.
  const int sweeps = static_cast<int>(std::clamp<std::size_t>(20'000'000 / std::max<std::size_t>(pairs, 1), 30, 300));
  for (int s = 0; s < sweeps; ++s) {
    double moved = 0;
    for (std::size_t i = 0; i < n; ++i) {
      double sx = 0, sy = 0, sw = 0;
      for (const auto& [j, h] : partners[i]) {
        const double w = 1.0 / (static_cast<double>(h) * h);
        double dx = pos[i].x - pos[j].x, dy = pos[i].y - pos[j].y;
        double len = std::sqrt(dx * dx + dy * dy);
        if (len < 1e-9) dx = 1e-3 * (static_cast<double>(i) - j), dy = 1e-3, len = std::sqrt(dx * dx + dy * dy);
        sx += w * (pos[j].x + h * dx / len), sy += w * (pos[j].y + h * dy / len), sw += w;
      }
      if (sw <= 0) continue;
      moved = std::max(moved, std::abs(sx / sw - pos[i].x) + std::abs(sy / sw - pos[i].y));
      pos[i] = {sx / sw, sy / sw};
    }
    if (moved < 1e-3) break;
  }
}

// Pushes apart every pair of qubits nearer than kMinSpacing (looked up in a grid of that cell size),
// each by half the shortfall, for a bounded number of rounds or until none is left.
void remove_overlaps(std::vector<Point>& pos) {
  const std::size_t n = pos.size();
  for (int round = 0; round < 200; ++round) {
    std::unordered_map<std::int64_t, std::vector<int>> cells;
    auto key = [](double x, double y) {
      return (static_cast<std::int64_t>(std::floor(x / kMinSpacing)) << 32) ^
             static_cast<std::int64_t>(static_cast<std::uint32_t>(static_cast<std::int32_t>(std::floor(y / kMinSpacing))));
    };
    for (std::size_t i = 0; i < n; ++i) cells[key(pos[i].x, pos[i].y)].push_back(static_cast<int>(i));
    bool moved = false;
    for (std::size_t i = 0; i < n; ++i)
      for (int ox = -1; ox <= 1; ++ox)
        for (int oy = -1; oy <= 1; ++oy) {
          const auto it = cells.find(key(pos[i].x + ox * kMinSpacing, pos[i].y + oy * kMinSpacing));
          if (it == cells.end()) continue;
          for (const int j : it->second) {
            if (static_cast<std::size_t>(j) <= i) continue;
            double dx = pos[j].x - pos[i].x, dy = pos[j].y - pos[i].y;
            double d = std::hypot(dx, dy);
            if (d >= kMinSpacing) continue;
            if (d < 1e-9) dx = 1, dy = 0.5 * static_cast<double>((i + static_cast<std::size_t>(j)) % 3) - 0.5, d = std::hypot(dx, dy);
            const double push = (kMinSpacing - d) / 2 + 1e-6;
            pos[i].x -= dx / d * push, pos[i].y -= dy / d * push;
            pos[j].x += dx / d * push, pos[j].y += dy / d * push;
            moved = true;
          }
        }
    if (!moved) return;
  }
}

// A piece's layout, wider than tall, with its lowest corner at the origin; returns its size.
Point layout_piece(const Piece& p, std::vector<Point>& pos) {
  if (p.qubits.size() == 1) {
    pos = {Point{0, 0}};
    return {0, 0};
  }
  const auto rows = pivot_rows(p);
  pos = pivot_mds(p, rows);
  unit_couplers(p, pos);
  stress_majorise(p, rows, pos);
  unit_couplers(p, pos);
  remove_overlaps(pos);
  double minx = pos[0].x, maxx = minx, miny = pos[0].y, maxy = miny;
  for (const auto& q : pos) minx = std::min(minx, q.x), maxx = std::max(maxx, q.x), miny = std::min(miny, q.y), maxy = std::max(maxy, q.y);
  const bool turn = maxy - miny > maxx - minx;
  for (auto& q : pos) q = turn ? Point{q.y - miny, q.x - minx} : Point{q.x - minx, q.y - miny};
  return turn ? Point{maxy - miny, maxx - minx} : Point{maxx - minx, maxy - miny};
}

}  // namespace

bool has_all_positions(const Device& device) {
  if (!device.has_positions()) return false;
  for (int q = 0; q < device.qubit_count(); ++q)
    if (!device.position(q)) return false;
  return true;
}

std::vector<Point> computed_positions(const Device& device) {
  std::vector<Point> out(static_cast<std::size_t>(device.qubit_count()));
  const auto pieces = pieces_of(device);
  std::vector<std::vector<Point>> laid(pieces.size());
  std::vector<Point> size(pieces.size());
  double area = 0, widest = 0;
  for (std::size_t i = 0; i < pieces.size(); ++i) {
    size[i] = layout_piece(pieces[i], laid[i]);
    area += (size[i].x + 1.5) * (size[i].y + 1.5), widest = std::max(widest, size[i].x);
  }
  // Larger pieces first (the lowest qubit on ties), in rows no wider than the largest piece or
  // a square of the total area, a gap of 1.5 couplers between pieces and rows.
  std::vector<std::size_t> order(pieces.size());
  for (std::size_t i = 0; i < order.size(); ++i) order[i] = i;
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return pieces[a].qubits.size() > pieces[b].qubits.size(); });
  const double row_w = std::max(widest, 1.2 * std::sqrt(area));
  double x = 0, y = 0, row_h = 0;
  for (const std::size_t i : order) {
    if (x > 0 && x + size[i].x > row_w) x = 0, y += row_h + 1.5, row_h = 0;
    for (std::size_t k = 0; k < pieces[i].qubits.size(); ++k)
      out[pieces[i].qubits[k]] = {x + laid[i][k].x, y + laid[i][k].y};
    x += size[i].x + 1.5, row_h = std::max(row_h, size[i].y);
  }
  return out;
}

std::vector<Point> drawing_positions(const Device& device) {
  if (!has_all_positions(device)) return computed_positions(device);
  std::vector<Point> p(static_cast<std::size_t>(device.qubit_count()));
  for (int q = 0; q < device.qubit_count(); ++q) p[q] = *device.position(q);
  return p;
}

double closest_pair_distance(const std::vector<Point>& pos) {
  if (pos.size() < 2) return std::numeric_limits<double>::infinity();
  // A grid whose cell is the spacing of a square lattice over the bounding box: a pair at most a cell
  // apart lies in neighbouring cells, and a nearer pair than that is found among them.
  double minx = pos[0].x, maxx = minx, miny = pos[0].y, maxy = miny;
  for (const auto& q : pos) minx = std::min(minx, q.x), maxx = std::max(maxx, q.x), miny = std::min(miny, q.y), maxy = std::max(maxy, q.y);
  const double cell = std::max(std::max(maxx - minx, maxy - miny) / std::sqrt(static_cast<double>(pos.size())), 1e-9);
  std::unordered_map<std::int64_t, std::vector<std::size_t>> cells;
  auto cx = [&](double v) { return static_cast<std::int64_t>(std::floor((v - minx) / cell)); };
  auto cy = [&](double v) { return static_cast<std::int64_t>(std::floor((v - miny) / cell)); };
  for (std::size_t i = 0; i < pos.size(); ++i) cells[(cx(pos[i].x) << 32) + cy(pos[i].y)].push_back(i);
  double best = std::numeric_limits<double>::infinity();
  for (std::size_t i = 0; i < pos.size(); ++i)
    for (std::int64_t ox = -1; ox <= 1; ++ox)
      for (std::int64_t oy = -1; oy <= 1; ++oy) {
        const auto it = cells.find(((cx(pos[i].x) + ox) << 32) + cy(pos[i].y) + oy);
        if (it == cells.end()) continue;
        for (const std::size_t j : it->second)
          if (j > i) best = std::min(best, std::hypot(pos[i].x - pos[j].x, pos[i].y - pos[j].y));
      }
  // Every pair nearer than a cell lies in neighbouring cells; when none is, look at every pair.
  if (!(best < cell)) {
    for (std::size_t i = 0; i < pos.size(); ++i)
      for (std::size_t j = i + 1; j < pos.size(); ++j) best = std::min(best, std::hypot(pos[i].x - pos[j].x, pos[i].y - pos[j].y));
  }
  return best;
}

}  // namespace qftplan
