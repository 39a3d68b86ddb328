#pragma once
/// The wave diagnostics of a run, written next to the fields (layout in the README's
/// output table):
///
///   /budget         (series, history cadence) energy per unit area: kinetic, thermal,
///                   magnetic, electric, total; energy in through each end and the mean
///                   flux over the last interval; work of the antennas; energy removed by
///                   absorbing layers; heating by resistivity, viscosity and collisions;
///                   the residual of the balance
///   /antenna_power  (series, history cadence, one column per drive) cumulative work,
///                   mean power over the last interval, and the drive signal
///   /antennas/NAME  (after the run) mean power, its window, energy, mean square drive,
///                   radiation resistance or load
///   /elsasser       (series, snapshot cadence) forward and backward Alfven-wave parts
///   /region_waves   (series, probe cadence, one column per region) incident, reflected
///                   and transmitted parts and powers
///   /regions/NAME   (after the run) energies, reflection and transmission coefficients
///
/// The run loop calls this object; nothing here changes the state.
#include <algorithm>
#include <cmath>
#include <limits>
#include <optional>
#include <sstream>
#include <string>
#include <vector>

#include "diagnostics/energy.hpp"
#include "diagnostics/wave_meters.hpp"
#include "io/output.hpp"
#include "sim/drive_setup.hpp"
#include "sim/loop_state.hpp"
#include "time/stepper.hpp"

namespace tw {

template <Model M>
class WaveOutput {
 public:
  using State = typename M::State;

  WaveOutput(const io::RunFile& rf, const CaseSetup& c, std::vector<DriveInfo> drives, std::vector<int> layers)
      : c_(c), drives_(std::move(drives)), layers_(std::move(layers)), records_(drives_.size()) {
    const auto b0 = c.plasma.b0();
    bg_.b = {b0[1], b0[2]};
    bg_.v = {c.plasma.flow[1], c.plasma.flow[2]};
    elsasser_ = rf.get_bool("output.elsasser");
    for (const auto& r : read_regions(rf, c)) {
      meters_.emplace_back(r.name, r.from, r.to);
      region_points_.push_back({point(r.from), point(r.to)});
    }
    if constexpr (!HasAlfvenFields<M>) {
      if (!meters_.empty())
        rf.fail("output.regions", std::string("the ") + M::name() + " model offers no Alfven-wave fields for regions");
    }
  }

  [[nodiscard]] bool has_regions() const { return !meters_.empty(); }

  void create(io::OutputFile& out) {
    const std::string e = c_.units.unit("J m^-2"), p = c_.units.unit("W m^-2"), v = c_.units.unit("m/s");
    if constexpr (HasEnergyDensity<M>) {
      std::vector<io::ColumnInfo> cols{
          {"kinetic", e, "kinetic energy per unit area"},
          {"thermal", e, "thermal energy per unit area"},
          {"magnetic", e, "magnetic energy per unit area (including the constant B_x)"},
          {"electric", e, "electric energy per unit area"},
          {"total", e, "total energy per unit area"},
          {"inflow_left", e, "energy in through the left end since the start (Poynting plus material flux)"},
          {"inflow_right", e, "energy in through the right end since the start"},
          {"flux_left", p, "mean energy flux in through the left end over the last interval"},
          {"flux_right", p, "mean energy flux in through the right end over the last interval"},
          {"antenna_work", e, "work done by the antennas inside the tube since the start"},
          {"absorbed", e, "energy removed by absorbing layers since the start"},
          {"resistive_heating", e, "heat released by resistivity since the start"},
          {"viscous_heating", e, "heat released by viscosity since the start"},
          {"collisional_heating", e, "heat released by collisional friction since the start"},
          {"heat_lost", e, "dissipated energy that leaves the model (isothermal closure) since the start"},
          {"residual", e, "total - total(0) - inflows - antenna_work + absorbed + heat_lost: zero when the budget closes"},
      };
      budget_ = out.create_series("budget", cols, 1, 256, false);
    }
    if (!drives_.empty()) {
      std::vector<io::ColumnInfo> cols{
          {"work", e, "work done by each drive since the start (driven ends: energy in through the end)"},
          {"power", p, "mean power of each drive over the last interval"},
          {"signal_y", "1", "drive signal, y component, divided by its amplitude"},
          {"signal_z", "1", "drive signal, z component, divided by its amplitude"},
      };
      antennas_ = out.create_series("antenna_power", cols, static_cast<int>(drives_.size()), 256, false);
    }
    if constexpr (HasAlfvenFields<M>) {
      if (elsasser_ && c_.plasma.b0()[0] != 0) {
        std::vector<io::ColumnInfo> cols{
            {"forward_y", v, "forward (+x) Alfven-wave part of the transverse velocity, y"},
            {"forward_z", v, "forward (+x) Alfven-wave part of the transverse velocity, z"},
            {"backward_y", v, "backward (-x) Alfven-wave part of the transverse velocity, y"},
            {"backward_z", v, "backward (-x) Alfven-wave part of the transverse velocity, z"},
        };
        elsasser_series_ = out.create_series("elsasser", cols, c_.grid.n_cells, 1, true);
      }
      if (!meters_.empty()) {
        std::vector<io::ColumnInfo> cols{
            {"incident_y", v, "incident Alfven-wave part at the region's `from` edge, y"},
            {"incident_z", v, "incident part, z"},
            {"reflected_y", v, "reflected part at the `from` edge, y"},
            {"reflected_z", v, "reflected part, z"},
            {"transmitted_y", v, "transmitted part at the `to` edge, y"},
            {"transmitted_z", v, "transmitted part, z"},
            {"incident_power", p, "energy flux of the incident part"},
            {"reflected_power", p, "energy flux of the reflected part"},
            {"transmitted_power", p, "energy flux of the transmitted part"},
        };
        regions_series_ = out.create_series("region_waves", cols, static_cast<int>(meters_.size()), 256, false);
      }
    }
  }

