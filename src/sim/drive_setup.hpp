#pragma once
/// Building the ends and antennas of a run for a model M from the run file (the keys are
/// in sim/drives.hpp). Capabilities come from the model's optional members: a velocity
/// drive needs transverse_velocity, a field drive transverse_field, a current antenna
/// external_current_source, antenna power and absorbing layers energy_density; a model
/// without them gets a ConfigError naming the key.
#include <algorithm>
#include <memory>
#include <sstream>
#include <string>
#include <vector>

#include "drive/absorbing_layer.hpp"
#include "drive/antenna.hpp"
#include "drive/boundary.hpp"
#include "drive/driven_end.hpp"
#include "drive/open_end.hpp"
#include "sim/case.hpp"
#include "sim/drives.hpp"
#include "sim/model_setup.hpp"

namespace tw {

/// A drive (driven end or antenna) as the diagnostics see it.
struct DriveInfo {
  std::string name;        ///< "left_end", "right_end" or the antenna's name
  std::string location;    ///< "left end", "right end" or "x = ... m"
  DriveQuantity quantity = DriveQuantity::velocity;
  DriveSignal signal;      ///< amplitude: v [m/s], b [T] or J0 [A/m^2]
  real sheet_length = 0;   ///< current antennas: integral of the shape w dx [m]: K0 = J0 * this
  int end = -1;            ///< 0 (left) or 1 (right) for driven ends
  int source = -1;         ///< index among the operator's source terms, for antennas
};

template <class M>
struct BuiltDrives {
  std::shared_ptr<const Boundary<M>> left, right;
  std::vector<std::shared_ptr<const SourceTerm<M>>> sources;  ///< antennas and layers
  std::vector<DriveInfo> drives;
  std::vector<int> layer_sources;  ///< indices of absorbing layers among `sources`
};

namespace detail {

template <Model M>
std::shared_ptr<const Boundary<M>> make_end(const io::RunFile& rf, const CaseSetup& c, const M& m,
                                            const Field<typename M::State>& W0, const EndSpec& e, Side side,
                                            BuiltDrives<M>& out) {
  if (e.kind == "periodic") return std::make_shared<PeriodicBoundary<M>>();
  if (e.kind == "zero-gradient") return std::make_shared<ZeroGradientBoundary<M>>();
  if (e.kind == "conducting") return std::make_shared<ConductingBoundary<M>>();
  const Grid& g = c.grid;
  const auto b0 = c.plasma.b0();
  if (e.kind == "driven") {
    DriveSpec d = read_drive(rf, e.key, false);
    DriveInfo info;
    info.name = std::string(side_name(side)) + "_end";
    info.location = std::string(side_name(side)) + " end";
    info.quantity = d.quantity;
    info.signal = d.signal;
    info.end = side == Side::left ? 0 : 1;
    if (d.quantity == DriveQuantity::velocity) {
      if constexpr (HasTransverseVelocity<M>) {
        out.drives.push_back(info);
        return std::make_shared<DrivenPlateBoundary<M>>(d.signal);
      } else {
        rf.fail(e.key + ".velocity_amplitude", std::string("the ") + M::name() + " model cannot be driven by a moving end");
      }
    } else {
      if constexpr (HasTransverseVelocity<M> && HasTransverseField<M>) {
        out.drives.push_back(info);
        return std::make_shared<DrivenFieldBoundary<M>>(d.signal, std::array<real, 2>{b0[1], b0[2]});
      } else {
        rf.fail(e.key + ".field_amplitude", std::string("the ") + M::name() + " model cannot be driven by a prescribed field");
      }
    }
  }
  if (e.kind == "open") {
    const OpenEndSpec o = read_open_end(rf, e.key);
    // The reference is the initial state at the end: what lies beyond it as the run starts.
    const auto W_ref = W0[side == Side::left ? 0 : g.n_cells - 1];
    if (o.layer_width > 0) {
      if constexpr (HasEnergyDensity<M>) {
        if (o.layer_width >= g.length) rf.fail(e.key + ".layer_width", "the absorbing layer is wider than the tube");
        const real v = m.signal_speeds(W_ref).abs_max();
        const real sigma = o.layer_damping ? *o.layer_damping : 5.0 * (o.layer_power + 1) * v / o.layer_width;
        Field<typename M::State> U_ref(g);
        for (int i = 0; i < g.n_cells; ++i) U_ref[i] = m.cons_from_prim(W0[i]);
        auto layer = std::make_shared<AbsorbingLayer<M>>(side, g, o.layer_width, o.layer_power, sigma, U_ref);
        if (layer->cell_count() == 0) rf.fail(e.key + ".layer_width", "the absorbing layer covers no cell; make it wider than a cell");
        out.layer_sources.push_back(static_cast<int>(out.sources.size()));
        out.sources.push_back(layer);
      } else {
        rf.fail(e.key + ".layer_width", std::string("the ") + M::name() + " model has no energy density for an absorbing layer");
      }
    }
    return std::make_shared<OpenBoundary<M>>(m, side, W_ref);
  }
  rf.fail(e.key + ".kind", "unknown end kind '" + e.kind + "'");
}

template <Model M>
void make_antenna(const io::RunFile& rf, const CaseSetup& c, const M& m, const Field<typename M::State>& W0,
                  const AntennaSpec& a, std::size_t index, BuiltDrives<M>& out) {
  const std::string key = "antennas[" + std::to_string(index) + "]";
  if constexpr (!HasEnergyDensity<M>) {
    rf.fail(key, std::string("the ") + M::name() + " model has no energy density, which antennas need");
  } else {
    const DriveQuantity q = a.drive.quantity;
    bool ok = false;
    if (q == DriveQuantity::current) ok = HasExternalCurrent<M>;
    if (q == DriveQuantity::velocity) ok = HasTransverseVelocity<M>;
    if (q == DriveQuantity::field) ok = HasTransverseField<M>;
    if (!ok)
      rf.fail(key, std::string("the ") + M::name() + " model cannot take a " + drive_quantity_name(q) + " antenna");
    AntennaCells cells = AntennaCells::sample(a.shape, c.grid);
    DriveInfo info;
    info.name = a.name;
    std::ostringstream loc;
    loc << "x = " << a.shape.centre << " m";
    info.location = loc.str();
    info.quantity = q;
    info.signal = a.drive.signal;
    if (q == DriveQuantity::current) {
      info.sheet_length = cells.integral(c.grid.dx());
      if (a.drive.sheet_current) info.signal.amplitude = *a.drive.sheet_current / info.sheet_length;
    }
    real nu = a.relaxation_rate;
    if (q != DriveQuantity::current && nu <= 0) {
      // Default: 10 v / W, with v the fastest signal speed at the antenna and W the
      // integral of its shape: a plasma whose fastest wave is the Alfven wave follows the
      // drive to v_d / 1.2 (see antenna.hpp), at a step limit of W / (40 v).
      const int ic = std::clamp(static_cast<int>((a.shape.centre - c.grid.x_min) / c.grid.dx()), 0, c.grid.n_cells - 1);
      nu = 10 * m.signal_speeds(W0[ic]).abs_max() / cells.integral(c.grid.dx());
    }
    const auto b0 = c.plasma.b0();
    info.source = static_cast<int>(out.sources.size());
    out.sources.push_back(std::make_shared<AntennaSource<M>>(a.name, q, info.signal, std::move(cells), nu,
                                                            std::array<real, 2>{b0[1], b0[2]}));
    out.drives.push_back(info);
  }
}

}  // namespace detail

/// Build both ends and every antenna of the run. `W0`: the initial primitive state, the
/// reference of open ends and absorbing layers.
template <Model M>
BuiltDrives<M> build_drives(const io::RunFile& rf, const CaseSetup& c, const M& m, const Field<typename M::State>& W0) {
  BuiltDrives<M> out;
  out.left = detail::make_end(rf, c, m, W0, c.left, Side::left, out);
  out.right = detail::make_end(rf, c, m, W0, c.right, Side::right, out);
  const auto antennas = read_antennas(rf, c);
  for (std::size_t i = 0; i < antennas.size(); ++i) detail::make_antenna(rf, c, m, W0, antennas[i], i, out);
  return out;
}

}  // namespace tw
