#pragma once
/// Hall MHD in one dimension along x: ideal MHD (models/mhd.hpp, held as `ideal` with its
/// closure, viscosity and displacement current) with the generalized Ohm's law
///
///   E = -u x B + eta J + (J x B - grad p_e) / (e n_e)   [+ electron inertia, below]
///
/// with n_e = Z rho / m (m: mass per ion including its electrons). In 1D only E_y and E_z
/// act (dB_y/dt = dE_z/dx, dB_z/dt = -dE_y/dx) and J = (0, -dB_z/dx, dB_y/dx)/mu0, so with
/// b = B_y + i B_z the resistive and Hall parts are one complex diffusion:
///
///   db/dt = (ideal MHD) + d/dx ((eta_m - i h) db/dx),   eta_m = eta/mu0,  h = B_x/(mu0 e n_e),
///
/// (see field_gradient_flux in mhd.hpp). grad p_e points along x: it drives no field in 1D
/// and enters only through the total pressure. The Poynting flux of the Hall field is in
/// the energy flux; it moves magnetic energy and does no work (E_Hall . J = 0).
/// Linear parallel waves (derived here; Hall MHD, e.g. Huba 2003, Lect. Notes Phys. 615 —
/// from memory): w^2 -+ |h| k^2 w - k^2 v_A^2 = 0, the right-hand (whistler) and left-hand
/// (ion-cyclotron) branches, with |h| = v_A d_i.
///
/// Electron pressure p_e (a separate variable; W[PE]):
/// - isothermal: T_e fixed at the run file's value at x_min, p_e = rho c_e^2, c_e^2 = Z T_e/m.
///   With the adiabatic (ion) closure the conserved energy is
///     E = p_i/(gamma-1) + p_e ln(rho/rho_ref) + rho u^2/2 + B^2/2mu0 (+ electric),
///   whose second term is the free energy of isothermal electrons (its rate balances their
///   p_e du/dx work), so the energy flux stays (E + p + B^2/2mu0) u - ... and everything is
///   in conservation form; the sound speed is sqrt((gamma p_i + p_e)/rho). With the
///   isothermal closure both species are isothermal (the MHD closure, p = rho a^2).
/// - adiabatic (the ions' gamma): the conserved electron entropy S = rho_ref (p_e/p_ref)^(1/gamma)
///   obeys dS/dt + d(S u)/dx = 0 (electrons share the x velocity in 1D, J_x = 0); the ions
///   have p_i = p - p_e. Ohmic heat enters the total thermal energy and therefore the ion
///   share (the split of Ohmic heating between species is not modelled).
///
/// Electron inertia (optional): Ohm's law gains -(m_e/e) du_e/dt with u_e = u - J/(e n_e);
/// keeping its linear part, the evolved field is the generalized field
///   B' = B - d/dx (d_e^2 dB/dx),   d_e^2 = m_e/(mu0 n_e e^2),   dB'/dt = -dF_B(B, u)/dx,
/// with the same flux F_B as without inertia. U holds B' and E includes the electron
/// kinetic energy d_e^2 |dB/dx|^2/2mu0; B is recovered by a tridiagonal solve over the grid
/// at every stage (recover_primitives). Parallel waves then obey
///   (1 + k^2 d_e^2) w^2 -+ |h| k^2 w - k^2 v_A^2 = 0:
/// the whistler bends over toward the electron cyclotron frequency |h|/d_e^2 = omega_ce.
/// Neglected: the nonlinear electron advection (u_e . grad) u_e (it vanishes for parallel
/// circularly polarised waves) and the electron kinetic energy carried by u in the energy
/// flux; energy_density() omits the electron kinetic energy.
///
/// Stepping the Hall and resistive terms (`stepping`):
/// - explicit: in the Runge-Kutta stages, through gradient_flux; the step obeys the whistler
///   limit dt <= (dx^2 + 4 d_e^2)/(pi |h|) (= dx/v_ph of the grid whistler, v_ph -> pi v_A d_i/dx,
///   for d_e = 0; validation sheet sect. 11), which step_limits() reports as "whistler". The central Hall
///   flux is non-dissipative: it needs SSP-RK3, whose stability region holds part of the
///   imaginary axis (SSP-RK2's does not).
/// - subcycled and implicit: a split step (split_step, Strang splitting around the stages)
///   with the density frozen, where the field law above is linear in b. subcycled: SSP-RK3
///   sub-steps within the explicit limit; implicit: Crank-Nicolson with one 2x2
///   block-tridiagonal solve (core/block_tridiagonal.hpp), unconditionally stable, energy
///   conserving (without electron inertia the Hall part leaves every cell's thermal energy
///   exactly as it was, and the Ohmic heat is exactly eta J^2 >= 0). The step then follows
///   the MHD CFL limit.
///
/// Primitive W = (rho, u, v, w, B_y, B_z, p, p_e) (p: total thermal pressure); conservative
/// U = (rho, m_x, m_y, m_z, B'_y, B'_z, E, S) (the first seven as in Mhd).
#include <algorithm>
#include <array>
#include <cmath>
#include <vector>

