#include "drive/waveform.hpp"

#include <algorithm>
#include <cmath>
#include <sstream>

#include "core/constants.hpp"
#include "core/error.hpp"

namespace tw {

namespace {
constexpr real two_pi = 2 * constants::pi;
constexpr real inf = std::numeric_limits<real>::infinity();

real lerp_table(const std::vector<real>& t, const std::vector<real>& v, real x) {
  if (v.empty() || x < t.front() || x > t.back()) return 0;
  const auto it = std::upper_bound(t.begin(), t.end(), x);
  if (it == t.end()) return v.back();
  const std::size_t j = static_cast<std::size_t>(it - t.begin());
  if (j == 0) return v.front();
  const real w = (x - t[j - 1]) / (t[j] - t[j - 1]);
  return (1 - w) * v[j - 1] + w * v[j];
}
}  // namespace

Waveform Waveform::continuous(real frequency, real ramp_time, real phase) {
  TW_CHECK(frequency > 0 && ramp_time >= 0, "continuous waveform needs f > 0 and a ramp >= 0");
  Waveform w;
  w.kind_ = Kind::continuous;
  w.f0_ = frequency;
  w.ramp_ = ramp_time;
  w.phase_ = phase;
  return w;
}

Waveform Waveform::tone_burst(real frequency, real cycles, Window window, real taper, real phase) {
  TW_CHECK(frequency > 0 && cycles > 0 && taper >= 0 && taper <= 1, "bad tone burst");
  Waveform w;
  w.kind_ = Kind::tone_burst;
  w.f0_ = frequency;
  w.cycles_ = cycles;
  w.duration_ = cycles / frequency;
  w.window_ = window;
  w.taper_ = window == Window::hann ? 1.0 : taper;
  w.phase_ = phase;
  return w;
}

Waveform Waveform::chirp(real f0, real f1, real duration, real taper, real phase) {
  TW_CHECK(f0 >= 0 && f1 >= 0 && duration > 0 && taper >= 0 && taper <= 1, "bad chirp");
  Waveform w;
  w.kind_ = Kind::chirp;
  w.f0_ = f0;
  w.f1_ = f1;
  w.duration_ = duration;
  w.window_ = Window::tukey;
  w.taper_ = taper;
  w.phase_ = phase;
  return w;
}

Waveform Waveform::gaussian_pulse(real frequency, real width, real centre, real phase) {
  TW_CHECK(frequency >= 0 && width > 0, "bad gaussian pulse");
  Waveform w;
  w.kind_ = Kind::gaussian_pulse;
  w.f0_ = frequency;
  w.width_ = width;
  w.centre_ = centre;
  w.phase_ = phase;
  return w;
}

Waveform Waveform::tones(std::vector<Tone> tones, real ramp_time) {
  TW_CHECK(!tones.empty() && ramp_time >= 0, "a sum of tones needs at least one tone");
  Waveform w;
  w.kind_ = Kind::tones;
  w.tones_ = std::move(tones);
  w.ramp_ = ramp_time;
  w.f0_ = w.tones_.front().frequency;
  for (const auto& t : w.tones_) w.f0_ = std::min(w.f0_, t.frequency);
  return w;
}

Waveform Waveform::table(std::vector<real> t, std::vector<real> s, std::vector<real> q) {
  TW_CHECK(t.size() >= 2 && s.size() == t.size() && (q.empty() || q.size() == t.size()),
           "a tabulated waveform needs matching columns of at least two rows");
  Waveform w;
  w.kind_ = Kind::table;
  w.tt_ = std::move(t);
  w.ts_ = std::move(s);
  w.tq_ = std::move(q);
  return w;
}

real Waveform::ramp(real t) const {
  if (ramp_ <= 0 || t >= ramp_) return 1;
  if (t <= 0) return 0;
  const real s = std::sin(0.5 * constants::pi * t / ramp_);
  return s * s;
}

real Waveform::window(real u) const {
  if (u < 0 || u > 1) return 0;
  const real a = taper_;
  if (a <= 0) return 1;
  if (u < 0.5 * a) return 0.5 * (1 - std::cos(two_pi * u / a));
  if (u > 1 - 0.5 * a) return 0.5 * (1 - std::cos(two_pi * (1 - u) / a));
  return 1;
}

WaveSample Waveform::at(real time) const {
  const real t = time - delay_;
  if (t < 0) return {};
  switch (kind_) {
    case Kind::continuous: {
      const real r = ramp(t), ph = two_pi * f0_ * t + phase_;
      return {r * std::sin(ph), -r * std::cos(ph)};
    }
    case Kind::tone_burst: {
      const real w = window(t / duration_), ph = two_pi * f0_ * t + phase_;
      return {w * std::sin(ph), -w * std::cos(ph)};
    }
    case Kind::chirp: {
      const real w = window(t / duration_);
      const real ph = two_pi * (f0_ * t + 0.5 * (f1_ - f0_) * t * t / duration_) + phase_;
      return {w * std::sin(ph), -w * std::cos(ph)};
    }
    case Kind::gaussian_pulse: {
      const real s = (t - centre_) / width_;
      const real g = std::exp(-4 * std::log(2.0) * s * s);
      if (f0_ <= 0) return {g, 0};
      const real ph = two_pi * f0_ * (t - centre_) + phase_;
      return {g * std::sin(ph), -g * std::cos(ph)};
    }
    case Kind::tones: {
      WaveSample s;
      for (const Tone& k : tones_) {
        const real ph = two_pi * k.frequency * t + k.phase;
        s.in_phase += k.amplitude * std::sin(ph);
        s.quadrature -= k.amplitude * std::cos(ph);
      }
      const real r = ramp(t);
      return {r * s.in_phase, r * s.quadrature};
    }
    case Kind::table:
      return {lerp_table(tt_, ts_, t), lerp_table(tt_, tq_, t)};
  }
  return {};
}

bool Waveform::has_quadrature() const {
  if (kind_ == Kind::table) return !tq_.empty();
  if (kind_ == Kind::gaussian_pulse) return f0_ > 0;
  return true;
}

real Waveform::frequency() const { return f0_; }

real Waveform::end_time() const {
  switch (kind_) {
    case Kind::continuous:
    case Kind::tones: return inf;
    case Kind::tone_burst:
    case Kind::chirp: return delay_ + duration_;
    case Kind::gaussian_pulse: return delay_ + centre_ + 2.5 * width_;
    case Kind::table: return delay_ + tt_.back();
  }
  return inf;
}

std::string Waveform::describe() const {
  std::ostringstream d;
  d.precision(6);
  switch (kind_) {
    case Kind::continuous: d << "continuous " << f0_ << " Hz, turn-on " << ramp_ << " s"; break;
    case Kind::tone_burst:
      d << "tone burst of " << cycles_ << " cycles at " << f0_ << " Hz, "
        << (window_ == Window::hann ? std::string("Hann window")
                                    : "Tukey window (taper " + std::to_string(taper_) + ")");
      break;
    case Kind::chirp: d << "chirp " << f0_ << " -> " << f1_ << " Hz over " << duration_ << " s"; break;
    case Kind::gaussian_pulse:
      d << "gaussian pulse, width " << width_ << " s at " << centre_ << " s";
      if (f0_ > 0) d << ", carrier " << f0_ << " Hz";
      break;
    case Kind::tones: d << "sum of " << tones_.size() << " tones, turn-on " << ramp_ << " s"; break;
    case Kind::table: d << "table of " << tt_.size() << " samples"; break;
  }
  if (delay_ > 0) d << ", delayed " << delay_ << " s";
  return d.str();
}

std::array<real, 2> Polarization::apply(const WaveSample& s) const {
  switch (kind) {
    case Kind::linear: return {std::cos(angle) * s.in_phase, std::sin(angle) * s.in_phase};
    case Kind::right: return {s.in_phase, s.quadrature};
    case Kind::left: return {s.in_phase, -s.quadrature};
  }
  return {0, 0};
}

std::string Polarization::describe() const {
  if (kind == Kind::right) return "circular, right-handed about +x";
  if (kind == Kind::left) return "circular, left-handed about +x";
  std::ostringstream d;
  d << "linear at " << angle * 180 / constants::pi << " deg from y toward z";
  return d.str();
}

real DriveSignal::mean_square(real t0, real t1) const {
  if (!(t1 > t0)) return 0;
  const real f = std::max(waveform.frequency(), 0.0);
  // At least 64 samples per carrier period and 4096 in all (midpoint rule).
  const long n = std::clamp(static_cast<long>(std::ceil((t1 - t0) * f * 64)), 4096L, 50000000L);
  const real h = (t1 - t0) / static_cast<real>(n);
  real sum = 0;
  for (long k = 0; k < n; ++k) {
    const auto v = at(t0 + (static_cast<real>(k) + 0.5) * h);
    sum += v[0] * v[0] + v[1] * v[1];
  }
  return sum / static_cast<real>(n);
}

std::array<real, 2> DriveSignal::averaging_window(real t_end) const {
  const Waveform& w = waveform;
  if (w.is_continuous()) {
    const real t0 = w.settled_time(), f = w.frequency();
    if (t_end <= t0 || f <= 0) return {t0, t0};
    const real periods = std::floor((t_end - t0) * f * (1 + 1e-12));
    if (periods < 1) return {t0, t0};
    return {t_end - periods / f, t_end};
  }
  return {w.start_time(), std::min(w.end_time(), t_end)};
}

}  // namespace tw
