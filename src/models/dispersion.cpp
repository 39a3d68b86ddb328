// Eigenvalues and eigenvectors of the Fourier-transformed linearized operator (see
// dispersion.hpp).
#include "models/dispersion.hpp"

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>

#include "core/error.hpp"

namespace tw {

namespace {

using CMat = Eigen::MatrixXcd;
using CVec = Eigen::VectorXcd;
const cplx I(0, 1);

CMat cmat(const std::vector<real>& v, int n) {
  CMat m = CMat::Zero(n, n);
  if (v.empty()) return m;
  for (int r = 0; r < n; ++r)
    for (int c = 0; c < n; ++c) m(r, c) = v[static_cast<std::size_t>(r * n + c)];
  return m;
}

/// Coefficients of M(k) = M0 + k M1 + k^2 M2 and L(k) = L0 + k L1 + k^2 L2 (k = k_x).
struct Symbol {
  CMat M[3], L[3];
};

Symbol symbol(const DispersionInput& in) {
  const LinearCoefficients& c = in.coeffs;
  const int n = c.n;
  const real kp = in.k_perp;
  auto m = [&](const std::vector<real>& v) { return cmat(v, n); };
  Symbol s;
  s.M[0] = m(c.M0) + kp * kp * m(c.N[1][1]) - I * kp * m(c.N0[1]);
  s.M[1] = kp * (m(c.N[0][1]) + m(c.N[1][0])) - I * m(c.N0[0]);
  s.M[2] = m(c.N[0][0]);
  s.L[0] = m(c.S) - I * kp * (m(c.G[1]) + m(c.K0[1])) + kp * kp * m(c.K[1][1]) + m(c.Q0) + I * kp * m(c.Q[1]);
  s.L[1] = -I * (m(c.G[0]) + m(c.K0[0])) + kp * (m(c.K[0][1]) + m(c.K[1][0])) + I * m(c.Q[0]);
  s.L[2] = m(c.K[0][0]);
  return s;
}

CMat at(const CMat (&P)[3], cplx k) { return P[0] + k * P[1] + k * k * P[2]; }

/// Normalise a primitive eigenvector: the component largest relative to its scale is 1.
std::vector<cplx> normalised(const DispersionInput& in, const CVec& v) {
  const int n = static_cast<int>(v.size());
  int big = 0;
  real best = -1;
  for (int j = 0; j < n; ++j) {
    const real r = std::abs(v(j)) / in.scales[static_cast<std::size_t>(j)];
    if (r > best) {
      best = r;
      big = j;
    }
  }
  const cplx f = best > 0 ? 1.0 / v(big) : 1.0;
  std::vector<cplx> out(static_cast<std::size_t>(n));
  for (int j = 0; j < n; ++j) out[static_cast<std::size_t>(j)] = f * v(j) * in.scales[static_cast<std::size_t>(big)];
  return out;
}

/// Fastest rate of the symbol at wavenumber k: sets the "static" threshold.
real rate_scale(const std::vector<cplx>& omegas) {
  real s = 0;
  for (const cplx& w : omegas) s = std::max(s, std::abs(w));
  return s;
}

/// Eigenvalues omega and eigenvectors at real or complex k. The operator is balanced by the
/// variables' scales (D^-1 A D, D = diag(scale)): the variables span many orders of
/// magnitude in SI units, and unbalanced the eigen-solver's absolute error, ~1e-16 of the
/// largest entry, would swamp the slow branches.
void solve_at(const Symbol& s, const std::vector<real>& scale, cplx k, std::vector<cplx>& omega, CMat& vectors) {
  const int n = static_cast<int>(s.M[0].rows());
  Eigen::VectorXcd d(n), du(n);
  for (int j = 0; j < n; ++j) d(j) = scale[static_cast<std::size_t>(j)];
  // Rows by the size of the conserved variables (|M0| times the scales), so that the solve
  // M^-1 L does not mix entries many orders of magnitude apart.
  for (int r = 0; r < n; ++r) {
    real sum = 0;
    for (int c = 0; c < n; ++c) sum += std::abs(s.M[0](r, c)) * scale[static_cast<std::size_t>(c)];
    du(r) = sum > 0 ? 1 / sum : 1.0;
  }
  const CMat M = du.asDiagonal() * at(s.M, k) * d.asDiagonal(), L = du.asDiagonal() * at(s.L, k) * d.asDiagonal();
  const CMat A = M.partialPivLu().solve(L);
  Eigen::ComplexEigenSolver<CMat> es(A, true);
  TW_CHECK(es.info() == Eigen::Success, "dispersion: eigen-decomposition failed");
  omega.resize(static_cast<std::size_t>(n));
  real big = 0;
  for (int j = 0; j < n; ++j) big = std::max(big, std::abs(es.eigenvalues()(j)));
  for (int j = 0; j < n; ++j) {
    cplx w = I * es.eigenvalues()(j);
    // Imaginary parts below the solver's resolution (1e-13 of the fastest rate) are zero.
    if (std::abs(w.imag()) < 1e-13 * big) w = {w.real(), 0.0};
    omega[static_cast<std::size_t>(j)] = w;
  }
  vectors = d.asDiagonal() * es.eigenvectors();
}

}  // namespace

void label_mode(const DispersionInput& in, WaveMode& mode) {
  const VariableRoles& r = in.roles;
  mode.polarization.clear();
  mode.character.clear();
  if (r.bx < 0 || mode.vector.empty()) return;
  const auto& W0 = in.background;
  const std::array<real, 3> B0{W0[static_cast<std::size_t>(r.bx)], W0[static_cast<std::size_t>(r.by)],
                               W0[static_cast<std::size_t>(r.bz)]};
  const real b0 = std::sqrt(B0[0] * B0[0] + B0[1] * B0[1] + B0[2] * B0[2]);
  if (!(b0 > 0)) return;
  const std::array<real, 3> bh{B0[0] / b0, B0[1] / b0, B0[2] / b0};
  const std::array<cplx, 3> dB{mode.vector[static_cast<std::size_t>(r.bx)], mode.vector[static_cast<std::size_t>(r.by)],
                               mode.vector[static_cast<std::size_t>(r.bz)]};
  auto dot = [](const std::array<cplx, 3>& a, const std::array<real, 3>& e) {
    return a[0] * e[0] + a[1] * e[1] + a[2] * e[2];
  };
  auto cross = [](const std::array<real, 3>& a, const std::array<real, 3>& b) {
    return std::array<real, 3>{a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]};
  };
  // Transverse basis: e1 across the k-B0 plane (the shear direction), e2 = b x e1; along B0,
  // e1 = y. e1 x e2 = b, so rotation from e1 toward e2 is right-handed about B0.
  const real kx = mode.k.real(), kp = in.k_perp;
  const real kn = std::hypot(kx, kp);
  std::array<real, 3> e1{0, 1, 0};
  bool parallel = true;
  if (kn > 0) {
    const auto kxb = cross({kx / kn, kp / kn, 0}, bh);
    const real s = std::sqrt(kxb[0] * kxb[0] + kxb[1] * kxb[1] + kxb[2] * kxb[2]);
    if (s > 1e-6) {
      e1 = {kxb[0] / s, kxb[1] / s, kxb[2] / s};
      parallel = false;
    }
  }
  if (parallel) {  // make e1 perpendicular to B0 (y always is: B0 lies in the x-z plane)
    const real d = e1[0] * bh[0] + e1[1] * bh[1] + e1[2] * bh[2];
    for (int j = 0; j < 3; ++j) e1[static_cast<std::size_t>(j)] -= d * bh[static_cast<std::size_t>(j)];
    const real s = std::sqrt(e1[0] * e1[0] + e1[1] * e1[1] + e1[2] * e1[2]);
    for (auto& v : e1) v /= s;
  }
  const auto e2 = cross(bh, e1);
  const cplx a = dot(dB, e1), b = dot(dB, e2), par = dot(dB, bh);
  const real perp2 = std::norm(a) + std::norm(b);
  const real rho0 = r.rho >= 0 ? W0[static_cast<std::size_t>(r.rho)] : 0;
  const real drho = r.rho >= 0 && rho0 > 0 ? std::abs(mode.vector[static_cast<std::size_t>(r.rho)]) / rho0 : 0;
  // Density weighted as in the wave energy, c_s |drho|/rho0 against v_A |dB|/B0, so that a
  // density perturbation counts as compressive only where it carries comparable energy.
  real p0 = r.p >= 0 ? W0[static_cast<std::size_t>(r.p)] : 0;
  if (r.p_extra >= 0) p0 += W0[static_cast<std::size_t>(r.p_extra)];
  const real weight = rho0 > 0 ? std::min(1.0, std::sqrt(std::max(p0, 0.0) * in.mu0) / b0) : 1.0;
  const real field = std::sqrt(perp2 + std::norm(par)) / b0;
  // Magnetic perturbation negligible against the density's: electrostatic.
  if (field < 1e-3 * drho) {
    mode.character = r.ex >= 0 ? "electrostatic" : "compressive";
    return;
  }
  // Polarization of the transverse field: V = 2 Im(conj(a) b) / (|a|^2 + |b|^2) in [-1, 1],
  // +1 for rotation from e1 to e2 in time when Re(omega) > 0.
  if (perp2 > 0 && std::sqrt(perp2) / b0 > 1e-3 * std::max(drho, field)) {
    const real V = 2 * std::imag(std::conj(a) * b) / perp2 * (mode.omega.real() >= 0 ? 1.0 : -1.0);
    const char* hand = V > 0 ? "R" : "L";
    if (std::abs(V) > 0.95) mode.polarization = hand;
    else if (std::abs(V) < 0.05) mode.polarization = "linear";
    else mode.polarization = std::string("elliptic ") + hand;
  }
  const real shear = (parallel ? std::sqrt(perp2) : std::abs(a)) / b0;
  const real compressive = std::max({weight * drho, std::abs(par) / b0, parallel ? 0.0 : std::abs(b) / b0});
  if (shear > 3 * compressive) mode.character = parallel ? "transverse" : "shear";
  else if (compressive > 3 * shear) mode.character = "compressive";
  else mode.character = "mixed";
}

