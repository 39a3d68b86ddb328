#pragma once
/// Linear solves along the tube for implicit and whole-grid updates that couple two
/// variables per cell (the transverse field B_y, B_z): a block-tridiagonal system with
/// 2x2 blocks, optionally closed into a ring by two corner blocks (periodic ends):
///
///   A_i x_{i-1} + B_i x_i + C_i x_{i+1} = r_i,   i = 0 .. n-1,
///
/// where A_0 multiplies x_{n-1} and C_{n-1} multiplies x_0 (both zero for an open line).
///
/// Method: block Thomas elimination (block LU without pivoting; e.g. Golub & Van Loan,
/// "Matrix Computations", 4th ed. 2013, sect. 4.5 — section from memory). It is stable for
/// block diagonally dominant systems, ||B_i^-1|| (||A_i|| + ||C_i||) < 1, which the implicit
/// Hall/resistive and electron-inertia operators are (each row is I plus a non-negative
/// diffusion and a skew rotation). With corner blocks the last unknown is eliminated by
/// bordering: x_i = y_i - Z_i x_{n-1} with y, Z from the open system of the first n-1 rows
/// (one factorisation, three right-hand sides), then a 2x2 solve for x_{n-1}. Cost O(n).
#include <cmath>
#include <complex>
#include <vector>

#include "core/error.hpp"
#include "core/types.hpp"