  /// At the start (t = 0) and after every step: cumulative work of every drive.
  void after_step(real t, const Stepper<M>& st) {
    for (std::size_t j = 0; j < drives_.size(); ++j) records_[j].add(t, work(j, st));
  }

  /// A history row: budget and antenna power. `W`: the primitive field at t (as the run
  /// loop recovers it for output, whole-grid where the model needs that).
  void history(real t, long step, const M& m, const Field<State>& W, const Stepper<M>& st) {
    const real dt = t - t_hist_;
    if constexpr (HasEnergyDensity<M>) {
      const EnergyParts ep = integrate_energy(m, W, c_.grid);
      const real total = ep.total();
      if (!have_total0_) {
        total0_ = total;
        have_total0_ = true;
      }
      const auto& in = st.energy_inflow();
      real antenna = 0, absorbed = 0;
      const auto& sw = st.source_work();
      for (std::size_t j = 0; j < sw.size(); ++j) {
        if (std::find(layers_.begin(), layers_.end(), static_cast<int>(j)) != layers_.end())
          absorbed -= sw[j];
        else
          antenna += sw[j];
      }
      const Dissipation& d = st.dissipated();
      const real lost = d.retained ? 0.0 : d.total();
      const real flux_l = dt > 0 ? (in[0] - in_prev_[0]) / dt : 0.0;
      const real flux_r = dt > 0 ? (in[1] - in_prev_[1]) / dt : 0.0;
      const real residual = (total - total0_) - in[0] - in[1] - antenna + absorbed + lost;
      const std::vector<real> row{ep.kinetic, ep.thermal, ep.magnetic, ep.electric, total, in[0], in[1],
                                  flux_l, flux_r, antenna, absorbed, d.resistive, d.viscous,
                                  d.collisional, lost, residual};
      budget_->append(t, step, row);
      in_prev_ = in;
    }
    if (antennas_) {
      const std::size_t nd = drives_.size();
      std::vector<real> row(4 * nd);
      work_prev_.resize(nd, 0.0);
      for (std::size_t j = 0; j < nd; ++j) {
        const real w = work(j, st);
        row[j] = w;
        row[nd + j] = dt > 0 ? (w - work_prev_[j]) / dt : 0.0;
        work_prev_[j] = w;
        const DriveSignal& s = drives_[j].signal;
        const auto v = s.polarization.apply(s.waveform.at(t));
        row[2 * nd + j] = v[0];
        row[3 * nd + j] = v[1];
      }
      antennas_->append(t, step, row);
    }
    t_hist_ = t;
  }

  /// A snapshot: the Elsasser parts of every cell (W: primitives, as for history).
  void snapshot(real t, long step, const M& m, const Field<State>& W) {
    if constexpr (HasAlfvenFields<M>) {
      if (!elsasser_series_) return;
      const int n = c_.grid.n_cells;
      buf_.assign(4 * static_cast<std::size_t>(n), 0.0);
      for (int i = 0; i < n; ++i) {
        const ElsasserSample e = elsasser(m, W[i], bg_);
        const auto I = static_cast<std::size_t>(i), N = static_cast<std::size_t>(n);
        buf_[I] = e.fy;
        buf_[N + I] = e.fz;
        buf_[2 * N + I] = e.gy;
        buf_[3 * N + I] = e.gz;
      }
      elsasser_series_->append(t, step, buf_);
    } else {
      (void)t, (void)step, (void)m, (void)W;
    }
  }