BranchSet branches_at(const DispersionInput& in, real kx, bool group_speeds) {
  const Symbol s = symbol(in);
  std::vector<cplx> omega;
  CMat V;
  solve_at(s, in.scales, kx, omega, V);
  const real scale = rate_scale(omega);
  BranchSet out;
  for (std::size_t j = 0; j < omega.size(); ++j) {
    if (std::abs(omega[j]) <= 1e-9 * scale) {
      ++out.static_modes;
      continue;
    }
    WaveMode m;
    m.omega = omega[j];
    m.k = kx;
    m.vector = normalised(in, V.col(static_cast<Eigen::Index>(j)));
    label_mode(in, m);
    out.modes.push_back(std::move(m));
  }
  std::sort(out.modes.begin(), out.modes.end(), [](const WaveMode& a, const WaveMode& b) {
    return a.omega.real() < b.omega.real() || (a.omega.real() == b.omega.real() && a.omega.imag() > b.omega.imag());
  });
  if (group_speeds && kx != 0) {
    // d Re(omega)/dk by central differences, each branch matched to the nearest eigenvalue.
    const real h = 1e-5 * std::abs(kx);
    std::vector<cplx> wp, wm;
    CMat tmp;
    solve_at(s, in.scales, kx + h, wp, tmp);
    solve_at(s, in.scales, kx - h, wm, tmp);
    auto nearest = [](const std::vector<cplx>& ws, cplx w) {
      cplx best = ws.front();
      for (const cplx& v : ws)
        if (std::abs(v - w) < std::abs(best - w)) best = v;
      return best;
    };
    for (WaveMode& m : out.modes) m.group_speed = (nearest(wp, m.omega).real() - nearest(wm, m.omega).real()) / (2 * h);
  }
  return out;
}

