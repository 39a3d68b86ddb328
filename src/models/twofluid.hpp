#pragma once
/// Two-fluid plasma: an ion fluid and an electron fluid (five moments each) coupled to
/// Maxwell's equations with the displacement current, in one dimension along x with
/// constant B_x.
///
/// Equations (SI; s = i, e; q_s the charge of one particle, n_s = rho_s/m_s):
///
///   each fluid:   the Euler equations of models/fluid.hpp, plus the sources
///     d(rho_s u_s)/dt += q_s n_s (E + u_s x B) + R_s
///     d(E_s)/dt       += q_s n_s u_s . E + u_s . R_s + Q_s
///   Faraday:      dB_y/dt - dE_z/dx = 0,          dB_z/dt + dE_y/dx = 0
///   Ampère:       dE_x/dt = -J_x/eps0,
///                 dE_y/dt + d(c^2 B_z)/dx = -J_y/eps0,  dE_z/dt - d(c^2 B_y)/dx = -J_z/eps0
///   J = sum_s q_s n_s u_s;  Gauss's law dE_x/dx = (q_i n_i + q_e n_e)/eps0 holds initially
///   and is monitored, not enforced (diagnostics()).
///
/// Collisions (optional), as forces R_s and heating Q_s:
/// - electron-ion friction (Braginskii 1965, Rev. Plasma Phys. 1, 205; from memory):
///   R_e = -R_i = -rho_e nu_ei [alpha_0 (b.du) b + (du - (b.du) b)], du = u_e - u_i,
///   b = B/|B|; nu_ei = 1/tau_e from core/plasma_params.hpp (local n_e, T_e, NRL Coulomb
///   logarithm unless one is given) and alpha_0(Z) the parallel-resistivity factor; the frictional heat
///   -R_e.du goes to the electrons (Braginskii's Q_e; thermal equilibration Q_Delta is not
///   included). With a reduced mass ratio nu_ei is scaled by m_e(physical)/m_e(model), so
///   the resistivity m_e nu_ei/(n_e e^2) stays the physical one.
/// - ion-neutral friction with neutrals at rest: R_i = -rho_i nu_in u_i,
///   nu_in = n_n sigma_in sqrt(8 k T_i/(pi m_i)) (collision frequency n_g sigma v-bar, e.g.
///   Lieberman & Lichtenberg 2005, "Principles of Plasma Discharges", ch. 3; from memory);
///   the kinetic energy the ions lose heats the ions (the neutral gas is a fixed background).
///
/// Energy bookkeeping: the electron energy slot of U carries the electron fluid energy
/// plus the field energy eps0|E|^2/2 + (B_y^2 + B_z^2)/2mu0, and its flux carries the
/// Poynting flux (E x B)_x/mu0 in addition. The total energy of the system is then the sum
/// of two conserved variables, so it is conserved to round-off with periodic ends; field
/// energy removed by the upwind Maxwell flux (numerical dissipation) heats the electrons,
/// as numerical resistivity heats an MHD plasma. (B_x^2/2mu0 is constant and left out.)
///
/// Splitting: the hyperbolic part (two fluids + Maxwell) goes through the finite-volume
/// operator; the local coupling (Lorentz force, currents, friction) is applied by
/// stiff_source_step, a time-centred (implicit midpoint) update per cell of the nine
/// unknowns (ion current, electron current, E): a linear 9x9 system, because B and the
/// densities do not change in it, solved by block elimination with closed-form 3x3 inverses. The update is stable for any omega_pe dt and
/// Omega_ce dt and conserves fluid kinetic + electric energy exactly without friction.
///
/// Variables: U = (ion fluid U (5), electron fluid U (5, energy incl. fields), E_x, E_y,
/// E_z, B_y, B_z); W = (ion fluid W (5), electron fluid W (5), E_x, E_y, E_z, B_y, B_z).
/// Units: the run's unit system (SI, or normalized with mu0 = 1, eps0 = 1/c^2).
#include <algorithm>
#include <array>
#include <cmath>
#include <vector>

#include "grid/grid.hpp"
#include "models/fluid.hpp"
#include "models/model.hpp"