  /// A region sample (probe cadence; W: primitives).
  void region_sample(real t, long step, const M& m, const Field<State>& W) {
    if constexpr (HasAlfvenFields<M>) {
      if (meters_.empty()) return;
      const std::size_t nr = meters_.size();
      std::vector<real> row(9 * nr);
      for (std::size_t r = 0; r < nr; ++r) {
        meters_[r].sample(t, at(m, W, region_points_[r][0]), at(m, W, region_points_[r][1]));
        const auto l = meters_[r].latest();
        for (std::size_t k = 0; k < 9; ++k) row[k * nr + r] = l[k];
      }
      regions_series_->append(t, step, row);
    } else {
      (void)t, (void)step, (void)m, (void)W;
    }
  }

  /// Summaries after the run (t_end: the time reached); returns one line per drive and
  /// region for the log.
  std::vector<std::string> finish(io::OutputFile& out, real t_end) {
    std::vector<std::string> notes;
    const std::string e = c_.units.unit("J m^-2"), p = c_.units.unit("W m^-2"), s = c_.units.unit("s");
    // A model without an energy density (a linearized one) has no drive power to report.
    for (std::size_t j = 0; HasEnergyDensity<M> && j < drives_.size(); ++j) {
      const DriveInfo& d = drives_[j];
      const auto win = d.signal.averaging_window(t_end);
      const real pm = records_[j].mean_power(win[0], win[1]);
      const real ms = d.signal.mean_square(win[0], win[1]);  // in the amplitude's unit squared
      const real nan = std::numeric_limits<real>::quiet_NaN();
      real resistance = nan, load = nan, sheet = nan;
      if (d.quantity == DriveQuantity::current && ms > 0) {
        sheet = d.signal.amplitude * d.sheet_length;
        resistance = pm / (ms * d.sheet_length * d.sheet_length);
      }
      if (d.quantity == DriveQuantity::field && ms > 0) resistance = pm * c_.units.mu0 * c_.units.mu0 / ms;
      if (d.quantity == DriveQuantity::velocity && ms > 0) load = pm / ms;
      const std::string au = c_.units.unit(drive_unit(d.quantity));
      std::vector<io::ParameterValue> vals{
          {"column", static_cast<real>(j), "1", "column of this drive in /antenna_power"},
          {"amplitude", d.signal.amplitude, au, "drive amplitude (current antennas: peak current density J0)"},
          {"sheet_current", sheet, c_.units.unit("A/m"), "current antennas: peak sheet current K0 = J0 * integral of the shape"},
          {"energy", records_[j].last(), e, "work done by the drive over the run"},
          {"mean_power", pm, p, "mean power delivered over the averaging window (radiated power per unit area)"},
          {"window_start", win[0], s, "start of the averaging window"},
          {"window_end", win[1], s, "end of the averaging window"},
          {"drive_mean_square", ms, c_.units.unit(std::string(drive_unit(d.quantity)) + "^2"),
           "mean square of the drive quantity over the window"},
          {"radiation_resistance", resistance, c_.units.unit("ohm"),
           "current drive: mean power / mean square sheet current; field drive: with K = b / mu0 (NaN otherwise)"},
          {"load", load, c_.units.unit("kg m^-2 s^-1"),
           "velocity drive: mean power / mean square velocity, the force per unit area and velocity (NaN otherwise)"},
      };
      std::ostringstream note;
      note.precision(4);
      note << d.name << " (" << drive_quantity_name(d.quantity) << " drive at " << d.location << "): mean power "
           << pm << " W/m^2 over [" << win[0] << ", " << win[1] << "] s, energy " << records_[j].last() << " J/m^2";
      if (std::isfinite(resistance)) note << ", radiation resistance " << resistance << " ohm";
      if (std::isfinite(load)) note << ", load " << load << " kg/(m^2 s)";
      if (c_.units.normalized) note << " (code units)";
      notes.push_back(note.str());
      out.write_scalars("antennas/" + d.name, vals,
                        {{"location", d.location},
                         {"quantity", drive_quantity_name(d.quantity)},
                         {"waveform", d.signal.waveform.describe()},
                         {"polarization", d.signal.polarization.describe()}});
    }
    for (const auto& mtr : meters_) {
      const auto r = mtr.result();
      std::vector<io::ParameterValue> vals{
          {"from", mtr.from(), c_.units.unit("m"), "edge the waves come from"},
          {"to", mtr.to(), c_.units.unit("m"), "edge the transmitted waves leave by"},
          {"incident_energy", r.incident_energy, e, "energy of the incident Alfven waves through `from`"},
          {"reflected_energy", r.reflected_energy, e, "energy of the reflected waves back through `from`"},
          {"transmitted_energy", r.transmitted_energy, e, "energy of the transmitted waves through `to`"},
          {"reflection", r.reflection, "1", "amplitude reflection coefficient sqrt(reflected / incident energy)"},
          {"transmission", r.transmission, "1", "energy transmission coefficient transmitted / incident"},
          {"velocity_reflection", r.velocity_reflection, "1",
           "signed reflection coefficient of the transverse velocity (pulses and bursts)"},
          {"delay", r.delay, s, "delay between incident and reflected signals at `from`"},
      };
      out.write_scalars("regions/" + mtr.name(), vals);
      std::ostringstream note;
      note.precision(4);
      note << "region " << mtr.name() << " (" << mtr.from() << " -> " << mtr.to() << " m): reflection "
           << r.reflection << " (velocity " << r.velocity_reflection << "), energy transmission " << r.transmission;
      notes.push_back(note.str());
    }
    return notes;
  }