#include "core/constants.hpp"
#include "models/mhd.hpp"
#include "models/model.hpp"

namespace tw {

enum class ElectronClosure { isothermal, adiabatic };
enum class HallStepping { explicit_stages, subcycled, implicit };

struct HallMhd {
  static constexpr int n_vars = 8;
  using State = Vec<n_vars>;
  enum : int { RHO = 0, MX = 1, MY = 2, MZ = 3, BY = 4, BZ = 5, EN = 6, SE = 7 };
  enum : int { VX = 1, VY = 2, VZ = 3, P = 6, PE = 7 };

  Mhd ideal;                          ///< the ideal part (closure, viscosity, displacement current)
  ElectronClosure electron_closure = ElectronClosure::isothermal;
  real electron_sound_speed2 = 0;     ///< Z k T_e / m of isothermal electrons [m^2/s^2]
  real reference_density = 1;         ///< rho_ref of the electron free energy and entropy [kg/m^3]
  real electron_reference_pressure = 1;  ///< p_ref of the electron entropy [Pa]
  real hall_rho = 0;                  ///< B_x m/(mu0 e Z): Hall coefficient h = hall_rho/rho [kg m^-1 s^-1]
  real inertia_rho = 0;               ///< m_e m/(mu0 e^2 Z): d_e^2 = inertia_rho/rho [kg/m]; 0 = no electron inertia
  real resistivity = 0;               ///< eta [Ohm m] (in `ideal` instead when stepping is explicit)
  HallStepping stepping = HallStepping::implicit;
  real split_cfl = 0.8;               ///< subcycled: sub-step as a fraction of the explicit limit

  static const char* name() { return "hall"; }

  [[nodiscard]] static Mhd::State head(const State& s) {
    Mhd::State h;
    for (int k = 0; k < Mhd::n_vars; ++k) h[k] = s[k];
    return h;
  }
  [[nodiscard]] bool isothermal_electrons_adiabatic_ions() const {
    return ideal.closure == Closure::adiabatic && electron_closure == ElectronClosure::isothermal;
  }
  /// Hall coefficient h = B_x/(mu0 e n_e) at mass density rho [m^2/s].
  [[nodiscard]] real hall_coefficient(real rho) const { return hall_rho / rho; }
  /// Squared electron inertial length d_e^2 at mass density rho [m^2] (0 without inertia).
  [[nodiscard]] real inertia_length2(real rho) const { return inertia_rho / rho; }

  /// Energy density beyond the one-gamma thermal energy p/(gamma-1): for isothermal
  /// electrons with adiabatic ions, p_e (ln(rho/rho_ref) - 1/(gamma-1)) [J/m^3].
  [[nodiscard]] real energy_offset(real rho, real pe) const {
    if (!isothermal_electrons_adiabatic_ions()) return 0;
    return pe * (std::log(rho / reference_density) - 1 / (ideal.gamma - 1));
  }
  /// The conserved electron entropy of adiabatic electrons for pressure pe.
  [[nodiscard]] real electron_entropy(real pe) const {
    return reference_density * std::pow(pe / electron_reference_pressure, 1 / ideal.gamma);
  }