std::vector<NumberedMode> numbered_branches(const BranchSet& set) {
  std::vector<NumberedMode> fwd, bwd, none;
  for (const WaveMode& m : set.modes) {
    const real s = 1e-6 * std::abs(m.omega);
    if (m.omega.real() > s) fwd.push_back({m, 0, "forward"});
    else if (m.omega.real() < -s) bwd.push_back({m, 0, "backward"});
    else none.push_back({m, 0, m.omega.imag() > 0 ? "growing" : "damped"});
  }
  // set.modes is sorted by Re(omega): forward ascending, backward by descending Re (ascending |Re|).
  std::reverse(bwd.begin(), bwd.end());
  for (std::size_t j = 0; j < fwd.size(); ++j) fwd[j].number = static_cast<int>(j + 1);
  for (std::size_t j = 0; j < bwd.size(); ++j) bwd[j].number = -static_cast<int>(j + 1);
  fwd.insert(fwd.end(), bwd.begin(), bwd.end());
  fwd.insert(fwd.end(), none.begin(), none.end());
  return fwd;
}

std::vector<WaveMode> forward_branches(const DispersionInput& in, real kx) {
  std::vector<WaveMode> out;
  for (auto& m : branches_at(in, kx, false).modes) {
    const real scale = std::abs(m.omega);
    if (m.omega.real() > 1e-6 * scale) out.push_back(std::move(m));
  }
  return out;
}

