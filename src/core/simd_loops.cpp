#include "core/simd_loops.hpp"

#include "core/simd_isa.hpp"
#include "core/simd_target.hpp"

namespace tw::simd {

namespace {

TW_ALWAYS_INLINE void stage_impl(long len, real a, real b, real dt, const real* __restrict u0,
                                                      const real* __restrict l, real* __restrict u) {
  for (long j = 0; j < len; ++j) u[j] = a * u0[j] + b * (u[j] + dt * l[j]);
}

TW_ALWAYS_INLINE void difference_impl(long len, int stride, real inv_dx, const real* __restrict f,
                                                           real* __restrict d) {
  for (long j = 0; j < len; ++j) d[j] = -(f[j + stride] - f[j]) * inv_dx;
}

void stage_baseline(long len, real a, real b, real dt, const real* u0, const real* l, real* u) {
  stage_impl(len, a, b, dt, u0, l, u);
}
void difference_baseline(long len, int stride, real inv_dx, const real* f, real* d) {
  difference_impl(len, stride, inv_dx, f, d);
}
#if TW_HAVE_AVX2_CLONES
TW_TARGET_AVX2 void stage_avx2(long len, real a, real b, real dt, const real* u0, const real* l, real* u) {
  stage_impl(len, a, b, dt, u0, l, u);
}
TW_TARGET_AVX2 void difference_avx2(long len, int stride, real inv_dx, const real* f, real* d) {
  difference_impl(len, stride, inv_dx, f, d);
}
#endif
#if TW_HAVE_AVX512_CLONES
TW_TARGET_AVX512 void stage_avx512(long len, real a, real b, real dt, const real* u0, const real* l, real* u) {
  stage_impl(len, a, b, dt, u0, l, u);
}
TW_TARGET_AVX512 void difference_avx512(long len, int stride, real inv_dx, const real* f, real* d) {
  difference_impl(len, stride, inv_dx, f, d);
}
#endif

}  // namespace

void stage_update(long len, real a, real b, real dt, const real* u0, const real* l, real* u) {
#if TW_HAVE_AVX512_CLONES
  if (simd_isa() == SimdIsa::avx512) return stage_avx512(len, a, b, dt, u0, l, u);
#endif
#if TW_HAVE_AVX2_CLONES
  if (simd_isa() == SimdIsa::avx2) return stage_avx2(len, a, b, dt, u0, l, u);
#endif
  stage_baseline(len, a, b, dt, u0, l, u);
}

void flux_difference(long len, int stride, real inv_dx, const real* f, real* d) {
#if TW_HAVE_AVX512_CLONES
  if (simd_isa() == SimdIsa::avx512) return difference_avx512(len, stride, inv_dx, f, d);
#endif
#if TW_HAVE_AVX2_CLONES
  if (simd_isa() == SimdIsa::avx2) return difference_avx2(len, stride, inv_dx, f, d);
#endif
  difference_baseline(len, stride, inv_dx, f, d);
}

}  // namespace tw::simd
