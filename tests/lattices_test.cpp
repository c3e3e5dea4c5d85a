// Tests of the built-in lattices against textbook graph facts, and of the spec parser.
//
// Graph facts used below (textbook graph theory; section numbers from memory):
//   R. Diestel, "Graph Theory", 5th ed., Springer, 2017 —
//   ch. 1: the path P_n has n-1 edges and diameter n-1; the cycle C_n has n edges and diameter
//   floor(n/2); the complete graph K_n has n(n-1)/2 edges; Prop. 1.6.1: a graph is bipartite iff it
//   has no odd cycle; sec. 1.9: the cycle space of a graph with n vertices, m edges and c
//   components has dimension m - n + c; Thm. 4.2.9 (Euler's formula) for plane graphs.
//   The grid P_R x P_C has R(C-1) + C(R-1) edges and diameter (R-1) + (C-1) ("common practice").

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <set>
#include <string>
#include <vector>

#include "qftplan/core/input_error.hpp"
#include "qftplan/device/lattices.hpp"

namespace qftplan {
namespace {

/// Two-colours the graph by breadth-first search (independent of the library's summary code).
/// Returns the colours, or an empty vector when an edge joins two qubits of the same colour.
std::vector<int> two_colouring(const Device& d) {
  std::vector<int> colour(d.qubit_count(), -1);
  for (int s = 0; s < d.qubit_count(); ++s) {
    if (colour[s] >= 0) continue;
    colour[s] = 0;
    std::vector<int> queue{s};
    for (std::size_t h = 0; h < queue.size(); ++h)
      for (int nb : d.neighbours(queue[h])) {
        if (colour[nb] < 0) {
          colour[nb] = 1 - colour[queue[h]];
          queue.push_back(nb);
        } else if (colour[nb] == colour[queue[h]]) {
          return {};
        }
      }
  }
  return colour;
}

/// Length of the shortest cycle (0 when the graph is a forest), by a search from every qubit.
int girth(const Device& d) {
  int best = 0;
  for (int s = 0; s < d.qubit_count(); ++s) {
    std::vector<int> dist(d.qubit_count(), -1), parent(d.qubit_count(), -1);
    std::vector<int> queue{s};
    dist[s] = 0;
    for (std::size_t h = 0; h < queue.size(); ++h) {
      const int q = queue[h];
      for (int nb : d.neighbours(q)) {
        if (dist[nb] < 0) {
          dist[nb] = dist[q] + 1;
          parent[nb] = q;
          queue.push_back(nb);
        } else if (parent[q] != nb) {
          const int len = dist[q] + dist[nb] + 1;
          if (best == 0 || len < best) best = len;
        }
      }
    }
  }
  return best;
}

int max_degree(const Device& d) {
  int m = 0;
  for (int q = 0; q < d.qubit_count(); ++q) m = std::max(m, d.degree(q));
  return m;
}

TEST(Lattices, LineCountsAndLayout) {
  for (int n : {1, 2, 5, 64}) {
    const Device d = make_line(n);
    EXPECT_EQ(d.name(), "line:" + std::to_string(n));
    EXPECT_EQ(d.qubit_count(), n);
    EXPECT_EQ(d.coupler_count(), n - 1);  // path P_n (Diestel ch. 1)
    EXPECT_EQ(d.diameter(), n - 1);
    for (int i = 0; i + 1 < n; ++i) EXPECT_TRUE(d.coupled(i, i + 1));
    for (int i = 0; i < n; ++i) EXPECT_EQ(d.position(i), (Point{static_cast<double>(i), 0}));
  }
}

TEST(Lattices, RingCountsAndLayout) {
  for (int n : {3, 4, 7, 16, 33}) {
    const Device d = make_ring(n);
    EXPECT_EQ(d.qubit_count(), n);
    EXPECT_EQ(d.coupler_count(), n);  // cycle C_n
    EXPECT_EQ(d.diameter(), n / 2);
    EXPECT_TRUE(d.coupled(0, n - 1));
    for (int q = 0; q < n; ++q) EXPECT_EQ(d.degree(q), 2);
    // Bipartite exactly when the cycle is even (Diestel Prop. 1.6.1).
    EXPECT_EQ(two_colouring(d).empty(), n % 2 == 1);
    // Drawn on a circle with neighbours about one unit apart (positions are rounded to 1e-4).
    const Point a = *d.position(0), b = *d.position(1);
    EXPECT_NEAR(std::hypot(a.x - b.x, a.y - b.y), 1.0, 1e-3);
  }
}

TEST(Lattices, GridCountsAndLayout) {
  for (auto [r, c] : {std::pair{1, 1}, {1, 5}, {4, 1}, {3, 4}, {7, 9}}) {
    const Device d = make_grid(r, c);
    EXPECT_EQ(d.name(), "grid:" + std::to_string(r) + "x" + std::to_string(c));
    EXPECT_EQ(d.qubit_count(), r * c);
    EXPECT_EQ(d.coupler_count(), r * (c - 1) + c * (r - 1));
    EXPECT_EQ(d.diameter(), (r - 1) + (c - 1));
    EXPECT_FALSE(two_colouring(d).empty());
    for (int row = 0; row < r; ++row)
      for (int col = 0; col < c; ++col) {
        const int q = row * c + col;
        EXPECT_EQ(d.position(q), (Point{static_cast<double>(col), static_cast<double>(row)}));
        if (col + 1 < c) {
          EXPECT_TRUE(d.coupled(q, q + 1));
        }
        if (row + 1 < r) {
          EXPECT_TRUE(d.coupled(q, q + c));
        }
      }
  }
}

TEST(Lattices, FullCounts) {
  for (int n : {1, 2, 3, 10, 40}) {
    const Device d = make_full(n);
    EXPECT_EQ(d.coupler_count(), n * (n - 1) / 2);  // complete graph K_n
    EXPECT_EQ(d.diameter(), n > 1 ? 1 : 0);
    for (int q = 0; q < n; ++q) EXPECT_EQ(d.degree(q), n - 1);
  }
}

// Heavy-hex counts. The brick-wall patch of R x C hexagonal cells has R+1 rows of lattice vertices:
// the top and bottom rows hold 2C+1 vertices, each of the R-1 middle rows 2C+2, so
//   V = 2(2C+1) + (R-1)(2C+2) = 2RC + 2R + 2C.
// Its edges: flat ones, one fewer than the vertices of each row, 2(2C) + (R-1)(2C+1); upright ones,
// C+1 per cell row, R(C+1); together E = 3RC + 2R + 2C - 1. (Check with Euler's formula, Diestel
// Thm. 4.2.9: V - E + F = 2 with F = RC + 1 faces.) One extra qubit per edge gives
//   qubits = V + E = 5RC + 4R + 4C - 1,   couplers = 2E = 6RC + 4R + 4C - 2.
TEST(Lattices, HeavyHexCountsAndStructure) {
  for (int r = 1; r <= 4; ++r)
    for (int c = 1; c <= 4; ++c) {
      SCOPED_TRACE("heavy-hex:" + std::to_string(r) + "x" + std::to_string(c));
      const Device d = make_heavy_hex(r, c);
      EXPECT_EQ(d.qubit_count(), 5 * r * c + 4 * r + 4 * c - 1);
      EXPECT_EQ(d.coupler_count(), 6 * r * c + 4 * r + 4 * c - 2);
      EXPECT_EQ(d.components().second, 1);
      EXPECT_LE(max_degree(d), 3);
      // Bipartite, and one colour class is exactly the edge qubits: all of degree 2.
      const auto colour = two_colouring(d);
      ASSERT_FALSE(colour.empty());
      bool one_class_all_degree_two = false;
      for (int cls : {0, 1}) {
        bool ok = true;
        int count = 0;
        for (int q = 0; q < d.qubit_count(); ++q)
          if (colour[q] == cls) {
            ++count;
            ok = ok && d.degree(q) == 2;
          }
        // The edge-qubit class has E = 3RC + 2R + 2C - 1 members.
        if (ok && count == 3 * r * c + 2 * r + 2 * c - 1) one_class_all_degree_two = true;
      }
      EXPECT_TRUE(one_class_all_degree_two);
      // Independent cycles = couplers - qubits + components = number of hexagons (Diestel sec. 1.9).
      EXPECT_EQ(d.coupler_count() - d.qubit_count() + 1, r * c);
      // A hexagon with every edge subdivided is a 12-cycle, the shortest cycle present.
      EXPECT_EQ(girth(d), 12);
    }
}

TEST(Lattices, HeavyHexCountsForAFewSizes) {
  struct Size {
    int rows, cols, qubits, couplers;
  };
  // Values from the formula above, written out.
  for (const Size s : {Size{1, 1, 12, 12}, Size{1, 2, 21, 22}, Size{2, 2, 35, 38}, Size{3, 3, 68, 76},
                       Size{5, 5, 164, 188}, Size{10, 10, 579, 678}}) {
    const Device d = make_heavy_hex(s.rows, s.cols);
    EXPECT_EQ(d.qubit_count(), s.qubits);
    EXPECT_EQ(d.coupler_count(), s.couplers);
  }
}

TEST(Lattices, HeavyHexNumberingFollowsTheDrawing) {
  // heavy-hex:1x1 is one subdivided hexagon: top chain 0-1-2-3-4, bridges 5 (left) and 6 (right),
  // bottom chain 7-8-9-10-11 (see the numbering note in src/device/lattices.cpp).
  const Device one = make_heavy_hex(1, 1);
  const std::vector<std::pair<int, int>> cycle = {{0, 1},   {1, 2},  {2, 3}, {3, 4}, {4, 6}, {6, 11},
                                                  {11, 10}, {10, 9}, {9, 8}, {8, 7}, {7, 5}, {5, 0}};
  for (auto [a, b] : cycle) EXPECT_TRUE(one.coupled(a, b)) << a << "-" << b;
  // heavy-hex:2x2 drawn as text (row y of the drawing, qubit ids at their x):
  //    0  1  2  3  4  5  6  7  8
  //    9           10          11
  //   12 13 14 15 16 17 18 19 20 21 22
  //          23          24          25
  //          26 27 28 29 30 31 32 33 34
  const Device two = make_heavy_hex(2, 2);
  const std::vector<std::vector<std::pair<int, int>>> rows = {
      {{0, 0}, {1, 1}, {2, 2}, {3, 3}, {4, 4}, {5, 5}, {6, 6}, {7, 7}, {8, 8}},
      {{9, 0}, {10, 4}, {11, 8}},
      {{12, 0}, {13, 1}, {14, 2}, {15, 3}, {16, 4}, {17, 5}, {18, 6}, {19, 7}, {20, 8}, {21, 9}, {22, 10}},
      {{23, 2}, {24, 6}, {25, 10}},
      {{26, 2}, {27, 3}, {28, 4}, {29, 5}, {30, 6}, {31, 7}, {32, 8}, {33, 9}, {34, 10}}};
  for (int y = 0; y < static_cast<int>(rows.size()); ++y)
    for (auto [q, x] : rows[y]) EXPECT_EQ(two.position(q), (Point{static_cast<double>(x), static_cast<double>(y)}));
  for (auto [a, b] : {std::pair{0, 9},
                      {9, 12},
                      {4, 10},
                      {10, 16},
                      {8, 11},
                      {11, 20},
                      {14, 23},
                      {23, 26},
                      {18, 24},
                      {24, 30},
                      {22, 25},
                      {25, 34}})
    EXPECT_TRUE(two.coupled(a, b)) << a << "-" << b;
  // Ids follow reading order of the drawing: by row, then left to right.
  for (int q = 0; q + 1 < two.qubit_count(); ++q) {
    const Point a = *two.position(q), b = *two.position(q + 1);
    EXPECT_TRUE(a.y < b.y || (a.y == b.y && a.x < b.x)) << q;
  }
}

TEST(Lattices, SpecsBuildNamedDevices) {
  EXPECT_EQ(make_lattice("grid:3x4").name(), "grid:3x4");
  EXPECT_EQ(make_lattice("grid:3x4").description(), make_grid(3, 4).description());
  EXPECT_EQ(make_lattice("heavy-hex:2x3").qubit_count(), make_heavy_hex(2, 3).qubit_count());
  EXPECT_EQ(make_lattice("ring:5").coupler_count(), 5);
  EXPECT_EQ(make_lattice("full:4").coupler_count(), 6);
  EXPECT_EQ(make_lattice("line:3").name(), "line:3");
  EXPECT_TRUE(is_lattice_spec("line:4"));
  EXPECT_TRUE(is_lattice_spec("heavy-hex:1x1"));
  EXPECT_TRUE(is_lattice_spec("line:"));  // a known family: make_lattice then explains the problem
  EXPECT_FALSE(is_lattice_spec("nosuch:4"));
  EXPECT_FALSE(is_lattice_spec("grid"));
  EXPECT_FALSE(is_lattice_spec("topologies/harbor-line-12.yaml"));
  EXPECT_FALSE(is_lattice_spec("/tmp/grid:3x3"));
  EXPECT_EQ(lattice_families(), (std::vector<std::string>{"line", "ring", "grid", "heavy-hex", "full"}));
}

TEST(Lattices, MalformedSpecsNameTheSpec) {
  const std::pair<const char*, const char*> cases[] = {
      {"grid:0x3", "device spec 'grid:0x3': a grid needs at least 1 row and 1 column"},
      {"grid:3", "device spec 'grid:3': expected rows x columns such as grid:3x4"},
      {"grid:3x", "device spec 'grid:3x': missing the column count"},
      {"grid:x3", "device spec 'grid:x3': missing the row count"},
      {"grid:3x4x5", "device spec 'grid:3x4x5': the column count must be a whole number, got '4x5'"},
      {"grid:1000x1001", "device spec 'grid:1000x1001': 1001000 qubits is more than the limit of 1000000"},
      {"line:abc", "device spec 'line:abc': the qubit count must be a whole number, got 'abc'"},
      {"line:", "device spec 'line:': missing the qubit count"},
      {"line:-3", "device spec 'line:-3': the qubit count must be a whole number, got '-3'"},
      {"line: 3", "device spec 'line: 3': the qubit count must be a whole number, got ' 3'"},
      {"line:0", "device spec 'line:0': a line needs at least 1 qubit"},
      {"line:99999999999",
       "device spec 'line:99999999999': the qubit count 99999999999 is more than the limit of 1000000 qubits"},
      {"line:99999999999999999999999",
       "device spec 'line:99999999999999999999999': the qubit count "
       "99999999999999999999999 is more than the limit of 1000000 qubits"},
      {"line:1000001", "device spec 'line:1000001': the qubit count 1000001 is more than the limit of 1000000 qubits"},
      {"ring:2", "device spec 'ring:2': a ring needs at least 3 qubits"},
      {"full:0", "device spec 'full:0': a fully coupled device needs at least 1 qubit"},
      {"full:2001", "device spec 'full:2001': full:N is limited to N <= 2000 (N(N-1)/2 couplers)"},
      {"heavy-hex:0x2", "device spec 'heavy-hex:0x2': a heavy-hex lattice needs at least 1 row and 1 column of cells"},
      {"heavy-hex:500x500", "device spec 'heavy-hex:500x500': 1253999 qubits is more than the limit of 1000000"},
      {"heavy-hex:1000000x1000000",
       "device spec 'heavy-hex:1000000x1000000': 5000007999999 qubits is more than the limit of 1000000"},
      {"nosuch:4", "device spec 'nosuch:4': unknown device family 'nosuch' (known: line, ring, grid, heavy-hex, full)"},
  };
  for (const auto& [spec, message] : cases) {
    try {
      make_lattice(spec);
      ADD_FAILURE() << spec << " was accepted";
    } catch (const InputError& e) {
      EXPECT_EQ(std::string(e.what()), message);
    }
  }
}

TEST(Lattices, LargestSizesAreAccepted) {
  // Right at the limit: 1000 x 1000 = 10^6 qubits (grid) and full:2000.
  EXPECT_EQ(make_lattice("grid:1000x1000").qubit_count(), 1'000'000);
  EXPECT_EQ(make_lattice("full:2000").coupler_count(), 1'999'000);
}

}  // namespace
}  // namespace qftplan