  [[nodiscard]] State prim_from_cons(const State& U) const {
    const Mhd::State w = ideal.prim_from_cons(head(U));
    State W;
    for (int k = 0; k < Mhd::n_vars; ++k) W[k] = w[k];
    const real rho = U[RHO];
    if (electron_closure == ElectronClosure::isothermal) {
      W[PE] = rho * electron_sound_speed2;
      if (isothermal_electrons_adiabatic_ions()) W[P] -= (ideal.gamma - 1) * energy_offset(rho, W[PE]);
    } else {
      W[PE] = electron_reference_pressure * std::pow(U[SE] / reference_density, ideal.gamma);
    }
    return W;
  }

  [[nodiscard]] State cons_from_prim(const State& W) const {
    const Mhd::State u = ideal.cons_from_prim(head(W));
    State U;
    for (int k = 0; k < Mhd::n_vars; ++k) U[k] = u[k];
    U[EN] += energy_offset(W[RHO], W[PE]);
    U[SE] = electron_closure == ElectronClosure::adiabatic ? electron_entropy(W[PE]) : 0.0;
    return U;
  }

  [[nodiscard]] State flux(const State& W) const {
    const Mhd::State f = ideal.flux(head(W));
    State F;
    for (int k = 0; k < Mhd::n_vars; ++k) F[k] = f[k];
    F[EN] += W[VX] * energy_offset(W[RHO], W[PE]);
    F[SE] = electron_closure == ElectronClosure::adiabatic ? W[VX] * electron_entropy(W[PE]) : 0.0;
    return F;
  }

  /// Squared sound speed [m^2/s^2]: gamma p/rho, (gamma p_i + p_e)/rho with isothermal
  /// electrons, or the isothermal a^2.
  [[nodiscard]] real sound_speed2(const State& W) const {
    if (ideal.closure == Closure::isothermal) return ideal.sound_speed_iso * ideal.sound_speed_iso;
    if (electron_closure == ElectronClosure::isothermal)
      return std::max(ideal.gamma * (W[P] - W[PE]) + W[PE], real(0)) / W[RHO];
    return ideal.gamma * W[P] / W[RHO];
  }

  /// Fast speed +- flow: the Riemann solvers' signal speeds. The whistler is not in them;
  /// it is a step limit (explicit) or handled by the split step.
  [[nodiscard]] SpeedRange signal_speeds(const State& W) const {
    const real cf = ideal.fast_speed(head(W), sound_speed2(W));
    return {W[VX] - cf, W[VX] + cf};
  }

  [[nodiscard]] bool admissible(const State& W) const {
    return ideal.admissible(head(W)) && std::isfinite(W[PE]) && W[PE] >= 0;
  }
  [[nodiscard]] bool positive(const State& W) const { return ideal.positive(head(W)) && W[PE] >= 0; }

  [[nodiscard]] State wall_mirror(const State& W) const {
    const Mhd::State g = ideal.wall_mirror(head(W));
    State G = W;
    for (int k = 0; k < Mhd::n_vars; ++k) G[k] = g[k];
    return G;
  }

  /// The Hall term is in the stages only when stepping explicitly.
  [[nodiscard]] bool hall_in_stages() const { return stepping == HallStepping::explicit_stages && hall_rho != 0; }

  [[nodiscard]] bool gradient_terms_active() const { return ideal.gradient_terms_active() || hall_in_stages(); }

