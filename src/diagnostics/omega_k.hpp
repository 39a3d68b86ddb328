#pragma once
/// The omega-k spectrum of a field from its snapshots, and its ridge.
///
///   S(k, omega) = sum_n sum_j w_t(n) w_x(j) (u(x_j, t_n) - <u(x_j)>_t) e^{-i k x_j} e^{+i omega t_n}
///
/// so a wave exp(i (k x - omega t)) peaks at (k, omega). The time mean of each cell is
/// removed (a background profile is not a wave). Windows: Hann in time; Hann in x unless
/// the tube is periodic (then a whole number of wavelengths falls exactly on a bin).
/// No zero padding: bins are the natural resolution 2 pi / (N dt) and 2 pi / (N dx); the
/// ridge is refined between bins by a parabola through the log power.
///
/// For a real field S(-k, -omega) = conj S(k, omega), so only omega >= 0 is kept: k > 0 is
/// then a wave moving toward +x, k < 0 toward -x. A complex field keeps both signs.
#include <string>
#include <vector>

#include "diagnostics/signal.hpp"

namespace tw::diag {

struct OmegaK {
  std::vector<real> k;      ///< [n_k] wavenumbers, increasing [rad/m]
  std::vector<real> omega;  ///< [n_omega] angular frequencies, increasing [rad/s]
  std::vector<real> power;  ///< [n_omega * n_k] (row = one omega), divided by its maximum
  real dk = 0, domega = 0;  ///< bin widths [rad/m], [rad/s]
  /// The ridge: for every k bin whose strongest omega is within 40 dB of the global peak,
  /// that omega (refined), its uncertainty (half a bin: the resolution of a windowed
  /// record) and its relative power.
  std::vector<real> ridge_k, ridge_omega, ridge_omega_sigma, ridge_power;
  real peak_k = 0, peak_omega = 0;  ///< the strongest bin (refined in omega and k)
  std::size_t x_stride = 1;  ///< cells skipped to keep the transform within memory
  std::string note;          ///< how the data were reduced, if they were
};

/// `snaps`: series = cells at positions `x` (uniform spacing), times uniform (the uniform
/// prefix is used). `periodic_x`: no window in x. Transforms larger than `max_points`
/// complex values are reduced by taking every m-th cell (noted in `note`).
[[nodiscard]] OmegaK omega_k_spectrum(const SeriesSet& snaps, const std::vector<real>& x,
                                      bool periodic_x, std::size_t max_points = std::size_t(1) << 23);

}  // namespace tw::diag
