#pragma once
/// Linearized forms of the models: the small per-model description from which every
/// linearized equation (runs and `tubewave modes`) is derived, and the derivation.
///
/// A linearized run follows perturbations about a static background W0(x) that vary as
/// exp(i k_perp y): complex amplitudes, d/dy -> i k_perp. Rather than writing the linear
/// equations of each model by hand, each model describes itself once, in three dimensions
/// (d/dz = 0), as balance laws for a state W of n primitive variables:
///
///   dU/dt + d_x [F_x(W) + H_x(W, grad W)] + d_y [F_y(W) + H_y(W, grad W)] = S(W) + Q(W, grad W),
///   U = C(W) - d_x P_x(W, grad W) - d_y P_y(W, grad W),
///
/// with the ideal fluxes F_d, the gradient fluxes H_d (resistivity, viscosity, the Hall
/// and electron-pressure electric field, the electron drift of adiabatic electrons), the
/// local sources S (Lorentz force, currents, friction), sources in the gradients Q (Powell's
/// div B terms of the single-fluid models, below) and the generalised conserved
/// variables C - div P (electron inertia: B' = B + curl(d_e^2 curl B)). The linearization
/// about (W0, dW0/dx) is taken numerically by `linearize` below (fourth-order central
/// differences; exact up to rounding for the terms of these models that are at most
/// bilinear in the perturbed quantities, and to ~1e-12 otherwise):
///
///   M0 = dC/dW,  G_d = dF_d/dW,  K_d0 = dH_d/dW,  K_dl = dH_d/d(d_l W),
///   N_d0 = dP_d/dW,  N_dl = dP_d/d(d_l W),  S_W = dS/dW,
///   Q_0 = dQ/dW,  Q_l = dQ/d(d_l W),                           d, l in {x, y},
///
/// all evaluated at the background, whose gradient enters K_d0 and N_d0 (e.g. the
/// electron pressure gradient of the Hall field). Numerical schemes (models/linear_system.*)
/// and the dispersion relation (models/dispersion.*) use only these matrices.
///
/// div B: with k_perp, B_x is a variable and div B = d_x B_x + i k_perp B_y must stay zero.
/// The conservation form of the single-fluid momentum equation carries the force
/// (div B) B/mu0, which turns any divergence (a one-dimensional initial state with k_perp,
/// the truncation error of an end) into a secularly growing flow (a Jordan block at
/// omega = 0: measured, u_x ~ 1e5 m/s within 5 us from a 1000 m/s plate). MHD and Hall MHD
/// therefore carry Powell's source terms, Q = -(div B)(0, B/mu0, u, 0) (Powell, Roe, Linde,
/// Gombosi & De Zeeuw 1999, J. Comput. Phys. 154, 284 — from memory): the momentum then
/// sees the Lorentz force (curl B) x B/mu0 and a divergence is carried with the flow instead
/// of growing. The two-fluid model has the Lorentz force as a source and Faraday's law in
/// curl form, and needs none.
///
/// Thermal variables: the linear balance laws use an entropy-like conserved variable,
/// S_s = p_s (rho_ref/rho_s)^(gamma-1) (conserved by adiabatic flow), or, for an
/// isothermal species, the closure p_s - rho c^2(x) = 0 as a variable with no flux and no
/// source (it stays zero). Heating (Ohmic, viscous, frictional) is quadratic in the
/// perturbation and absent from linear theory, so the linear system is the same as that
/// of the total-energy form of the nonlinear models; unlike the energy, these variables
/// stay conserved when closure parameters vary along x (isothermal electrons with T_e(x))
/// and when currents along x carry the electron pressure (d/dy != 0). See DEVELOPERS.md.
///
/// A specialisation LinearForm<M> (models/<model>_linear.hpp) is an object holding the
/// model's parameters at one point (the local model) and provides:
///
///   static constexpr int n;                      number of primitive variables (3D)
///   using Vars = Vec<n>;
///   static constexpr bool stiff_source;          S is stiff: integrated implicitly per cell
///   static std::vector<VariableInfo> variables();  primitive variables (name, SI unit)
///   static std::vector<VariableInfo> conserved();  components of U (for /history)
///   static std::vector<VariableInfo> output_info();  output columns of one real perturbation
///   static VariableRoles roles();               where density, velocity and fields are
///   static Vars wall_parity();                  +1 / -1 per variable behind a conducting end
///   Vars conservative(const Vars& W) const;     C(W)
///   Vars flux(const Vars& W, int d) const;      F_d(W), d = 0 (x) or 1 (y)
///   Vars gradient_flux(const Vars& W, const Vars& gx, const Vars& gy, int d) const;  H_d
///   Vars inertia_flux(const Vars& W, const Vars& gx, const Vars& gy, int d) const;   P_d
///   Vars source(const Vars& W) const;           S(W)
///   Vars gradient_source(const Vars& W, const Vars& gx, const Vars& gy) const;  Q
///   bool has_gradient_terms() const, has_inertia() const, has_source() const,
///        has_gradient_source() const;
///   Vars scales(const Vars& W0) const;          typical size of each variable (never 0)
///   void to_output(const Vars& w, real* out) const;  output columns of a real perturbation
///   static const char* gradient_limit_name();  name of the step limit of H (and P)
#include <cmath>
#include <string>
#include <vector>

