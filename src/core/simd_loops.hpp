#pragma once
/// Flat element-wise loops of the time step, compiled for baseline x86-64 and for AVX2 and
/// run with the instruction set simd_isa() (core/simd_isa.hpp). Each element is computed
/// with the same operations in the same order whichever is used, so results do not depend
/// on it. The caller splits long ranges between threads.
#include "core/types.hpp"

namespace tw::simd {

/// u[j] = a * u0[j] + b * (u[j] + dt * l[j]) for j in [0, len): one Shu-Osher stage.
void stage_update(long len, real a, real b, real dt, const real* u0, const real* l, real* u);

/// d[j] = -(f[j + stride] - f[j]) * inv_dx for j in [0, len): the flux difference of
/// cells whose faces are stored one after another, `stride` values per face.
void flux_difference(long len, int stride, real inv_dx, const real* f, real* d);

}  // namespace tw::simd
