#pragma once
/// Run-file keys and resolved specifications of drives (driven ends and antennas), open
/// ends with absorbing layers, and the wave diagnostics (Elsasser decomposition, regions).
/// Model-independent; sim/drive_setup.hpp turns them into boundaries and source terms for
/// a model.
///
/// A drive is given by the same keys at a driven end and in an antenna:
///   exactly one amplitude, which also says what is driven:
///     velocity_amplitude [m/s]   transverse velocity
///     field_amplitude    [T]     transverse magnetic field (added to the background's)
///     current_density    [A/m^2] antenna current density J0 (antennas only)
///     sheet_current      [A/m]   antenna sheet current K0 = J0 * integral of w dx (antennas only)
///   waveform (continuous, tone-burst, chirp, gaussian-pulse, tones, table) and its keys,
///   delay, phase_deg, polarization (linear at angle_deg, left, right; y and z are linear
///   at 0 and 90 degrees).
#include <optional>
#include <string>
#include <vector>

#include "drive/antenna.hpp"
#include "drive/waveform.hpp"
#include "io/runfile.hpp"
#include "io/schema.hpp"
#include "sim/case.hpp"

namespace tw {

/// A resolved drive.
struct DriveSpec {
  DriveQuantity quantity = DriveQuantity::velocity;
  DriveSignal signal;               ///< amplitude in the quantity's unit (J0 for currents)
  std::optional<real> sheet_current;  ///< K0 [A/m] when the antenna was given by its sheet current
  std::string key;                  ///< run-file path of the drive's section
};

/// An antenna region.
struct AntennaSpec {
  std::string name;
  AntennaShape shape;
  DriveSpec drive;
  real relaxation_rate = 0;  ///< [1/s] velocity and field antennas (0: the default, set by the model setup)
};

/// Open-end options.
struct OpenEndSpec {
  real layer_width = 0;   ///< [m] 0 = no absorbing layer
  int layer_power = 2;    ///< 1, 2, 3: linear, quadratic, cubic
  std::optional<real> layer_damping;  ///< sigma_max [1/s]; default from the wave speed
};

/// A region whose reflection and transmission are measured.
struct RegionSpec {
  std::string name;
  real from = 0, to = 0;  ///< [m] its two edges (waves come from the `from` side)
};

/// Keys of one end beyond `kind`: the drive keys (driven) and the absorbing layer (open).
void declare_end_drive_keys(io::Section& end);
/// The `antennas` list and the wave-diagnostic keys of `output`.
void declare_drive_keys(io::Schema& schema);

/// The drive of a driven end, or of antenna `key` (`in_domain`).
DriveSpec read_drive(const io::RunFile& rf, const std::string& key, bool in_domain);
/// Check that an end that is not driven carries no drive keys, and that only open ends
/// carry layer keys.
void check_end_keys(const io::RunFile& rf, const EndSpec& end);
OpenEndSpec read_open_end(const io::RunFile& rf, const std::string& key);
std::vector<AntennaSpec> read_antennas(const io::RunFile& rf, const CaseSetup& c);
std::vector<RegionSpec> read_regions(const io::RunFile& rf, const CaseSetup& c);

/// Human-readable unit of a drive quantity's amplitude.
const char* drive_unit(DriveQuantity q);

}  // namespace tw
