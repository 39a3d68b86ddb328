#pragma once
/// The linearized form of a model M as a model of its own (models/model.hpp): complex
/// amplitudes of perturbations about a static background that may vary along x, varying as
/// exp(i k_perp y) across the tube. Built from M's linear description (LinearForm<M>,
/// models/linear_form.hpp) by the run setup (sim/linear_setup.*), which evaluates it at every
/// cell centre and face of the background into a LinearSystem (models/linear_system.hpp).
///
/// State (both U and W, 2n reals per cell for the n variables of LinearForm<M>): the n
/// real parts, then the n imaginary parts. W holds the primitive perturbations (density,
/// velocity, B including B_x, pressures, ...), U the conserved ones; they differ by the
/// background of each cell, so the conversion is a whole-grid hook (grid_coupled):
/// recover_primitives / complete_conservatives, per cell or, with electron inertia,
/// by a sparse solve over the grid. The members the generic code calls:
///
///   - the ideal flux along x: the exact upwind flux of each face (numerics/linear_flux.hpp,
///     FluxKind::upwind), which knows its face; `flux(W)` is not used and returns zeros;
///   - the gradient terms (Hall, resistivity, viscosity, their k_perp parts across faces):
///     face_gradient_flux(face, ...), in the Runge-Kutta stages;
///   - the k_perp terms local to a cell (and a non-stiff source): source(W, x, t), in the
///     Runge-Kutta stages, with their step limit (step_limits);
///   - a stiff source (two-fluid): stiff_source_step, the implicit midpoint rule per cell,
///     Strang split around the stages as in the nonlinear model; the k_perp terms are then
///     part of that local step (see models/linear_system.hpp for why).
///
/// Output: every column of LinearForm<M>::output_info() as NAME_re and NAME_im (SI units).
#include <algorithm>
#include <array>
#include <cmath>
#include <memory>
#include <string>
#include <vector>

#include "core/parallel.hpp"
#include "models/linear_form.hpp"
#include "models/linear_system.hpp"
#include "models/model.hpp"

namespace tw {

template <class M>
struct Linearized {
  using Form = LinearForm<M>;
  static constexpr int nc = Form::n;      ///< complex variables
  static constexpr int n_vars = 2 * nc;  ///< reals per cell
  using State = Vec<n_vars>;

  M nonlinear;                            ///< the nonlinear model (at x_min; parameters, drives)
  Form form;                              ///< the linear form at x_min (output conversions)
  std::shared_ptr<const LinearSystem> system;  ///< the discrete equations of the run's grid
  real x_min = 0;                         ///< grid origin [m] (cell index of a source call)
  real dx = 1;                            ///< cell size [m]

  static const char* name() { return M::name(); }

  [[nodiscard]] State prim_from_cons(const State& U) const { return U; }  // see recover_primitives
  [[nodiscard]] State cons_from_prim(const State& W) const { return W; }  // see complete_conservatives
  [[nodiscard]] State flux(const State&) const { return {}; }             // not used: the flux is per face
  [[nodiscard]] SpeedRange signal_speeds(const State&) const {
    const real s = system->max_speed();
    return {-s, s};
  }
  [[nodiscard]] bool admissible(const State& W) const {
    real sum = 0;
    for (real q : W) sum += q;
    return std::isfinite(sum);
  }
  [[nodiscard]] bool positive(const State&) const { return true; }
  [[nodiscard]] State wall_mirror(const State& W) const {
    static const auto parity = Form::wall_parity();
    State G = W;
    for (int k = 0; k < nc; ++k) {
      G[k] *= parity[k];
      G[nc + k] *= parity[k];
    }
    return G;
  }

  static std::vector<VariableInfo> output_info() {
    std::vector<VariableInfo> out;
    for (const auto& v : Form::output_info()) {
      out.push_back({v.name + "_re", v.units, v.description + " (perturbation, real part)"});
      out.push_back({v.name + "_im", v.units, v.description + " (perturbation, imaginary part)"});
    }
    return out;
  }
  void to_output(const State& W, real* out) const {
    const std::size_t m = Form::output_info().size();
    typename Form::Vars re{}, im{};
    for (int k = 0; k < nc; ++k) {
      re[k] = W[k];
      im[k] = W[nc + k];
    }
    std::vector<real> a(m), b(m);
    form.to_output(re, a.data());
    form.to_output(im, b.data());
    for (std::size_t k = 0; k < m; ++k) {
      out[2 * k] = a[k];
      out[2 * k + 1] = b[k];
    }
  }
  static std::vector<VariableInfo> conserved_info() {
    std::vector<VariableInfo> out;
    for (const char* part : {"_re", "_im"})
      for (const auto& v : Form::conserved())
        out.push_back({v.name + part, v.units, v.description + " (perturbation, " + (part[1] == 'r' ? "real" : "imaginary") + " part)"});
    return out;
  }

