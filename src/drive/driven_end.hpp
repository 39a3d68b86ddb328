#pragma once
/// A driven end: a conducting end plate moved transversely at a prescribed velocity,
///
///   linear:   v_perp(t) = A r(t) sin(w t) e        (e = y or z)
///   circular: v_perp(t) = A r(t) (sin(w t), -s cos(w t))   (s = +1 right, -1 left)
///
/// with w = 2 pi f. "right" turns from +y toward +z (right-handed about +x), "left" the
/// other way. The turn-on
/// r(t) = sin^2(pi t / (2 T_ramp)) for t < T_ramp, then 1, avoids the broadband transient
/// of a sudden start.
///
/// Ghost cells mirror the interior as a line-tied conducting end does (the model's
/// wall_mirror), then set the transverse velocity so that the face average equals the
/// plate velocity: v_ghost = 2 v_plate - v_mirror. The plate drags the tied field lines
/// and launches a shear Alfvén wave with v_perp = v_plate.
#include <cmath>
#include <string>

#include "core/constants.hpp"
#include "drive/boundary.hpp"

namespace tw {

/// Models a driven end can move (they expose their transverse velocity).
template <class M>
concept HasTransverseVelocity = requires(const M m, typename M::State& W, real v) {
  { m.transverse_velocity(W) };
  { m.set_transverse_velocity(W, v, v) };
};

struct PlateMotion {
  real amplitude = 0;      ///< [m/s]
  real frequency = 0;      ///< [Hz]
  real ramp_time = 0;      ///< [s]
  real e_y = 1, e_z = 0;   ///< linear polarization direction (unit vector)
  int circular = 0;        ///< 0 linear, +1 right-handed about +x, -1 left-handed

  [[nodiscard]] real ramp(real t) const {
    if (ramp_time <= 0 || t >= ramp_time) return 1;
    if (t <= 0) return 0;
    const real s = std::sin(0.5 * constants::pi * t / ramp_time);
    return s * s;
  }
  /// Plate velocity (v_y, v_z) at time t.
  [[nodiscard]] std::array<real, 2> velocity(real t) const {
    const real ph = 2 * constants::pi * frequency * t;
    const real a = amplitude * ramp(t);
    // Circular: the direction angle from +y toward +z is +-(w t - pi/2).
    if (circular != 0) return {a * std::sin(ph), -circular * a * std::cos(ph)};
    return {a * e_y * std::sin(ph), a * e_z * std::sin(ph)};
  }
};

template <class M>
  requires HasTransverseVelocity<M>
class DrivenPlateBoundary final : public Boundary<M> {
 public:
  using State = typename M::State;
  explicit DrivenPlateBoundary(PlateMotion motion) : motion_(motion) {}

  void fill(const M& m, const Grid& g, Side side, real t, Field<State>& W) const override {
    const auto v = motion_.velocity(t);
    for (int k = 1; k <= Grid::n_ghost; ++k) {
      const State& inner = W[mirror_index(g, side, k)];
      State ghost = m.wall_mirror(inner);
      const auto vi = m.transverse_velocity(inner);
      m.set_transverse_velocity(ghost, 2 * v[0] - vi[0], 2 * v[1] - vi[1]);
      W[ghost_index(g, side, k)] = ghost;
    }
  }
  [[nodiscard]] std::string describe() const override { return "driven plate"; }
  [[nodiscard]] const PlateMotion& motion() const { return motion_; }

 private:
  PlateMotion motion_;
};

}  // namespace tw
