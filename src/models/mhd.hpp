#pragma once
/// Ideal and resistive MHD in one dimension along x, with constant B_x.
///
/// Equations (SI; B in tesla; E the total energy density):
///
///   d(rho)/dt   + d(rho u)/dx                                   = 0
///   d(rho u)/dt + d(rho u^2 + p + B^2/2mu0 - Bx^2/mu0)/dx       = 0
///   d(rho v)/dt + d(rho u v - Bx By/mu0)/dx                     = 0
///   d(rho w)/dt + d(rho u w - Bx Bz/mu0)/dx                     = 0
///   d(By)/dt    + d(By u - Bx v)/dx                             = 0
///   d(Bz)/dt    + d(Bz u - Bx w)/dx                             = 0
///   d(E)/dt     + d((E + p + B^2/2mu0) u - Bx (u.B)/mu0)/dx    = 0
///
/// with (u, v, w) the velocity and E = p/(gamma-1) + rho|u|^2/2 + |B|^2/2mu0.
/// Closures: adiabatic (gamma law) or isothermal (p = rho a^2, energy not evolved; its
/// slot stays zero).
///
/// Dissipation, through fluxes built from gradients at faces:
/// - resistivity eta [Ohm m]: E_res = eta J adds -(eta/mu0) dB_perp/dx to the B fluxes and
///   the matching Poynting flux (E_res x B)_x / mu0 to the energy flux, so Ohmic heating
///   is included and total energy is conserved;
/// - kinematic viscosity nu [m^2/s] (Navier-Stokes, no bulk viscosity): momentum flux
///   -rho nu (4/3 du/dx, dv/dx, dw/dx) and the matching work term in the energy flux.
///
/// Displacement current (the Boris correction; Boris 1970, NRL Memo. Rep. 2167, and
/// Gombosi et al. 2002, J. Comput. Phys. 177, 176 — both from memory): with a light speed c
/// (physical, or reduced to lengthen the step) Ampère's law keeps eps dE/dt,
/// eps = 1/(mu0 c^2), and E = -u x B. Momentum and energy then include the field's:
///
///   m = rho u + eps E x B = rho u + eps (B^2 u - (u.B) B),   E_tot += eps |E|^2 / 2,
///
/// and the momentum flux gains the electric stress eps (|E|^2/2 I - E E) (x row). The
/// extra inertia eps B^2 acts on the velocity across B only, so shear Alfvén waves travel
/// at v_A / sqrt(1 + v_A^2/c^2) (the low-frequency perpendicular dielectric constant
/// eps0 (1 + c^2/v_A^2)). The velocity is recovered exactly from m by Sherman-Morrison:
/// u = (m + (eps/rho)(B.m) B) / (rho + eps B^2). The fast speed used for the Riemann
/// solvers is the root of the linearised system (derived here):
///   s^2 (1 + e b^2) - s (a^2 + b^2 + e a^2 b_x^2) + a^2 b_x^2 = 0,  e = 1/c^2,
/// b^2 = |B|^2/(mu0 rho), b_x^2 = B_x^2/(mu0 rho); it reduces to the perpendicular fast
/// speed (a^2 + b^2)/(1 + b^2/c^2) and to a^2 and b_x^2/(1 + b^2/c^2) along B.
///
/// Primitive variables W = (rho, u, v, w, By, Bz, p); conservative
/// U = (rho, m_x, m_y, m_z, By, Bz, E) with m = rho u (plus eps E x B with the
/// displacement current).
#include <cmath>
#include <limits>
#include <vector>

#include "models/model.hpp"