  [[nodiscard]] State gradient_flux(const State& Wl, const State& Wr, real dx) const {
    State F{};
    if (ideal.gradient_terms_active()) {
      const Mhd::State g = ideal.gradient_flux(head(Wl), head(Wr), dx);
      for (int k = 0; k < Mhd::n_vars; ++k) F[k] = g[k];
    }
    if (hall_in_stages()) {
      const real h = 0.5 * (hall_coefficient(Wl[RHO]) + hall_coefficient(Wr[RHO]));
      const FieldGradientFlux f = field_gradient_flux(0, h, ideal.mu0, Wl[BY], Wl[BZ], Wr[BY], Wr[BZ], dx);
      F[BY] += f.by;
      F[BZ] += f.bz;
      if (ideal.closure == Closure::adiabatic) F[EN] += f.energy;
    }
    return F;
  }

  /// Explicit whistler limit (dx^2 + 4 d_e^2)/(pi |h|) at one cell [s].
  [[nodiscard]] real whistler_limit(real dx, real rho) const {
    return (dx * dx + 4 * inertia_length2(rho)) / (constants::pi * std::abs(hall_coefficient(rho)));
  }

  void step_limits(real dx, const State& W, StepLimits& limits) const {
    ideal.step_limits(dx, head(W), limits);
    if (hall_in_stages()) limits.offer("whistler", whistler_limit(dx, W[RHO]));
  }

  /// Frequency [rad/s] of the parallel circularly polarised wave of wavenumber k [1/m] at
  /// mass density rho, on the right-hand (whistler) or left-hand (ion-cyclotron) branch:
  /// the positive root of (1 + k^2 d_e^2) w^2 -+ |h| k^2 w - k^2 v_A^2 = 0 (v_A along x, with
  /// the displacement current when kept).
  [[nodiscard]] real circular_frequency(real k, bool right, real rho) const {
    const real va = ideal.alfven_speed_x(rho);
    const real hk2 = std::abs(hall_coefficient(rho)) * k * k;
    const real g = 1 + k * k * inertia_length2(rho);
    const real root = std::sqrt(hk2 * hk2 + 4 * g * k * k * va * va);
    return (right ? root + hk2 : root - hk2) / (2 * g);
  }

  static std::vector<VariableInfo> output_info() {
    auto v = Mhd::output_info();
    v.push_back({"electron_pressure", "Pa", "electron pressure p_e (part of pressure)"});
    return v;
  }
  void to_output(const State& W, real* out) const {
    ideal.to_output(head(W), out);
    out[Mhd::n_vars + 1] = W[PE];
  }
  static std::vector<VariableInfo> conserved_info() {
    auto v = Mhd::conserved_info();
    v[4].description = "integral of B_y (of the generalized field B_y - d_e^2 d2B_y/dx2 with electron inertia: the same integral)";
    v[5].description = "integral of B_z (of the generalized field with electron inertia: the same integral)";
    v.push_back({"electron_entropy", "kg m^-2",
                 "integral of rho_ref (p_e/p_ref)^(1/gamma), conserved by adiabatic electrons (zero for isothermal electrons)"});
    return v;
  }

  [[nodiscard]] EnergyParts energy_density(const State& W) const {
    EnergyParts e = ideal.energy_density(head(W));
    e.thermal += energy_offset(W[RHO], W[PE]);
    return e;
  }

  [[nodiscard]] std::array<real, 2> transverse_velocity(const State& W) const { return {W[VY], W[VZ]}; }
  void set_transverse_velocity(State& W, real vy, real vz) const {
    W[VY] = vy;
    W[VZ] = vz;
  }