#include "core/types.hpp"
#include "models/model.hpp"

namespace tw {

template <class M>
struct LinearForm;

/// Indices of the variables that labels, drives and normalisations need (-1: absent).
struct VariableRoles {
  int rho = -1;               ///< mass density (of the ions for two fluids)
  int vx = -1, vy = -1, vz = -1;  ///< velocity (of the ions for two fluids)
  int bx = -1, by = -1, bz = -1;  ///< magnetic field
  int ex = -1, ey = -1, ez = -1;  ///< electric field (-1 where E is not a variable)
  int p = -1;                 ///< (total or ion) pressure
  int p_extra = -1;           ///< a pressure to add to p for the total (the electrons' of two fluids)
};

/// The linearization at one point: n x n real matrices, row-major (entry (r, c) at
/// r * n + c). Empty vectors stand for zero matrices (no such terms).
struct LinearCoefficients {
  int n = 0;
  std::vector<real> M0;          ///< dC/dW
  std::vector<real> G[2];        ///< dF_d/dW
  std::vector<real> K0[2];       ///< dH_d/dW (through the background gradient)
  std::vector<real> K[2][2];     ///< dH_d/d(d_l W)
  std::vector<real> N0[2];       ///< dP_d/dW
  std::vector<real> N[2][2];     ///< dP_d/d(d_l W)
  std::vector<real> S;           ///< dS/dW
  std::vector<real> Q0;          ///< dQ/dW (through the background gradient)
  std::vector<real> Q[2];        ///< dQ/d(d_l W)
  std::vector<real> scale;       ///< typical size of each primitive variable (for balancing eigen-solves)
  [[nodiscard]] bool gradient() const { return !K[0][0].empty() || !Q[0].empty(); }
  [[nodiscard]] bool inertia() const { return !N[0][0].empty(); }
  [[nodiscard]] bool source() const { return !S.empty(); }
};

namespace linear_detail {

/// Levi-Civita symbol eps_ijk for indices 0..2.
constexpr real levi_civita(int i, int j, int k) {
  if (i == j || j == k || i == k) return 0;
  return ((i == 0 && j == 1) || (i == 1 && j == 2) || (i == 2 && j == 0)) ? 1.0 : -1.0;
}

/// Jacobian of f: Vars -> Vars at x by the fourth-order central difference
/// (-f(x+2h) + 8 f(x+h) - 8 f(x-h) + f(x-2h)) / (12 h), steps h[j] > 0: exact up to rounding
/// for polynomials of degree <= 4, O(h^4) otherwise.
template <int n, class F>
std::vector<real> jacobian(const F& f, const Vec<n>& x, const Vec<n>& h) {
  std::vector<real> J(static_cast<std::size_t>(n * n));
  for (int j = 0; j < n; ++j) {
    Vec<n> x1 = x, x2 = x, x3 = x, x4 = x;
    x1[j] += h[j];
    x2[j] -= h[j];
    x3[j] += 2 * h[j];
    x4[j] -= 2 * h[j];
    const Vec<n> f1 = f(x1), f2 = f(x2), f3 = f(x3), f4 = f(x4);
    for (int i = 0; i < n; ++i)
      J[static_cast<std::size_t>(i * n + j)] = (8 * (f1[i] - f2[i]) - (f3[i] - f4[i])) / (12 * h[j]);
  }
  return J;
}

}  // namespace linear_detail

/// Linearize `form` about the background W0 with gradient dW0/dx along the tube (none
/// along y). Steps: 1e-3 of each variable's scale for W, with the fourth-order difference:
/// truncation ~1e-12 for the smooth terms (the entropy variable's rho^(1-gamma)), exact
/// for the at most bilinear rest, and rounding ~1e-16 |F| / (h |dF|): small steps would lose
/// digits where a flux holds a large constant part (the magnetic pressure, 1e3 to 1e6 times
/// the thermal one at low beta; 1e-6 steps shifted slow-wave speeds by 5e-8). Gradients:
/// steps scale/length (the gradient terms are linear in them). `length` is a typical
/// length of the problem (the cell size).
template <class Form>
LinearCoefficients linearize(const Form& form, const typename Form::Vars& W0, const typename Form::Vars& dW0dx,
                             real length) {
  using linear_detail::jacobian;
  constexpr int n = Form::n;
  using Vars = typename Form::Vars;
  const Vars sc = form.scales(W0);
  Vars h{}, hg{};
  for (int j = 0; j < n; ++j) {
    h[j] = 1e-3 * sc[j];
    hg[j] = sc[j] / length;
  }
  const Vars zero{};
  LinearCoefficients c;
  c.n = n;
  c.scale.assign(sc.begin(), sc.end());
  c.M0 = jacobian<n>([&](const Vars& w) { return form.conservative(w); }, W0, h);
  for (int d = 0; d < 2; ++d) c.G[d] = jacobian<n>([&](const Vars& w) { return form.flux(w, d); }, W0, h);
  // Gradient-dependent terms: in W at the background gradient, and in each gradient.
  auto terms = [&](auto&& fn, std::vector<real>(&T0)[2], std::vector<real>(&T)[2][2]) {
    for (int d = 0; d < 2; ++d) {
      T0[d] = jacobian<n>([&](const Vars& w) { return fn(w, dW0dx, zero, d); }, W0, h);
      T[d][0] = jacobian<n>([&](const Vars& g) { return fn(W0, g, zero, d); }, dW0dx, hg);
      T[d][1] = jacobian<n>([&](const Vars& g) { return fn(W0, dW0dx, g, d); }, zero, hg);
    }
  };
  if (form.has_gradient_terms())
    terms([&](const Vars& w, const Vars& gx, const Vars& gy, int d) { return form.gradient_flux(w, gx, gy, d); },
          c.K0, c.K);
  if (form.has_inertia())
    terms([&](const Vars& w, const Vars& gx, const Vars& gy, int d) { return form.inertia_flux(w, gx, gy, d); },
          c.N0, c.N);
  if (form.has_source()) c.S = jacobian<n>([&](const Vars& w) { return form.source(w); }, W0, h);
  if (form.has_gradient_source()) {
    c.Q0 = jacobian<n>([&](const Vars& w) { return form.gradient_source(w, dW0dx, zero); }, W0, h);
    c.Q[0] = jacobian<n>([&](const Vars& g) { return form.gradient_source(W0, g, zero); }, dW0dx, hg);
    c.Q[1] = jacobian<n>([&](const Vars& g) { return form.gradient_source(W0, dW0dx, g); }, zero, hg);
  }
  return c;
}

}  // namespace tw
