#pragma once
/// Attributes that compile one function for a given vector instruction set, for the files
/// that build their loops once per instruction set (see core/simd_isa.hpp). Internal:
/// include it only from .cpp files.
///
/// GCC or Clang on x86-64 get AVX2 builds; GCC also gets AVX-512 builds (F, VL, DQ, BW,
/// 512-bit vectors preferred; Clang spells that preference differently). Elsewhere only
/// the baseline build exists and simd_isa_supported() says so.
#if defined(__x86_64__) && (defined(__GNUC__) || defined(__clang__))
#define TW_HAVE_AVX2_CLONES 1
#define TW_TARGET_AVX2 __attribute__((target("avx2")))
#else
#define TW_HAVE_AVX2_CLONES 0
#endif

#if defined(__x86_64__) && defined(__GNUC__) && !defined(__clang__)
#define TW_HAVE_AVX512_CLONES 1
#define TW_TARGET_AVX512 __attribute__((target("avx512f,avx512vl,avx512dq,avx512bw,prefer-vector-width=512")))
#else
#define TW_HAVE_AVX512_CLONES 0
#endif

#if defined(__GNUC__)
#define TW_ALWAYS_INLINE inline __attribute__((always_inline))
#else
#define TW_ALWAYS_INLINE inline
#endif
