#include "core/simd_isa.hpp"

#include "core/error.hpp"

namespace tw {

namespace {

SimdIsa best_supported() {
  return simd_isa_supported(SimdIsa::avx2) ? SimdIsa::avx2 : SimdIsa::baseline;
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
  }
  return "?";
}

bool simd_isa_supported(SimdIsa isa) {
  switch (isa) {
    case SimdIsa::baseline: return true;
    case SimdIsa::avx2:
#if defined(__x86_64__) && (defined(__GNUC__) || defined(__clang__))
      __builtin_cpu_init();  // harmless when already done; needed before static constructors
      return __builtin_cpu_supports("avx2");
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