namespace tw {

enum class Closure { adiabatic, isothermal };

/// Face flux of the transverse-field law dB_perp/dt = d/dx (C dB_perp/dx) with
/// C = [[eta_m, h], [-h, eta_m]]: magnetic diffusion eta_m = eta/mu0 [m^2/s] (resistive
/// electric field eta J) and the Hall coefficient h = B_x/(mu0 e n_e) [m^2/s] (Hall
/// electric field J x B/(e n_e)); in complex form b = B_y + i B_z, F_b = -(eta_m - i h) db/dx.
/// Gradients by the two-point difference across the face, field values by the face
/// average. The energy flux is the matching Poynting flux (E x B)_x/mu0 = (B.F_B)/mu0, so
/// total energy is conserved and the Hall part does no work (its E is across J).
struct FieldGradientFlux {
  real by = 0, bz = 0;  ///< fluxes of B_y and B_z [T m/s]
  real energy = 0;      ///< Poynting flux [W/m^2]
};
inline FieldGradientFlux field_gradient_flux(real eta_m, real h, real mu0, real by_l, real bz_l, real by_r,
                                             real bz_r, real dx) {
  const real dby = (by_r - by_l) / dx, dbz = (bz_r - bz_l) / dx;
  const real by = 0.5 * (by_l + by_r), bz = 0.5 * (bz_l + bz_r);
  FieldGradientFlux f;
  f.by = -(eta_m * dby + h * dbz);
  f.bz = h * dby - eta_m * dbz;
  f.energy = (by * f.by + bz * f.bz) / mu0;
  return f;
}

struct Mhd {
  static constexpr int n_vars = 7;
  using State = Vec<n_vars>;
  /// Indices, shared by U and W where the meaning matches.
  enum : int { RHO = 0, MX = 1, MY = 2, MZ = 3, BY = 4, BZ = 5, EN = 6 };
  enum : int { VX = 1, VY = 2, VZ = 3, P = 6 };

  Closure closure = Closure::adiabatic;
  real gamma = 5.0 / 3.0;        ///< ratio of specific heats (adiabatic closure)
  real sound_speed_iso = 0;      ///< isothermal sound speed a [m/s] (isothermal closure)
  real bx = 0;                   ///< constant B_x [T]
  real mu0 = 1.25663706212e-6;   ///< permeability of the unit system
  real particle_mass = 1;        ///< mass per ion incl. its electrons [kg]: rho / n_i
  real resistivity = 0;          ///< eta [Ohm m]
  real viscosity = 0;            ///< kinematic viscosity nu [m^2/s]
  real eps_disp = 0;             ///< 1/(mu0 c^2) of the displacement current [F/m]; 0 = neglected

  /// Electric field E = -u x B of a primitive state [V/m].
  [[nodiscard]] std::array<real, 3> electric_field(const State& W) const {
    return {-(W[VY] * W[BZ] - W[VZ] * W[BY]), -(W[VZ] * bx - W[VX] * W[BZ]), -(W[VX] * W[BY] - W[VY] * bx)};
  }
  /// Electric energy density eps |E|^2/2 of the displacement current [J/m^3] (0 without it).
  [[nodiscard]] real electric_energy(const State& W) const {
    if (eps_disp <= 0) return 0;
    const auto e = electric_field(W);
    return 0.5 * eps_disp * (e[0] * e[0] + e[1] * e[1] + e[2] * e[2]);
  }
  /// Speed of circularly polarised Alfvén waves along B0 = B_x x [m/s]: B_x^2/(mu0 rho_eff)
  /// with rho_eff = rho + eps B_x^2 when the displacement current is kept (its inertia acts on
  /// u_perp, which is parallel to B_perp in these waves).
  [[nodiscard]] real alfven_speed_x(real rho) const {
    const real va2 = bx * bx / (mu0 * rho);
    return std::sqrt(va2 / (1 + eps_disp * mu0 * va2));
  }

  static const char* name() { return "mhd"; }

  [[nodiscard]] real magnetic_energy(real by, real bz) const {
    return (bx * bx + by * by + bz * bz) / (2 * mu0);
  }

