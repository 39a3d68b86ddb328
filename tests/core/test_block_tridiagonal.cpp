// The 2x2 block-tridiagonal solver (open and periodic) against a dense Gaussian
// elimination of the same system, and the ends' ghost map against the boundary objects.
#include <catch2/catch.hpp>
#include <cmath>
#include <random>
#include <vector>

#include "core/block_tridiagonal.hpp"
#include "drive/boundary.hpp"
#include "models/ghost_map.hpp"
#include "models/hall.hpp"

using namespace tw;

namespace {

/// Dense solve with partial pivoting (the independent reference).
std::vector<double> dense_solve(std::vector<std::vector<double>> a, std::vector<double> b) {
  const std::size_t n = b.size();
  for (std::size_t c = 0; c < n; ++c) {
    std::size_t p = c;
    for (std::size_t r = c + 1; r < n; ++r)
      if (std::abs(a[r][c]) > std::abs(a[p][c])) p = r;
    std::swap(a[p], a[c]);
    std::swap(b[p], b[c]);
    for (std::size_t r = c + 1; r < n; ++r) {
      const double f = a[r][c] / a[c][c];
      for (std::size_t k = c; k < n; ++k) a[r][k] -= f * a[c][k];
      b[r] -= f * b[c];
    }
  }
  std::vector<double> x(n);
  for (std::size_t r = n; r-- > 0;) {
    double s = b[r];
    for (std::size_t k = r + 1; k < n; ++k) s -= a[r][k] * x[k];
    x[r] = s / a[r][r];
  }
  return x;
}

void place(std::vector<std::vector<double>>& a, std::size_t row, std::size_t col, const M2& m) {
  a[2 * row][2 * col] += m.a;
  a[2 * row][2 * col + 1] += m.b;
  a[2 * row + 1][2 * col] += m.c;
  a[2 * row + 1][2 * col + 1] += m.d;
}

}  // namespace

TEST_CASE("block-tridiagonal solver matches dense elimination, open and periodic", "[unit][numerics]") {
  std::mt19937 gen(7);
  std::uniform_real_distribution<double> u(-1, 1);
  for (bool rotation : {false, true})
  for (bool ring : {false, true}) {
    // General 2x2 blocks, or blocks [[a, b], [-b, a]] (solved in complex arithmetic).
    auto rnd = [&] {
      if (rotation) {
        const double a = u(gen), b = u(gen);
        return M2{a, b, -b, a};
      }
      return M2{u(gen), u(gen), u(gen), u(gen)};
    };
    for (std::size_t n : {3u, 4u, 17u}) {
      DYNAMIC_SECTION((rotation ? "rotation blocks, " : "general blocks, ") << (ring ? "periodic" : "open")
                                                                           << ", n = " << n) {
        std::vector<M2> A(n), B(n), C(n);
        std::vector<V2> r(n);
        for (std::size_t i = 0; i < n; ++i) {
          A[i] = rnd();
          C[i] = rnd();
          // Diagonally dominant like the implicit Hall operator: identity plus rotation.
          B[i] = M2::identity(4) + rnd();
          r[i] = {u(gen), u(gen)};
        }
        if (!ring) {
          A[0] = M2{};
          C[n - 1] = M2{};
        }
        std::vector<std::vector<double>> dense(2 * n, std::vector<double>(2 * n, 0.0));
        std::vector<double> rhs(2 * n);
        for (std::size_t i = 0; i < n; ++i) {
          place(dense, i, (i + n - 1) % n, A[i]);
          place(dense, i, i, B[i]);
          place(dense, i, (i + 1) % n, C[i]);
          rhs[2 * i] = r[i].x;
          rhs[2 * i + 1] = r[i].y;
        }
        const auto ref = dense_solve(dense, rhs);
        solve_block_tridiagonal(A, B, C, r);
        for (std::size_t i = 0; i < n; ++i) {
          CHECK(r[i].x == Approx(ref[2 * i]).margin(1e-12));
          CHECK(r[i].y == Approx(ref[2 * i + 1]).margin(1e-12));
        }
      }
    }
  }
}

TEST_CASE("ghost map: the ends' first ghost cell as an affine map of the end cells", "[unit][numerics]") {
  Grid g(6, 0.0, 1.0);
  HallMhd m;
  m.ideal.mu0 = 1;
  m.ideal.bx = 1;
  Field<HallMhd::State> W(g);
  for (int i = 0; i < 6; ++i) {
    W[i] = HallMhd::State{1.0 + 0.1 * i, 0.0, 0.2, -0.1, 0.3 * i, -0.2 * i, 1.0, 0.5};
  }
  auto with = [&](const Boundary<HallMhd>& left, const Boundary<HallMhd>& right) {
    GhostFill<HallMhd::State> fill = [&](Field<HallMhd::State>& w, real t) {
      left.fill(m, g, Side::left, t, w);
      right.fill(m, g, Side::right, t, w);
    };
    return probe_ghost_map(W, fill, 0.0, HallMhd::BY, HallMhd::BZ, 0.7);
  };
  const PeriodicBoundary<HallMhd> periodic;
  const ConductingBoundary<HallMhd> wall;
  const GhostMap p = with(periodic, periodic);
  // Periodic: left ghost = last cell, right ghost = first cell.
  CHECK(p.left_first.is_zero());
  CHECK(p.left_last.a == Approx(1.0));
  CHECK(p.left_last.d == Approx(1.0));
  CHECK(p.right_first.a == Approx(1.0));
  CHECK(p.right_last.is_zero());
  CHECK(p.left_offset.x == Approx(0.0).margin(1e-14));
  // Conducting (line-tied): the field is mirrored evenly, nothing couples across.
  const GhostMap c = with(wall, wall);
  CHECK(c.left_first.a == Approx(1.0));
  CHECK(c.left_first.b == 0.0);
  CHECK(c.left_last.is_zero());
  CHECK(c.right_last.d == Approx(1.0));
  CHECK(c.right_first.is_zero());
  // The map reproduces the filled ghosts, and the interior is left as it was.
  const V2 gl = c.left({W[0][HallMhd::BY], W[0][HallMhd::BZ]}, {W[5][HallMhd::BY], W[5][HallMhd::BZ]});
  CHECK(gl.x == Approx(W[-1][HallMhd::BY]).margin(1e-14));
  CHECK(W[0][HallMhd::BY] == 0.0);
  CHECK(W[5][HallMhd::BZ] == Approx(-1.0));
}
