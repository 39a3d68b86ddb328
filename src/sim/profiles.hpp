#pragma once
/// Profiles along the tube for the background plasma (density, temperatures): a plain
/// number (uniform), or a map with a `shape`:
///
///   uniform      value
///   linear       left (value at x_min), right (value at x_max), straight line between
///   tanh         left, right, centre, width:  left + (right - left) (1 + tanh((x - centre)/width)) / 2
///                (the value changes over about two widths around centre)
///   exponential  value, centre, scale_length:  value exp((x - centre) / scale_length)
///                (scale_length may be negative: decaying along +x)
///   gaussian     background, peak, centre, width:
///                background + (peak - background) exp(-4 ln 2 (x - centre)^2 / width^2)
///                (width is the full width at half maximum; peak below background is a well)
///   table        file: a CSV table with columns x [m], n [m^-3], T_e [eV], T_i [eV]
///                (see io/table.hpp); linear interpolation; x must increase strictly and
///                cover the whole tube; the column read is the one of the key (n for the
///                density, T_e, T_i for the temperatures)
///
/// `centre` defaults to the middle of the tube. Every profile is checked on the cell centres
/// of the grid: a density must be > 0 and a temperature >= 0 everywhere (ConfigError naming
/// the key, the position and the value).
#include <string>

#include "grid/grid.hpp"
#include "io/runfile.hpp"
#include "io/schema.hpp"
#include "sim/plasma.hpp"

namespace tw {

/// Declare key `name` of `parent` as a profile: a number in `unit`, or the map form.
/// Returns the key for modifiers (range of the number form, default, require).
io::KeySpec& declare_profile_key(io::Section& parent, const std::string& name, const std::string& unit,
                                 const std::string& doc);

/// What a profile may hold, for the checks on the grid.
enum class ProfileSign { positive, non_negative };

/// Read the profile at `key` (number or map). `table_column` is the CSV column it takes
/// from a table ("n", "T_e", "T_i"). The grid is used for the default centre, the coverage
/// of tables and the sign checks.
Profile read_profile(const io::RunFile& rf, const std::string& key, const Grid& grid,
                     const std::string& table_column, ProfileSign sign);

}  // namespace tw
