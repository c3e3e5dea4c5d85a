// Built-in lattices. Numbering of heavy-hex:RxC (for the README, "Built-in lattices"):
//   Start from a brick-wall drawing of R rows x C columns of hexagonal cells: R+1 rows of lattice
//   vertices at integer x; cell (r, c) has corners x = 2c+s .. 2c+s+2 on vertex rows r and r+1,
//   where s = r mod 2 (odd cell rows are shifted right by half a cell), and its two upright sides
//   at x = 2c+s and x = 2c+s+2. Every hexagon edge gets one extra qubit at its midpoint. Drawn at
//   twice the scale, vertex (x, row i) sits at (2x, 2i), a flat edge's qubit at (2x+1, 2i) and an
//   upright edge's qubit at (2x, 2i+1). Qubits are numbered in reading order of that drawing: by
//   drawing row y = 0, 1, ..., 2R from top to bottom, then by x from left to right. Even drawing
//   rows are long chains of alternating vertex and edge qubits; odd rows hold the C+1 bridge qubits
//   of one cell row. Counts: 5RC + 4R + 4C - 1 qubits, 6RC + 4R + 4C - 2 couplers (see tests).
#include "qftplan/device/lattices.hpp"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstdint>
#include <numbers>
#include <random>
#include <string_view>
#include <utility>

#include <fmt/format.h>

#include "qftplan/core/input_error.hpp"

