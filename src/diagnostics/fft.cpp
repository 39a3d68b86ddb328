#include "diagnostics/fft.hpp"

#include <cmath>
#include <algorithm>
#include <numbers>
#include <utility>

#include "core/error.hpp"

namespace tw::diag {

std::size_t next_pow2(std::size_t n) {
  std::size_t p = 1;
  while (p < n) p <<= 1U;
  return p;
}

void fft_inplace(std::vector<cplx>& a, bool inverse) {
  const std::size_t n = a.size();
  TW_CHECK(n > 0 && (n & (n - 1)) == 0, "FFT length " + std::to_string(n) + " is not a power of two");
  // Bit-reversal permutation.
  for (std::size_t i = 1, j = 0; i < n; ++i) {
    std::size_t bit = n >> 1U;
    for (; (j & bit) != 0; bit >>= 1U) j ^= bit;
    j ^= bit;
    if (i < j) std::swap(a[i], a[j]);
  }
  // Danielson-Lanczos butterflies; twiddles from cos/sin per stage (accurate to round-off,
  // no accumulated recurrence error).
  const real sign = inverse ? 1.0 : -1.0;
  for (std::size_t len = 2; len <= n; len <<= 1U) {
    const std::size_t half = len >> 1U;
    std::vector<cplx> w(half);
    for (std::size_t k = 0; k < half; ++k) {
      const real ang = sign * 2 * std::numbers::pi * static_cast<real>(k) / static_cast<real>(len);
      w[k] = cplx(std::cos(ang), std::sin(ang));
    }
    for (std::size_t i = 0; i < n; i += len) {
      for (std::size_t k = 0; k < half; ++k) {
        const cplx u = a[i + k];
        const cplx v = a[i + k + half] * w[k];
        a[i + k] = u + v;
        a[i + k + half] = u - v;
      }
    }
  }
  if (inverse) {
    const real s = 1 / static_cast<real>(n);
    for (auto& v : a) v *= s;
  }
}

void dft_inplace(std::vector<cplx>& a) {
  const std::size_t n = a.size();
  if (n == 0) return;
  if ((n & (n - 1)) == 0) {
    fft_inplace(a);
    return;
  }
  // X_m = conj(c_m) sum_j (x_j conj(c_j)) c_(m-j), with the chirp c_j = exp(i pi j^2 / n):
  // a convolution, done with power-of-two transforms of length >= 2n - 1.
  std::vector<cplx> chirp(n);
  for (std::size_t j = 0; j < n; ++j) {
    // j^2 mod 2n keeps the angle small (exact in integers) for long transforms.
    const std::size_t jj = (j * j) % (2 * n);
    const real ang = std::numbers::pi * static_cast<real>(jj) / static_cast<real>(n);
    chirp[j] = cplx(std::cos(ang), std::sin(ang));
  }
  const std::size_t m = next_pow2(2 * n - 1);
  std::vector<cplx> f(m, cplx(0, 0)), g(m, cplx(0, 0));
  for (std::size_t j = 0; j < n; ++j) f[j] = a[j] * std::conj(chirp[j]);
  g[0] = chirp[0];
  for (std::size_t j = 1; j < n; ++j) g[j] = g[m - j] = chirp[j];
  fft_inplace(f);
  fft_inplace(g);
  for (std::size_t j = 0; j < m; ++j) f[j] *= g[j];
  fft_inplace(f, true);
  for (std::size_t j = 0; j < n; ++j) a[j] = f[j] * std::conj(chirp[j]);
}

std::vector<real> hann(std::size_t n) {
  std::vector<real> w(n);
  for (std::size_t j = 0; j < n; ++j) {
    const real s = std::sin(std::numbers::pi * (static_cast<real>(j) + 0.5) / static_cast<real>(n));
    w[j] = s * s;
  }
  return w;
}

long signed_bin(std::size_t m, std::size_t n) {
  return m < n / 2 ? static_cast<long>(m) : static_cast<long>(m) - static_cast<long>(n);
}

real parabolic_peak_offset(real a, real b, real c) {
  const real denom = a - 2 * b + c;
  if (!(denom < 0)) return 0;  // flat or not a maximum
  const real d = 0.5 * (a - c) / denom;
  return std::clamp(d, real(-0.5), real(0.5));
}

}  // namespace tw::diag
