// The discrete linearized equations: precomputation (upwind projectors, local operators,
// step limits) and the sparse solve of electron inertia. See linear_system.hpp.
#include "models/linear_system.hpp"

#include <Eigen/Dense>
#include <Eigen/Sparse>
#include <Eigen/SparseLU>
#include <algorithm>
#include <cmath>
#include <complex>
#include <mutex>

#include "core/constants.hpp"
#include "core/error.hpp"
#include "core/parallel.hpp"

namespace tw {

namespace {

using Mat = Eigen::MatrixXd;
using CMat = Eigen::MatrixXcd;
using cplx = std::complex<real>;

Mat to_mat(const std::vector<real>& v, int n) {
  Mat m = Mat::Zero(n, n);
  if (v.empty()) return m;
  for (int r = 0; r < n; ++r)
    for (int c = 0; c < n; ++c) m(r, c) = v[static_cast<std::size_t>(r * n + c)];
  return m;
}

void append(std::vector<real>& out, const Mat& m) {
  for (int r = 0; r < m.rows(); ++r)
    for (int c = 0; c < m.cols(); ++c) out.push_back(m(r, c));
}

/// y = M x for an n x n row-major block at `m`.
inline void matvec(const real* m, const real* x, real* y, int n) {
  for (int r = 0; r < n; ++r) {
    real s = 0;
    const real* row = m + static_cast<std::ptrdiff_t>(r) * n;
    for (int c = 0; c < n; ++c) s += row[c] * x[c];
    y[r] = s;
  }
}
inline void matvec_add(const real* m, const real* x, real* y, int n, real scale = 1) {
  for (int r = 0; r < n; ++r) {
    real s = 0;
    const real* row = m + static_cast<std::ptrdiff_t>(r) * n;
    for (int c = 0; c < n; ++c) s += row[c] * x[c];
    y[r] += scale * s;
  }
}

/// The positive part A+ = R max(Lambda, 0) R^-1 of a matrix with real eigenvalues, from its
/// eigen-decomposition, or from the matrix sign function where the eigenvectors are
/// ill-conditioned. Also returns the largest |eigenvalue|.
Mat positive_part(const Mat& A, real& spectral_radius) {
  const int n = static_cast<int>(A.rows());
  const real norm = std::max(A.lpNorm<Eigen::Infinity>(), real(1e-300));
  Eigen::EigenSolver<Mat> es(A);
  TW_CHECK(es.info() == Eigen::Success, "eigen-decomposition of a flux Jacobian failed");
  const auto lambda = es.eigenvalues();
  spectral_radius = 0;
  for (int k = 0; k < n; ++k) spectral_radius = std::max(spectral_radius, std::abs(lambda(k)));
  const CMat R = es.eigenvectors();
  Eigen::JacobiSVD<CMat> svd(R);
  const auto sv = svd.singularValues();
  const real cond = sv(n - 1) > 0 ? sv(0) / sv(n - 1) : std::numeric_limits<real>::infinity();
  if (cond < 1e6) {
    CMat Lp = CMat::Zero(n, n);
    for (int k = 0; k < n; ++k) Lp(k, k) = lambda(k).real() > 0 ? cplx(lambda(k).real(), 0) : cplx(0, 0);
    const CMat Ap = R * Lp * R.inverse();
    const Mat out = Ap.real();
    // Check: A+ and A - A+ reproduce A, and the imaginary part is round-off.
    if (Ap.imag().lpNorm<Eigen::Infinity>() < 1e-9 * norm) return out;
  }
  // Newton's iteration for sign(A - eps I): the shift moves zero eigenvalues (waves at
  // rest, closure constraints) off the imaginary axis; their sign does not matter, since
  // A+ = A (I + sign)/2 multiplies them by zero. Scaled by |det|^(-1/n) (Higham 2008, 5.5).
  const real eps = 1e-9 * norm;
  Mat S = A - eps * Mat::Identity(n, n);
  for (int it = 0; it < 100; ++it) {
    const Eigen::PartialPivLU<Mat> lu(S);
    const Mat Si = lu.inverse();
    const real det = std::abs(lu.determinant());
    const real mu = det > 0 && std::isfinite(det) ? std::pow(det, -1.0 / n) : 1.0;
    const Mat next = 0.5 * (mu * S + Si / mu);
    const real change = (next - S).lpNorm<Eigen::Infinity>();
    S = next;
    if (change < 1e-13 * S.lpNorm<Eigen::Infinity>()) break;
  }
  return 0.5 * A * (Mat::Identity(n, n) + S);
}

/// (I + sign(A - shift I))/2: the projector onto the eigenvalues above `shift`, from the
/// eigen-decomposition or, where that is ill-conditioned, from A+ of the shifted matrix.
Mat projector_above(const Mat& A, real shift) {
  const int n = static_cast<int>(A.rows());
  const Mat I = Mat::Identity(n, n);
  const Mat B = A - shift * I;
  real rho = 0;
  // A+ = B (I + sign B)/2, so (I + sign B)/2 = B^-1 A+ where B is regular (the shift
  // keeps it so).
  return B.partialPivLu().solve(positive_part(B, rho));
}

/// Complex n x n matrix as a 2n x 2n real one acting on (re, im).
Mat realify(const Mat& re, const Mat& im) {
  const auto n = re.rows();
  Mat out(2 * n, 2 * n);
  out << re, -im, im, re;
  return out;
}

}  // namespace

struct LinearSystem::Factorization {
  std::mutex mutex;
  bool ready = false;
  std::vector<real> key;  // the linear part of the ends it was built for
  Eigen::SparseLU<Eigen::SparseMatrix<real>> lu;
};

LinearSystem::~LinearSystem() = default;

LinearSystem::LinearSystem(const LinearSystemSpec& spec)
    : n_(spec.n), cells_(static_cast<int>(spec.cell.size())), dx_(spec.dx), k_(spec.k_perp),
      stiff_(spec.stiff_source), lu_(std::make_shared<Factorization>()) {
  const int n = n_;
  TW_CHECK(n > 0 && cells_ > 0 && static_cast<int>(spec.face.size()) == cells_ + 1, "linear system: bad sizes");
  for (const auto& c : spec.cell) {
    gradient_ = gradient_ || c.gradient();
    inertia_ = inertia_ || c.inertia();
  }
  const real k = k_;
  const real dx = dx_;
  auto mat = [&](const std::vector<real>& v) { return to_mat(v, n); };

  // Faces: upwind projectors, gradient and inertia coefficients.
  for (int f = 0; f <= cells_; ++f) {
    const LinearCoefficients& c = spec.face[static_cast<std::size_t>(f)];
    const Mat M0 = mat(c.M0);
    const Mat A = mat(c.G[0]) * M0.inverse();
    // Balanced by the sizes of the conserved variables, s_U = |M0| s_W (SI variables span
    // many orders of magnitude): A+ = S (S^-1 A S)+ S^-1.
    Eigen::VectorXd su = Eigen::VectorXd::Ones(n);
    if (!c.scale.empty())
      for (int r = 0; r < n; ++r) {
        real sum = 0;
        for (int q = 0; q < n; ++q) sum += std::abs(M0(r, q)) * c.scale[static_cast<std::size_t>(q)];
        if (sum > 0) su(r) = sum;
      }
    real rho = 0;
    const Mat Ap = su.asDiagonal() * positive_part(su.asDiagonal().inverse() * A * su.asDiagonal(), rho) *
                   su.asDiagonal().inverse();
    append(gp_, Ap * M0);
    append(gm_, (A - Ap) * M0);
    speed_.push_back(rho);
    max_speed_ = std::max(max_speed_, rho);
    if (f == 0 || f == cells_) {
      // Outgoing characteristics of the end, in w: M0^-1 P_u M0. Zero speeds count as
      // outgoing (extrapolated), hence the shift by a small multiple of the largest speed.
      const real shift = 1e-7 * std::max(rho, real(1e-300));
      const Mat As = su.asDiagonal().inverse() * A * su.asDiagonal();
      Mat Pu = f == 0 ? Mat(Mat::Identity(n, n) - projector_above(As, shift)) : projector_above(As, -shift);
      Pu = su.asDiagonal() * Pu * su.asDiagonal().inverse();
      append(out_[f == 0 ? 0 : 1], M0.inverse() * Pu * M0);
    }
    if (gradient_) {
      // Q_x d_x w = d_x(Q_x w) - (d_x Q_x) w: the first part as the face flux -Q_x w.
      append(ga_re_, mat(c.K0[0]) - mat(c.Q[0]));
      append(ga_im_, k * (mat(c.K[0][1]) + mat(c.K[1][0])));
      append(gd_, mat(c.K[0][0]) / dx);
    }
    if (inertia_) {
      append(na_re_, mat(c.N0[0]));
      append(na_im_, k * (mat(c.N[0][1]) + mat(c.N[1][0])));
      append(nd_, mat(c.N[0][0]) / dx);
    }
  }

  // Cells: mass matrices, the local operator, the stiff source; step limits.
  real s_y = 0, grad_rate = 0, source_rate = 0;
  for (int i = 0; i < cells_; ++i) {
    const LinearCoefficients& c = spec.cell[static_cast<std::size_t>(i)];
    const LinearCoefficients& fl = spec.face[static_cast<std::size_t>(i)];
    const LinearCoefficients& fr = spec.face[static_cast<std::size_t>(i + 1)];
    const Mat M0 = mat(c.M0);
    const Mat M0i = M0.inverse();
    append(m0_, M0);
    append(m0inv_, M0i);
    Mat Lre = Mat::Zero(n, n), Lim = Mat::Zero(n, n);
    if (k != 0) {
      Lim -= k * (mat(c.G[1]) + mat(c.K0[1]));
      if (gradient_) {
        Lre += k * k * mat(c.K[1][1]);
        Lim += k * (mat(fr.K[1][0]) - mat(fl.K[1][0])) / dx;
      }
      Eigen::EigenSolver<Mat> es(mat(c.G[1]) * M0i, false);
      for (int j = 0; j < n; ++j) s_y = std::max(s_y, std::abs(es.eigenvalues()(j)));
    }
    if (!c.Q0.empty() || !c.Q[0].empty()) {
      Lre += mat(c.Q0) - (mat(fr.Q[0]) - mat(fl.Q[0])) / dx;
      Lim += k * mat(c.Q[1]);
    }
    if (c.source()) {
      const Mat SU = mat(c.S) * M0i;
      if (stiff_) {
        Lre += mat(c.S);  // moved to the stiff step below, with the k_perp terms
      } else {
        Lre += mat(c.S);
        Eigen::EigenSolver<Mat> es(SU, false);
        for (int j = 0; j < n; ++j) source_rate = std::max(source_rate, std::abs(es.eigenvalues()(j)));
      }
    }
    if (stiff_) {
      append(su_re_, Lre * M0i);
      append(su_im_, Lim * M0i);
      Lre.setZero();
      Lim.setZero();
    }
    local_ = local_ || Lre.lpNorm<Eigen::Infinity>() > 0 || Lim.lpNorm<Eigen::Infinity>() > 0;
    append(l_re_, Lre);
    append(l_im_, Lim);
    Mat Mre = M0, Mim = Mat::Zero(n, n);
    if (inertia_) {
      Mre += k * k * mat(c.N[1][1]);
      Mim += -k * mat(c.N0[1]) + k * (mat(fr.N[1][0]) - mat(fl.N[1][0])) / dx;
      append(mc_re_, Mre);
      append(mc_im_, Mim);
    }
    if (gradient_) {
      // The gradient terms at the largest wavenumber of the grid, kx = 2/dx (the
      // three-point second difference reaches 4/dx^2): rates lambda of the symbol
      // M(k)^-1 (kx^2 K_xx + kx k (K_xy + K_yx) + k^2 K_yy), for both signs of kx.
      for (real kx : {2 / dx, -2 / dx}) {
        const Mat D = kx * kx * mat(c.K[0][0]) + kx * k * (mat(c.K[0][1]) + mat(c.K[1][0])) + k * k * mat(c.K[1][1]);
        Mat Mk = M0;
        if (inertia_) Mk += kx * kx * mat(c.N[0][0]) + kx * k * (mat(c.N[0][1]) + mat(c.N[1][0])) + k * k * mat(c.N[1][1]);
        // (U = C - div P with P = N grad w: the mass symbol is M0 + kx^2 N_xx + ...)
        Eigen::EigenSolver<Mat> es(Mk.inverse() * D, false);
        for (int j = 0; j < n; ++j) {
          const cplx lam = es.eigenvalues()(j);
          // SSP-RK3 keeps |Im(lambda dt)| <= sqrt(3) and Re(lambda dt) >= -2.5: limit
          // dispersive rates at 4/pi and diffusive ones at 2 (the explicit Hall and
          // resistive limits of the nonlinear models, README).
          grad_rate = std::max(grad_rate, std::abs(lam.real()) / 2 + std::abs(lam.imag()) / (4 / constants::pi));
        }
      }
    }
  }
  if (k != 0 && !stiff_)
    limits_.push_back({"perpendicular wavenumber (with the flux along x)", 1 / (max_speed_ / dx + k * s_y)});
  stiff_cache_ = std::make_shared<StiffCache>();
  if (grad_rate > 0) limits_.push_back({spec.gradient_limit_name, 1 / grad_rate});
  if (source_rate > 0) limits_.push_back({"local source", 1 / source_rate});
}

real LinearSystem::upwind_flux(int f, const real* wl, const real* wr, real* out) const {
  const int n = n_;
  const auto off = static_cast<std::size_t>(f) * static_cast<std::size_t>(n * n);
  const real* gp = gp_.data() + off;
  const real* gm = gm_.data() + off;
  for (int part = 0; part < 2; ++part) {
    matvec(gp, wl + part * n, out + part * n, n);
    matvec_add(gm, wr + part * n, out + part * n, n);
  }
  return speed_[static_cast<std::size_t>(f)];
}

void LinearSystem::gradient_flux(int f, const real* wl, const real* wr, real* out) const {
  const int n = n_;
  for (int k = 0; k < 2 * n; ++k) out[k] = 0;
  if (!gradient_) return;
  const auto off = static_cast<std::size_t>(f) * static_cast<std::size_t>(n * n);
  std::vector<real> avg(static_cast<std::size_t>(2 * n)), dif(static_cast<std::size_t>(2 * n));
  for (int k = 0; k < 2 * n; ++k) {
    avg[static_cast<std::size_t>(k)] = 0.5 * (wl[k] + wr[k]);
    dif[static_cast<std::size_t>(k)] = wr[k] - wl[k];
  }
  const real* ar = ga_re_.data() + off;
  const real* ai = ga_im_.data() + off;
  const real* d = gd_.data() + off;
  const real* are = avg.data();
  const real* aim = avg.data() + n;
  matvec_add(ar, are, out, n);
  matvec_add(ai, aim, out, n, -1);
  matvec_add(ai, are, out + n, n);
  matvec_add(ar, aim, out + n, n);
  matvec_add(d, dif.data(), out, n);
  matvec_add(d, dif.data() + n, out + n, n);
}

void LinearSystem::local_rhs(int i, const real* w, real* out) const {
  const int n = n_;
  for (int k = 0; k < 2 * n; ++k) out[k] = 0;
  if (!local_) return;
  const auto off = static_cast<std::size_t>(i) * static_cast<std::size_t>(n * n);
  const real* lr = l_re_.data() + off;
  const real* li = l_im_.data() + off;
  matvec_add(lr, w, out, n);
  matvec_add(li, w + n, out, n, -1);
  matvec_add(li, w, out + n, n);
  matvec_add(lr, w + n, out + n, n);
}

struct LinearSystem::StiffCache {
  std::mutex mutex;
  real dt = -1;
  std::vector<real> T;  // per cell: (I - dt A/2)^-1 (I + dt A/2), 2n x 2n row-major
};

void LinearSystem::stiff_step(real dt, real* u) const {
  if (su_re_.empty()) return;
  const int n = n_, nn = 2 * n;
  const auto blk = static_cast<std::size_t>(nn * nn);
  {
    std::lock_guard<std::mutex> lock(stiff_cache_->mutex);
    StiffCache& sc = *stiff_cache_;
    // Steps toward an output time differ from the last by round-off: reuse the matrices
    // when dt agrees to 1e-10 (an error of that size relative to dt A, far below the scheme's).
    if (!(std::abs(sc.dt - dt) <= 1e-10 * dt)) {
      sc.T.resize(blk * static_cast<std::size_t>(cells_));
      const Mat I = Mat::Identity(nn, nn);
#pragma omp parallel for schedule(static) if (run_parallel(cells_))
      for (int i = 0; i < cells_; ++i) {
        const auto off = static_cast<std::size_t>(i) * static_cast<std::size_t>(n * n);
        using RowMap = Eigen::Map<const Eigen::Matrix<real, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor>>;
        const Mat A = realify(RowMap(su_re_.data() + off, n, n), RowMap(su_im_.data() + off, n, n));
        const Mat T = (I - 0.5 * dt * A).partialPivLu().solve(I + 0.5 * dt * A);
        Eigen::Map<Eigen::Matrix<real, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor>>(
            sc.T.data() + static_cast<std::size_t>(i) * blk, nn, nn) = T;
      }
      sc.dt = dt;
    }
  }
  const real* T = stiff_cache_->T.data();
#pragma omp parallel for schedule(static) if (run_parallel(cells_))
  for (int i = 0; i < cells_; ++i) {
    real* ui = u + static_cast<std::ptrdiff_t>(i) * nn;
    real tmp[128];
    std::vector<real> big;
    real* y = tmp;
    if (nn > 128) {
      big.resize(static_cast<std::size_t>(nn));
      y = big.data();
    }
    matvec(T + static_cast<std::size_t>(i) * blk, ui, y, nn);
    for (int k = 0; k < nn; ++k) ui[k] = y[k];
  }
}

void LinearSystem::to_primitive(int i, const real* u, real* w) const {
  const int n = n_;
  const real* mi = m0inv_.data() + static_cast<std::size_t>(i) * static_cast<std::size_t>(n * n);
  matvec(mi, u, w, n);
  matvec(mi, u + n, w + n, n);
}

void LinearSystem::to_conservative(int i, const real* w, real* u) const {
  const int n = n_;
  const real* m = m0_.data() + static_cast<std::size_t>(i) * static_cast<std::size_t>(n * n);
  matvec(m, w, u, n);
  matvec(m, w + n, u + n, n);
}

namespace {

/// The inertia operator's blocks for cell i: coefficients of w_{i-1}, w_i, w_{i+1} in U_i
/// (2n x 2n real each), from U_i = Mc_i w_i - (P_{i+1/2} - P_{i-1/2})/dx with
/// P_f = A_f (w_{f-1} + w_f)/2 + D_f (w_f - w_{f-1}).
struct RowBlocks {
  Mat lower, diag, upper;
};

}  // namespace

void LinearSystem::to_conservative_coupled(const real* wg, real* u) const {
  const int n = n_, nn = 2 * n;
  auto face = [&](const std::vector<real>& v, int f) {
    return Eigen::Map<const Eigen::Matrix<real, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor>>(
        v.data() + static_cast<std::size_t>(f) * static_cast<std::size_t>(n * n), n, n);
  };
  auto P = [&](int f) {  // P_f (2n) from cells f-1 and f (wg points at cell -1)
    Eigen::Map<const Eigen::VectorXd> wl(wg + static_cast<std::ptrdiff_t>(f) * nn, nn);
    Eigen::Map<const Eigen::VectorXd> wr(wg + static_cast<std::ptrdiff_t>(f + 1) * nn, nn);
    const Eigen::VectorXd avg = 0.5 * (wl + wr), dif = wr - wl;
    const Mat A = realify(face(na_re_, f), face(na_im_, f));
    Mat D = Mat::Zero(nn, nn);
    D.topLeftCorner(n, n) = face(nd_, f);
    D.bottomRightCorner(n, n) = face(nd_, f);
    return Eigen::VectorXd(A * avg + D * dif);
  };
  for (int i = 0; i < cells_; ++i) {
    Eigen::Map<const Eigen::VectorXd> wi(wg + static_cast<std::ptrdiff_t>(i + 1) * nn, nn);
    const Mat Mc = realify(face(mc_re_, i), face(mc_im_, i));
    Eigen::Map<Eigen::VectorXd> ui(u + static_cast<std::ptrdiff_t>(i) * nn, nn);
    ui = Mc * wi - (P(i + 1) - P(i)) / dx_;
  }
}

void LinearSystem::to_primitive_coupled(const real* u, const GhostAffine& ends, real* w) const {
  const int n = n_, nn = 2 * n, nc = cells_;
  auto face = [&](const std::vector<real>& v, int f) {
    return Eigen::Map<const Eigen::Matrix<real, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor>>(
        v.data() + static_cast<std::size_t>(f) * static_cast<std::size_t>(n * n), n, n);
  };
  auto block = [&](const std::vector<real>& v) {
    return Eigen::Map<const Eigen::Matrix<real, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor>>(v.data(), nn, nn);
  };
  auto rows = [&](int i) {
    // P_f = (A_f/2 - D_f) w_{f-1} + (A_f/2 + D_f) w_f, as 2n x 2n blocks.
    auto parts = [&](int f, Mat& left, Mat& right) {
      const Mat A = realify(face(na_re_, f), face(na_im_, f));
      Mat D = Mat::Zero(nn, nn);
      D.topLeftCorner(n, n) = face(nd_, f);
      D.bottomRightCorner(n, n) = face(nd_, f);
      left = 0.5 * A - D;
      right = 0.5 * A + D;
    };
    Mat lL, lR, rL, rR;
    parts(i, lL, lR);      // face i-1/2: w_{i-1}, w_i
    parts(i + 1, rL, rR);  // face i+1/2: w_i, w_{i+1}
    RowBlocks b;
    b.lower = lL / dx_;
    b.diag = realify(face(mc_re_, i), face(mc_im_, i)) - (rL - lR) / dx_;
    b.upper = -rR / dx_;
    return b;
  };
  std::vector<real> key = ends.L0;
  key.insert(key.end(), ends.Ln.begin(), ends.Ln.end());
  key.insert(key.end(), ends.R0.begin(), ends.R0.end());
  key.insert(key.end(), ends.Rn.begin(), ends.Rn.end());
  const int N = nn * nc;
  std::lock_guard<std::mutex> lock(lu_->mutex);
  if (!lu_->ready || lu_->key != key) {
    std::vector<Eigen::Triplet<real>> t;
    auto put = [&](int bi, int bj, const Mat& m) {
      for (int r = 0; r < nn; ++r)
        for (int c = 0; c < nn; ++c)
          if (m(r, c) != 0) t.emplace_back(bi * nn + r, bj * nn + c, m(r, c));
    };
    for (int i = 0; i < nc; ++i) {
      const RowBlocks b = rows(i);
      put(i, i, b.diag);
      if (i > 0) {
        put(i, i - 1, b.lower);
      } else {  // w_{-1} = L0 w_0 + Ln w_{nc-1} + l
        put(i, 0, b.lower * block(ends.L0));
        put(i, nc - 1, b.lower * block(ends.Ln));
      }
      if (i < nc - 1) {
        put(i, i + 1, b.upper);
      } else {  // w_{nc} = R0 w_0 + Rn w_{nc-1} + r
        put(i, 0, b.upper * block(ends.R0));
        put(i, nc - 1, b.upper * block(ends.Rn));
      }
    }
    Eigen::SparseMatrix<real> A(N, N);
    A.setFromTriplets(t.begin(), t.end());  // duplicates (ring of a few cells) are summed
    lu_->lu.compute(A);
    TW_CHECK(lu_->lu.info() == Eigen::Success, "electron-inertia operator: sparse LU failed");
    lu_->key = key;
    lu_->ready = true;
  }
  Eigen::VectorXd rhs = Eigen::Map<const Eigen::VectorXd>(u, N);
  const Eigen::Map<const Eigen::VectorXd> l(ends.l.data(), nn), r(ends.r.data(), nn);
  rhs.segment(0, nn) -= rows(0).lower * l;
  rhs.segment((nc - 1) * nn, nn) -= rows(nc - 1).upper * r;
  Eigen::Map<Eigen::VectorXd>(w, N) = lu_->lu.solve(rhs);
}

}  // namespace tw
