#pragma once
/// One species as an ideal gas (the Euler equations in one dimension along x): the
/// building block of the multi-fluid models. The two-fluid model holds two of these (ions
/// and electrons) and adds the electromagnetic coupling; the fluid itself knows nothing
/// about charge or fields.
///
/// Equations (SI; rho the mass density of the species, E its total energy density):
///
///   d(rho)/dt   + d(rho u)/dx           = 0
///   d(rho u)/dt + d(rho u^2 + p)/dx     = 0
///   d(rho v)/dt + d(rho u v)/dx         = 0
///   d(rho w)/dt + d(rho u w)/dx         = 0
///   d(E)/dt     + d((E + p) u)/dx       = 0
///
/// with (u, v, w) the velocity and E = p/(gamma-1) + rho|u|^2/2 (gamma-law closure).
/// Primitive variables W = (rho, u, v, w, p); conservative U = (rho, rho u, rho v, rho w, E).
/// Signal speeds u -+ a, a = sqrt(gamma p / rho).
#include <cmath>
#include <vector>

#include "models/model.hpp"

namespace tw {

struct Fluid {
  static constexpr int n_vars = 5;
  using State = Vec<n_vars>;
  enum : int { RHO = 0, MX = 1, MY = 2, MZ = 3, EN = 4 };
  enum : int { VX = 1, VY = 2, VZ = 3, P = 4 };

  real gamma = 5.0 / 3.0;   ///< ratio of specific heats
  real particle_mass = 1;   ///< mass of one particle [kg] (number density = rho / this)

  static const char* name() { return "fluid"; }

  /// Bulk kinetic energy density rho |u|^2 / 2 of a conservative state [J/m^3].
  [[nodiscard]] static real kinetic_energy_cons(const State& U) {
    return 0.5 * (U[MX] * U[MX] + U[MY] * U[MY] + U[MZ] * U[MZ]) / U[RHO];
  }

  [[nodiscard]] State prim_from_cons(const State& U) const {
    const real inv = 1 / U[RHO];
    State W;
    W[RHO] = U[RHO];
    W[VX] = U[MX] * inv;
    W[VY] = U[MY] * inv;
    W[VZ] = U[MZ] * inv;
    W[P] = (gamma - 1) * (U[EN] - 0.5 * (U[MX] * W[VX] + U[MY] * W[VY] + U[MZ] * W[VZ]));
    return W;
  }

  [[nodiscard]] State cons_from_prim(const State& W) const {
    const real rho = W[RHO];
    State U;
    U[RHO] = rho;
    U[MX] = rho * W[VX];
    U[MY] = rho * W[VY];
    U[MZ] = rho * W[VZ];
    U[EN] = W[P] / (gamma - 1) + 0.5 * rho * (W[VX] * W[VX] + W[VY] * W[VY] + W[VZ] * W[VZ]);
    return U;
  }

  [[nodiscard]] State flux(const State& W) const {
    const real rho = W[RHO], u = W[VX];
    const real e = W[P] / (gamma - 1) + 0.5 * rho * (u * u + W[VY] * W[VY] + W[VZ] * W[VZ]);
    State F;
    F[RHO] = rho * u;
    F[MX] = rho * u * u + W[P];
    F[MY] = rho * u * W[VY];
    F[MZ] = rho * u * W[VZ];
    F[EN] = (e + W[P]) * u;
    return F;
  }

  /// Adiabatic sound speed [m/s].
  [[nodiscard]] real sound_speed(const State& W) const { return std::sqrt(gamma * W[P] / W[RHO]); }

  [[nodiscard]] SpeedRange signal_speeds(const State& W) const {
    const real a = sound_speed(W);
    return {W[VX] - a, W[VX] + a};
  }

  [[nodiscard]] bool admissible(const State& W) const {
    real sum = 0;
    for (real q : W) sum += q;
    return std::isfinite(sum) && W[RHO] > 0 && W[P] > 0;
  }
  [[nodiscard]] bool positive(const State& W) const { return W[RHO] > 0 && W[P] > 0; }

  /// Ghost state behind a wall: all velocity components change sign (no flow through it,
  /// no slip along it).
  [[nodiscard]] State wall_mirror(const State& W) const {
    State G = W;
    G[VX] = -W[VX];
    G[VY] = -W[VY];
    G[VZ] = -W[VZ];
    return G;
  }

  static std::vector<VariableInfo> output_info() {
    return {{"density", "m^-3", "number density"},
            {"velocity_x", "m/s", "flow velocity along the tube"},
            {"velocity_y", "m/s", "transverse flow velocity, y"},
            {"velocity_z", "m/s", "transverse flow velocity, z"},
            {"pressure", "Pa", "pressure"}};
  }
  void to_output(const State& W, real* out) const {
    out[0] = W[RHO] / particle_mass;
    for (int k = 1; k < n_vars; ++k) out[k] = W[k];
  }
  static std::vector<VariableInfo> conserved_info() {
    return {{"mass", "kg m^-2", "mass per unit area"},
            {"momentum_x", "kg m^-1 s^-1", "x momentum per unit area"},
            {"momentum_y", "kg m^-1 s^-1", "y momentum per unit area"},
            {"momentum_z", "kg m^-1 s^-1", "z momentum per unit area"},
            {"energy", "J m^-2", "total energy per unit area"}};
  }
};

static_assert(Model<Fluid>);

}  // namespace tw
