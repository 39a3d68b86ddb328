// The discrete linear system of linearized runs (models/linear_system.*): the exact upwind
// flux (each characteristic from its upwind side, also where waves are degenerate), the
// linear descriptions against the nonlinear models' own characteristic speeds, and the
// electron-inertia solve with its ends.
#include <catch2/catch.hpp>
#include <Eigen/Dense>
#include <cmath>
#include <random>
#include <string>

#include "io/runfile.hpp"
#include "models/eigen_modes.hpp"
#include "models/linear_form.hpp"
#include "models/linear_system.hpp"
#include "sim/case.hpp"
#include "sim/linear_setup.hpp"
#include "sim/mhd_setup.hpp"
#include "sim/run.hpp"

using namespace tw;

namespace {

io::RunFile parse(const std::string& body) {
  return io::RunFile::parse(body + "grid: {length: 1, cells: 16}\ntime: {end: 1}\n"
                                   "boundaries: {left: {kind: periodic}, right: {kind: periodic}}\n",
                            "test", run_schema());
}

Eigen::MatrixXd mat(const std::vector<real>& v, int n) {
  Eigen::MatrixXd m(n, n);
  for (int r = 0; r < n; ++r)
    for (int c = 0; c < n; ++c) m(r, c) = v[static_cast<std::size_t>(r * n + c)];
  return m;
}

/// The MHD linear form at the run's background (x_min), and its linearization.
struct MhdPoint {
  Mhd model;
  LinearForm<Mhd>::Vars W0;
  LinearCoefficients c;
};
MhdPoint mhd_point(const std::string& body) {
  const io::RunFile rf = parse(body);
  const CaseSetup c = read_case(rf);
  MhdPoint p;
  p.model = ModelSetup<Mhd>::make(rf, c);
  const PlasmaPoint pt = c.plasma.at(c.grid.x_min, c.units);
  p.W0 = LinearForm<Mhd>::from_model(p.model, ModelSetup<Mhd>::primitive(p.model, pt, c));
  const LinearForm<Mhd> form{p.model, p.W0[0]};
  p.c = linearize(form, p.W0, LinearForm<Mhd>::Vars{}, 1.0);
  return p;
}

/// Flux matrices G+ and G- of one face from a one-cell system with these coefficients.
std::pair<Eigen::MatrixXd, Eigen::MatrixXd> face_matrices(const LinearCoefficients& c) {
  LinearSystemSpec spec;
  spec.n = c.n;
  spec.cell = {c};
  spec.face = {c, c};
  const LinearSystem sys(spec);
  const int n = c.n;
  Eigen::MatrixXd gp(n, n), gm(n, n);
  std::vector<real> w(static_cast<std::size_t>(2 * n), 0.0), z(w), out(w);
  for (int j = 0; j < n; ++j) {
    std::fill(w.begin(), w.end(), 0.0);
    w[static_cast<std::size_t>(j)] = 1;
    sys.upwind_flux(0, w.data(), z.data(), out.data());
    for (int r = 0; r < n; ++r) gp(r, j) = out[static_cast<std::size_t>(r)];
    sys.upwind_flux(0, z.data(), w.data(), out.data());
    for (int r = 0; r < n; ++r) gm(r, j) = out[static_cast<std::size_t>(r)];
  }
  return {gp, gm};
}

}  // namespace

TEST_CASE("linear system: the upwind flux takes each characteristic from its upwind side", "[unit][linear]") {
  // Godunov flux of a linear system (e.g. Toro 2009, ch. 2): for a right eigenvector u_j of
  // A = dF/dU with speed lambda_j, F(U_L = u_j, U_R = 0) = max(lambda_j, 0) u_j and
  // F(0, u_j) = min(lambda_j, 0) u_j. Oblique MHD with the displacement current: seven
  // distinct speeds and B_x's zero.
  const MhdPoint p = mhd_point(
      "units: normalized\nnormalized: {light_speed: 3}\nmodel: {equations: mhd, displacement_current: true}\n"
      "plasma: {density: 1, ion_temperature: 0.2, electron_temperature: 0.2, field: 1, field_angle_deg: 35, "
      "flow: [0.1, 0, 0]}\n");
  const int n = p.c.n;
  const auto [gp, gm] = face_matrices(p.c);
  const Eigen::MatrixXd M0 = mat(p.c.M0, n), A = mat(p.c.G[0], n) * M0.inverse();
  Eigen::EigenSolver<Eigen::MatrixXd> es(A);
  for (int j = 0; j < n; ++j) {
    const double lam = es.eigenvalues()(j).real();
    const Eigen::VectorXd u = es.eigenvectors().col(j).real();
    const Eigen::VectorXd w = M0.inverse() * u;
    INFO("speed " << lam);
    CHECK((gp * w - std::max(lam, 0.0) * u).norm() <= 1e-9 * u.norm() * A.norm());
    CHECK((gm * w - std::min(lam, 0.0) * u).norm() <= 1e-9 * u.norm() * A.norm());
  }
}

