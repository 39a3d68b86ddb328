#pragma once
/// Measurements made over a whole run from samples taken along the way: the power an
/// antenna couples into the plasma, and the reflection and transmission of a region.
/// Model-independent: the run loop feeds them numbers.
#include <array>
#include <string>
#include <vector>

#include "core/types.hpp"
#include "diagnostics/energy.hpp"

namespace tw {

/// Time-averaged power of one drive from its cumulative work W(t) [J/m^2], recorded after
/// every step (the work is integrated with the Runge-Kutta stage weights).
class WorkRecord {
 public:
  void add(real t, real work) {
    t_.push_back(t);
    w_.push_back(work);
  }
  /// W at time t, linear between records (clamped to the recorded range).
  [[nodiscard]] real at(real t) const;
  [[nodiscard]] real last() const { return w_.empty() ? 0 : w_.back(); }
  /// Mean power over [t0, t1] [W/m^2]; 0 for an empty window.
  [[nodiscard]] real mean_power(real t0, real t1) const {
    return t1 > t0 ? (at(t1) - at(t0)) / (t1 - t0) : 0;
  }

 private:
  std::vector<real> t_, w_;
};

/// Reflection and transmission of a region, from the Elsasser parts at its two edges,
/// sampled at a fixed interval. Waves come from `from`: if to > from the incident wave is
/// the forward part at `from`, the reflected the backward part there and the transmitted
/// the forward part at `to` (mirrored if to < from).
class RegionMeter {
 public:
  RegionMeter(std::string name, real from, real to) : name_(std::move(name)), from_(from), to_(to) {}
  void sample(real t, const ElsasserSample& at_from, const ElsasserSample& at_to);

  struct Result {
    real incident_energy = 0, reflected_energy = 0, transmitted_energy = 0;  ///< [J/m^2]
    real reflection = 0;           ///< sqrt(reflected / incident energy): amplitude reflection
    real transmission = 0;         ///< transmitted / incident energy
    real velocity_reflection = 0;  ///< signed, from the best-matching delay (pulses and bursts)
    real delay = 0;                ///< that delay [s]
  };
  /// Energies by the trapezoidal rule over the samples; the signed velocity reflection
  /// coefficient is (reflected . incident delayed by tau) / (incident . incident), at the
  /// delay tau >= 0 where its magnitude is largest (meaningful when the reflected signal is
  /// a scaled copy of the incident one: pulses and bursts on a non-dispersive line).
  [[nodiscard]] Result result() const;

  [[nodiscard]] const std::string& name() const { return name_; }
  [[nodiscard]] real from() const { return from_; }
  [[nodiscard]] real to() const { return to_; }
  /// The latest sample, for the time series: incident, reflected, transmitted (y, z) and
  /// the three powers.
  [[nodiscard]] std::array<real, 9> latest() const;

 private:
  std::string name_;
  real from_, to_;
  std::vector<real> t_;
  std::vector<std::array<real, 2>> inc_, ref_, tra_;
  std::vector<real> p_inc_, p_ref_, p_tra_;
};

}  // namespace tw