namespace qftplan {
namespace {

/// full:N is capped so its N(N-1)/2 couplers stay around two million.
constexpr int kMaxFullQubits = 2000;

[[noreturn]] void bad_spec(const std::string& spec, const std::string& message) {
  throw InputError(fmt::format("device spec '{}': {}", spec, message));
}

void check_qubit_count(const std::string& spec, std::int64_t qubits) {
  if (qubits > kMaxDeviceQubits)
    bad_spec(spec, fmt::format("{} qubits is more than the limit of {}", qubits, kMaxDeviceQubits));
}

/// A coupler without its own calibration.
Coupler couple(int a, int b) {
  Coupler c;
  c.a = a;
  c.b = b;
  return c;
}

/// Rounds drawing coordinates to 1e-4 so written files stay readable.
double round4(double v) {
  const double r = std::round(v * 1e4) / 1e4;
  return r == 0.0 ? 0.0 : r;  // no "-0" in files
}

/// n points on a circle whose neighbouring points are one unit apart.
std::vector<std::optional<Point>> circle_positions(int n) {
  std::vector<std::optional<Point>> pos(n);
  const double radius = n > 1 ? 0.5 / std::sin(std::numbers::pi / n) : 0.0;
  for (int i = 0; i < n; ++i) {
    const double angle = 2.0 * std::numbers::pi * i / n;
    pos[i] = Point{round4(radius * std::cos(angle)), round4(radius * std::sin(angle))};
  }
  return pos;
}

Device line_device(int n, std::string name) {
  if (n < 1) bad_spec(name, "a line needs at least 1 qubit");
  check_qubit_count(name, n);
  DeviceDescription d;
  d.name = std::move(name);
  d.qubits = n;
  d.couplers.reserve(n - 1);
  for (int i = 0; i + 1 < n; ++i) d.couplers.push_back(couple(i, i + 1));
  d.positions.resize(n);
  for (int i = 0; i < n; ++i) d.positions[i] = Point{static_cast<double>(i), 0.0};
  return Device(std::move(d));
}

Device ring_device(int n, std::string name) {
  if (n < 3) bad_spec(name, "a ring needs at least 3 qubits");
  check_qubit_count(name, n);
  DeviceDescription d;
  d.name = std::move(name);
  d.qubits = n;
  d.couplers.reserve(n);
  for (int i = 0; i + 1 < n; ++i) d.couplers.push_back(couple(i, i + 1));
  d.couplers.push_back(couple(0, n - 1));
  d.positions = circle_positions(n);
  return Device(std::move(d));
}

Device grid_device(int rows, int cols, std::string name) {
  if (rows < 1 || cols < 1) bad_spec(name, "a grid needs at least 1 row and 1 column");
  check_qubit_count(name, std::int64_t{rows} * cols);
  DeviceDescription d;
  d.name = std::move(name);
  d.qubits = rows * cols;
  d.couplers.reserve(static_cast<std::size_t>(rows) * (cols - 1) + static_cast<std::size_t>(cols) * (rows - 1));
  d.positions.resize(d.qubits);
  for (int r = 0; r < rows; ++r)
    for (int c = 0; c < cols; ++c) {
      const int q = r * cols + c;
      if (c + 1 < cols) d.couplers.push_back(couple(q, q + 1));
      if (r + 1 < rows) d.couplers.push_back(couple(q, q + cols));
      d.positions[q] = Point{static_cast<double>(c), static_cast<double>(r)};
    }
  return Device(std::move(d));
}

Device heavy_hex_device(int rows, int cols, std::string name) {
  if (rows < 1 || cols < 1) bad_spec(name, "a heavy-hex lattice needs at least 1 row and 1 column of cells");
  const std::int64_t R = rows, C = cols;
  check_qubit_count(name, 5 * R * C + 4 * R + 4 * C - 1);

  // Vertex row i spans lattice x = lo[i] .. hi[i] (see the numbering note at the top of this file).
  const auto shift = [](int r) { return r % 2; };
  std::vector<int> lo(rows + 1), hi(rows + 1);
  for (int i = 0; i <= rows; ++i) {
    lo[i] = 1 << 30;
    hi[i] = -1;
    for (int r : {i - 1, i})  // the cell rows above and below vertex row i
      if (r >= 0 && r < rows) {
        lo[i] = std::min(lo[i], shift(r));
        hi[i] = std::max(hi[i], 2 * cols + shift(r));
      }
  }
  // Drawing row y holds the qubits with that y, left to right. Even y = 2i: vertex row i and its flat
  // edges at drawing x = 2*lo .. 2*hi. Odd y = 2r+1: upright edges of cell row r at x = 2(2c + s).
  const int drawing_rows = 2 * rows + 1;
  std::vector<int> first_id(drawing_rows + 1, 0);  // id of the leftmost qubit of each drawing row
  for (int y = 0; y < drawing_rows; ++y) {
    const int count = (y % 2 == 0) ? 2 * (hi[y / 2] - lo[y / 2]) + 1 : cols + 1;
    first_id[y + 1] = first_id[y] + count;
  }
  // Id of the qubit at drawing (x, y).
  const auto id = [&](int x, int y) {
    if (y % 2 == 0) return first_id[y] + (x - 2 * lo[y / 2]);
    return first_id[y] + (x / 2 - shift(y / 2)) / 2;
  };

  DeviceDescription d;
  d.name = std::move(name);
  d.qubits = first_id[drawing_rows];
  d.positions.resize(d.qubits);
  for (int y = 0; y < drawing_rows; y += 2)
    for (int x = 2 * lo[y / 2]; x <= 2 * hi[y / 2]; ++x) {
      d.positions[id(x, y)] = Point{static_cast<double>(x), static_cast<double>(y)};
      if (x < 2 * hi[y / 2]) d.couplers.push_back(couple(id(x, y), id(x + 1, y)));
    }
  for (int r = 0; r < rows; ++r) {
    const int y = 2 * r + 1;
    for (int c = 0; c <= cols; ++c) {
      const int x = 2 * (2 * c + shift(r));
      const int bridge = id(x, y);
      d.positions[bridge] = Point{static_cast<double>(x), static_cast<double>(y)};
      d.couplers.push_back(couple(id(x, y - 1), bridge));
      d.couplers.push_back(couple(bridge, id(x, y + 1)));
    }
  }
  std::sort(d.couplers.begin(), d.couplers.end(),
            [](const Coupler& p, const Coupler& q) { return std::pair(p.a, p.b) < std::pair(q.a, q.b); });
  return Device(std::move(d));
}

Device full_device(int n, std::string name) {
  if (n < 1) bad_spec(name, "a fully coupled device needs at least 1 qubit");
  if (n > kMaxFullQubits)
    bad_spec(name, fmt::format("full:N is limited to N <= {} (N(N-1)/2 couplers)", kMaxFullQubits));
  DeviceDescription d;
  d.name = std::move(name);
  d.qubits = n;
  d.couplers.reserve(static_cast<std::size_t>(n) * (n - 1) / 2);
  for (int a = 0; a < n; ++a)
    for (int b = a + 1; b < n; ++b) d.couplers.push_back(couple(a, b));
  d.positions = circle_positions(n);
  return Device(std::move(d));
}

/// Parses a positive decimal size ("12"); no sign, no spaces.
int parse_size(const std::string& spec, std::string_view text, const char* what) {
  if (text.empty()) bad_spec(spec, fmt::format("missing {}", what));
  if (!std::all_of(text.begin(), text.end(), [](char c) { return c >= '0' && c <= '9'; }))
    bad_spec(spec, fmt::format("{} must be a whole number, got '{}'", what, text));
  std::int64_t v = 0;
  const auto [p, ec] = std::from_chars(text.data(), text.data() + text.size(), v);
  // Anything past the qubit limit is refused, so clamp absurd values rather than overflow.
  if (ec == std::errc::result_out_of_range || v > kMaxDeviceQubits)
    bad_spec(spec, fmt::format("{} {} is more than the limit of {} qubits", what, text, kMaxDeviceQubits));
  if (ec != std::errc{} || p != text.data() + text.size())
    bad_spec(spec, fmt::format("{} must be a whole number, got '{}'", what, text));
  return static_cast<int>(v);
}

/// Parses "RxC" for grid and heavy-hex.
std::pair<int, int> parse_dims(const std::string& spec, std::string_view text, const char* example) {
  const auto x = text.find('x');
  if (x == std::string_view::npos) bad_spec(spec, fmt::format("expected rows x columns such as {}", example));
  return {parse_size(spec, text.substr(0, x), "the row count"),
          parse_size(spec, text.substr(x + 1), "the column count")};
}

}  // namespace

Device make_line(int n) { return line_device(n, fmt::format("line:{}", n)); }
Device make_ring(int n) { return ring_device(n, fmt::format("ring:{}", n)); }
Device make_grid(int rows, int cols) { return grid_device(rows, cols, fmt::format("grid:{}x{}", rows, cols)); }
Device make_heavy_hex(int rows, int cols) {
  return heavy_hex_device(rows, cols, fmt::format("heavy-hex:{}x{}", rows, cols));
}
Device make_full(int n) { return full_device(n, fmt::format("full:{}", n)); }

const std::vector<std::string>& lattice_families() {
  static const std::vector<std::string> families = {"line", "ring", "grid", "heavy-hex", "full"};
  return families;
}

bool is_lattice_spec(const std::string& text) {
  const auto colon = text.find(':');
  if (colon == std::string::npos) return false;
  const auto& f = lattice_families();
  return std::find(f.begin(), f.end(), text.substr(0, colon)) != f.end();
}

Device make_lattice(const std::string& spec) {
  const auto colon = spec.find(':');
  if (colon == std::string::npos || !is_lattice_spec(spec)) {
    std::string known;
    for (const auto& f : lattice_families()) known += (known.empty() ? "" : ", ") + f;
    bad_spec(spec, fmt::format("unknown device family '{}' (known: {})", spec.substr(0, colon), known));
  }
  const std::string family = spec.substr(0, colon);
  const std::string_view args = std::string_view(spec).substr(colon + 1);
  if (family == "line") return line_device(parse_size(spec, args, "the qubit count"), spec);
  if (family == "ring") return ring_device(parse_size(spec, args, "the qubit count"), spec);
  if (family == "full") return full_device(parse_size(spec, args, "the qubit count"), spec);
  if (family == "grid") {
    const auto [r, c] = parse_dims(spec, args, "grid:3x4");
    return grid_device(r, c, spec);
  }
  const auto [r, c] = parse_dims(spec, args, "heavy-hex:2x3");
  return heavy_hex_device(r, c, spec);
}

Device with_defects(const Device& clean, int dead_qubits, int broken_couplers, std::uint64_t seed,
                     bool largest_component) {
  std::mt19937_64 rng(seed);
  const int N = clean.qubit_count();
  std::vector<int> order(N);
  for (int q = 0; q < N; ++q) order[q] = q;
  std::shuffle(order.begin(), order.end(), rng);
  std::vector<bool> dead(N, false);
  for (int i = 0; i < dead_qubits && i < N; ++i) dead[order[i]] = true;
  std::vector<std::pair<int, int>> pairs;
  for (const auto& c : clean.couplers())
    if (!dead[c.a] && !dead[c.b]) pairs.emplace_back(c.a, c.b);
  std::shuffle(pairs.begin(), pairs.end(), rng);
  pairs.resize(pairs.size() - std::min<std::size_t>(pairs.size(), static_cast<std::size_t>(std::max(0, broken_couplers))));
  // Keep the live qubits (of the largest piece when asked), renumbered in a random order.
  std::vector<bool> keep(N);
  for (int q = 0; q < N; ++q) keep[q] = !dead[q];
  if (largest_component) {
    DeviceDescription tmp;
    tmp.name = "tmp";
    tmp.qubits = N;
    for (const auto& [a, b] : pairs) tmp.couplers.push_back({a, b, {}, {}});
    const auto [comp, count] = Device(tmp).components();
    std::vector<int> size(count, 0);
    for (int q = 0; q < N; ++q)
      if (keep[q]) ++size[comp[q]];
    const int big = static_cast<int>(std::max_element(size.begin(), size.end()) - size.begin());
    for (int q = 0; q < N; ++q) keep[q] = keep[q] && comp[q] == big;
  }
  std::vector<int> live;
  for (int q = 0; q < N; ++q)
    if (keep[q]) live.push_back(q);
  std::shuffle(live.begin(), live.end(), rng);
  std::vector<int> id(N, -1);
  for (std::size_t i = 0; i < live.size(); ++i) id[live[i]] = static_cast<int>(i);
  DeviceDescription d;
  d.name = clean.name() + "-defective-" + std::to_string(seed);
  d.qubits = static_cast<int>(live.size());
  for (const auto& [a, b] : pairs)
    if (id[a] >= 0 && id[b] >= 0) d.couplers.push_back({std::min(id[a], id[b]), std::max(id[a], id[b]), {}, {}});
  std::sort(d.couplers.begin(), d.couplers.end(),
            [](const Coupler& x, const Coupler& y) { return std::pair(x.a, x.b) < std::pair(y.a, y.b); });
  return Device(std::move(d));
}

}  // namespace qftplan