namespace tw {

struct TwoFluid {
  static constexpr int n_vars = 15;
  using State = Vec<n_vars>;
  /// Offsets of the ion and electron fluid blocks (each Fluid::n_vars long).
  static constexpr int ION = 0, ELECTRON = 5;
  /// Field indices (same in U and W).
  enum : int { EX = 10, EY = 11, EZ = 12, BY = 13, BZ = 14 };

  Fluid ion, electron;            ///< each carries its gamma and particle mass [kg]
  real ion_charge = 1.602176634e-19;        ///< q_i = Z e [C]
  real electron_charge = -1.602176634e-19;  ///< q_e = -e [C]
  real bx = 0;                    ///< constant B_x [T]
  real mu0 = 1.25663706212e-6;    ///< permeability [H/m]
  real c = 299792458.0;           ///< light speed in Maxwell's equations (may be reduced) [m/s]
  real eps0 = 1 / (1.25663706212e-6 * 299792458.0 * 299792458.0);  ///< 1/(mu0 c^2) [F/m]

  // Collisions (see the file comment).
  bool spitzer_friction = false;  ///< electron-ion friction with the Spitzer/Braginskii nu_ei
  int charge_number = 1;          ///< ion charge number Z (Coulomb logarithm, alpha_0)
  real coulomb_logarithm = 0;     ///< fixed ln Lambda for the friction; 0: the NRL formula per cell
  real energy_per_eV = 1.602176634e-19;  ///< J per eV (temperatures for the collision time)
  real friction_mass_factor = 1;  ///< m_e(physical) / m_e(model): keeps the resistivity physical
  real neutral_density = 0;       ///< n_n [m^-3] for ion-neutral friction (0: off)
  real ion_neutral_cross_section = 0;  ///< sigma_in [m^2]

  static const char* name() { return "two-fluid"; }

  // --- the two fluid blocks -------------------------------------------------------------
  [[nodiscard]] static Fluid::State block(const State& s, int offset) {
    Fluid::State b;
    for (int k = 0; k < Fluid::n_vars; ++k) b[k] = s[offset + k];
    return b;
  }
  static void set_block(State& s, int offset, const Fluid::State& b) {
    for (int k = 0; k < Fluid::n_vars; ++k) s[offset + k] = b[k];
  }

  /// Field energy density eps0|E|^2/2 + (B_y^2 + B_z^2)/2mu0 of a state (U or W) [J/m^3].
  [[nodiscard]] real field_energy(const State& s) const {
    return 0.5 * eps0 * (s[EX] * s[EX] + s[EY] * s[EY] + s[EZ] * s[EZ]) +
           (s[BY] * s[BY] + s[BZ] * s[BZ]) / (2 * mu0);
  }

  [[nodiscard]] State prim_from_cons(const State& U) const {
    State W = U;
    set_block(W, ION, ion.prim_from_cons(block(U, ION)));
    Fluid::State ue = block(U, ELECTRON);
    ue[Fluid::EN] -= field_energy(U);
    set_block(W, ELECTRON, electron.prim_from_cons(ue));
    return W;
  }

  [[nodiscard]] State cons_from_prim(const State& W) const {
    State U = W;
    set_block(U, ION, ion.cons_from_prim(block(W, ION)));
    Fluid::State ue = electron.cons_from_prim(block(W, ELECTRON));
    ue[Fluid::EN] += field_energy(W);
    set_block(U, ELECTRON, ue);
    return U;
  }

  /// Poynting flux (E x B)_x / mu0 [W/m^2] (B_x does not enter).
  [[nodiscard]] real poynting_flux(real ey, real ez, real by, real bz) const {
    return (ey * bz - ez * by) / mu0;
  }

  /// Physical flux. The Maxwell part is linear: F(E_x) = 0, F(E_y) = c^2 B_z,
  /// F(E_z) = -c^2 B_y, F(B_y) = -E_z, F(B_z) = E_y.
  [[nodiscard]] State flux(const State& W) const {
    State F;
    set_block(F, ION, ion.flux(block(W, ION)));
    Fluid::State fe = electron.flux(block(W, ELECTRON));
    fe[Fluid::EN] += poynting_flux(W[EY], W[EZ], W[BY], W[BZ]);
    set_block(F, ELECTRON, fe);
    const real c2 = c * c;
    F[EX] = 0;
    F[EY] = c2 * W[BZ];
    F[EZ] = -c2 * W[BY];
    F[BY] = -W[EZ];
    F[BZ] = W[EY];
    return F;
  }

