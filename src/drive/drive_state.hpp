#pragma once
/// Drives and boundaries with an internal state that is not a function of time alone.
///
/// The drives built in so far are pure functions of the simulated time (the driven plate's
/// phase is 2 pi f t), so a checkpoint that restores t bit for bit restores them too. A drive
/// that carries state from step to step (an integrated phase of a chirped drive, the currents
/// of an antenna circuit) also derives from DriveState: checkpoints save `drive_state()` and a
/// continued run hands it back through `restore_drive_state()` before the first step. The run
/// loop finds such objects among the two boundaries and the operator's source terms with
/// dynamic_cast, so nothing else needs to know.
///
/// Contract: `restore_drive_state(drive_state())` must leave the object exactly as it was
/// (bitwise), so that a continued run equals an uninterrupted one. Boundaries and sources are
/// held as const objects (fill() and add() are const), so the state lives in mutable members
/// and restoring is a const operation; it happens before the time loop starts, on one thread.
#include <span>
#include <vector>

#include "core/types.hpp"

namespace tw {

class DriveState {
 public:
  virtual ~DriveState() = default;
  /// The state as a flat list of reals (units are the drive's business).
  [[nodiscard]] virtual std::vector<real> drive_state() const = 0;
  /// Put back a state saved by drive_state(); a wrong size is an InputError (the checkpoint
  /// does not belong to this drive).
  virtual void restore_drive_state(std::span<const real> state) const = 0;
};

}  // namespace tw
