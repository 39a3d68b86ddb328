#pragma once
/// `tubewave measure` on a run file: loading one field (real, or complex from a NAME_re /
/// NAME_im pair) into WaveData, and storing a WaveMeasurement under /measurements.
///
/// Stored layout (written atomically by io::replace_group; documented in the README):
///   /measurements/FIELD             attributes: field, complex ("yes"/"no"), created,
///                                   tubewave_version, window, notes
///   /measurements/FIELD/NAME        one scalar per figure (frequency, angular_frequency,
///                                   wavenumber, wavelength, phase_speed, group_speed,
///                                   damping_rate, spatial_damping_rate, damping_length);
///                                   attributes units, description, uncertainty (one
///                                   sigma), method. NaN where not measured (method says why).
///   /measurements/FIELD/profile     x, amplitude, phase, used: the exp(-i omega t)
///                                   component along x that k was fitted to; attributes
///                                   t_start, t_end
///   /measurements/FIELD/arrivals    probe_x, time, burst: envelope arrival at the probes
///   /measurements/FIELD/omega_k     k, omega, power [n_omega, n_k] (relative), ridge_k,
///                                   ridge_omega, ridge_omega_uncertainty, ridge_power
#include <optional>
#include <string>
#include <vector>

#include "diagnostics/wave_measure.hpp"
#include "io/h5read.hpp"
#include "io/h5update.hpp"

namespace tw::diag {

/// What the run's resolved run file says about the layout (read by the caller, which
/// knows the run-file schema).
struct RunLayout {
  std::vector<real> probe_x;            ///< probe positions (empty: unknown)
  bool periodic = false;                ///< both ends periodic
  std::optional<real> drive_frequency;  ///< [Hz] of a driven end
  bool normalized = false;              ///< code units: times and lengths are not s and m
};

/// Fields of /snapshots by the names `--field` accepts: real fields, and each NAME_re /
/// NAME_im pair as one complex field NAME (the parts stay accepted as real fields too,
/// but are not listed).
[[nodiscard]] std::vector<std::string> field_names(const io::H5Reader& r);

/// The field measured when none is named: the first (in file order) whose fluctuations
/// are the largest fraction of its magnitude, std / sqrt(mean^2 + std^2) over all
/// snapshots, so a wave's transverse velocity wins over a background density.
[[nodiscard]] std::string default_field(const io::H5Reader& r);

/// Load a field's snapshots and probes. InputError naming the file and the available
/// fields (with the nearest) when `field` is not one.
[[nodiscard]] WaveData load_wave_data(const io::H5Reader& r, const std::string& field, const RunLayout& layout);

/// Store a measurement under /measurements/FIELD of `path`, replacing an earlier one of
/// the same field; other fields' results stay. `window` describes the data used.
void store_measurement(const std::string& path, const WaveMeasurement& m, const std::string& window);

/// Write a measurement into `g` (the group /measurements/FIELD of a file being updated,
/// see io::replace_groups): what store_measurement writes, for callers that update several
/// groups at once.
void fill_measurement(io::GroupWriter& g, const WaveMeasurement& m, const std::string& window);

}  // namespace tw::diag