  // Members used by drives, open ends and budgets (models/model.hpp), mostly the ideal part's.
  [[nodiscard]] std::array<real, 2> transverse_field(const State& W) const { return {W[BY], W[BZ]}; }
  void set_transverse_field(State& W, real by, real bz) const {
    W[BY] = by;
    W[BZ] = bz;
  }
  [[nodiscard]] AlfvenFields alfven_fields(const State& W) const { return ideal.alfven_fields(head(W)); }
  /// The energy component of the face flux (which holds the Hall Poynting flux when the Hall
  /// term is in the stages); isothermal closure: as in Mhd. The split step's end fluxes are
  /// counted by the Stepper.
  [[nodiscard]] real energy_flux(const State& F, const State& W) const { return ideal.energy_flux(head(F), head(W)); }
  /// Heating by the stage terms (resistivity and viscosity when stepping explicitly). With a
  /// split Hall step its Ohmic heat stays in the thermal energy but is not reported here.
  [[nodiscard]] Dissipation dissipation(const State& Wl, const State& Wr, real dx) const {
    return ideal.dissipation(head(Wl), head(Wr), dx);
  }
  [[nodiscard]] real energy_rate(const State& U, const State& S) const { return ideal.energy_rate(head(U), head(S)); }
  [[nodiscard]] State conserved_scale(const State& U) const {
    const Mhd::State s = ideal.conserved_scale(head(U));
    State r;
    for (int k = 0; k < Mhd::n_vars; ++k) r[k] = s[k];
    r[SE] = std::max(std::abs(U[SE]), U[RHO]);
    return r;
  }
  /// An antenna current J_ext = (0, jy, jz) [A/m^2]: the force -J_ext x B and its work, as
  /// in MHD (see external_current_field_flux for the Hall field).
  [[nodiscard]] State external_current_source(const State& W, real jy, real jz) const {
    const Mhd::State s = ideal.external_current_source(head(W), jy, jz);
    State r{};
    for (int k = 0; k < Mhd::n_vars; ++k) r[k] = s[k];
    return r;
  }
  /// Ohm's law holds the plasma current J_p = curl(B)/mu0 - J_ext, but the Hall term of the
  /// model is built from curl(B)/mu0: the antenna adds back E_corr = -J_ext x B/(e n_e),
  /// i.e. (E_y, E_z) = mu0 h (-jz, jy). As fluxes of dB/dt + dG/dx = 0:
  /// G_By = -E_z = -mu0 h jy, G_Bz = E_y = -mu0 h jz, with h = B_x/(mu0 e n_e) at the face.
  /// This field does no work on the plasma (it is across J_p); the antenna counts its
  /// magnetic energy. (Electron inertia of the antenna current is not modelled.)
  [[nodiscard]] std::array<real, 2> external_current_field_flux(const State& Wl, const State& Wr, real jy,
                                                                 real jz) const {
    const real h = 0.5 * (hall_coefficient(Wl[RHO]) + hall_coefficient(Wr[RHO]));
    return {-ideal.mu0 * h * jy, -ideal.mu0 * h * jz};
  }

  // Whole-grid members (models/model.hpp; implemented in hall.cpp).
  [[nodiscard]] bool grid_coupled() const { return inertia_rho > 0; }
  void recover_primitives(const Grid& g, const Field<State>& U, Field<State>& W, const GhostFill<State>& fill,
                          real t) const;
  void complete_conservatives(const Grid& g, Field<State>& W, Field<State>& U, const GhostFill<State>& fill,
                              real t) const;
  [[nodiscard]] bool split_step_active() const {
    return stepping != HallStepping::explicit_stages && (hall_rho != 0 || resistivity > 0);
  }
  std::array<State, 2> split_step(const Grid& g, Field<State>& U, real t, real dt, const GhostFill<State>& fill) const;
  /// Number of sub-steps the subcycled split step takes for a step dt at the state U.
  [[nodiscard]] long substeps(const Grid& g, const Field<State>& U, real dt) const;
};

static_assert(Model<HallMhd>);
static_assert(HasGradientFlux<HallMhd>);
static_assert(HasStepLimits<HallMhd>);
static_assert(HasEnergyDensity<HallMhd>);
static_assert(HasGridRecovery<HallMhd>);
static_assert(HasSplitStep<HallMhd>);
static_assert(HasEnergyFlux<HallMhd> && HasDissipation<HallMhd> && HasExternalCurrent<HallMhd> && HasEnergyRate<HallMhd>);
static_assert(HasTransverseVelocity<HallMhd> && HasTransverseField<HallMhd> && HasAlfvenFields<HallMhd>);

}  // namespace tw