  [[nodiscard]] State prim_from_cons(const State& U) const {
    State W;
    const real rho = U[RHO];
    const real inv = 1 / rho;
    W[RHO] = rho;
    W[VX] = U[MX] * inv;
    W[VY] = U[MY] * inv;
    W[VZ] = U[MZ] * inv;
    W[BY] = U[BY];
    W[BZ] = U[BZ];
    if (eps_disp > 0) {
      // (rho I + eps (B^2 I - B B)) u = m, inverted by Sherman-Morrison.
      const real by = U[BY], bz = U[BZ];
      const real b2 = bx * bx + by * by + bz * bz;
      const real bm = bx * U[MX] + by * U[MY] + bz * U[MZ];
      const real f = eps_disp * bm * inv;
      const real d = 1 / (rho + eps_disp * b2);
      W[VX] = (U[MX] + f * bx) * d;
      W[VY] = (U[MY] + f * by) * d;
      W[VZ] = (U[MZ] + f * bz) * d;
    }
    if (closure == Closure::adiabatic) {
      const real kin = eps_disp > 0 ? 0.5 * rho * (W[VX] * W[VX] + W[VY] * W[VY] + W[VZ] * W[VZ]) + electric_energy(W)
                                    : 0.5 * (U[MX] * W[VX] + U[MY] * W[VY] + U[MZ] * W[VZ]);
      W[P] = (gamma - 1) * (U[EN] - kin - magnetic_energy(U[BY], U[BZ]));
    } else {
      W[P] = rho * sound_speed_iso * sound_speed_iso;
    }
    return W;
  }

  [[nodiscard]] State cons_from_prim(const State& W) const {
    State U;
    const real rho = W[RHO];
    U[RHO] = rho;
    U[MX] = rho * W[VX];
    U[MY] = rho * W[VY];
    U[MZ] = rho * W[VZ];
    U[BY] = W[BY];
    U[BZ] = W[BZ];
    U[EN] = closure == Closure::adiabatic ? total_energy(W) : 0.0;
    if (eps_disp > 0) {
      const real b2 = bx * bx + W[BY] * W[BY] + W[BZ] * W[BZ];
      const real ub = W[VX] * bx + W[VY] * W[BY] + W[VZ] * W[BZ];
      U[MX] += eps_disp * (b2 * W[VX] - ub * bx);
      U[MY] += eps_disp * (b2 * W[VY] - ub * W[BY]);
      U[MZ] += eps_disp * (b2 * W[VZ] - ub * W[BZ]);
      if (closure == Closure::adiabatic) U[EN] += electric_energy(W);
    }
    return U;
  }

  /// Total energy density of a primitive state (adiabatic closure) without the electric
  /// energy of the displacement current [J/m^3].
  [[nodiscard]] real total_energy(const State& W) const {
    return W[P] / (gamma - 1) +
           0.5 * W[RHO] * (W[VX] * W[VX] + W[VY] * W[VY] + W[VZ] * W[VZ]) +
           magnetic_energy(W[BY], W[BZ]);
  }

  [[nodiscard]] State flux(const State& W) const {
    const real rho = W[RHO], u = W[VX], v = W[VY], w = W[VZ], by = W[BY], bz = W[BZ];
    const real inv_mu0 = 1 / mu0;
    const real pmag = magnetic_energy(by, bz);
    const real ptot = W[P] + pmag;
    State F;
    F[RHO] = rho * u;
    F[MX] = rho * u * u + ptot - bx * bx * inv_mu0;
    F[MY] = rho * u * v - bx * by * inv_mu0;
    F[MZ] = rho * u * w - bx * bz * inv_mu0;
    F[BY] = by * u - bx * v;
    F[BZ] = bz * u - bx * w;
    if (closure == Closure::adiabatic) {
      const real e = total_energy(W);
      F[EN] = (e + ptot) * u - bx * (u * bx + v * by + w * bz) * inv_mu0;
    } else {
      F[EN] = 0;
    }
    if (eps_disp > 0) {  // electric stress eps (|E|^2/2 I - E E), x row
      const auto e = electric_field(W);
      const real e2 = e[0] * e[0] + e[1] * e[1] + e[2] * e[2];
      F[MX] += eps_disp * (0.5 * e2 - e[0] * e[0]);
      F[MY] -= eps_disp * e[0] * e[1];
      F[MZ] -= eps_disp * e[0] * e[2];
    }
    return F;
  }

  /// Squared sound speed of a primitive state [m^2/s^2].
  [[nodiscard]] real sound_speed2(const State& W) const {
    return closure == Closure::adiabatic ? gamma * W[P] / W[RHO]
                                         : sound_speed_iso * sound_speed_iso;
  }

