#include "diagnostics/omega_k.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>

#include "core/error.hpp"
#include "diagnostics/fft.hpp"

namespace tw::diag {

OmegaK omega_k_spectrum(const SeriesSet& snaps, const std::vector<real>& x_all, bool periodic_x,
                        std::size_t max_points) {
  OmegaK out;
  const std::size_t nt = uniform_prefix(snaps.t);
  TW_CHECK(x_all.size() == snaps.n_series, "omega_k_spectrum: positions and series differ");
  if (nt < 4 || x_all.size() < 4) {
    out.note = "too few snapshots or cells for a spectrum";
    return out;
  }
  std::size_t stride = 1;
  while (nt * ((x_all.size() + stride - 1) / stride) > max_points) ++stride;
  // A periodic record keeps its periodicity only with a stride dividing the cell count.
  if (periodic_x)
    while (x_all.size() % stride != 0) ++stride;
  out.x_stride = stride;
  if (stride > 1)
    out.note = "every " + std::to_string(stride) + "th cell used (the full transform exceeds " +
               std::to_string(max_points) + " points); |k| is limited to pi / (" + std::to_string(stride) +
               " dx)";
  const std::size_t nx = (x_all.size() + stride - 1) / stride;
  const real dt = snaps.t[1] - snaps.t[0];
  const real dx = (x_all[1] - x_all[0]) * static_cast<real>(stride);

  const std::vector<real> wt = hann(nt);
  const std::vector<real> wx = periodic_x ? std::vector<real>(nx, 1.0) : hann(nx);
  std::vector<cplx> a(nt * nx);
  for (std::size_t j = 0; j < nx; ++j) {
    const std::size_t col = j * stride;
    cplx mean(0, 0);
    for (std::size_t i = 0; i < nt; ++i) mean += snaps.at(i, col);
    mean /= static_cast<real>(nt);
    for (std::size_t i = 0; i < nt; ++i) a[i * nx + j] = (snaps.at(i, col) - mean) * wt[i] * wx[j];
  }
  // Along x: forward transform, bin m is k = 2 pi signed(m) / (nx dx).
  std::vector<cplx> row(nx);
  for (std::size_t i = 0; i < nt; ++i) {
    std::copy(a.begin() + static_cast<long>(i * nx), a.begin() + static_cast<long>((i + 1) * nx), row.begin());
    dft_inplace(row);
    std::copy(row.begin(), row.end(), a.begin() + static_cast<long>(i * nx));
  }
  // Along t: a forward transform gives e^{-i nu t}; bin m holds omega = -2 pi signed(m) / (nt dt).
  std::vector<cplx> col(nt);
  for (std::size_t j = 0; j < nx; ++j) {
    for (std::size_t i = 0; i < nt; ++i) col[i] = a[i * nx + j];
    dft_inplace(col);
    for (std::size_t i = 0; i < nt; ++i) a[i * nx + j] = col[i];
  }
  out.dk = 2 * std::numbers::pi / (static_cast<real>(nx) * dx);
  out.domega = 2 * std::numbers::pi / (static_cast<real>(nt) * dt);

  // Sorted axes: k bins from -nx/2 .. (nx-1)/2; omega from -nt/2.. or 0.. for real fields.
  const long kmin = -static_cast<long>(nx / 2), kmax = static_cast<long>((nx - 1) / 2);
  const long wmin = snaps.real_valued ? 0 : -static_cast<long>(nt / 2);
  const long wmax = static_cast<long>((nt - 1) / 2);
  for (long m = kmin; m <= kmax; ++m) out.k.push_back(static_cast<real>(m) * out.dk);
  for (long m = wmin; m <= wmax; ++m) out.omega.push_back(static_cast<real>(m) * out.domega);
  const std::size_t nk = out.k.size(), nw = out.omega.size();
  auto index_k = [&](long m) { return static_cast<std::size_t>((m % static_cast<long>(nx) + static_cast<long>(nx)) % static_cast<long>(nx)); };
  // omega = +m domega lives in forward bin -m.
  auto index_w = [&](long m) { return static_cast<std::size_t>(((-m) % static_cast<long>(nt) + static_cast<long>(nt)) % static_cast<long>(nt)); };
  out.power.assign(nw * nk, 0);
  real pmax = 0;
  for (std::size_t iw = 0; iw < nw; ++iw)
    for (std::size_t ik = 0; ik < nk; ++ik) {
      const real p = std::norm(a[index_w(wmin + static_cast<long>(iw)) * nx + index_k(kmin + static_cast<long>(ik))]);
      out.power[iw * nk + ik] = p;
      pmax = std::max(pmax, p);
    }
  if (!(pmax > 0)) {
    out.note += (out.note.empty() ? "" : "; ") + std::string("the field does not vary in time");
    return out;
  }
  for (auto& p : out.power) p /= pmax;

  auto P = [&](std::size_t iw, std::size_t ik) { return out.power[iw * nk + ik]; };
  auto lg = [](real p) { return std::log(p + 1e-300); };
  std::size_t best_w = 0, best_k = 0;
  for (std::size_t iw = 0; iw < nw; ++iw)
    for (std::size_t ik = 0; ik < nk; ++ik)
      if (P(iw, ik) > P(best_w, best_k)) {
        best_w = iw;
        best_k = ik;
      }
  // A parabola through the log power needs a peak spread over neighbouring bins; a line
  // exactly on a bin (a whole number of periods, no window) has nothing to refine.
  constexpr real spread = 1e-10;
  auto refine_w = [&](std::size_t iw, std::size_t ik) {
    if (iw == 0 || iw + 1 >= nw) return out.omega[iw];
    if (P(iw - 1, ik) < spread * P(iw, ik) || P(iw + 1, ik) < spread * P(iw, ik)) return out.omega[iw];
    return out.omega[iw] + out.domega * parabolic_peak_offset(lg(P(iw - 1, ik)), lg(P(iw, ik)), lg(P(iw + 1, ik)));
  };
  out.peak_omega = refine_w(best_w, best_k);
  out.peak_k = out.k[best_k];
  if (best_k > 0 && best_k + 1 < nk && P(best_w, best_k - 1) >= spread * P(best_w, best_k) &&
      P(best_w, best_k + 1) >= spread * P(best_w, best_k))
    out.peak_k += out.dk * parabolic_peak_offset(lg(P(best_w, best_k - 1)), lg(P(best_w, best_k)),
                                                 lg(P(best_w, best_k + 1)));
  constexpr real floor = 1e-4;  // 40 dB below the peak
  for (std::size_t ik = 0; ik < nk; ++ik) {
    if (out.k[ik] == 0) continue;
    std::size_t iw_best = 0;
    for (std::size_t iw = 0; iw < nw; ++iw)
      if (P(iw, ik) > P(iw_best, ik)) iw_best = iw;
    if (P(iw_best, ik) < floor) continue;
    out.ridge_k.push_back(out.k[ik]);
    out.ridge_omega.push_back(refine_w(iw_best, ik));
    out.ridge_omega_sigma.push_back(0.5 * out.domega);
    out.ridge_power.push_back(P(iw_best, ik));
  }
  return out;
}

}  // namespace tw::diag
