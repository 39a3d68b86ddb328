#pragma once
/// Which vector instruction set the hand-blocked kernels use (see
/// numerics/mhd_block_kernel.hpp). The default build targets baseline x86-64 (SSE2), so its
/// binaries run anywhere; kernels that profit from wider vectors are also compiled for
/// AVX2 and chosen at run time when the processor has it.
///
/// Results do not depend on the choice: the kernels are compiled with -ffp-contract=off
/// and without -ffast-math, so every lane performs the same correctly rounded IEEE
/// operations in the same order as the scalar code (a test checks this bitwise).
namespace tw {

enum class SimdIsa { baseline, avx2, avx512 };

/// Every instruction set, narrowest first.
inline constexpr SimdIsa all_simd_isas[] = {SimdIsa::baseline, SimdIsa::avx2, SimdIsa::avx512};

/// Name for logs and benchmark output ("x86-64", "avx2", "avx512").
const char* simd_isa_name(SimdIsa isa);

/// True when this processor (and this build) can run kernels compiled for `isa`.
bool simd_isa_supported(SimdIsa isa);

/// The instruction set the kernels use now: the best supported one unless set otherwise.
SimdIsa simd_isa();

/// Choose the instruction set (tests and benchmarks compare them). An unsupported choice
/// throws InternalError. Not thread-safe: call it between runs, never during one.
void set_simd_isa(SimdIsa isa);

}  // namespace tw