  // Whole-grid conversions (models/model.hpp).
  [[nodiscard]] bool grid_coupled() const { return true; }
  void recover_primitives(const Grid& g, const Field<State>& U, Field<State>& W, const GhostFill<State>& fill,
                          real t) const {
    const int n = g.n_cells;
    if (!system->has_inertia()) {
#pragma omp parallel for schedule(static) if (run_parallel(n))
      for (int i = 0; i < n; ++i) system->to_primitive(i, U[i].data(), W[i].data());
      return;
    }
    const GhostAffine ends = probe_ends(g, fill, t);
    system->to_primitive_coupled(U[0].data(), ends, W[0].data());
  }
  void complete_conservatives(const Grid& g, Field<State>& W, Field<State>& U, const GhostFill<State>& fill,
                              real t) const {
    const int n = g.n_cells;
    fill(W, t);
    if (system->has_inertia()) {
      system->to_conservative_coupled(W[-1].data(), U[0].data());
      return;
    }
    for (int i = 0; i < n; ++i) system->to_conservative(i, W[i].data(), U[i].data());
  }

  // Terms in the Runge-Kutta stages.
  [[nodiscard]] bool gradient_terms_active() const { return system->has_gradient(); }
  [[nodiscard]] State face_gradient_flux(int face, const State& Wl, const State& Wr, real) const {
    State H;
    system->gradient_flux(face, Wl.data(), Wr.data(), H.data());
    return H;
  }
  [[nodiscard]] State source(const State& W, real x, real) const {
    State s{};
    if (!system->has_local()) return s;
    system->local_rhs(cell_of(x), W.data(), s.data());
    return s;
  }
  void step_limits(real, const State&, StepLimits& limits) const {
    for (const auto& l : system->step_limits()) limits.offer(l.name, l.dt);
  }

  /// The stiff local source (two-fluid: plasma and cyclotron frequencies, collisions).
  void stiff_source_step(const Grid& g, Field<State>& U, real, real dt) const
    requires(Form::stiff_source)
  {
    (void)g;
    system->stiff_step(dt, U[0].data());
  }

  /// Driven ends move the (ion) velocity perturbation across the tube; its amplitude is
  /// real (the plate moves as v(t) cos(k_perp y)).
  [[nodiscard]] std::array<real, 2> transverse_velocity(const State& W) const
    requires HasTransverseVelocity<M>
  {
    static const VariableRoles r = Form::roles();
    return {W[r.vy], W[r.vz]};
  }
  void set_transverse_velocity(State& W, real vy, real vz) const
    requires HasTransverseVelocity<M>
  {
    static const VariableRoles r = Form::roles();
    W[r.vy] = vy;
    W[r.vz] = vz;
  }

  /// Open ends: the projector onto the outgoing characteristics of the end face's
  /// background (drive/open_end.hpp), on the real and imaginary parts alike.
  [[nodiscard]] std::vector<real> open_end_projector(Side side) const {
    const auto& p = system->outgoing_projector(side == Side::left ? 0 : 1);
    std::vector<real> P(static_cast<std::size_t>(n_vars * n_vars), 0.0);
    for (int part = 0; part < 2; ++part)
      for (int r = 0; r < nc; ++r)
        for (int c = 0; c < nc; ++c)
          P[static_cast<std::size_t>((part * nc + r) * n_vars + part * nc + c)] = p[static_cast<std::size_t>(r * nc + c)];
    return P;
  }

  /// Cell index of a cell-centre position.
  [[nodiscard]] int cell_of(real x) const {
    const int i = static_cast<int>(std::floor((x - x_min) / dx));
    return std::clamp(i, 0, system->cells() - 1);
  }

 private:
  /// The ends as an affine map of the first and last cells, found by filling the ghosts of a
  /// field that is zero except for one unit component at a time (2 * 2n + 1 fills, O(1) each).
  GhostAffine probe_ends(const Grid& g, const GhostFill<State>& fill, real t) const {
    const int n = g.n_cells, N = n_vars;
    Field<State> Z(g, State{});
    GhostAffine a;
    fill(Z, t);
    a.l.assign(Z[-1].begin(), Z[-1].end());
    a.r.assign(Z[n].begin(), Z[n].end());
    for (auto* m : {&a.L0, &a.Ln, &a.R0, &a.Rn}) m->assign(static_cast<std::size_t>(N * N), 0.0);
    for (int side = 0; side < 2; ++side) {
      const int cell = side == 0 ? 0 : n - 1;
      std::vector<real>& L = side == 0 ? a.L0 : a.Ln;
      std::vector<real>& R = side == 0 ? a.R0 : a.Rn;
      for (int j = 0; j < N; ++j) {
        Z[cell][j] = 1;
        fill(Z, t);
        for (int r = 0; r < N; ++r) {
          L[static_cast<std::size_t>(r * N + j)] = Z[-1][r] - a.l[static_cast<std::size_t>(r)];
          R[static_cast<std::size_t>(r * N + j)] = Z[n][r] - a.r[static_cast<std::size_t>(r)];
        }
        Z[cell][j] = 0;
      }
    }
    return a;
  }
};

}  // namespace tw