  [[nodiscard]] SpeedRange signal_speeds(const State& W) const {
    const SpeedRange a = ion.signal_speeds(block(W, ION));
    const SpeedRange b = electron.signal_speeds(block(W, ELECTRON));
    return {std::min({a.min, b.min, -c}), std::max({a.max, b.max, c})};
  }

  [[nodiscard]] bool admissible(const State& W) const {
    real sum = 0;
    for (real q : W) sum += q;
    return std::isfinite(sum) && positive(W);
  }
  [[nodiscard]] bool positive(const State& W) const {
    return W[ION + Fluid::RHO] > 0 && W[ION + Fluid::P] > 0 && W[ELECTRON + Fluid::RHO] > 0 &&
           W[ELECTRON + Fluid::P] > 0;
  }

  /// Ghost state behind a perfectly conducting, line-tied end: both fluids' velocities
  /// change sign, the tangential electric field changes sign (E_y = E_z = 0 on the end),
  /// the normal E_x (surface charge) and the tangential B are mirrored evenly.
  [[nodiscard]] State wall_mirror(const State& W) const {
    State G = W;
    set_block(G, ION, ion.wall_mirror(block(W, ION)));
    set_block(G, ELECTRON, electron.wall_mirror(block(W, ELECTRON)));
    G[EY] = -W[EY];
    G[EZ] = -W[EZ];
    return G;
  }

  /// Charge density q_i n_i + q_e n_e of a state (U or W: densities are the same) [C/m^3].
  [[nodiscard]] real charge_density(const State& s) const {
    return ion_charge * s[ION + Fluid::RHO] / ion.particle_mass +
           electron_charge * s[ELECTRON + Fluid::RHO] / electron.particle_mass;
  }

  /// Electron-ion collision frequency nu_ei of a primitive state [1/s] (0 when off).
  [[nodiscard]] real electron_ion_collision_frequency(const State& W) const;
  /// Ion-neutral collision frequency nu_in of a primitive state [1/s] (0 when off).
  [[nodiscard]] real ion_neutral_collision_frequency(const State& W) const {
    if (neutral_density <= 0 || ion_neutral_cross_section <= 0) return 0;
    constexpr real pi = 3.14159265358979323846;
    const real t_i = W[ION + Fluid::P] * ion.particle_mass / W[ION + Fluid::RHO];  // k T_i [J]
    return neutral_density * ion_neutral_cross_section * std::sqrt(8 * t_i / (pi * ion.particle_mass));
  }

  /// The Strang-split local source: Lorentz force, currents and friction over dt in every
  /// interior cell, time-centred and implicit (see the file comment). Never throws; a
  /// non-physical result is caught by the stepper's next admissibility check.
  void stiff_source_step(const Grid& grid, Field<State>& U, real t, real dt) const;

  /// The source update of one cell (conservative state), for tests and the above.
  [[nodiscard]] State source_update(const State& U, real dt) const;

