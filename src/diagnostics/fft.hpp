#pragma once
/// A small radix-2 fast Fourier transform and the window used by the spectral estimates.
///
/// Sign convention (the one every diagnostic here uses): the forward transform is
///   X_m = sum_n x_n exp(-2 pi i m n / N),
/// so a wave exp(i (k x - omega t)) appears at +k in a spatial transform and at -omega in a
/// temporal one; spectra of waves are therefore built with exp(+i omega t) in time (see
/// omega_k.hpp). No normalisation is applied; the inverse divides by N.
#include <complex>
#include <cstddef>
#include <vector>

#include "core/types.hpp"

namespace tw::diag {

using cplx = std::complex<real>;

/// Smallest power of two >= n (1 for n = 0).
[[nodiscard]] std::size_t next_pow2(std::size_t n);

/// In-place transform of a power-of-two length (InternalError otherwise). O(N log N).
void fft_inplace(std::vector<cplx>& a, bool inverse = false);

/// In-place forward transform of any length: radix-2 for powers of two, otherwise
/// Bluestein's chirp-z algorithm (L. I. Bluestein 1970, IEEE Trans. Audio Electroacoust.
/// 18, 451) on power-of-two transforms, so spectra need no zero padding. O(N log N).
void dft_inplace(std::vector<cplx>& a);

/// Hann window of n points sampled at the sample midpoints, w_j = sin^2(pi (j + 1/2) / n):
/// symmetric, every weight > 0, mean 1/2. Its sidelobes fall as 1/f^3, which keeps a strong
/// wave from leaking over weaker ones in the omega-k spectrum.
[[nodiscard]] std::vector<real> hann(std::size_t n);

/// Index of the frequency/wavenumber of FFT bin m of an N-point transform, in
/// [-N/2, N/2): m for m < N/2, m - N otherwise.
[[nodiscard]] long signed_bin(std::size_t m, std::size_t n);

/// Vertex offset in (-1/2, 1/2) of the parabola through (-1, a), (0, b), (1, c) with b the
/// largest: the usual sub-bin refinement of a spectral peak. 0 when the three are flat.
[[nodiscard]] real parabolic_peak_offset(real a, real b, real c);

}  // namespace tw::diag
