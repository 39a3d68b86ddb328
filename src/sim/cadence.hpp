#pragma once
/// Output times at a fixed interval, shared by the run loop and its checkpoints.
#include <cmath>

#include "core/types.hpp"

namespace tw {

/// Output times k * interval, k = 0, 1, 2, ...
class Cadence {
 public:
  explicit Cadence(real interval) : interval_(interval) {}
  [[nodiscard]] real next_time() const { return static_cast<real>(next_) * interval_; }
  /// True if t has reached the next output time (to round-off); advances past t.
  bool due(real t) {
    if (t < next_time() * (1 - 1e-12)) return false;
    next_ = static_cast<long>(std::floor(t / interval_ * (1 + 1e-12))) + 1;
    return true;
  }
  /// Number of outputs in [0, t_end], the first at t = 0.
  [[nodiscard]] long count(real t_end) const {
    return static_cast<long>(std::floor(t_end / interval_ * (1 + 1e-12))) + 1;
  }
  /// Index k of the next output time (what a checkpoint saves; times are k * interval, so
  /// the index restores them exactly).
  [[nodiscard]] long next_index() const { return next_; }
  void set_next_index(long k) { next_ = k; }

 private:
  real interval_;
  long next_ = 0;
};

}  // namespace tw