TEST_CASE("linear system: degenerate waves (MHD along B0 with c_s = v_A) still split exactly", "[unit][linear]") {
  // Along B0 with a = v_A the fast, slow and Alfvén speeds coincide and the eigenvector
  // matrix is ill-conditioned: the projector comes from the matrix sign function. It must
  // still satisfy A+ + A- = A, A+ A- = 0, and have no negative eigenvalues.
  // a^2 = gamma p/rho = v_A^2 = 1: p = 0.6 (gamma 5/3, rho = 1 with a huge mass ratio).
  const MhdPoint p = mhd_point(
      "units: normalized\nnormalized: {mass_ratio: 1e15}\nmodel: {equations: mhd}\n"
      "plasma: {density: 1, ion_temperature: 0.3, electron_temperature: 0.3, field: 1}\n");
  const int n = p.c.n;
  const auto [gp, gm] = face_matrices(p.c);
  const Eigen::MatrixXd M0i = mat(p.c.M0, n).inverse();
  const Eigen::MatrixXd Ap = gp * M0i, Am = gm * M0i, A = mat(p.c.G[0], n) * M0i;
  CHECK((Ap + Am - A).norm() <= 1e-10 * A.norm());
  CHECK((Ap * Am).norm() <= 1e-8 * A.norm() * A.norm());
  Eigen::EigenSolver<Eigen::MatrixXd> es(Ap);
  for (int j = 0; j < n; ++j) CHECK(es.eigenvalues()(j).real() >= -1e-8 * A.norm());
}

TEST_CASE("linear system: the linear descriptions carry the nonlinear models' characteristic speeds", "[unit][linear]") {
  // The x-flux Jacobian of LinearForm<Mhd> (entropy variable, 3D) against the numerical
  // Jacobian of Mhd::flux itself (models/eigen_modes, the 1D nonlinear model): the same
  // seven speeds (the linear form adds B_x, whose speed is 0), with the displacement current.
  for (const char* dc : {"false", "true"}) {
    const MhdPoint p = mhd_point(std::string("units: normalized\nnormalized: {light_speed: 2}\nmodel: {equations: mhd, "
                                             "displacement_current: ") + dc +
                                 "}\nplasma: {density: 1, ion_temperature: 0.1, electron_temperature: 0.1, field: 1, "
                                 "field_angle_deg: 50, flow: [0.2, 0.1, 0]}\n");
    const int n = p.c.n;
    Eigen::EigenSolver<Eigen::MatrixXd> es(mat(p.c.G[0], n) * mat(p.c.M0, n).inverse());
    std::vector<double> lin;
    for (int j = 0; j < n; ++j) lin.push_back(es.eigenvalues()(j).real());
    Mhd::State W{};
    for (int k = 0; k < 4; ++k) W[k] = p.W0[k];
    W[Mhd::BY] = p.W0[5];
    W[Mhd::BZ] = p.W0[6];
    W[Mhd::P] = p.W0[7];
    const ModeSet nl = primitive_modes_mhd(p.model, W);
    for (double s : nl.speeds) {
      double best = 1e300;
      for (double l : lin) best = std::min(best, std::abs(l - s));
      INFO("displacement current " << dc << ": nonlinear speed " << s);
      CHECK(best <= 1e-7 * std::max(1.0, std::abs(s)));
    }
  }
}

TEST_CASE("linear system: electron inertia is inverted exactly with periodic and conducting ends", "[unit][linear]") {
  // U = M0 w - div(P) couples cells (B' = B + curl(d_e^2 curl B)); the sparse solve must
  // return w from U for any ends, here periodic and conducting (mirrors), with k_perp.
  const io::RunFile rf = parse("units: normalized\nnormalized: {mass_ratio: 25}\nmodel: {equations: hall, form: linearized, "
                               "electron_inertia: true, perpendicular_wavenumber: 3}\nnumerics: {integrator: ssp-rk3}\n"
                               "plasma: {density: 1, ion_temperature: 0.1, electron_temperature: 0.1, field: 1, "
                               "field_angle_deg: 20}\n");
  CaseSetup c = read_case(rf);
  const auto m = ModelSetup<Linearized<HallMhd>>::make(rf, c);
  using L = Linearized<HallMhd>;
  const Grid& g = c.grid;
  const int n = g.n_cells;
  std::mt19937 rng(5);
  std::uniform_real_distribution<double> u(-1, 1);
  Field<L::State> W(g), U(g), W2(g);
  for (int i = 0; i < n; ++i)
    for (auto& q : W[i]) q = u(rng);
  const GhostFill<L::State> periodic = [&](Field<L::State>& F, real) {
    for (int k = 1; k <= Grid::n_ghost; ++k) {
      F[-k] = F[n - k];
      F[n - 1 + k] = F[k - 1];
    }
  };
  const GhostFill<L::State> conducting = [&](Field<L::State>& F, real) {
    for (int k = 1; k <= Grid::n_ghost; ++k) {
      F[-k] = m.wall_mirror(F[k - 1]);
      F[n - 1 + k] = m.wall_mirror(F[n - k]);
    }
  };
  for (const auto* fill : {&periodic, &conducting}) {
    m.complete_conservatives(g, W, U, *fill, 0);
    // The inertia terms are there: U differs from the cell-wise M0 w in the field slots.
    double coupled = 0;
    for (int i = 0; i < n; ++i) {
      L::State ui;
      m.system->to_conservative(i, W[i].data(), ui.data());
      for (int k = 0; k < L::n_vars; ++k) coupled = std::max(coupled, std::abs(ui[k] - U[i][k]));
    }
    CHECK(coupled > 1e-3);
    m.recover_primitives(g, U, W2, *fill, 0);
    double err = 0;
    for (int i = 0; i < n; ++i)
      for (int k = 0; k < L::n_vars; ++k) err = std::max(err, std::abs(W2[i][k] - W[i][k]));
    CHECK(err < 1e-10);
  }
}