namespace tw {

/// A 2-vector (the pair B_y, B_z of one cell).
struct V2 {
  real x = 0, y = 0;
};
/// A 2x2 matrix [[a, b], [c, d]].
struct M2 {
  real a = 0, b = 0, c = 0, d = 0;
  static M2 identity(real s = 1) { return {s, 0, 0, s}; }
  [[nodiscard]] bool is_zero() const { return a == 0 && b == 0 && c == 0 && d == 0; }
};

inline V2 operator+(V2 u, V2 v) { return {u.x + v.x, u.y + v.y}; }
inline V2 operator-(V2 u, V2 v) { return {u.x - v.x, u.y - v.y}; }
inline V2 operator*(real s, V2 v) { return {s * v.x, s * v.y}; }
inline V2 operator*(const M2& m, V2 v) { return {m.a * v.x + m.b * v.y, m.c * v.x + m.d * v.y}; }
inline M2 operator+(const M2& p, const M2& q) { return {p.a + q.a, p.b + q.b, p.c + q.c, p.d + q.d}; }
inline M2 operator-(const M2& p, const M2& q) { return {p.a - q.a, p.b - q.b, p.c - q.c, p.d - q.d}; }
inline M2 operator*(real s, const M2& m) { return {s * m.a, s * m.b, s * m.c, s * m.d}; }
inline M2 operator*(const M2& p, const M2& q) {
  return {p.a * q.a + p.b * q.c, p.a * q.b + p.b * q.d, p.c * q.a + p.d * q.c, p.c * q.b + p.d * q.d};
}
inline M2 inverse(const M2& m) {
  const real det = m.a * m.d - m.b * m.c;
  TW_CHECK(det != 0 && std::isfinite(det), "singular 2x2 block in a block-tridiagonal solve");
  const real inv = 1 / det;
  return {m.d * inv, -m.b * inv, -m.c * inv, m.a * inv};
}

namespace detail {

inline bool is_zero(const M2& m) { return m.is_zero(); }
inline bool is_zero(std::complex<real> z) { return z == std::complex<real>(0); }
inline std::complex<real> inverse(std::complex<real> z) {
  TW_CHECK(z != std::complex<real>(0) && std::isfinite(std::abs(z)), "singular pivot in a block-tridiagonal solve");
  return real(1) / z;
}

/// Block Thomas elimination with optional corner blocks (see the file comment), for 2x2
/// real blocks (Mat = M2, Vec = V2) or for blocks that are complex numbers (both complex).
template <class Mat, class Vec>
void solve_tridiagonal(const std::vector<Mat>& A, const std::vector<Mat>& B, const std::vector<Mat>& C,
                       std::vector<Vec>& r) {
  using tw::inverse;
  using detail::inverse;
  const std::size_t n = B.size();
  const bool ring = !is_zero(A[0]) || !is_zero(C[n - 1]);
  if (!ring) {
    // Forward elimination, keeping the inverted pivots.
    std::vector<Mat> Dinv(n);
    Dinv[0] = inverse(B[0]);
    for (std::size_t i = 1; i < n; ++i) {
      const Mat l = A[i] * Dinv[i - 1];
      Dinv[i] = inverse(B[i] - l * C[i - 1]);
      r[i] = r[i] - l * r[i - 1];
    }
    r[n - 1] = Dinv[n - 1] * r[n - 1];
    for (std::size_t i = n - 1; i-- > 0;) r[i] = Dinv[i] * (r[i] - C[i] * r[i + 1]);
    return;
  }
  TW_CHECK(n >= 3, "a periodic block-tridiagonal solve needs at least 3 rows");
  // Bordering: rows 0 .. m-1 in x_0 .. x_{m-1}, with the border unknown x_m (m = n-1)
  // entering row 0 through A_0 and row m-1 through C_{m-1}.
  const std::size_t m = n - 1;
  std::vector<Mat> Dinv(m), Z(m);
  std::vector<Vec> y(r.begin(), r.begin() + static_cast<long>(m));
  Z[0] = A[0];
  Z[m - 1] = Z[m - 1] + C[m - 1];
  Dinv[0] = inverse(B[0]);
  for (std::size_t i = 1; i < m; ++i) {
    const Mat l = A[i] * Dinv[i - 1];
    Dinv[i] = inverse(B[i] - l * C[i - 1]);
    y[i] = y[i] - l * y[i - 1];
    Z[i] = Z[i] - l * Z[i - 1];
  }
  y[m - 1] = Dinv[m - 1] * y[m - 1];
  Z[m - 1] = Dinv[m - 1] * Z[m - 1];
  for (std::size_t i = m - 1; i-- > 0;) {
    y[i] = Dinv[i] * (y[i] - C[i] * y[i + 1]);
    Z[i] = Dinv[i] * (Z[i] - C[i] * Z[i + 1]);
  }
  // Row m: A_m x_{m-1} + B_m x_m + C_m x_0 = r_m, with x_i = y_i - Z_i x_m.
  const Mat S = B[m] - A[m] * Z[m - 1] - C[m] * Z[0];
  const Vec xm = inverse(S) * (r[m] - A[m] * y[m - 1] - C[m] * y[0]);
  for (std::size_t i = 0; i < m; ++i) r[i] = y[i] - Z[i] * xm;
  r[m] = xm;
}

/// A block [[a, b], [-b, a]] acts on (x, y) as the complex number a - i b on x + i y.
inline bool is_complex(const M2& m) { return m.a == m.d && m.b == -m.c; }

}  // namespace detail

/// Solves the system described above in place: on return r holds x. A, B, C and r have n
/// entries each (n >= 3 when a corner block is non-zero, n >= 1 otherwise); A[0] and C[n-1]
/// are the corner blocks. A, B and C are not modified. When every block has the form
/// [[a, b], [-b, a]] (a diffusion and a rotation, as the Hall and resistive operators with
/// ends that treat B_y and B_z alike) the same elimination runs in complex arithmetic,
/// about four times cheaper.
inline void solve_block_tridiagonal(const std::vector<M2>& A, const std::vector<M2>& B, const std::vector<M2>& C,
                                    std::vector<V2>& r) {
  const std::size_t n = B.size();
  TW_CHECK(A.size() == n && C.size() == n && r.size() == n && n >= 1, "block-tridiagonal sizes differ");
  bool complex = true;
  for (std::size_t i = 0; i < n && complex; ++i)
    complex = detail::is_complex(A[i]) && detail::is_complex(B[i]) && detail::is_complex(C[i]);
  if (!complex) {
    detail::solve_tridiagonal(A, B, C, r);
    return;
  }
  using Z = std::complex<real>;
  auto z = [](const M2& m) { return Z(m.a, -m.b); };
  std::vector<Z> a(n), b(n), c(n), x(n);
  for (std::size_t i = 0; i < n; ++i) {
    a[i] = z(A[i]);
    b[i] = z(B[i]);
    c[i] = z(C[i]);
    x[i] = Z(r[i].x, r[i].y);
  }
  detail::solve_tridiagonal(a, b, c, x);
  for (std::size_t i = 0; i < n; ++i) r[i] = {x[i].real(), x[i].imag()};
}

}  // namespace tw
