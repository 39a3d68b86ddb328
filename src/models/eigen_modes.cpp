#include "models/eigen_modes.hpp"

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>
#include <numeric>

#include "core/error.hpp"

namespace tw {

ModeSet primitive_modes(int n, const std::function<void(const real*, real*)>& flux,
                        const std::function<void(const real*, real*)>& cons,
                        const std::vector<real>& W0, const std::vector<real>& scale) {
  TW_CHECK(static_cast<int>(W0.size()) == n && static_cast<int>(scale.size()) == n, "size mismatch");
  Eigen::MatrixXd dF(n, n), dU(n, n);
  std::vector<real> wp(W0), wm(W0), fp(static_cast<std::size_t>(n)), fm(fp), up(fp), um(fp);
  for (int j = 0; j < n; ++j) {
    const auto J = static_cast<std::size_t>(j);
    const real h = 1e-6 * scale[J];
    wp = W0;
    wm = W0;
    wp[J] += h;
    wm[J] -= h;
    flux(wp.data(), fp.data());
    flux(wm.data(), fm.data());
    cons(wp.data(), up.data());
    cons(wm.data(), um.data());
    for (int i = 0; i < n; ++i) {
      const auto I = static_cast<std::size_t>(i);
      dF(i, j) = (fp[I] - fm[I]) / (2 * h);
      dU(i, j) = (up[I] - um[I]) / (2 * h);
    }
  }
  const Eigen::MatrixXd A = dU.partialPivLu().solve(dF);
  Eigen::EigenSolver<Eigen::MatrixXd> es(A);
  TW_CHECK(es.info() == Eigen::Success, "eigen-decomposition failed");
  const auto ev = es.eigenvalues();
  const auto vecs = es.eigenvectors();
  std::vector<int> order(static_cast<std::size_t>(n));
  std::iota(order.begin(), order.end(), 0);
  std::sort(order.begin(), order.end(), [&](int a, int b) { return ev(a).real() < ev(b).real(); });
  ModeSet out;
  for (int idx : order) {
    out.speeds.push_back(ev(idx).real());
    out.max_imag = std::max(out.max_imag, std::abs(ev(idx).imag()));
    std::vector<real> v(static_cast<std::size_t>(n));
    for (int i = 0; i < n; ++i) v[static_cast<std::size_t>(i)] = vecs(i, idx).real();
    out.vectors.push_back(std::move(v));
  }
  return out;
}

}  // namespace tw

namespace tw {

CharacteristicBasis conservative_basis(int n, const std::function<void(const real*, real*)>& flux,
                                       const std::vector<real>& U0, const std::vector<real>& scale) {
  TW_CHECK(static_cast<int>(U0.size()) == n && static_cast<int>(scale.size()) == n, "size mismatch");
  Eigen::MatrixXd A(n, n);
  std::vector<real> up(U0), um(U0), fp(static_cast<std::size_t>(n)), fm(fp);
  for (int j = 0; j < n; ++j) {
    const auto J = static_cast<std::size_t>(j);
    const real h = 1e-6 * scale[J];
    TW_CHECK(h > 0, "numerical Jacobian needs positive scales");
    up = U0;
    um = U0;
    up[J] += h;
    um[J] -= h;
    flux(up.data(), fp.data());
    flux(um.data(), fm.data());
    for (int i = 0; i < n; ++i) A(i, j) = (fp[static_cast<std::size_t>(i)] - fm[static_cast<std::size_t>(i)]) / (2 * h);
  }
  // Balance the matrix by the scales (A' = D^-1 A D) so that the eigen-solver sees numbers
  // of similar size whatever the units; eigenvectors are scaled back below.
  Eigen::MatrixXd B(n, n);
  for (int i = 0; i < n; ++i)
    for (int j = 0; j < n; ++j)
      B(i, j) = A(i, j) * scale[static_cast<std::size_t>(j)] / scale[static_cast<std::size_t>(i)];
  Eigen::EigenSolver<Eigen::MatrixXd> es(B);
  TW_CHECK(es.info() == Eigen::Success, "eigen-decomposition failed");
  const auto ev = es.eigenvalues();
  Eigen::MatrixXd R = es.eigenvectors().real();
  std::vector<int> order(static_cast<std::size_t>(n));
  std::iota(order.begin(), order.end(), 0);
  std::sort(order.begin(), order.end(), [&](int a, int b) { return ev(a).real() < ev(b).real(); });
  Eigen::MatrixXd Rs(n, n);
  CharacteristicBasis out;
  for (int c = 0; c < n; ++c) {
    const int idx = order[static_cast<std::size_t>(c)];
    out.speeds.push_back(ev(idx).real());
    out.max_imag = std::max(out.max_imag, std::abs(ev(idx).imag()));
    Rs.col(c) = R.col(idx);
  }
  const Eigen::MatrixXd Ls = Rs.fullPivLu().inverse();
  for (int c = 0; c < n; ++c) {
    std::vector<real> r(static_cast<std::size_t>(n)), l(static_cast<std::size_t>(n));
    for (int i = 0; i < n; ++i) {
      const auto I = static_cast<std::size_t>(i);
      r[I] = Rs(i, c) * scale[I];  // back to unscaled variables
      l[I] = Ls(c, i) / scale[I];
    }
    out.right.push_back(std::move(r));
    out.left.push_back(std::move(l));
  }
  return out;
}

}  // namespace tw
