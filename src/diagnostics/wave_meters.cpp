#include "diagnostics/wave_meters.hpp"

#include <algorithm>
#include <cmath>

namespace tw {

real WorkRecord::at(real t) const {
  if (t_.empty()) return 0;
  if (t <= t_.front()) return w_.front();
  if (t >= t_.back()) return w_.back();
  const auto it = std::upper_bound(t_.begin(), t_.end(), t);
  const std::size_t j = static_cast<std::size_t>(it - t_.begin());
  const real a = (t - t_[j - 1]) / (t_[j] - t_[j - 1]);
  return (1 - a) * w_[j - 1] + a * w_[j];
}

void RegionMeter::sample(real t, const ElsasserSample& a, const ElsasserSample& b) {
  const bool fwd = to_ > from_;
  t_.push_back(t);
  if (fwd) {
    inc_.push_back({a.fy, a.fz});
    ref_.push_back({a.gy, a.gz});
    tra_.push_back({b.fy, b.fz});
    p_inc_.push_back(a.forward_power());
    p_ref_.push_back(a.backward_power());
    p_tra_.push_back(b.forward_power());
  } else {
    inc_.push_back({a.gy, a.gz});
    ref_.push_back({a.fy, a.fz});
    tra_.push_back({b.gy, b.gz});
    p_inc_.push_back(a.backward_power());
    p_ref_.push_back(a.forward_power());
    p_tra_.push_back(b.backward_power());
  }
}

std::array<real, 9> RegionMeter::latest() const {
  if (t_.empty()) return {};
  return {inc_.back()[0], inc_.back()[1], ref_.back()[0], ref_.back()[1], tra_.back()[0],
          tra_.back()[1], p_inc_.back(), p_ref_.back(), p_tra_.back()};
}

RegionMeter::Result RegionMeter::result() const {
  Result r;
  const std::size_t n = t_.size();
  for (std::size_t k = 1; k < n; ++k) {
    const real h = 0.5 * (t_[k] - t_[k - 1]);
    r.incident_energy += h * (p_inc_[k] + p_inc_[k - 1]);
    r.reflected_energy += h * (p_ref_[k] + p_ref_[k - 1]);
    r.transmitted_energy += h * (p_tra_[k] + p_tra_[k - 1]);
  }
  if (r.incident_energy > 0) {
    r.reflection = std::sqrt(r.reflected_energy / r.incident_energy);
    r.transmission = r.transmitted_energy / r.incident_energy;
  }
  // Signed coefficient: correlate on the sample index (samples are evenly spaced); long
  // records are thinned to at most 8192 samples so the search stays cheap.
  const std::size_t stride = std::max<std::size_t>(1, (n + 8191) / 8192);
  real norm = 0;
  for (std::size_t k = 0; k < n; k += stride) norm += inc_[k][0] * inc_[k][0] + inc_[k][1] * inc_[k][1];
  if (norm > 0 && n > 1) {
    real best = 0;
    std::size_t best_lag = 0;
    for (std::size_t lag = 0; lag < n; lag += stride) {
      real c = 0;
      for (std::size_t k = lag; k < n; k += stride)
        c += ref_[k][0] * inc_[k - lag][0] + ref_[k][1] * inc_[k - lag][1];
      if (std::abs(c) > std::abs(best)) {
        best = c;
        best_lag = lag;
      }
    }
    r.velocity_reflection = best / norm;
    r.delay = t_[best_lag] - t_[0];
  }
  return r;
}

}  // namespace tw