  [[nodiscard]] const std::vector<DriveInfo>& drives() const { return drives_; }

  /// What this object carries from step to step, as named accumulators for checkpoints
  /// (sim/loop_state.hpp): the work records of the drives, the region meters' samples and
  /// the budget's running values. Restored exactly, a continued run writes what an
  /// uninterrupted one would. The object must outlive the accumulators.
  void add_checkpoint_state(std::vector<std::pair<std::string, Accumulator>>& acc) {
    for (std::size_t j = 0; j < records_.size(); ++j)
      acc.emplace_back("drive_work_" + std::to_string(j),
                       Accumulator{[this, j] { return records_[j].state(); },
                                   [this, j](std::span<const real> s) { records_[j].restore(s); }});
    for (std::size_t r = 0; r < meters_.size(); ++r)
      acc.emplace_back("region_" + std::to_string(r),
                       Accumulator{[this, r] { return meters_[r].state(); },
                                   [this, r](std::span<const real> s) { meters_[r].restore(s); }});
    acc.emplace_back("budget_running",
                     Accumulator{[this] {
                                   std::vector<real> v{total0_, t_hist_, have_total0_ ? 1.0 : 0.0, in_prev_[0],
                                                       in_prev_[1]};
                                   v.insert(v.end(), work_prev_.begin(), work_prev_.end());
                                   return v;
                                 },
                                 [this](std::span<const real> v) {
                                   if (v.size() < 5) throw InputError("it holds " + std::to_string(v.size()) + " values");
                                   total0_ = v[0];
                                   t_hist_ = v[1];
                                   have_total0_ = v[2] != 0;
                                   in_prev_ = {v[3], v[4]};
                                   work_prev_.assign(v.begin() + 5, v.end());
                                 }});
  }

 private:
  struct Point {
    int i0 = 0;
    real w = 0;
  };
  Point point(real x) const {
    const Grid& g = c_.grid;
    const real s = (x - g.x_min) / g.dx() - 0.5;
    int i0 = std::clamp(static_cast<int>(std::floor(s)), 0, std::max(0, g.n_cells - 2));
    return {i0, g.n_cells > 1 ? std::clamp(s - i0, real(0), real(1)) : 0};
  }
  ElsasserSample at(const M& m, const Field<State>& W, const Point& p) const {
    const ElsasserSample a = elsasser(m, W[p.i0], bg_);
    const ElsasserSample b = elsasser(m, W[std::min(p.i0 + 1, c_.grid.n_cells - 1)], bg_);
    return ElsasserSample::mix(a, b, p.w);
  }
  real work(std::size_t j, const Stepper<M>& st) const {
    const DriveInfo& d = drives_[j];
    if (d.end >= 0) return st.energy_inflow()[static_cast<std::size_t>(d.end)];
    const auto& sw = st.source_work();
    return d.source >= 0 && static_cast<std::size_t>(d.source) < sw.size() ? sw[static_cast<std::size_t>(d.source)] : 0.0;
  }

  CaseSetup c_;
  std::vector<DriveInfo> drives_;
  std::vector<int> layers_;
  std::vector<WorkRecord> records_;
  TransverseBackground bg_;
  bool elsasser_ = true;
  std::vector<RegionMeter> meters_;
  std::vector<std::array<Point, 2>> region_points_;
  std::optional<io::Series> budget_, antennas_, elsasser_series_, regions_series_;
  real total0_ = 0, t_hist_ = 0;
  bool have_total0_ = false;
  std::array<real, 2> in_prev_{};
  std::vector<real> work_prev_;
  std::vector<real> buf_;
};

}  // namespace tw