std::vector<WaveMode> wavenumbers_at(const DispersionInput& in, real omega, real k_max) {
  TW_CHECK(omega > 0, "wavenumbers_at needs omega > 0");
  const Symbol s = symbol(in);
  const int n = in.coeffs.n;
  // Balanced: rows by the size of the conserved variables, columns by the primitives'.
  Eigen::VectorXcd dw(n), du(n);
  for (int j = 0; j < n; ++j) dw(j) = in.scales[static_cast<std::size_t>(j)];
  for (int r = 0; r < n; ++r) {
    real sum = 0;
    for (int c = 0; c < n; ++c) sum += std::abs(s.M[0](r, c)) * in.scales[static_cast<std::size_t>(c)];
    du(r) = sum > 0 ? 1 / sum : 1.0;
  }
  CMat P[3];
  for (int j = 0; j < 3; ++j) P[j] = du.asDiagonal() * (-I * omega * s.M[j] - s.L[j]) * dw.asDiagonal();
  // A wavenumber scale: omega over the fastest speed of the ideal flux along x.
  real vmax = 0;
  {
    const CMat A = dw.asDiagonal().inverse() * s.M[0].partialPivLu().solve(s.L[1]) * dw.asDiagonal();  // ~ -i speeds
    Eigen::ComplexEigenSolver<CMat> es(A, false);
    for (int j = 0; j < n; ++j) vmax = std::max(vmax, std::abs(es.eigenvalues()(j)));
  }
  const real ks = vmax > 0 ? omega / vmax : 1.0;
  if (!(k_max > 0)) k_max = 1e6 * ks;
  // A shift sigma where P is regular (try a few points off the real axis).
  cplx sigma = ks * cplx(0.37, 0.23);
  CMat Ps = at(P, sigma);
  for (int tries = 0; tries < 8; ++tries) {
    Eigen::JacobiSVD<CMat> svd(Ps);
    const auto sv = svd.singularValues();
    if (sv(n - 1) > 1e-10 * sv(0)) break;
    sigma *= cplx(1.7, 0.4);
    Ps = at(P, sigma);
  }
  const auto lu = Ps.partialPivLu();
  const CMat B1 = lu.solve(P[1] + 2.0 * sigma * P[2]), B0 = lu.solve(P[2]);
  CMat C = CMat::Zero(2 * n, 2 * n);
  C.topLeftCorner(n, n) = -B1;
  C.topRightCorner(n, n) = -B0;
  C.bottomLeftCorner(n, n) = CMat::Identity(n, n);
  Eigen::ComplexEigenSolver<CMat> es(C, true);
  TW_CHECK(es.info() == Eigen::Success, "dispersion: companion eigen-decomposition failed");
  std::vector<WaveMode> out;
  for (int j = 0; j < 2 * n; ++j) {
    const cplx mu = es.eigenvalues()(j);
    if (std::abs(mu) < 1e-12 / std::abs(sigma)) continue;  // infinite root
    const cplx k = sigma + 1.0 / mu;
    if (!(std::abs(k) < k_max)) continue;
    CVec v = es.eigenvectors().col(j).tail(n);
    // Refine the null vector of P(k) (smallest singular vector) for the labels.
    const CMat Pk = at(P, k);
    Eigen::JacobiSVD<CMat> svd(Pk, Eigen::ComputeFullV);
    const auto sv = svd.singularValues();
    if (sv(n - 1) > 1e-6 * sv(0)) continue;  // not a root after all (an artefact of the shift)
    v = dw.asDiagonal() * svd.matrixV().col(n - 1);
    WaveMode m;
    m.omega = omega;
    m.k = k;
    m.vector = normalised(in, v);
    label_mode(in, m);
    // Group speed along the branch: from the forward problem at Re k (weakly damped roots).
    out.push_back(std::move(m));
  }
  std::sort(out.begin(), out.end(), [](const WaveMode& a, const WaveMode& b) {
    const real qa = std::abs(a.k.imag()) / std::max(std::abs(a.k.real()), 1e-300);
    const real qb = std::abs(b.k.imag()) / std::max(std::abs(b.k.real()), 1e-300);
    return qa < qb;
  });
  return out;
}

}  // namespace tw
