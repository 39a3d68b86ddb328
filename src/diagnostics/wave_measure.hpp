#pragma once
/// Measuring one wave from a run's snapshots and probes: frequency, wavenumber,
/// wavelength, phase speed, spatial and temporal damping, group speed and the omega-k
/// spectrum, each with a one-sigma uncertainty and the method that produced it.
///
/// Method (see signal.hpp for the conventions and the meaning of the uncertainties):
/// 1. Frequency: `--frequency` if given, else the drive frequency of a driven end, else the
///    spectral peak of the probe series (or, without probes, of up to 64 snapshot columns)
///    refined by a damped-tone fit, which also gives the temporal damping rate.
/// 2. Profile: the exp(-i omega t) component A(x) of every cell over a time window (the
///    last half of the snapshots for a given or drive frequency; the whole record for a
///    fitted one), from a least-squares fit at each cell. Cells where the wave is not
///    steady (the front still passing, a reflection arriving: A over the first and second
///    half of the window differ by more than 5% from the cells' common ratio) or too weak
///    (< 2% of the largest |A|) are left out; the longest run of remaining cells is used.
/// 3. Wavenumber: slope of the unwrapped phase of A along x (weights |A|^2); wavelength
///    2 pi/|k|; phase speed omega/k (its sign is the direction of travel).
///    Spatial damping rate: kappa = -sign(k) d ln|A|/dx from the same cells; the damping
///    length 1/kappa when kappa exceeds twice its uncertainty.
/// 4. Group speed: arrival time of the wave's envelope at each probe (signal.hpp,
///    arrival_time), fitted as t = t0 + x / v_g.
/// 5. Temporal damping rate: from the tone fit when the frequency was fitted; otherwise
///    kappa |v_g| (weak damping of a steadily driven wave).
/// 6. omega-k spectrum of the snapshots (omega_k.hpp) and its ridge.
#include <cmath>
#include <limits>
#include <optional>
#include <string>
#include <vector>

#include "diagnostics/omega_k.hpp"
#include "diagnostics/signal.hpp"

namespace tw::diag {

/// One field of a run, as plain arrays (loaded by run_measure.hpp).
struct WaveData {
  std::string field;            ///< name; for a complex field its base name ("velocity_y")
  std::string field_units;      ///< CF units of the field
  std::string time_units = "s";  ///< "s", or "1" for a normalized run
  std::string length_units = "m";
  std::vector<real> x;          ///< cell centres, uniform
  SeriesSet snapshots;          ///< series = cells
  SeriesSet probes;             ///< series = probes (n_series 0 without probes)
  std::vector<real> probe_x;    ///< probe positions (empty when unknown)
  bool periodic = false;        ///< both ends periodic
  std::optional<real> drive_frequency;  ///< [Hz] of a driven end
};

struct MeasureOptions {
  std::optional<real> frequency;  ///< [Hz]: measure the component at this frequency
  std::optional<real> t_min, t_max, x_min, x_max;  ///< restrict the data used
  bool spectrum = true;           ///< compute the omega-k spectrum
};

/// One measured figure.
struct Figure {
  std::string name;         ///< e.g. "phase_speed"
  std::string units;        ///< CF units
  std::string description;  ///< one line
  real value = std::numeric_limits<real>::quiet_NaN();
  real uncertainty = std::numeric_limits<real>::quiet_NaN();  ///< one sigma
  std::string method;       ///< how it was obtained, or why it could not be
  [[nodiscard]] bool valid() const { return std::isfinite(value); }
};

/// The complex amplitude profile the wavenumber was fitted to.
struct WaveProfile {
  std::vector<real> x, amplitude, phase;  ///< every cell; phase unwrapped over the used cells
  std::vector<int> used;                  ///< 1 for cells in the fit
  real t_start = 0, t_end = 0;            ///< the time window
};

/// Envelope arrivals at the probes.
struct Arrivals {
  std::vector<real> x, time;  ///< probes with an arrival (time NaN where none)
  std::vector<int> burst;     ///< 1: a burst's peak, 0: a front's half-rise
};

struct WaveMeasurement {
  std::string field;
  std::string field_units;
  bool complex_field = false;
  std::vector<Figure> figures;
  WaveProfile profile;
  Arrivals arrivals;
  std::optional<OmegaK> spectrum;
  std::vector<std::string> notes;  ///< what was left out and why
  /// The figure of that name (InternalError if none).
  [[nodiscard]] const Figure& figure(const std::string& name) const;
};

/// Measure the wave in `d`. Never throws for data that hold no measurable wave: those
/// figures are NaN with the reason in `method`.
[[nodiscard]] WaveMeasurement measure_wave(const WaveData& d, const MeasureOptions& opt);

}  // namespace tw::diag
