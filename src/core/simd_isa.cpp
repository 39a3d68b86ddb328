#include "core/simd_isa.hpp"

#include "core/error.hpp"
#include "core/simd_target.hpp"

namespace tw {

namespace {

SimdIsa best_supported() {
  SimdIsa best = SimdIsa::baseline;
  for (SimdIsa isa : all_simd_isas)
    if (simd_isa_supported(isa)) best = isa;
  return best;
}

// Chosen on first use; changed only by set_simd_isa (tests, benchmarks).
SimdIsa& active() {
  static SimdIsa isa = best_supported();
  return isa;
}

}  // namespace

const char* simd_isa_name(SimdIsa isa) {
  switch (isa) {
    case SimdIsa::baseline: return "x86-64";
    case SimdIsa::avx2: return "avx2";
    case SimdIsa::avx512: return "avx512";
  }
  return "?";
}

bool simd_isa_supported(SimdIsa isa) {
  switch (isa) {
    case SimdIsa::baseline: return true;
    case SimdIsa::avx2:
#if TW_HAVE_AVX2_CLONES
      __builtin_cpu_init();  // harmless when already done; needed before static constructors
      return __builtin_cpu_supports("avx2");
#else
      return false;
#endif
    case SimdIsa::avx512:
#if TW_HAVE_AVX512_CLONES
      __builtin_cpu_init();
      return __builtin_cpu_supports("avx512f") && __builtin_cpu_supports("avx512vl") &&
             __builtin_cpu_supports("avx512dq") && __builtin_cpu_supports("avx512bw");
#else
      return false;
#endif
  }
  return false;
}

SimdIsa simd_isa() { return active(); }

void set_simd_isa(SimdIsa isa) {
  TW_CHECK(simd_isa_supported(isa), std::string("instruction set not supported here: ") + simd_isa_name(isa));
  active() = isa;
}

}  // namespace tw