  // --- output ---------------------------------------------------------------------------
  static std::vector<VariableInfo> output_info() {
    return {{"ion_density", "m^-3", "ion number density"},
            {"ion_velocity_x", "m/s", "ion flow velocity along the tube"},
            {"ion_velocity_y", "m/s", "ion flow velocity, y"},
            {"ion_velocity_z", "m/s", "ion flow velocity, z"},
            {"ion_pressure", "Pa", "ion pressure"},
            {"electron_density", "m^-3", "electron number density"},
            {"electron_velocity_x", "m/s", "electron flow velocity along the tube"},
            {"electron_velocity_y", "m/s", "electron flow velocity, y"},
            {"electron_velocity_z", "m/s", "electron flow velocity, z"},
            {"electron_pressure", "Pa", "electron pressure"},
            {"electric_field_x", "V/m", "electric field along the tube"},
            {"electric_field_y", "V/m", "transverse electric field, y"},
            {"electric_field_z", "V/m", "transverse electric field, z"},
            {"magnetic_field_y", "T", "transverse magnetic field, y"},
            {"magnetic_field_z", "T", "transverse magnetic field, z"},
            {"mass_density", "kg m^-3", "mass density of ions and electrons"},
            {"charge_density", "C m^-3", "charge density q_i n_i + q_e n_e"}};
  }
  void to_output(const State& W, real* out) const {
    ion.to_output(block(W, ION), out);
    electron.to_output(block(W, ELECTRON), out + 5);
    for (int k = EX; k <= BZ; ++k) out[k] = W[k];
    out[15] = W[ION + Fluid::RHO] + W[ELECTRON + Fluid::RHO];
    out[16] = charge_density(W);
  }
  static std::vector<VariableInfo> conserved_info() {
    return {{"ion_mass", "kg m^-2", "ion mass per unit area"},
            {"ion_momentum_x", "kg m^-1 s^-1", "ion x momentum per unit area"},
            {"ion_momentum_y", "kg m^-1 s^-1", "ion y momentum per unit area"},
            {"ion_momentum_z", "kg m^-1 s^-1", "ion z momentum per unit area"},
            {"ion_energy", "J m^-2", "ion energy (kinetic + thermal) per unit area"},
            {"electron_mass", "kg m^-2", "electron mass per unit area"},
            {"electron_momentum_x", "kg m^-1 s^-1", "electron x momentum per unit area"},
            {"electron_momentum_y", "kg m^-1 s^-1", "electron y momentum per unit area"},
            {"electron_momentum_z", "kg m^-1 s^-1", "electron z momentum per unit area"},
            {"electron_and_field_energy", "J m^-2",
             "electron energy plus field energy (without B_x^2/2mu0) per unit area"},
            {"electric_field_x_integral", "V", "integral of E_x along the tube"},
            {"electric_field_y_integral", "V", "integral of E_y along the tube"},
            {"electric_field_z_integral", "V", "integral of E_z along the tube"},
            {"magnetic_flux_y", "T m", "integral of B_y along the tube"},
            {"magnetic_flux_z", "T m", "integral of B_z along the tube"}};
  }

  [[nodiscard]] EnergyParts energy_density(const State& W) const {
    EnergyParts e;
    for (const auto& [f, off] : {std::pair{&ion, ION}, std::pair{&electron, ELECTRON}}) {
      const Fluid::State w = block(W, off);
      e.kinetic += 0.5 * w[Fluid::RHO] * (w[Fluid::VX] * w[Fluid::VX] + w[Fluid::VY] * w[Fluid::VY] +
                                         w[Fluid::VZ] * w[Fluid::VZ]);
      e.thermal += w[Fluid::P] / (f->gamma - 1);
    }
    e.magnetic = (bx * bx + W[BY] * W[BY] + W[BZ] * W[BZ]) / (2 * mu0);
    e.electric = 0.5 * eps0 * (W[EX] * W[EX] + W[EY] * W[EY] + W[EZ] * W[EZ]);
    return e;
  }