  /// Fast magnetosonic speed along x [m/s] (with the displacement current when kept).
  [[nodiscard]] real fast_speed(const State& W) const { return fast_speed(W, sound_speed2(W)); }

  /// Fast speed along x for a given squared sound speed a2 [m^2/s^2] (models whose
  /// pressure is not one gamma law pass their own).
  [[nodiscard]] real fast_speed(const State& W, real a2) const {
    const real inv = 1 / (mu0 * W[RHO]);
    const real b2 = (bx * bx + W[BY] * W[BY] + W[BZ] * W[BZ]) * inv;
    const real bx2 = bx * bx * inv;
    if (eps_disp > 0) {
      const real e = eps_disp * mu0;  // 1/c^2
      const real den = 1 + e * b2;
      const real s = a2 + b2 + e * a2 * bx2;
      return std::sqrt((s + std::sqrt(std::max(s * s - 4 * den * a2 * bx2, real(0)))) / (2 * den));
    }
    const real s = a2 + b2;
    return std::sqrt(0.5 * (s + std::sqrt(std::max(s * s - 4 * a2 * bx2, real(0)))));
  }

  [[nodiscard]] SpeedRange signal_speeds(const State& W) const {
    const real cf = fast_speed(W);
    return {W[VX] - cf, W[VX] + cf};
  }

  /// Finite everywhere, positive density and pressure. (A sum of finite numbers is
  /// finite unless it overflows, so one isfinite test covers all components.)
  [[nodiscard]] bool admissible(const State& W) const {
    real sum = 0;
    for (real q : W) sum += q;
    return std::isfinite(sum) && W[RHO] > 0 && W[P] > 0;
  }

  /// Positive density and pressure (false for NaN); used for reconstructed face values,
  /// which are finite whenever the cell averages are.
  [[nodiscard]] bool positive(const State& W) const { return W[RHO] > 0 && W[P] > 0; }

  /// Ghost state behind a perfectly conducting, line-tied end: the normal and transverse
  /// velocity change sign (no flow through the end, field lines tied), the transverse
  /// field is mirrored evenly (E_perp = 0 on the end).
  [[nodiscard]] State wall_mirror(const State& W) const {
    State G = W;
    G[VX] = -W[VX];
    G[VY] = -W[VY];
    G[VZ] = -W[VZ];
    return G;
  }

  /// True when gradient fluxes are non-zero (lets the operator skip them).
  [[nodiscard]] bool gradient_terms_active() const { return resistivity > 0 || viscosity > 0; }

  [[nodiscard]] State gradient_flux(const State& Wl, const State& Wr, real dx) const {
    State F{};
    if (resistivity > 0) {
      const FieldGradientFlux f =
          field_gradient_flux(resistivity / mu0, 0, mu0, Wl[BY], Wl[BZ], Wr[BY], Wr[BZ], dx);
      F[BY] = f.by;
      F[BZ] = f.bz;
      if (closure == Closure::adiabatic) F[EN] = f.energy;
    }
    if (viscosity > 0) {
      const real rho = 0.5 * (Wl[RHO] + Wr[RHO]);
      const real mu = rho * viscosity;
      const real du = (Wr[VX] - Wl[VX]) / dx, dv = (Wr[VY] - Wl[VY]) / dx,
                 dw = (Wr[VZ] - Wl[VZ]) / dx;
      const real u = 0.5 * (Wl[VX] + Wr[VX]), v = 0.5 * (Wl[VY] + Wr[VY]),
                 w = 0.5 * (Wl[VZ] + Wr[VZ]);
      F[MX] -= mu * (4.0 / 3.0) * du;
      F[MY] -= mu * dv;
      F[MZ] -= mu * dw;
      if (closure == Closure::adiabatic) F[EN] -= mu * ((4.0 / 3.0) * u * du + v * dv + w * dw);
    }
    return F;
  }

  void step_limits(real dx, const State& /*W*/, StepLimits& limits) const {
    if (resistivity > 0) limits.offer("resistive diffusion", dx * dx * mu0 / (2 * resistivity));
    if (viscosity > 0) limits.offer("viscous diffusion", dx * dx / (2 * (4.0 / 3.0) * viscosity));
  }

