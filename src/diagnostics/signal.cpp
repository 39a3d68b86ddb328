#include "diagnostics/signal.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <numbers>

#include "core/error.hpp"
#include "diagnostics/fft.hpp"

namespace tw::diag {

namespace {

constexpr real nan = std::numeric_limits<real>::quiet_NaN();
constexpr real two_pi = 2 * std::numbers::pi;

using C3 = std::array<cplx, 3>;
using M3 = std::array<C3, 3>;

/// Solve the 3x3 complex system G c = h by Gaussian elimination with partial pivoting.
/// Returns false when G is singular to working precision.
bool solve3(M3 g, C3 h, C3& c) {
  real scale = 0;
  for (const auto& row : g)
    for (const auto& v : row) scale = std::max(scale, std::abs(v));
  if (!(scale > 0)) return false;
  for (int col = 0; col < 3; ++col) {
    int piv = col;
    for (int r = col + 1; r < 3; ++r)
      if (std::abs(g[r][col]) > std::abs(g[piv][col])) piv = r;
    if (std::abs(g[piv][col]) < 1e-13 * scale) return false;
    std::swap(g[col], g[piv]);
    std::swap(h[col], h[piv]);
    for (int r = col + 1; r < 3; ++r) {
      const cplx f = g[r][col] / g[col][col];
      for (int k = col; k < 3; ++k) g[r][k] -= f * g[col][k];
      h[r] -= f * h[col];
    }
  }
  for (int r = 2; r >= 0; --r) {
    cplx s = h[r];
    for (int k = r + 1; k < 3; ++k) s -= g[r][k] * c[k];
    c[r] = s / g[r][r];
  }
  return true;
}

/// The three-term model of fit_damped_tone / demodulate over samples [i0, i1), with the
/// exponentials evaluated at tau = (t - t_ref) * scale: coefficients per series and the
/// total squared residual.
struct ThreeTerm {
  bool ok = false;
  std::vector<C3> coef;  ///< per series: (A, B, C)
  std::vector<real> sq_residual;  ///< per series
  real total = 0;
};

ThreeTerm fit_three_term(const SeriesSet& s, real omega, real gamma, real t_ref, real scale,
                         std::size_t i0, std::size_t i1) {
  const std::size_t n = i1 - i0;
  std::vector<C3> phi(n);
  for (std::size_t i = 0; i < n; ++i) {
    const real tau = (s.t[i0 + i] - t_ref) * scale;
    const real damp = std::exp(-gamma * tau);
    const cplx rot(std::cos(omega * tau), -std::sin(omega * tau));  // e^{-i omega tau}
    phi[i] = {damp * rot, damp * std::conj(rot), cplx(1, 0)};
  }
  M3 g{};
  for (const auto& p : phi)
    for (int a = 0; a < 3; ++a)
      for (int b = 0; b < 3; ++b) g[a][b] += std::conj(p[a]) * p[b];
  ThreeTerm out;
  out.coef.resize(s.n_series);
  out.sq_residual.assign(s.n_series, 0);
  for (std::size_t k = 0; k < s.n_series; ++k) {
    C3 h{};
    for (std::size_t i = 0; i < n; ++i) {
      const cplx y = s.at(i0 + i, k);
      for (int a = 0; a < 3; ++a) h[a] += std::conj(phi[i][a]) * y;
    }
    C3 c{};
    if (!solve3(g, h, c)) return out;
    real r2 = 0;
    for (std::size_t i = 0; i < n; ++i) {
      const cplx model = c[0] * phi[i][0] + c[1] * phi[i][1] + c[2];
      r2 += std::norm(s.at(i0 + i, k) - model);
    }
    out.coef[k] = c;
    out.sq_residual[k] = r2;
    out.total += r2;
  }
  out.ok = true;
  return out;
}

}  // namespace

LineFit fit_line(std::span<const real> x, std::span<const real> y, std::span<const real> w) {
  TW_CHECK(x.size() == y.size() && (w.empty() || w.size() == x.size()), "fit_line: sizes differ");
  TW_CHECK(x.size() >= 2, "fit_line needs two points");
  const std::size_t n = x.size();
  auto wt = [&](std::size_t i) { return w.empty() ? real(1) : w[i]; };
  real sw = 0, sx = 0, sy = 0;
  for (std::size_t i = 0; i < n; ++i) {
    sw += wt(i);
    sx += wt(i) * x[i];
    sy += wt(i) * y[i];
  }
  const real xm = sx / sw, ym = sy / sw;
  real sxx = 0, sxy = 0;
  for (std::size_t i = 0; i < n; ++i) {
    sxx += wt(i) * (x[i] - xm) * (x[i] - xm);
    sxy += wt(i) * (x[i] - xm) * (y[i] - ym);
  }
  TW_CHECK(sxx > 0, "fit_line: all x are equal");
  LineFit f;
  f.n = n;
  f.slope = sxy / sxx;
  f.intercept = ym - f.slope * xm;
  real rss = 0;
  for (std::size_t i = 0; i < n; ++i) {
    const real r = y[i] - f.intercept - f.slope * x[i];
    rss += wt(i) * r * r;
  }
  f.rms = std::sqrt(rss / sw);
  if (n > 2) {
    // Weights are relative: the noise scale comes from the residuals.
    const real s2 = rss / static_cast<real>(n - 2) * static_cast<real>(n) / sw;
    f.slope_sigma = std::sqrt(s2 / (sxx * static_cast<real>(n) / sw));
    f.intercept_sigma = std::sqrt(s2 * (1 / static_cast<real>(n) + xm * xm / (sxx * static_cast<real>(n) / sw)));
  }
  return f;
}

void unwrap(std::vector<real>& phase) {
  for (std::size_t i = 1; i < phase.size(); ++i) {
    real d = phase[i] - phase[i - 1];
    d -= two_pi * std::round(d / two_pi);
    phase[i] = phase[i - 1] + d;
  }
}

std::size_t uniform_prefix(std::span<const real> t) {
  if (t.size() < 3) return t.size();
  const real dt = t[1] - t[0];
  std::size_t n = 2;
  while (n < t.size() && std::abs((t[n] - t[n - 1]) - dt) <= 1e-6 * std::abs(dt)) ++n;
  return n;
}

real spectral_peak(const SeriesSet& s) {
  const std::size_t n = uniform_prefix(s.t);
  if (n < 4 || s.n_series == 0) return 0;
  const real dt = s.t[1] - s.t[0];
  constexpr std::size_t pad = 8;
  const std::size_t m = next_pow2(pad * n);
  const std::vector<real> w = hann(n);
  std::vector<real> power(m, 0);
  std::vector<cplx> buf(m);
  for (std::size_t k = 0; k < s.n_series; ++k) {
    cplx mean(0, 0);
    for (std::size_t i = 0; i < n; ++i) mean += s.at(i, k);
    mean /= static_cast<real>(n);
    std::fill(buf.begin(), buf.end(), cplx(0, 0));
    for (std::size_t i = 0; i < n; ++i) buf[i] = (s.at(i, k) - mean) * w[i];
    fft_inplace(buf);
    for (std::size_t j = 0; j < m; ++j) power[j] += std::norm(buf[j]);
  }
  // Skip the bins next to zero frequency (1.5 Fourier bins = 1.5 * m / n padded bins).
  const real min_bin = 1.5 * static_cast<real>(m) / static_cast<real>(n);
  std::size_t best = m;
  for (std::size_t j = 0; j < m; ++j) {
    const long b = signed_bin(j, m);
    if (std::abs(static_cast<real>(b)) < min_bin) continue;
    if (s.real_valued && b < 0) continue;
    if (best == m || power[j] > power[best]) best = j;
  }
  if (best == m || !(power[best] > 0)) return 0;
  const auto lg = [&](std::size_t j) { return std::log(power[j] + 1e-300); };
  const real d = parabolic_peak_offset(lg((best + m - 1) % m), lg(best), lg((best + 1) % m));
  const real nu = (static_cast<real>(signed_bin(best, m)) + d) / (static_cast<real>(m) * dt);
  // A component e^{-i omega t} sits at nu = -omega / 2 pi in the forward transform.
  const real omega = -two_pi * nu;
  return s.real_valued ? std::abs(omega) : omega;
}

ToneFit fit_damped_tone(const SeriesSet& s, real omega_start) {
  ToneFit out;
  const std::size_t n = s.n_times();
  if (n < 8 || s.n_series == 0) {
    out.message = "too few samples for a tone fit (" + std::to_string(n) + ")";
    return out;
  }
  const real tc = 0.5 * (s.t.front() + s.t.back());
  const real ts = 0.5 * (s.t.back() - s.t.front());
  if (!(ts > 0)) {
    out.message = "the samples span no time";
    return out;
  }
  out.t_centre = tc;
  const real inv_ts = 1 / ts;
  // Normalised parameters: W = omega ts, G = gamma ts (tau in [-1, 1]).
  auto residual = [&](real W, real G) {
    const ThreeTerm f = fit_three_term(s, W, G, tc, inv_ts, 0, n);
    return f.ok ? f.total : std::numeric_limits<real>::infinity();
  };
  real W = std::abs(omega_start) * ts;
  if (!(W > 0)) {
    out.message = "no spectral line to start the tone fit from";
    return out;
  }
  // Start gamma from a coarse scan (damping of up to e^8 over the record, growth of e^4).
  real G = 0, best = std::numeric_limits<real>::infinity();
  for (real g = -2; g <= 4.0001; g += 0.125) {
    const real r = residual(W, g);
    if (r < best) {
      best = r;
      G = g;
    }
  }
  real f0 = best;
  // Damped Newton (Levenberg-Marquardt) with central differences.
  real h = 1e-3;
  auto derivatives = [&](real w, real g, real f, std::array<real, 2>& grad, std::array<real, 3>& hess) {
    const real fwp = residual(w + h, g), fwm = residual(w - h, g);
    const real fgp = residual(w, g + h), fgm = residual(w, g - h);
    const real fpp = residual(w + h, g + h), fpm = residual(w + h, g - h);
    const real fmp = residual(w - h, g + h), fmm = residual(w - h, g - h);
    grad = {(fwp - fwm) / (2 * h), (fgp - fgm) / (2 * h)};
    hess = {(fwp - 2 * f + fwm) / (h * h), (fpp - fpm - fmp + fmm) / (4 * h * h),
            (fgp - 2 * f + fgm) / (h * h)};
  };
  real lambda = 1e-3;
  std::array<real, 2> grad{};
  std::array<real, 3> hess{};
  // Two passes: the second with a smaller difference step, whose truncation error
  // (h^2/6 times the third derivative, in the gradient) no longer moves the minimum.
  for (real hh : {real(1e-3), real(1e-5)}) {
    h = hh;
    lambda = 1e-3;
    for (int iter = 0; iter < 200 && f0 > 0; ++iter) {
      derivatives(W, G, f0, grad, hess);
      bool moved = false;
      real step = 0;
      for (int tries = 0; tries < 30; ++tries) {
        const real a = hess[0] + lambda * std::max(std::abs(hess[0]), 1e-30);
        const real b = hess[1];
        const real c = hess[2] + lambda * std::max(std::abs(hess[2]), 1e-30);
        const real det = a * c - b * b;
        if (!(det > 0) || !(a > 0)) {
          lambda *= 10;
          continue;
        }
        const real dW = -(c * grad[0] - b * grad[1]) / det;
        const real dG = -(a * grad[1] - b * grad[0]) / det;
        // Keep steps inside the region where the start guess is trusted.
        if (std::abs(dW) > 1.5 || std::abs(dG) > 1.5) {
          lambda *= 10;
          continue;
        }
        const real f1 = residual(W + dW, G + dG);
        if (f1 <= f0) {
          W += dW;
          G += dG;
          step = std::hypot(dW, dG);
          moved = f1 < f0;
          f0 = f1;
          lambda = std::max(lambda / 10, 1e-12);
          break;
        }
        lambda *= 10;
      }
      if (!moved || step < 1e-12) break;
    }
  }
  h = 1e-3;  // the covariance: a step well above round-off in the residual
  derivatives(W, G, f0, grad, hess);

  const ThreeTerm fit = fit_three_term(s, W, G, tc, inv_ts, 0, n);
  if (!fit.ok) {
    out.message = "the tone fit is singular (frequency too close to zero?)";
    return out;
  }
  // Parameter covariance of (W, G): 2 s^2 H^-1, s^2 the residual variance per real datum.
  const real n_data = static_cast<real>(n * s.n_series) * (s.real_valued ? 1 : 2);
  const real n_par = static_cast<real>(s.n_series) * (s.real_valued ? 3 : 6) + 2;
  const real dof = n_data - n_par;
  const real det = hess[0] * hess[2] - hess[1] * hess[1];
  if (dof > 0 && det > 0) {
    const real s2 = fit.total / dof;
    out.omega_sigma = std::sqrt(std::max(real(0), 2 * s2 * hess[2] / det)) * inv_ts;
    out.gamma_sigma = std::sqrt(std::max(real(0), 2 * s2 * hess[0] / det)) * inv_ts;
  } else {
    out.omega_sigma = out.gamma_sigma = nan;
  }
  real pa = 0, pb = 0;
  for (const auto& c : fit.coef) {
    pa += std::norm(c[0]);
    pb += std::norm(c[1]);
  }
  const bool use_b = !s.real_valued && pb > pa;
  out.omega = (use_b ? -W : W) * inv_ts;
  out.gamma = G * inv_ts;
  for (const auto& c : fit.coef) out.amplitude.push_back(use_b ? c[1] : c[0]);
  out.rms_residual = std::sqrt(fit.total / static_cast<real>(n * s.n_series));
  real sig = 0;
  for (std::size_t k = 0; k < s.n_series; ++k) {
    cplx mean(0, 0);
    for (std::size_t i = 0; i < n; ++i) mean += s.at(i, k);
    mean /= static_cast<real>(n);
    for (std::size_t i = 0; i < n; ++i) sig += std::norm(s.at(i, k) - mean);
  }
  out.rms_signal = std::sqrt(sig / static_cast<real>(n * s.n_series));
  out.ok = true;
  return out;
}

Demodulation demodulate(const SeriesSet& s, real omega, real gamma, real t_ref, std::size_t i0,
                        std::size_t i1) {
  TW_CHECK(i0 < i1 && i1 <= s.n_times(), "demodulate: bad sample range");
  Demodulation d;
  const ThreeTerm f = fit_three_term(s, omega, gamma, t_ref, 1.0, i0, i1);
  const std::size_t n = i1 - i0;
  for (std::size_t k = 0; k < s.n_series; ++k) {
    if (f.ok) {
      d.a.push_back(f.coef[k][0]);
      d.b.push_back(f.coef[k][1]);
      d.rms_residual.push_back(std::sqrt(f.sq_residual[k] / static_cast<real>(n)));
    } else {
      d.a.emplace_back(nan, nan);
      d.b.emplace_back(nan, nan);
      d.rms_residual.push_back(nan);
    }
  }
  return d;
}

std::vector<real> tone_envelope(std::span<const real> t, std::span<const cplx> u, real omega,
                                bool real_valued) {
  const std::size_t n = t.size();
  TW_CHECK(u.size() == n, "tone_envelope: sizes differ");
  std::vector<real> env(n, nan);
  if (n < 3 || omega == 0) return env;
  std::vector<cplx> z(n);
  for (std::size_t i = 0; i < n; ++i) z[i] = u[i] * cplx(std::cos(omega * t[i]), std::sin(omega * t[i]));
  // Cumulative integral of the linear interpolant of z.
  std::vector<cplx> cum(n, cplx(0, 0));
  for (std::size_t i = 1; i < n; ++i) cum[i] = cum[i - 1] + 0.5 * (t[i] - t[i - 1]) * (z[i] + z[i - 1]);
  auto integral_to = [&](real tt) {
    // Index of the interval [t_j, t_j+1] holding tt.
    const auto it = std::upper_bound(t.begin(), t.end(), tt);
    std::size_t j = it == t.begin() ? 0 : static_cast<std::size_t>(it - t.begin()) - 1;
    j = std::min(j, n - 2);
    const real h = t[j + 1] - t[j];
    const real s = tt - t[j];
    return cum[j] + s * z[j] + (s * s / (2 * h)) * (z[j + 1] - z[j]);
  };
  const real period = two_pi / std::abs(omega);
  const real factor = real_valued ? 2 : 1;
  for (std::size_t i = 0; i < n; ++i) {
    const real a = t[i] - 0.5 * period, b = t[i] + 0.5 * period;
    if (a < t.front() || b > t.back()) continue;
    env[i] = factor * std::abs(integral_to(b) - integral_to(a)) / period;
  }
  return env;
}

real arrival_time(std::span<const real> t, std::span<const real> env, real settle, bool* is_burst) {
  const std::size_t n = t.size();
  if (is_burst != nullptr) *is_burst = false;
  real emax = 0;
  std::size_t last_valid = 0;
  for (std::size_t i = 0; i < n; ++i)
    if (std::isfinite(env[i])) {
      emax = std::max(emax, env[i]);
      last_valid = i;
    }
  if (!(emax > 0)) return nan;
  std::size_t i0 = n;
  for (std::size_t i = 0; i < n; ++i)
    if (std::isfinite(env[i]) && env[i] >= 0.1 * emax) {
      i0 = i;
      break;
    }
  if (i0 == n) return nan;
  // First hump: a sample that no later sample within `settle` exceeds by more than 1%.
  std::size_t hump = n;
  for (std::size_t i = i0; i <= last_valid; ++i) {
    if (t[i] + settle > t[last_valid]) break;  // cannot judge: the record ends too soon
    bool top = true;
    for (std::size_t j = i + 1; j <= last_valid && t[j] <= t[i] + settle; ++j)
      if (std::isfinite(env[j]) && env[j] > 1.01 * env[i]) {
        top = false;
        break;
      }
    if (top) {
      hump = i;
      break;
    }
  }
  if (hump == n) return nan;
  const real ref = env[hump];
  bool burst = false;
  std::size_t drop = n;
  for (std::size_t j = hump + 1; j <= last_valid; ++j)
    if (std::isfinite(env[j]) && env[j] < 0.5 * ref) {
      burst = true;
      drop = j;
      break;
    }
  if (is_burst != nullptr) *is_burst = burst;
  if (burst) {
    std::size_t pk = hump;
    for (std::size_t j = i0; j < drop; ++j)
      if (std::isfinite(env[j]) && env[j] > env[pk]) pk = j;
    if (pk == 0 || pk + 1 >= n || !std::isfinite(env[pk - 1]) || !std::isfinite(env[pk + 1])) return t[pk];
    const real d = parabolic_peak_offset(env[pk - 1], env[pk], env[pk + 1]);
    return t[pk] + d * (d >= 0 ? t[pk + 1] - t[pk] : t[pk] - t[pk - 1]);
  }
  for (std::size_t j = 0; j <= hump; ++j) {
    if (!std::isfinite(env[j]) || env[j] < 0.5 * ref) continue;
    if (j == 0 || !std::isfinite(env[j - 1])) return t[j];
    const real f = (0.5 * ref - env[j - 1]) / (env[j] - env[j - 1]);
    return t[j - 1] + f * (t[j] - t[j - 1]);
  }
  return nan;
}

}  // namespace tw::diag
