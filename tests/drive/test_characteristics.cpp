// The model-generic characteristic decomposition used by open ends: the numerical flux
// Jacobian of MHD has the analytic wave speeds, and its left and right eigenvectors are
// dual bases.
//
// Reference speeds: ideal MHD along x, u +- c_f, u +- c_a, u +- c_s, u with
// c_a = |B_x| / sqrt(mu0 rho) and c_f,s^2 = (a^2 + b^2 +- sqrt((a^2 + b^2)^2 - 4 a^2 c_a^2)) / 2
// (e.g. Goedbloed & Poedts 2004, "Principles of Magnetohydrodynamics", ch. 5 [from memory]).
#include <catch2/catch.hpp>
#include <cmath>

#include "drive/open_end.hpp"
#include "models/mhd.hpp"

using namespace tw;

TEST_CASE("characteristic basis of MHD: analytic speeds and dual eigenvectors", "[unit][open]") {
  Mhd m;
  m.bx = 0.08;
  Mhd::State W{1e-8, 3e3, -2e3, 1e3, 0.05, -0.02, 40.0};
  const CharacteristicBasis b = characteristic_basis(m, W);
  const double rho = W[Mhd::RHO];
  const double a2 = m.gamma * W[Mhd::P] / rho, ca2 = m.bx * m.bx / (m.mu0 * rho);
  const double b2 = (m.bx * m.bx + W[Mhd::BY] * W[Mhd::BY] + W[Mhd::BZ] * W[Mhd::BZ]) / (m.mu0 * rho);
  const double disc = std::sqrt((a2 + b2) * (a2 + b2) - 4 * a2 * ca2);
  const double cf = std::sqrt(0.5 * (a2 + b2 + disc)), cs = std::sqrt(0.5 * (a2 + b2 - disc)), ca = std::sqrt(ca2);
  const double u = W[Mhd::VX];
  const double expect[7] = {u - cf, u - ca, u - cs, u, u + cs, u + ca, u + cf};
  REQUIRE(b.speeds.size() == 7);
  CHECK(b.max_imag < 1e-6 * cf);
  // Central differences with a relative step 1e-6: the speeds to 1e-8 relative.
  for (int k = 0; k < 7; ++k) CHECK(b.speeds[static_cast<std::size_t>(k)] == Approx(expect[k]).epsilon(1e-7).margin(1e-7 * cf));
  for (std::size_t k = 0; k < 7; ++k)
    for (std::size_t j = 0; j < 7; ++j) {
      double dot = 0;
      for (std::size_t i = 0; i < 7; ++i) dot += b.left[k][i] * b.right[j][i];
      CHECK(dot == Approx(k == j ? 1.0 : 0.0).margin(1e-8));
    }
}

TEST_CASE("open end: a state made of outgoing waves only is copied, incoming ones dropped", "[unit][open]") {
  Mhd m;
  m.bx = 0.1;
  const Mhd::State W0{1e-8, 0, 0, 0, 0, 0, 50.0};
  const CharacteristicBasis b = characteristic_basis(m, W0);
  const Grid g(10, 0.0, 1.0);
  OpenBoundary<Mhd> right(m, Side::right, W0);
  CHECK(right.outgoing() == 4);  // three forward waves plus the entropy mode at rest
  const Mhd::State U0 = m.cons_from_prim(W0);
  auto field_with = [&](std::size_t k, double a) {
    Field<Mhd::State> W(g, W0);
    Mhd::State U = U0;
    for (std::size_t i = 0; i < 7; ++i) U[i] += a * b.right[k][i];
    W[g.n_cells - 1] = m.prim_from_cons(U);
    return W;
  };
  // A forward (outgoing) Alfven wave continues into the ghost cells unchanged.
  auto Wf = field_with(5, 1e-6 * U0[Mhd::EN]);
  right.fill(m, g, Side::right, 0, Wf);
  for (int k = 0; k < 7; ++k) CHECK(Wf[g.n_cells][k] == Approx(Wf[g.n_cells - 1][k]).epsilon(1e-9).margin(1e-14));
  // A backward (incoming) Alfven wave is replaced by the reference state.
  auto Wb = field_with(1, 1e-6 * U0[Mhd::EN]);
  right.fill(m, g, Side::right, 0, Wb);
  for (int k = 0; k < 7; ++k) CHECK(Wb[g.n_cells + 1][k] == Approx(W0[k]).epsilon(1e-9).margin(1e-12));
}