  static std::vector<VariableInfo> output_info() {
    return {{"density", "m^-3", "ion number density"},
            {"mass_density", "kg m^-3", "mass density (ions and electrons)"},
            {"velocity_x", "m/s", "flow velocity along the tube"},
            {"velocity_y", "m/s", "transverse flow velocity, y"},
            {"velocity_z", "m/s", "transverse flow velocity, z"},
            {"magnetic_field_y", "T", "transverse magnetic field, y"},
            {"magnetic_field_z", "T", "transverse magnetic field, z"},
            {"pressure", "Pa", "total thermal pressure (ions and electrons)"}};
  }
  void to_output(const State& W, real* out) const {
    out[0] = W[RHO] / particle_mass;
    for (int k = 0; k < n_vars; ++k) out[k + 1] = W[k];
  }

  [[nodiscard]] EnergyParts energy_density(const State& W) const {
    EnergyParts e;
    e.kinetic = 0.5 * W[RHO] * (W[VX] * W[VX] + W[VY] * W[VY] + W[VZ] * W[VZ]);
    e.thermal = closure == Closure::adiabatic ? W[P] / (gamma - 1) : 0.0;
    e.magnetic = magnetic_energy(W[BY], W[BZ]);
    e.electric = electric_energy(W);
    return e;
  }

  /// Integrated conserved quantities per unit cross-section (for totals and budgets),
  /// in the order of U.
  static std::vector<VariableInfo> conserved_info() {
    return {{"mass", "kg m^-2", "mass per unit area"},
            {"momentum_x", "kg m^-1 s^-1", "x momentum per unit area"},
            {"momentum_y", "kg m^-1 s^-1", "y momentum per unit area"},
            {"momentum_z", "kg m^-1 s^-1", "z momentum per unit area"},
            {"magnetic_flux_y", "T m", "integral of B_y along the tube"},
            {"magnetic_flux_z", "T m", "integral of B_z along the tube"},
            {"energy", "J m^-2", "total energy per unit area (zero: not evolved, for the isothermal closure)"}};
  }

  /// Transverse velocity of a primitive state, and setting it (used by drives).
  [[nodiscard]] std::array<real, 2> transverse_velocity(const State& W) const { return {W[VY], W[VZ]}; }
  void set_transverse_velocity(State& W, real vy, real vz) const {
    W[VY] = vy;
    W[VZ] = vz;
  }
  /// Transverse magnetic field of a primitive state, and setting it (used by drives).
  [[nodiscard]] std::array<real, 2> transverse_field(const State& W) const { return {W[BY], W[BZ]}; }
  void set_transverse_field(State& W, real by, real bz) const {
    W[BY] = by;
    W[BZ] = bz;
  }

  /// With the displacement current the transverse motion of a wave along x carries the
  /// extra inertia eps B_x^2 (see above), so the Elsasser split uses rho + eps B_x^2.
  [[nodiscard]] AlfvenFields alfven_fields(const State& W) const {
    return {W[VY], W[VZ], W[BY], W[BZ], W[RHO] + eps_disp * bx * bx, bx, mu0};
  }

  /// Energy flux through a face: the energy component of the numerical flux (adiabatic:
  /// exact budgets); for the isothermal closure, whose energy slot is not evolved, the
  /// Poynting flux (E x B)_x / mu0 = (F_By By + F_Bz Bz) / mu0 (F_B = -E x e_x, the
  /// induction fluxes) plus the flux of kinetic energy and the pressure work at the face
  /// state W.
  [[nodiscard]] real energy_flux(const State& F, const State& W) const {
    if (closure == Closure::adiabatic) return F[EN];
    const real u = W[VX];
    const real kin = 0.5 * W[RHO] * (W[VX] * W[VX] + W[VY] * W[VY] + W[VZ] * W[VZ]);
    return (F[BY] * W[BY] + F[BZ] * W[BZ]) / mu0 + u * (kin + W[P]);
  }

