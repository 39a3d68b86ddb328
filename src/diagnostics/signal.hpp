#pragma once
/// Signal analysis behind `tubewave measure`: straight-line fits, phase unwrapping, the
/// spectral peak of a set of time series, a least-squares fit of one damped tone shared by
/// several series, demodulation at a known frequency, and the envelope of a tone.
///
/// Conventions. Every series is complex (a real field has zero imaginary parts and
/// `real_valued` set). A wave of angular frequency omega is the component
/// exp(-i omega t): a real signal a cos(omega t - phi) = Re(a e^{i phi} e^{-i omega t}) has
/// that component with coefficient (a/2) e^{i phi}, and its mirror exp(+i omega t) with
/// the conjugate. "Damping rate" gamma is the amplitude e-folding rate: |u| ~ e^{-gamma t}
/// (negative for growth).
///
/// Uncertainties are one-standard-deviation statistical errors: the fit's parameter
/// covariance scaled by the residual variance (so they grow with noise and with misfit,
/// and vanish for exact data). They do not include systematic errors (numerical
/// dispersion of a run, a badly chosen window).
#include <complex>
#include <cstddef>
#include <span>
#include <string>
#include <vector>

#include "core/types.hpp"

namespace tw::diag {

using cplx = std::complex<real>;

/// Several time series sampled at common times: values[i * n_series + s] is series s at
/// time t[i] (the row-major [time, series] layout of /snapshots and /probes).
struct SeriesSet {
  std::vector<real> t;       ///< sample times [s], increasing
  std::vector<cplx> values;  ///< [t.size() * n_series]
  std::size_t n_series = 0;
  bool real_valued = true;   ///< all imaginary parts are zero
  [[nodiscard]] cplx at(std::size_t i, std::size_t s) const { return values[i * n_series + s]; }
  [[nodiscard]] std::size_t n_times() const { return t.size(); }
};

/// Weighted least-squares straight line y = intercept + slope x.
struct LineFit {
  real intercept = 0, slope = 0;
  real intercept_sigma = 0, slope_sigma = 0;  ///< from the weighted residual variance
  real rms = 0;                               ///< weighted rms residual
  std::size_t n = 0;
};

/// Fit a line through (x, y) with weights w (empty: all 1). Needs >= 2 points with distinct
/// x (InternalError otherwise); with exactly 2 the sigmas are 0 (no residual to judge by).
[[nodiscard]] LineFit fit_line(std::span<const real> x, std::span<const real> y,
                               std::span<const real> w = {});

/// Remove 2 pi jumps between neighbours (each step brought into (-pi, pi]).
void unwrap(std::vector<real>& phase);

/// Number of leading samples of `t` on a uniform grid (spacing within 1e-6 relative of the
/// first step): the part an FFT may use. At least min(2, t.size()).
[[nodiscard]] std::size_t uniform_prefix(std::span<const real> t);

/// The angular frequency [rad/s] of the strongest spectral line of a set of series: the
/// peak of the summed Hann-windowed power (mean removed, zero-padded 8x, parabolic
/// refinement), over the uniform prefix of the samples. Signed in the exp(-i omega t)
/// convention; > 0 for real series. Bins within 1.5 Fourier bins of zero frequency are
/// skipped (what is left of a trend). Returns 0 when the series are constant.
[[nodiscard]] real spectral_peak(const SeriesSet& s);

/// One damped tone shared by every series:
///   u_s(t) = A_s e^{(-gamma - i omega)(t - t_c)} + B_s e^{(-gamma + i omega)(t - t_c)} + C_s,
/// t_c the middle of the record, complex A_s, B_s, C_s per series (for real series the fit
/// returns B_s = conj(A_s), C_s real). Fitted by variable projection: the linear
/// coefficients are solved exactly for each (omega, gamma), which are found by a damped
/// Newton iteration on the residual from `omega_start`. The sign of omega is then chosen so
/// that the exp(-i omega t) part dominates (omega > 0 for real series).
struct ToneFit {
  bool ok = false;
  std::string message;        ///< why not, when !ok
  real omega = 0, omega_sigma = 0;  ///< [rad/s]
  real gamma = 0, gamma_sigma = 0;  ///< amplitude decay rate [1/s]
  real t_centre = 0;                ///< t_c [s]
  std::vector<cplx> amplitude;      ///< A_s (of the dominant component), per series
  real rms_residual = 0;            ///< over all samples of all series
  real rms_signal = 0;              ///< of the series with their means removed
};
[[nodiscard]] ToneFit fit_damped_tone(const SeriesSet& s, real omega_start);

/// Coefficients of the exp(-i omega (t - t_ref)) e^{-gamma (t - t_ref)} component of each
/// series over samples [i0, i1), from the same three-term least-squares model as the tone
/// fit with omega and gamma fixed. For a real series, the coefficient is half the real
/// amplitude times e^{i phase}.
struct Demodulation {
  std::vector<cplx> a;      ///< exp(-i omega t) coefficient, per series
  std::vector<cplx> b;      ///< exp(+i omega t) coefficient, per series
  std::vector<real> rms_residual;
};
[[nodiscard]] Demodulation demodulate(const SeriesSet& s, real omega, real gamma, real t_ref,
                                      std::size_t i0, std::size_t i1);

/// Envelope of the exp(-i omega t) component of one uniformly sampled series: the series
/// times exp(+i omega t), averaged over one period centred on each sample (exact for the
/// period's fractional length by integrating the linear interpolant), so the mean and the
/// mirror component (at 2 omega) cancel. Real series: 2 |average| (the real amplitude);
/// complex: |average|. The first and last half period are NaN.
[[nodiscard]] std::vector<real> tone_envelope(std::span<const real> t, std::span<const cplx> u,
                                              real omega, bool real_valued);

/// Arrival time of a wave packet from its envelope: the first hump is found (the envelope
/// rises above 10% of its maximum, then the first sample not exceeded by more than 1%
/// within the following `settle` seconds); if the envelope falls below half that value
/// afterwards it is a burst and its peak time (parabolic refinement) is returned, otherwise
/// a front and the time it first reached half the hump (linear interpolation). NaN when no
/// hump is complete before the record ends. `is_burst` says which.
[[nodiscard]] real arrival_time(std::span<const real> t, std::span<const real> env, real settle,
                                bool* is_burst = nullptr);

}  // namespace tw::diag
