#pragma once
/// Driven ends: an end of the tube that launches waves by prescribing a transverse
/// quantity with a DriveSignal (drive/waveform.hpp: any waveform and polarization).
///
/// - Velocity (a moving plate): a conducting end plate moved transversely. Ghost cells
///   mirror the interior as a line-tied conducting end does (the model's wall_mirror),
///   then set the transverse velocity so that the face average equals the plate velocity:
///   v_ghost = 2 v_plate - v_mirror. The plate drags the tied field lines and launches a
///   shear Alfven wave with v_perp = v_plate. A wave coming back reflects as from a
///   conducting end (v_perp reversed).
/// - Field: the transverse magnetic field at the end is prescribed (added to the background's) (a current sheet in
///   the end plate carrying K = b x e_x / mu0), the transverse velocity is free. Ghost
///   cells copy the interior with the normal velocity reversed (no flow through the end)
///   and set b_ghost = 2 b_end - b_interior; the face state of a linear Alfven wave then
///   has exactly b = b_end, and a wave coming back reflects with b reversed (v kept).
#include <string>

#include "drive/boundary.hpp"
#include "drive/waveform.hpp"

namespace tw {

template <class M>
  requires HasTransverseVelocity<M>
class DrivenPlateBoundary final : public Boundary<M> {
 public:
  using State = typename M::State;
  explicit DrivenPlateBoundary(DriveSignal drive) : drive_(std::move(drive)) {}

  void fill(const M& m, const Grid& g, Side side, real t, Field<State>& W) const override {
    const auto v = drive_.at(t);
    for (int k = 1; k <= Grid::n_ghost; ++k) {
      const State& inner = W[mirror_index(g, side, k)];
      State ghost = m.wall_mirror(inner);
      const auto vi = m.transverse_velocity(inner);
      m.set_transverse_velocity(ghost, 2 * v[0] - vi[0], 2 * v[1] - vi[1]);
      W[ghost_index(g, side, k)] = ghost;
    }
  }
  [[nodiscard]] std::string describe() const override { return "driven plate (velocity)"; }
  [[nodiscard]] const DriveSignal& drive() const { return drive_; }

 private:
  DriveSignal drive_;
};

template <class M>
  requires HasTransverseVelocity<M> && HasTransverseField<M>
class DrivenFieldBoundary final : public Boundary<M> {
 public:
  using State = typename M::State;
  /// `b0`: the background transverse field at the end, which the drive adds to.
  DrivenFieldBoundary(DriveSignal drive, std::array<real, 2> b0) : drive_(std::move(drive)), b0_(b0) {}

  void fill(const M& m, const Grid& g, Side side, real t, Field<State>& W) const override {
    auto b = drive_.at(t);
    b[0] += b0_[0];
    b[1] += b0_[1];
    for (int k = 1; k <= Grid::n_ghost; ++k) {
      const State& inner = W[mirror_index(g, side, k)];
      // wall_mirror reverses the normal flow; the transverse flow is then restored (free).
      State ghost = m.wall_mirror(inner);
      const auto vi = m.transverse_velocity(inner);
      m.set_transverse_velocity(ghost, vi[0], vi[1]);
      const auto bi = m.transverse_field(inner);
      m.set_transverse_field(ghost, 2 * b[0] - bi[0], 2 * b[1] - bi[1]);
      W[ghost_index(g, side, k)] = ghost;
    }
  }
  [[nodiscard]] std::string describe() const override { return "driven end (field)"; }
  [[nodiscard]] const DriveSignal& drive() const { return drive_; }

 private:
  DriveSignal drive_;
  std::array<real, 2> b0_;
};

}  // namespace tw