  // --- drives, open ends and budgets (models/model.hpp) ----------------------------------
  /// Centre-of-mass transverse velocity [m/s].
  [[nodiscard]] std::array<real, 2> transverse_velocity(const State& W) const {
    const real ri = W[ION + Fluid::RHO], re = W[ELECTRON + Fluid::RHO];
    const real inv = 1 / (ri + re);
    return {(ri * W[ION + Fluid::VY] + re * W[ELECTRON + Fluid::VY]) * inv,
            (ri * W[ION + Fluid::VZ] + re * W[ELECTRON + Fluid::VZ]) * inv};
  }
  /// Move the plasma transversely as a whole: both species' velocities shift by the same
  /// d = v - v_cm (the current is kept) and the transverse E by -(d x B), so E + u x B of
  /// each species is unchanged (a transverse boost of the frozen-in plasma; what a moving
  /// conducting plate imposes, E = -v_plate x B).
  void set_transverse_velocity(State& W, real vy, real vz) const {
    const auto v = transverse_velocity(W);
    const real dy = vy - v[0], dz = vz - v[1];
    for (int off : {ION, ELECTRON}) {
      W[off + Fluid::VY] += dy;
      W[off + Fluid::VZ] += dz;
    }
    W[EY] -= dz * bx;
    W[EZ] += dy * bx;
  }
  [[nodiscard]] std::array<real, 2> transverse_field(const State& W) const { return {W[BY], W[BZ]}; }
  void set_transverse_field(State& W, real by, real bz) const {
    W[BY] = by;
    W[BZ] = bz;
  }
  /// Centre-of-mass velocity and B; the inertia of transverse motion along x includes the
  /// displacement current's eps0 B_x^2 (waves at v_A / sqrt(1 + v_A^2/c^2)).
  [[nodiscard]] AlfvenFields alfven_fields(const State& W) const {
    const auto v = transverse_velocity(W);
    return {v[0], v[1], W[BY], W[BZ], W[ION + Fluid::RHO] + W[ELECTRON + Fluid::RHO] + eps0 * bx * bx, bx, mu0};
  }
  /// The total energy is the sum of the two energy components (the electron one carries
  /// the field energy and the Poynting flux): exact budgets.
  [[nodiscard]] real energy_flux(const State& F, const State&) const {
    return F[ION + Fluid::EN] + F[ELECTRON + Fluid::EN];
  }
  [[nodiscard]] real energy_rate(const State&, const State& S) const {
    return S[ION + Fluid::EN] + S[ELECTRON + Fluid::EN];
  }
  /// An antenna current J_ext = (0, jy, jz) [A/m^2] enters Ampère's law,
  /// dE/dt += -J_ext/eps0; the field energy it changes, eps0 E.dE/dt = -E.J_ext (the
  /// antenna's power), is booked in the electron-and-field energy slot.
  [[nodiscard]] State external_current_source(const State& W, real jy, real jz) const {
    State S{};
    S[EY] = -jy / eps0;
    S[EZ] = -jz / eps0;
    S[ELECTRON + Fluid::EN] = -(W[EY] * jy + W[EZ] * jz);
    return S;
  }
  /// Typical sizes of the conservative variables (numerical Jacobians): each fluid's
  /// density, momentum and energy with its sound speed, and the fields from |B|.
  [[nodiscard]] State conserved_scale(const State& U) const {
    State s{};
    const State W = prim_from_cons(U);
    real b = std::sqrt(bx * bx + U[BY] * U[BY] + U[BZ] * U[BZ]);
    for (int off : {ION, ELECTRON}) {
      const Fluid& f = off == ION ? ion : electron;
      const Fluid::State w = block(W, off);
      const real rho = w[Fluid::RHO];
      const real a = std::max(f.sound_speed(w), std::abs(w[Fluid::VX]));
      s[off + Fluid::RHO] = rho;
      s[off + Fluid::MX] = s[off + Fluid::MY] = s[off + Fluid::MZ] = rho * a;
      s[off + Fluid::EN] = std::max(std::abs(U[off + Fluid::EN]), rho * a * a);
      b = std::max(b, std::sqrt(mu0 * w[Fluid::P]));
    }
    s[EX] = s[EY] = s[EZ] = c * b;
    s[BY] = s[BZ] = b;
    return s;
  }

  /// Whole-tube diagnostics written to /history (see diagnostic_info()).
  static std::vector<VariableInfo> diagnostic_info() {
    return {{"charge_total", "C m^-2", "net charge per unit area: integral of q_i n_i + q_e n_e"},
            {"energy_total", "J m^-2",
             "total energy per unit area: both fluids and the fields (without the constant B_x^2/2mu0)"},
            {"gauss_residual_max", "C m^-3",
             "largest |eps0 dE_x/dx - charge density| over the interior faces"},
            {"gauss_residual_relative", "1",
             "sum |eps0 dE_x/dx - charge density| / max(sum |eps0 dE_x/dx|, sum |charge density|, "
             "1e-12 sum |q_e n_e|) over interior faces"},
            {"gauss_residual_per_electron_charge", "1",
             "gauss_residual_max / max |q_e n_e|: unaccounted charge separation as a fraction of the electron "
             "charge density"}};
  }
  void diagnostics(const Grid& grid, const Field<State>& U, real* out) const;
};

static_assert(Model<TwoFluid>);
static_assert(HasEnergyDensity<TwoFluid>);
static_assert(HasDiagnostics<TwoFluid>);
static_assert(HasEnergyFlux<TwoFluid> && HasExternalCurrent<TwoFluid> && HasEnergyRate<TwoFluid>);
static_assert(HasTransverseVelocity<TwoFluid> && HasTransverseField<TwoFluid> && HasAlfvenFields<TwoFluid>);

}  // namespace tw
