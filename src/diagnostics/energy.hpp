#pragma once
/// Energy diagnostics of a state: the energy parts integrated along the tube, and the
/// forward/backward (Elsasser) decomposition of transverse Alfven waves.
///
/// Elsasser decomposition along x. With s = sign(B_x), rho the mass density and the
/// transverse perturbations dv = v_perp - v0_perp and db = B_perp - B0_perp (relative to
/// the background flow and field), a shear Alfven wave travelling toward +x has
/// dv = -s db / sqrt(mu0 rho) and one toward -x has dv = +s db / sqrt(mu0 rho) (ideal MHD;
/// e.g. Goedbloed & Poedts 2004, "Principles of Magnetohydrodynamics", ch. 5, from
/// memory). The forward and backward parts, in velocity units,
///
///     f = (dv - s db / sqrt(mu0 rho)) / 2,   g = (dv + s db / sqrt(mu0 rho)) / 2,
///
/// add up to dv, and each carries the energy flux +-rho v_A |f|^2 (|g|^2) along x, with
/// v_A = |B_x| / sqrt(mu0 rho) (kinetic and magnetic energy in equipartition). In Hall and
/// two-fluid models the same split is a diagnostic of direction, exact only at
/// wavelengths long compared with the inertial lengths.
#include <array>
#include <cmath>

#include "grid/grid.hpp"
#include "models/model.hpp"

namespace tw {

/// Forward and backward Alfven-wave parts at one point.
struct ElsasserSample {
  real fy = 0, fz = 0;  ///< forward (+x) part [m/s]
  real gy = 0, gz = 0;  ///< backward (-x) part [m/s]
  real rho = 0;         ///< mass density [kg/m^3]
  real v_a = 0;         ///< Alfven speed along x [m/s]
  /// Energy flux carried toward +x by the forward part and toward -x by the backward
  /// part [W/m^2].
  [[nodiscard]] real forward_power() const { return rho * v_a * (fy * fy + fz * fz); }
  [[nodiscard]] real backward_power() const { return rho * v_a * (gy * gy + gz * gz); }
  /// Linear interpolation between two samples.
  static ElsasserSample mix(const ElsasserSample& a, const ElsasserSample& b, real w) {
    auto l = [w](real p, real q) { return (1 - w) * p + w * q; };
    return {l(a.fy, b.fy), l(a.fz, b.fz), l(a.gy, b.gy), l(a.gz, b.gz), l(a.rho, b.rho), l(a.v_a, b.v_a)};
  }
};

/// The background the perturbations are measured from.
struct TransverseBackground {
  std::array<real, 2> v{};  ///< transverse flow [m/s]
  std::array<real, 2> b{};  ///< transverse field [T]
};

template <class M>
  requires HasAlfvenFields<M>
ElsasserSample elsasser(const M& m, const typename M::State& W, const TransverseBackground& bg) {
  const AlfvenFields a = m.alfven_fields(W);
  ElsasserSample e;
  e.rho = a.rho;
  if (a.bx == 0 || !(a.rho > 0)) return e;
  const real sq = std::sqrt(a.mu0 * a.rho);
  const real s = a.bx > 0 ? 1.0 : -1.0;
  const real dvy = a.vy - bg.v[0], dvz = a.vz - bg.v[1];
  const real dby = s * (a.by - bg.b[0]) / sq, dbz = s * (a.bz - bg.b[1]) / sq;
  e.fy = 0.5 * (dvy - dby);
  e.fz = 0.5 * (dvz - dbz);
  e.gy = 0.5 * (dvy + dby);
  e.gz = 0.5 * (dvz + dbz);
  e.v_a = std::abs(a.bx) / sq;
  return e;
}

/// Energy parts integrated along the tube [J/m^2] from the primitive field W, summed
/// serially in cell order (reproducible for any thread count).
template <class M>
  requires HasEnergyDensity<M>
EnergyParts integrate_energy(const M& m, const Field<typename M::State>& W, const Grid& g) {
  EnergyParts t;
  for (int i = 0; i < g.n_cells; ++i) {
    const EnergyParts e = m.energy_density(W[i]);
    t.kinetic += e.kinetic;
    t.thermal += e.thermal;
    t.magnetic += e.magnetic;
    t.electric += e.electric;
  }
  const real dx = g.dx();
  t.kinetic *= dx;
  t.thermal *= dx;
  t.magnetic *= dx;
  t.electric *= dx;
  return t;
}

}  // namespace tw
