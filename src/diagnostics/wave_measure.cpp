#include "diagnostics/wave_measure.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>
#include <sstream>

#include "core/error.hpp"

namespace tw::diag {

namespace {

constexpr real nan = std::numeric_limits<real>::quiet_NaN();
constexpr real two_pi = 2 * std::numbers::pi;
/// At most this many snapshot columns feed the tone fit when there are no probes.
constexpr std::size_t max_tone_columns = 64;

std::string num(real v) {
  std::ostringstream s;
  s.precision(6);
  s << v;
  return s.str();
}

/// Units of derived quantities: SI, or "1" throughout for a normalized run.
struct DerivedUnits {
  std::string frequency, angular, wavenumber, length, speed, rate;
};
DerivedUnits derived_units(const WaveData& d) {
  if (d.time_units == "s" && d.length_units == "m") return {"Hz", "rad/s", "rad/m", "m", "m/s", "s^-1"};
  return {"1", "1", "1", "1", "1", "1"};
}

/// Rows of `s` with t in [t0, t1] and the given columns.
SeriesSet select(const SeriesSet& s, real t0, real t1, const std::vector<std::size_t>& cols) {
  SeriesSet out;
  out.real_valued = s.real_valued;
  out.n_series = cols.size();
  for (std::size_t i = 0; i < s.n_times(); ++i) {
    if (s.t[i] < t0 || s.t[i] > t1) continue;
    out.t.push_back(s.t[i]);
    for (std::size_t c : cols) out.values.push_back(s.at(i, c));
  }
  return out;
}

/// Sign of omega for a given |frequency|: the component (exp(-i omega t) or exp(+i omega
/// t)) carrying more power, so a complex field's wave is followed in its own direction.
real signed_omega(const SeriesSet& src, real omega_abs) {
  if (src.real_valued || src.n_times() < 4) return omega_abs;
  const Demodulation dm = demodulate(src, omega_abs, 0, 0.5 * (src.t.front() + src.t.back()), 0, src.n_times());
  real pa = 0, pb = 0;
  for (std::size_t k = 0; k < dm.a.size(); ++k) {
    pa += std::norm(dm.a[k]);
    pb += std::norm(dm.b[k]);
  }
  return pb > pa ? -omega_abs : omega_abs;
}

Figure figure(std::string name, std::string units, std::string description) {
  Figure f;
  f.name = std::move(name);
  f.units = std::move(units);
  f.description = std::move(description);
  return f;
}

}  // namespace

const Figure& WaveMeasurement::figure(const std::string& name) const {
  for (const auto& f : figures)
    if (f.name == name) return f;
  fail_internal("no measured figure named '" + name + "'");
}

WaveMeasurement measure_wave(const WaveData& d, const MeasureOptions& opt) {
  WaveMeasurement m;
  m.field = d.field;
  m.field_units = d.field_units;
  m.complex_field = !d.snapshots.real_valued;
  const DerivedUnits u = derived_units(d);
  const std::string tu = d.time_units == "s" ? " s" : "";
  const std::string lu = d.length_units == "m" ? " m" : "";

  // --- The data used -------------------------------------------------------------------
  const real inf = std::numeric_limits<real>::infinity();
  const real t0 = opt.t_min.value_or(-inf), t1 = opt.t_max.value_or(inf);
  const real x0 = opt.x_min.value_or(-inf), x1 = opt.x_max.value_or(inf);
  std::vector<std::size_t> cells;
  std::vector<real> xs;
  for (std::size_t j = 0; j < d.x.size(); ++j)
    if (d.x[j] >= x0 && d.x[j] <= x1) {
      cells.push_back(j);
      xs.push_back(d.x[j]);
    }
  const SeriesSet snaps = select(d.snapshots, t0, t1, cells);
  std::vector<std::size_t> probe_cols;
  std::vector<real> probe_pos;
  const bool positions_known = !d.probe_x.empty() && d.probe_x.size() == d.probes.n_series;
  for (std::size_t p = 0; p < d.probes.n_series; ++p) {
    if (positions_known && (d.probe_x[p] < x0 || d.probe_x[p] > x1)) continue;
    probe_cols.push_back(p);
    if (positions_known) probe_pos.push_back(d.probe_x[p]);
  }
  const SeriesSet probes = select(d.probes, t0, t1, probe_cols);
  if (d.probes.n_series > 0 && !positions_known)
    m.notes.push_back("probe positions are unknown: the group speed is not measured");

  // --- 1. Frequency ----------------------------------------------------------------------
  Figure f_freq = figure("frequency", u.frequency, "frequency of the measured component (sign: direction of rotation of a complex field's exp(-i omega t) component)");
  Figure f_omega = figure("angular_frequency", u.angular, "angular frequency omega = 2 pi f");
  Figure f_gamma = figure("damping_rate", u.rate, "amplitude decay rate in time (negative: growth)");
  real omega = nan, omega_sigma = nan;
  bool fitted = false;
  // The series the frequency is taken from: probes, else a sample of snapshot columns.
  SeriesSet source;
  std::string source_name;
  if (probes.n_series > 0 && probes.n_times() >= 8) {
    source = probes;
    source_name = std::to_string(probes.n_series) + " probe series";
  } else if (snaps.n_series > 0) {
    std::vector<std::size_t> cols;
    const std::size_t step = std::max<std::size_t>(1, snaps.n_series / max_tone_columns);
    for (std::size_t j = 0; j < snaps.n_series; j += step) cols.push_back(j);
    source = select(snaps, -inf, inf, cols);
    source_name = std::to_string(cols.size()) + " snapshot columns";
  }
  if (opt.frequency || d.drive_frequency) {
    const real f = opt.frequency ? *opt.frequency : *d.drive_frequency;
    omega = signed_omega(source, two_pi * f);
    omega_sigma = 0;
    f_freq.method = opt.frequency ? "given (--frequency)" : "drive frequency (run file)";
  } else if (source.n_series == 0 || source.n_times() < 8) {
    f_freq.method = "not measured: fewer than 8 samples in time";
  } else {
    const real w0 = spectral_peak(source);
    if (w0 == 0) {
      f_freq.method = "not measured: the field does not oscillate";
    } else {
      const ToneFit tf = fit_damped_tone(source, w0);
      if (!tf.ok) {
        f_freq.method = "not measured: " + tf.message;
      } else {
        fitted = true;
        omega = tf.omega;
        omega_sigma = tf.omega_sigma;
        f_freq.method = "spectral peak of " + source_name + ", refined by a damped-tone fit (rms misfit " +
                        num(tf.rms_signal > 0 ? tf.rms_residual / tf.rms_signal : 0) + " of the signal)";
        f_gamma.value = tf.gamma;
        f_gamma.uncertainty = tf.gamma_sigma;
        f_gamma.method = "damped-tone fit of " + source_name;
        if (source_name.find("snapshot") != std::string::npos) {
          const real dt = source.t.size() > 1 ? source.t[1] - source.t[0] : 0;
          if (std::abs(omega) * dt > 0.9 * std::numbers::pi)
            m.notes.push_back("the snapshot interval is too long for this frequency: it may be an alias");
        }
      }
    }
  }
  if (std::isfinite(omega)) {
    f_freq.value = omega / two_pi;
    f_freq.uncertainty = omega_sigma / two_pi;
    f_omega.value = omega;
    f_omega.uncertainty = omega_sigma;
  }
  f_omega.method = f_freq.method;

  // --- 2-3. Profile, wavenumber, spatial damping ---------------------------------------------
  Figure f_k = figure("wavenumber", u.wavenumber, "wavenumber k of the exp(i(k x - omega t)) wave (sign: direction of the phase)");
  Figure f_lambda = figure("wavelength", u.length, "wavelength 2 pi / |k|");
  Figure f_vph = figure("phase_speed", u.speed, "phase speed omega / k (sign: direction of travel)");
  Figure f_kappa = figure("spatial_damping_rate", u.wavenumber == "1" ? "1" : "m^-1",
                 "amplitude decay rate along the direction of travel, -d ln|A| / dx (negative: growth)");
  Figure f_ld = figure("damping_length", u.length, "distance over which the amplitude falls by e, 1 / spatial_damping_rate");
  auto profile_fail = [&](const std::string& why) {
    for (Figure* f : {&f_k, &f_lambda, &f_vph, &f_kappa, &f_ld}) f->method = "not measured: " + why;
  };
  if (!std::isfinite(omega)) {
    profile_fail("no frequency");
  } else if (snaps.n_times() < 4 || snaps.n_series < 6) {
    profile_fail("fewer than 4 snapshots or 6 cells in the window");
  } else {
    const std::size_t nt = snaps.n_times();
    const real dt = (snaps.t.back() - snaps.t.front()) / static_cast<real>(nt - 1);
    std::size_t i0 = 0;
    const bool whole = fitted || opt.t_min.has_value();
    if (!whole) {
      const real t_half = 0.5 * (snaps.t.front() + snaps.t.back());
      while (i0 + 4 < nt && snaps.t[i0] < t_half) ++i0;
    }
    const std::size_t i1 = nt;
    const real tw0 = snaps.t[i0], tw1 = snaps.t[i1 - 1];
    const real periods = std::abs(omega) * (tw1 - tw0) / two_pi;
    if (std::abs(omega) * dt > 0.9 * std::numbers::pi) {
      profile_fail("the snapshot interval (" + num(dt) + tu + ") is too long for this frequency: it needs more than 2.2 snapshots per period");
    } else if (periods < 0.5) {
      profile_fail("the window (" + num(tw0) + " to " + num(tw1) + tu + ") is shorter than half a period");
    } else {
      const real g = fitted && std::isfinite(f_gamma.value) ? f_gamma.value : 0;
      const real t_ref = 0.5 * (tw0 + tw1);
      const Demodulation dm = demodulate(snaps, omega, g, t_ref, i0, i1);
      const std::size_t nc = snaps.n_series;
      real amax = 0;
      for (const auto& a : dm.a)
        if (std::isfinite(std::abs(a))) amax = std::max(amax, std::abs(a));
      std::vector<int> ok(nc, 0);
      for (std::size_t j = 0; j < nc; ++j) ok[j] = std::isfinite(std::abs(dm.a[j])) && std::abs(dm.a[j]) >= 0.02 * amax;
      if (!(amax > 0)) {
        profile_fail("the field has no component at this frequency");
      } else {
        std::size_t steady_out = 0;
        if (periods >= 2 && i1 - i0 >= 8) {
          // Steadiness: with omega and gamma in the model, a steady (or freely decaying)
          // wave has the same component in both halves of the window: the ratio must be 1
          // within 5% in magnitude and 0.05 rad in phase.
          const std::size_t im = i0 + (i1 - i0) / 2;
          const Demodulation d1 = demodulate(snaps, omega, g, t_ref, i0, im);
          const Demodulation d2 = demodulate(snaps, omega, g, t_ref, im, i1);
          for (std::size_t j = 0; j < nc; ++j) {
            if (!ok[j]) continue;
            const cplx r = d2.a[j] / d1.a[j];
            const bool steady = std::abs(std::abs(r) - 1) < 0.05 && std::abs(std::arg(r)) < 0.05;
            if (!steady) {
              ok[j] = 0;
              ++steady_out;
            }
          }
        }
        // The longest run of usable cells.
        std::size_t best0 = 0, best_len = 0;
        for (std::size_t j = 0; j < nc;) {
          if (!ok[j]) {
            ++j;
            continue;
          }
          std::size_t e = j;
          while (e < nc && ok[e]) ++e;
          if (e - j > best_len) {
            best_len = e - j;
            best0 = j;
          }
          j = e;
        }
        m.profile.t_start = tw0;
        m.profile.t_end = tw1;
        m.profile.x = xs;
        m.profile.used.assign(nc, 0);
        for (std::size_t j = 0; j < nc; ++j) {
          m.profile.amplitude.push_back((m.complex_field ? 1.0 : 2.0) * std::abs(dm.a[j]));
          m.profile.phase.push_back(std::arg(dm.a[j]));
        }
        if (best_len < 6) {
          profile_fail("fewer than 6 neighbouring cells carry a steady wave (" + std::to_string(steady_out) +
                       " cells unsteady); choose a window with --t-min/--x-min/--x-max");
        } else {
          std::vector<real> xx, ph, lnamp, w;
          for (std::size_t j = best0; j < best0 + best_len; ++j) {
            m.profile.used[j] = 1;
            xx.push_back(xs[j]);
            ph.push_back(std::arg(dm.a[j]));
            lnamp.push_back(std::log(std::abs(dm.a[j])));
            w.push_back(std::norm(dm.a[j]) / (amax * amax));
          }
          unwrap(ph);
          for (std::size_t j = 0; j < best_len; ++j) m.profile.phase[best0 + j] = ph[j];
          const LineFit pf = fit_line(xx, ph, w);
          const LineFit af = fit_line(xx, lnamp, w);
          const std::string where = std::to_string(best_len) + " cells, x = " + num(xx.front()) + " to " +
                                    num(xx.back()) + lu + ", t = " + num(tw0) + " to " + num(tw1) + tu;
          f_k.value = pf.slope;
          f_k.uncertainty = pf.slope_sigma;
          f_k.method = "slope of the unwrapped phase of the exp(-i omega t) component along x (" + where + ")";
          if (pf.slope != 0) {
            f_lambda.value = two_pi / std::abs(pf.slope);
            f_lambda.uncertainty = f_lambda.value * pf.slope_sigma / std::abs(pf.slope);
            f_lambda.method = "2 pi / |k|";
            f_vph.value = omega / pf.slope;
            const real rel = std::hypot(omega_sigma / omega, pf.slope_sigma / pf.slope);
            f_vph.uncertainty = std::abs(f_vph.value) * rel;
            f_vph.method = "omega / k";
            const real sgn = pf.slope > 0 ? 1.0 : -1.0;
            f_kappa.value = -sgn * af.slope;
            f_kappa.uncertainty = af.slope_sigma;
            f_kappa.method = "slope of ln|A| along x (" + where + ")";
            if (f_kappa.value > 2 * f_kappa.uncertainty && f_kappa.value > 0) {
              f_ld.value = 1 / f_kappa.value;
              f_ld.uncertainty = f_ld.value * f_kappa.uncertainty / f_kappa.value;
              f_ld.method = "1 / spatial_damping_rate";
            } else {
              f_ld.method = "not measured: no significant decay along x (rate " + num(f_kappa.value) + " +- " +
                            num(f_kappa.uncertainty) + ")";
            }
          } else {
            for (Figure* f : {&f_lambda, &f_vph, &f_kappa, &f_ld}) f->method = "not measured: the phase does not vary along x";
          }
          if (steady_out > 0)
            m.notes.push_back(std::to_string(steady_out) + " cells left out of the profile fit: the wave there was not steady in the window");
        }
      }
    }
  }

  // --- 4. Group speed ----------------------------------------------------------------------
  Figure f_vg = figure("group_speed", u.speed, "speed of the wave envelope between the probes (sign: direction)");
  if (!std::isfinite(omega)) {
    f_vg.method = "not measured: no frequency";
  } else if (probe_pos.size() < 2) {
    f_vg.method = "not measured: needs two or more probes with known positions";
  } else {
    const std::size_t n = uniform_prefix(probes.t);
    const std::span<const real> t(probes.t.data(), n);
    const real period = two_pi / std::abs(omega);
    std::vector<real> xa, ta;
    for (std::size_t p = 0; p < probes.n_series; ++p) {
      std::vector<cplx> series(n);
      for (std::size_t i = 0; i < n; ++i) series[i] = probes.at(i, p);
      const std::vector<real> env = tone_envelope(t, series, omega, probes.real_valued);
      bool burst = false;
      const real ta_p = arrival_time(t, env, 2 * period, &burst);
      m.arrivals.x.push_back(probe_pos[p]);
      m.arrivals.time.push_back(ta_p);
      m.arrivals.burst.push_back(burst ? 1 : 0);
      if (std::isfinite(ta_p)) {
        xa.push_back(probe_pos[p]);
        ta.push_back(ta_p);
      }
    }
    real spread = 0;
    for (real xv : xa) spread = std::max(spread, std::abs(xv - xa.front()));
    if (xa.size() < 2 || !(spread > 0)) {
      f_vg.method = "not measured: the envelope's arrival is complete at fewer than two probes";
    } else {
      const LineFit lf = fit_line(xa, ta);
      // Timing floor: the arrival is read off a sampled envelope (uniform error over one
      // sample interval, sigma = dt / sqrt(12)).
      const real dt = n > 1 ? t[1] - t[0] : 0;
      real sxx = 0, xm = 0;
      for (real xv : xa) xm += xv / static_cast<real>(xa.size());
      for (real xv : xa) sxx += (xv - xm) * (xv - xm);
      const real floor_sigma = dt / std::sqrt(12.0) / std::sqrt(sxx);
      const real s_sigma = std::max(lf.slope_sigma, floor_sigma);
      if (lf.slope == 0) {
        f_vg.method = "not measured: the envelope arrives at every probe at once";
      } else {
        f_vg.value = 1 / lf.slope;
        f_vg.uncertainty = s_sigma / (lf.slope * lf.slope);
        f_vg.method = "envelope arrival at " + std::to_string(xa.size()) + " probes (" +
                      (m.arrivals.burst.empty() || m.arrivals.burst[0] == 0 ? "half-rise of the front" : "peak of the burst") +
                      "), fitted t = t0 + x / v_g";
      }
    }
  }

  // --- 5. Temporal damping when the frequency was not fitted ----------------------------------
  if (!f_gamma.valid()) {
    if (f_kappa.valid() && f_vg.valid()) {
      f_gamma.value = f_kappa.value * std::abs(f_vg.value);
      f_gamma.uncertainty = std::abs(f_gamma.value) * std::hypot(f_kappa.uncertainty / f_kappa.value, f_vg.uncertainty / f_vg.value);
      if (f_kappa.value == 0) f_gamma.uncertainty = f_kappa.uncertainty * std::abs(f_vg.value);
      f_gamma.method = "spatial_damping_rate x |group_speed| (a steadily driven, weakly damped wave)";
    } else {
      f_gamma.method = "not measured: the frequency was not fitted and the spatial decay or group speed is missing";
    }
  }

  // --- 6. omega-k spectrum -----------------------------------------------------------------
  if (opt.spectrum) {
    const bool periodic = d.periodic && cells.size() == d.x.size();
    m.spectrum = omega_k_spectrum(snaps, xs, periodic);
    if (!m.spectrum->note.empty()) m.notes.push_back("omega-k spectrum: " + m.spectrum->note);
  }

  m.figures = {f_freq, f_omega, f_k, f_lambda, f_vph, f_vg, f_gamma, f_kappa, f_ld};
  return m;
}

}  // namespace tw::diag
