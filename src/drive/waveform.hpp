#pragma once
/// Drive waveforms: the time dependence of every drive (driven ends and antennas), in one
/// library so that all drives share it.
///
/// A Waveform is a dimensionless signal s(t) whose peak is about 1 (the drive's amplitude
/// carries the unit), together with its quadrature q(t): the same signal with every carrier
/// phase retarded by a quarter period (sin -> -cos). Circular polarization uses both.
/// Shapes (t is time since the drive's `delay`; the signal is zero before it):
///
///   continuous      r(t) sin(w t + phi),  r = sin^2(pi t / 2 T_r) for t < T_r, then 1
///                   (a smooth turn-on over T_r avoids the broadband transient of a sudden start)
///   tone burst      W(t / T_b) sin(w t + phi), T_b = N / f (N cycles), zero after the burst;
///                   W is a Hann window sin^2(pi u), or a Tukey window (flat top, cosine
///                   tapers over the fraction `taper` of the burst, half at each end;
///                   taper 1 is Hann, 0 a rectangle)
///   chirp           W(t / T) sin(phi(t)), phi = 2 pi (f0 t + (f1 - f0) t^2 / 2T) + phi:
///                   the frequency sweeps linearly from f0 to f1 over T (Tukey window W)
///   gaussian pulse  g(t) sin(w (t - t_c) + phi), g = exp(-4 ln 2 (t - t_c)^2 / tau^2),
///                   tau the full width at half maximum of the envelope; with f = 0 the
///                   pulse is the bare envelope g (no quadrature: linear polarization only)
///   tones           r(t) sum_k a_k sin(w_k t + phi_k), turned on like `continuous`
///   table           linear interpolation in a time series (t_k, s_k) and optionally
///                   (t_k, q_k); zero outside the table's time range
///
/// Value type, no mutable state: safe to evaluate from any thread.
#include <array>
#include <limits>
#include <string>
#include <vector>

#include "core/types.hpp"

namespace tw {

/// One sample of a waveform: the signal and its quadrature.
struct WaveSample {
  real in_phase = 0;
  real quadrature = 0;
};

enum class Window { hann, tukey };

/// One component of a sum of tones.
struct Tone {
  real frequency = 0;  ///< [Hz]
  real amplitude = 1;  ///< relative amplitude
  real phase = 0;      ///< [rad]
};

class Waveform {
 public:
  enum class Kind { continuous, tone_burst, chirp, gaussian_pulse, tones, table };

  /// `ramp_time` [s] of the sin^2 turn-on; `phase` [rad].
  static Waveform continuous(real frequency, real ramp_time, real phase = 0);
  /// `cycles` > 0 carrier periods under a window; `taper` (Tukey) in [0, 1].
  static Waveform tone_burst(real frequency, real cycles, Window window, real taper = 0.5, real phase = 0);
  /// Linear sweep f0 -> f1 over `duration` [s] under a Tukey window of `taper`.
  static Waveform chirp(real f0, real f1, real duration, real taper = 0.1, real phase = 0);
  /// Envelope of full width at half maximum `width` [s] centred at `centre` [s]; carrier
  /// `frequency` (0: none).
  static Waveform gaussian_pulse(real frequency, real width, real centre, real phase = 0);
  static Waveform tones(std::vector<Tone> tones, real ramp_time);
  /// Times must increase strictly (checked by the caller, which knows the file); `q` may
  /// be empty (no quadrature).
  static Waveform table(std::vector<real> t, std::vector<real> s, std::vector<real> q = {});

  /// Shift the whole waveform later by `delay` [s] (>= 0).
  Waveform& delayed(real delay) {
    delay_ = delay;
    return *this;
  }

  [[nodiscard]] WaveSample at(real t) const;
  [[nodiscard]] Kind kind() const { return kind_; }
  /// True if the quadrature is defined (needed for circular polarization).
  [[nodiscard]] bool has_quadrature() const;
  /// Carrier frequency [Hz] (continuous, burst, pulse; the lowest tone; the start of a
  /// chirp); 0 if none.
  [[nodiscard]] real frequency() const;
  /// Time [s] at which the signal starts (the delay) and after which it is zero for good
  /// (infinite for continuous signals).
  [[nodiscard]] real start_time() const { return delay_; }
  [[nodiscard]] real end_time() const;
  /// Time [s] from which a continuous signal has its full amplitude (after the turn-on).
  [[nodiscard]] real settled_time() const { return delay_ + ramp_; }
  /// True for signals that go on forever (continuous, tones).
  [[nodiscard]] bool is_continuous() const { return kind_ == Kind::continuous || kind_ == Kind::tones; }
  /// One line for logs and the output file.
  [[nodiscard]] std::string describe() const;

 private:
  Kind kind_ = Kind::continuous;
  real f0_ = 0, f1_ = 0;       ///< carrier frequency; chirp end frequency [Hz]
  real phase_ = 0;             ///< [rad]
  real ramp_ = 0;              ///< turn-on time [s]
  real duration_ = 0;          ///< burst / chirp duration [s]
  real width_ = 0, centre_ = 0;  ///< gaussian pulse FWHM and centre [s]
  real cycles_ = 0;
  Window window_ = Window::hann;
  real taper_ = 0.5;
  real delay_ = 0;
  std::vector<Tone> tones_;
  std::vector<real> tt_, ts_, tq_;  ///< table

  [[nodiscard]] real ramp(real t) const;
  [[nodiscard]] real window(real u) const;
};

/// How the two transverse components follow a waveform:
///   linear  (cos a, sin a) s(t), the angle a measured from +y toward +z;
///   right   (s(t), q(t)): for a tone, turns right-handed about +x (from +y toward +z; the
///           electron gyration sense when B0 points along +x);
///   left    (s(t), -q(t)): the opposite sense.
struct Polarization {
  enum class Kind { linear, left, right };
  Kind kind = Kind::linear;
  real angle = 0;  ///< linear: [rad] from +y toward +z

  [[nodiscard]] std::array<real, 2> apply(const WaveSample& s) const;
  [[nodiscard]] std::string describe() const;
};

/// A transverse drive: amplitude times a polarized waveform, (y, z) components in the
/// drive's own unit (m/s, T or A/m^2).
struct DriveSignal {
  Waveform waveform;
  Polarization polarization;
  real amplitude = 0;

  [[nodiscard]] std::array<real, 2> at(real t) const {
    const auto v = polarization.apply(waveform.at(t));
    return {amplitude * v[0], amplitude * v[1]};
  }
  /// Mean of |signal|^2 over [t0, t1] (numerical quadrature, fine enough for any
  /// waveform resolved at 64 samples per carrier period).
  [[nodiscard]] real mean_square(real t0, real t1) const;
  /// The window over which time averages of the drive's power are taken, ending at t_end:
  /// whole carrier periods after the turn-on for continuous signals, else the part of
  /// [start, end] of the waveform before t_end. {t0, t1}; t1 <= t0 if there is none.
  [[nodiscard]] std::array<real, 2> averaging_window(real t_end) const;
};

}  // namespace tw