  /// Ohmic and viscous heating between two cells, from the same face gradients as
  /// gradient_flux (so the adiabatic energy budget moves exactly this much into heat).
  [[nodiscard]] Dissipation dissipation(const State& Wl, const State& Wr, real dx) const {
    Dissipation d;
    d.retained = closure == Closure::adiabatic;
    if (resistivity > 0) {
      const real dby = (Wr[BY] - Wl[BY]) / dx, dbz = (Wr[BZ] - Wl[BZ]) / dx;
      d.resistive = resistivity * (dby * dby + dbz * dbz) / (mu0 * mu0);
    }
    if (viscosity > 0) {
      const real mu = 0.5 * (Wl[RHO] + Wr[RHO]) * viscosity;
      const real du = (Wr[VX] - Wl[VX]) / dx, dv = (Wr[VY] - Wl[VY]) / dx, dw = (Wr[VZ] - Wl[VZ]) / dx;
      d.viscous = mu * ((4.0 / 3.0) * du * du + dv * dv + dw * dw);
    }
    return d;
  }

  /// An antenna current J_ext = (0, jy, jz) [A/m^2] carried by conductors in the cell.
  /// Ampere's law gives the plasma current J = curl(B)/mu0 - J_ext, so the plasma feels,
  /// besides the Maxwell stress already in the flux, the force -J_ext x B, and the total
  /// energy gains -E.J_ext = u.(-J_ext x B) with the ideal E = -u x B. (The resistive
  /// field of the antenna current itself is not modelled: antennas sit in ideal regions.)
  [[nodiscard]] State external_current_source(const State& W, real jy, real jz) const {
    State S{};
    const real fx = jz * W[BY] - jy * W[BZ], fy = -jz * bx, fz = jy * bx;
    S[MX] = fx;
    S[MY] = fy;
    S[MZ] = fz;
    if (closure == Closure::adiabatic) S[EN] = W[VX] * fx + W[VY] * fy + W[VZ] * fz;
    return S;
  }

  /// d(total energy density)/dt for a source S: its energy component (adiabatic), or the
  /// change of kinetic plus magnetic energy (isothermal).
  [[nodiscard]] real energy_rate(const State& U, const State& S) const {
    if (closure == Closure::adiabatic) return S[EN];
    if (eps_disp > 0) {
      // Kinetic + magnetic + electric energy of the state, differentiated along S (a
      // central difference; the map from U is rational, the step small).
      real h = std::numeric_limits<real>::infinity();
      for (int k = 0; k < n_vars; ++k)
        if (S[k] != 0 && U[k] != 0) h = std::min(h, std::abs(U[k] / S[k]));
      if (!std::isfinite(h)) return 0;
      h *= 1e-4;
      State up = U, um = U;
      for (int k = 0; k < n_vars; ++k) {
        up[k] += h * S[k];
        um[k] -= h * S[k];
      }
      return (energy_density(prim_from_cons(up)).total() - energy_density(prim_from_cons(um)).total()) / (2 * h);
    }
    const real inv = 1 / U[RHO];
    const real u = U[MX] * inv, v = U[MY] * inv, w = U[MZ] * inv;
    return u * S[MX] + v * S[MY] + w * S[MZ] - 0.5 * (u * u + v * v + w * w) * S[RHO] +
           (U[BY] * S[BY] + U[BZ] * S[BZ]) / mu0;
  }

  /// Typical sizes of the conservative variables (for numerical Jacobians).
  [[nodiscard]] State conserved_scale(const State& U) const {
    const State W = prim_from_cons(U);
    const real cf = fast_speed(W);
    const real rho = U[RHO];
    const real b = std::sqrt(mu0 * rho) * cf;
    return {rho, rho * cf, rho * cf, rho * cf, b, b, std::max(std::abs(U[EN]), rho * cf * cf)};
  }
};

static_assert(Model<Mhd>);
static_assert(HasGradientFlux<Mhd>);
static_assert(HasStepLimits<Mhd>);
static_assert(HasEnergyDensity<Mhd>);
static_assert(HasEnergyFlux<Mhd> && HasDissipation<Mhd> && HasExternalCurrent<Mhd> && HasEnergyRate<Mhd>);
static_assert(HasTransverseVelocity<Mhd> && HasTransverseField<Mhd> && HasAlfvenFields<Mhd>);

}  // namespace tw
