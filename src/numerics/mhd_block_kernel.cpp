// The MHD block kernels (see mhd_block_kernel.hpp for the contract).
//
// Every function below that does arithmetic mirrors, expression by expression, the
// generic code it replaces (Mhd in models/mhd.hpp, the solvers in numerics/riemann.hpp
// and numerics/hlld.hpp, the limiters in numerics/reconstruction.hpp and the
// reconstruction loop of FvOperator): same operands, same order, so the same rounding.
// Branches become selects (`c ? a : b` on values computed unconditionally), which lets
// GCC vectorise the loops over the faces of a block. Quantities of the wave regions a face
// does not use are computed too and discarded (they may be infinite or NaN there; nothing
// traps). If you change the generic code, change this file the same way: the
// bitwise-equality test in tests/numerics/test_mhd_block_kernel.cpp will tell you.
//
// Each vectorised loop is compiled for baseline x86-64 (SSE2, 2 lanes), AVX2 (4 lanes) and
// AVX-512 (8 lanes), and the instruction set is picked at run time (core/simd_isa.hpp).
// The loops take their arrays through __restrict pointers (a separate one per output
// column where it matters): without them GCC gives up on the aliasing checks and leaves
// the loop scalar. `-fopt-info-vec-missed` on this file shows which loops vectorise.
#include "numerics/mhd_block_kernel.hpp"

#include <algorithm>
#include <cmath>
#include <cstdint>

#include "core/error.hpp"
#include "core/simd_target.hpp"

namespace tw {

// A tripwire: the kernels mirror every member of Mhd that changes its fluxes or its
// primitive variables. When a member is added, make the kernels reproduce it (or make
// applies() false while it is active), extend the tests, then update this size.
static_assert(sizeof(Mhd) == 9 * sizeof(real), "Mhd changed: review MhdBlockKernel (see the comment above)");

namespace {

constexpr int NV = Mhd::n_vars;
constexpr int BF = MhdBlockKernel::block_faces;
constexpr int RHO = Mhd::RHO, VX = Mhd::VX, VY = Mhd::VY, VZ = Mhd::VZ, BY = Mhd::BY,
              BZ = Mhd::BZ, P = Mhd::P;

/// Scratch of one block, one array per variable (structure of arrays).
struct Block {
  /// Left state of face f_begin + j (the upper face value of cell f_begin - 1 + j).
  alignas(64) real wl[NV][BF + 1];
  /// Lower face value of cell f_begin - 1 + j: the right state of face f_begin + j - 1.
  alignas(64) real wr[NV][BF + 1];
  alignas(64) real f[NV][BF];
  alignas(64) real speed[BF];
  /// HLLD side quantities of the left and right states of each face (first pass).
  alignas(64) real side[2][6][BF];
};

/// Model constants, computed once per call exactly as the generic code computes them.
struct Consts {
  // Mhd members.
  real gamma, mu0, bx, a_iso, eps;
  // HlldFlux: the field in units with mu0 = 1.
  real sqrt_mu0, inv_sqrt_mu0, bx_h, inv_gm1, sgn;
};

Consts make_consts(const Mhd& m) {
  Consts c{};
  c.gamma = m.gamma;
  c.mu0 = m.mu0;
  c.bx = m.bx;
  c.a_iso = m.sound_speed_iso;
  c.eps = m.eps_disp;
  c.sqrt_mu0 = std::sqrt(m.mu0);
  c.inv_sqrt_mu0 = 1 / c.sqrt_mu0;
  c.bx_h = m.bx * c.inv_sqrt_mu0;
  c.inv_gm1 = 1 / (m.gamma - 1);
  c.sgn = c.bx_h > 0 ? 1.0 : (c.bx_h < 0 ? -1.0 : 0.0);
  return c;
}

// ---------------------------------------------------------------------------------------
// The displacement current (Mhd::electric_field, Mhd::electric_energy).

struct EField {
  real x, y, z;
};
TW_ALWAYS_INLINE EField electric_field(const Consts& c, const real* W) {
  const real bx = c.bx;
  return {-(W[VY] * W[BZ] - W[VZ] * W[BY]), -(W[VZ] * bx - W[VX] * W[BZ]), -(W[VX] * W[BY] - W[VY] * bx)};
}
/// Only called with eps > 0, where Mhd::electric_energy computes this.
TW_ALWAYS_INLINE real electric_energy(const Consts& c, const real* W) {
  const EField e = electric_field(c, W);
  return 0.5 * c.eps * (e.x * e.x + e.y * e.y + e.z * e.z);
}

// ---------------------------------------------------------------------------------------
// Primitive variables (Mhd::prim_from_cons and Mhd::admissible).

struct CellBlock {
  alignas(64) real u[NV][BF];
  alignas(64) std::int64_t ok[BF];  // 1 where admissible, else 0 (as wide as a real)
  std::int64_t n_ok;                // how many are admissible
};

/// Mhd::prim_from_cons and Mhd::admissible over one block. The seven output columns are
/// separate restrict pointers so that the compiler sees they do not overlap.
template <bool Adiabatic, bool Disp>
TW_ALWAYS_INLINE void primitives_compute(const Consts& c, const real (*__restrict u)[BF], std::int64_t* __restrict ok,
                                         real* __restrict w0, real* __restrict w1, real* __restrict w2,
                                         real* __restrict w3, real* __restrict w4, real* __restrict w5,
                                         real* __restrict w6, int nc) {
  const real bx = c.bx, mu0 = c.mu0;
  for (int j = 0; j < nc; ++j) {
    real w[NV];
    const real rho = u[RHO][j];
    const real inv = 1 / rho;
    w[RHO] = rho;
    w[VX] = u[VX][j] * inv;
    w[VY] = u[VY][j] * inv;
    w[VZ] = u[VZ][j] * inv;
    w[BY] = u[BY][j];
    w[BZ] = u[BZ][j];
    if constexpr (Disp) {
      // (rho I + eps (B^2 I - B B)) u = m, inverted by Sherman-Morrison.
      const real by = u[BY][j], bz = u[BZ][j];
      const real b2 = bx * bx + by * by + bz * bz;
      const real bm = bx * u[VX][j] + by * u[VY][j] + bz * u[VZ][j];
      const real f = c.eps * bm * inv;
      const real d = 1 / (rho + c.eps * b2);
      w[VX] = (u[VX][j] + f * bx) * d;
      w[VY] = (u[VY][j] + f * by) * d;
      w[VZ] = (u[VZ][j] + f * bz) * d;
    }
    if constexpr (Adiabatic) {
      real kin;
      if constexpr (Disp) {
        kin = 0.5 * rho * (w[VX] * w[VX] + w[VY] * w[VY] + w[VZ] * w[VZ]) + electric_energy(c, w);
      } else {
        kin = 0.5 * (u[VX][j] * w[VX] + u[VY][j] * w[VY] + u[VZ][j] * w[VZ]);
      }
      const real mag = (bx * bx + u[BY][j] * u[BY][j] + u[BZ][j] * u[BZ][j]) / (2 * mu0);
      w[P] = (c.gamma - 1) * (u[P][j] - kin - mag);
    } else {
      w[P] = rho * c.a_iso * c.a_iso;
    }
    real sum = 0;
#pragma GCC unroll 7
    for (int k = 0; k < NV; ++k) sum += w[k];
    const bool good = std::isfinite(sum) & (w[RHO] > 0) & (w[P] > 0);
    ok[j] = good ? 1 : 0;
    w0[j] = w[0];
    w1[j] = w[1];
    w2[j] = w[2];
    w3[j] = w[3];
    w4[j] = w[4];
    w5[j] = w[5];
    w6[j] = w[6];
  }
}

/// One block of cells: U (AoS) -> primitive columns and W (AoS).
template <bool Adiabatic, bool Disp>
TW_ALWAYS_INLINE void primitives_impl(const Consts& c, const real* __restrict U, real* __restrict W,
                                      real* __restrict cols, long stride, int nc, CellBlock& b) {
  for (int j = 0; j < nc; ++j)
#pragma GCC unroll 7
    for (int k = 0; k < NV; ++k) b.u[k][j] = U[j * NV + k];
  primitives_compute<Adiabatic, Disp>(c, b.u, b.ok, cols, cols + stride, cols + 2 * stride, cols + 3 * stride,
                                cols + 4 * stride, cols + 5 * stride, cols + 6 * stride, nc);
  std::int64_t n_ok = 0;
  for (int j = 0; j < nc; ++j) n_ok += b.ok[j];
  b.n_ok = n_ok;
  for (int j = 0; j < nc; ++j)
#pragma GCC unroll 7
    for (int k = 0; k < NV; ++k) W[j * NV + k] = cols[k * stride + j];
}

using PrimFn = void (*)(const Consts&, const real*, real*, real*, long, int, CellBlock&);

template <bool Adiabatic, bool Disp>
void primitives_baseline(const Consts& c, const real* U, real* W, real* cols, long stride, int nc, CellBlock& b) {
  primitives_impl<Adiabatic, Disp>(c, U, W, cols, stride, nc, b);
}
#if TW_HAVE_AVX2_CLONES
template <bool Adiabatic, bool Disp>
TW_TARGET_AVX2 void primitives_avx2(const Consts& c, const real* U, real* W, real* cols, long stride, int nc,
                                    CellBlock& b) {
  primitives_impl<Adiabatic, Disp>(c, U, W, cols, stride, nc, b);
}
#endif
#if TW_HAVE_AVX512_CLONES
template <bool Adiabatic, bool Disp>
TW_TARGET_AVX512 void primitives_avx512(const Consts& c, const real* U, real* W, real* cols, long stride, int nc,
                                    CellBlock& b) {
  primitives_impl<Adiabatic, Disp>(c, U, W, cols, stride, nc, b);
}
#endif

template <bool Adiabatic, bool Disp>
PrimFn prim_fn(SimdIsa isa) {
#if TW_HAVE_AVX512_CLONES
  if (isa == SimdIsa::avx512) return &primitives_avx512<Adiabatic, Disp>;
#endif
#if TW_HAVE_AVX2_CLONES
  if (isa == SimdIsa::avx2) return &primitives_avx2<Adiabatic, Disp>;
#endif
  (void)isa;
  return &primitives_baseline<Adiabatic, Disp>;
}

// ---------------------------------------------------------------------------------------
// Reconstruction (FvOperator::recon_loop and the limiters, branch-free).

TW_ALWAYS_INLINE real max0(real x) { return x < real(0) ? real(0) : x; }  // std::max(x, 0)

template <Limiter L>
TW_ALWAYS_INLINE real slope(real a, real b) {
  if constexpr (L == Limiter::minmod) {
    const real r = std::abs(a) < std::abs(b) ? a : b;
    return a * b <= 0 ? real(0) : r;
  } else if constexpr (L == Limiter::mc) {
    const real c = 0.5 * (a + b);
    // std::min({x, y, z}) keeps the first of equal values: x, then y if y < x, then z.
    real m = 2 * std::abs(a);
    const real y = 2 * std::abs(b), z = std::abs(c);
    m = y < m ? y : m;
    m = z < m ? z : m;
    return a * b <= 0 ? real(0) : std::copysign(m, c);
  } else if constexpr (L == Limiter::van_leer) {
    const real r = 2 * a * b / (a + b);
    return a * b <= 0 ? real(0) : r;
  } else {
    return 0.5 * (a + b);
  }
}

/// Face values of cells f0-1 .. f0+nf-1 into b.wl (upper) and b.wr (lower); w points at
/// cell f0-2 of variable 0 in the columns.
template <int Order, Limiter L>
TW_ALWAYS_INLINE void reconstruct(const real* __restrict w, long stride, real (*__restrict wl)[BF + 1],
                                  real (*__restrict wr)[BF + 1], int nf) {
  for (int j = 0; j <= nf; ++j) {
    real lo[NV], hi[NV], c[NV];
#pragma GCC unroll 7
    for (int k = 0; k < NV; ++k) {
      const real* wk = w + k * stride;
      c[k] = wk[j + 1];
      if constexpr (Order == 0) {
        lo[k] = c[k];
        hi[k] = c[k];
      } else {
        const real s = 0.5 * slope<L>(c[k] - wk[j], wk[j + 2] - c[k]);
        lo[k] = c[k] - s;
        hi[k] = c[k] + s;
      }
    }
    if constexpr (Order > 0) {
      // Mhd::positive of both face values, else first order in this cell.
      const bool ok = (lo[RHO] > 0) & (lo[P] > 0) & (hi[RHO] > 0) & (hi[P] > 0);
#pragma GCC unroll 7
      for (int k = 0; k < NV; ++k) {
        lo[k] = ok ? lo[k] : c[k];
        hi[k] = ok ? hi[k] : c[k];
      }
    }
#pragma GCC unroll 7
    for (int k = 0; k < NV; ++k) {
      wl[k][j] = hi[k];
      wr[k][j] = lo[k];
    }
  }
}

template <int Order, Limiter L>
void reconstruct_baseline(const real* cols, long stride, int f0, int nf, Block& b) {
  reconstruct<Order, L>(cols + (f0 - 2), stride, b.wl, b.wr, nf);
}
#if TW_HAVE_AVX2_CLONES
template <int Order, Limiter L>
TW_TARGET_AVX2 void reconstruct_avx2(const real* cols, long stride, int f0, int nf, Block& b) {
  reconstruct<Order, L>(cols + (f0 - 2), stride, b.wl, b.wr, nf);
}
#endif
#if TW_HAVE_AVX512_CLONES
template <int Order, Limiter L>
TW_TARGET_AVX512 void reconstruct_avx512(const real* cols, long stride, int f0, int nf, Block& b) {
  reconstruct<Order, L>(cols + (f0 - 2), stride, b.wl, b.wr, nf);
}
#endif

// ---------------------------------------------------------------------------------------
// HLLD (HlldFlux::operator(), branch-free).

struct HSide {
  real rho, u, v, w, by, bz, p, e, pt, vb, cf;
};

TW_ALWAYS_INLINE HSide hlld_side(const Consts& c, const real* W) {
  const real bx = c.bx_h;
  HSide s;
  s.rho = W[RHO];
  s.u = W[VX];
  s.v = W[VY];
  s.w = W[VZ];
  s.by = W[BY] * c.inv_sqrt_mu0;
  s.bz = W[BZ] * c.inv_sqrt_mu0;
  s.p = W[P];
  const real b2 = bx * bx + s.by * s.by + s.bz * s.bz;
  s.e = s.p * c.inv_gm1 + 0.5 * s.rho * (s.u * s.u + s.v * s.v + s.w * s.w) + 0.5 * b2;
  s.pt = s.p + 0.5 * b2;
  s.vb = s.u * bx + s.v * s.by + s.w * s.bz;
  const real inv_rho = 1 / s.rho;
  const real a2 = c.gamma * s.p * inv_rho, va2 = b2 * inv_rho, vax2 = bx * bx * inv_rho;
  const real sum = a2 + va2;
  s.cf = std::sqrt(0.5 * (sum + std::sqrt(max0(sum * sum - 4 * a2 * vax2))));
  return s;
}

/// Outer star state: the parts needed from both sides.
struct HStar {
  real rho, v, w, by, bz, inv_sasm;
};

TW_ALWAYS_INLINE HStar hlld_star(const Consts& c, const HSide& s, real sa, real sm) {
  const real bx = c.bx_h;
  HStar st;
  const real d = s.rho * (sa - s.u);
  st.inv_sasm = 1 / (sa - sm);
  st.rho = d * st.inv_sasm;
  const real den = d * (sa - sm) - bx * bx;
  const bool degenerate = std::abs(den) <= 1e-12 * (std::abs(d * (sa - sm)) + bx * bx);
  const real inv = 1 / den;
  const real f = bx * (sm - s.u) * inv;
  const real g = (d * (sa - s.u) - bx * bx) * inv;
  st.v = degenerate ? s.v : s.v - s.by * f;
  st.w = degenerate ? s.w : s.w - s.bz * f;
  st.by = degenerate ? s.by : s.by * g;
  st.bz = degenerate ? s.bz : s.bz * g;
  return st;
}

TW_ALWAYS_INLINE real pick(bool c, real a, real b) { return c ? a : b; }

/// What the flux assembly needs of a face: the state on the face's side of the contact,
/// its outer star state, the inner state, the wave speeds and the region.
struct HSel {
  real rho, u, v, w, by, bz, e, pt, vb;  // outer state
  real st_rho, st_v, st_w, st_by, st_bz, st_e;  // outer star state
  real v2, w2, by2, bz2, e2;  // inner (double-star) state
  real sm, sa, ss;  // contact, outer and Alfvén speeds
  real outer, star;  // region: 1 or 0
};
/// Flux assembly, eq. (64) and the outer cases, then the field fluxes back to tesla.
TW_ALWAYS_INLINE void hlld_flux(const Consts& c, const HSel& s, real* F) {
  const real bx = c.bx_h, sm = s.sm, sa = s.sa, ss = s.ss;
  const real Fs[NV] = {s.rho * s.u,
                       s.rho * s.u * s.u + s.pt - bx * bx,
                       s.rho * s.u * s.v - bx * s.by,
                       s.rho * s.u * s.w - bx * s.bz,
                       s.by * s.u - bx * s.v,
                       s.bz * s.u - bx * s.w,
                       (s.e + s.pt) * s.u - bx * s.vb};
  const real Us[NV] = {s.rho, s.rho * s.u, s.rho * s.v, s.rho * s.w, s.by, s.bz, s.e};
  const real Ust[NV] = {s.st_rho, s.st_rho * sm, s.st_rho * s.st_v, s.st_rho * s.st_w, s.st_by, s.st_bz, s.st_e};
  const real U2[NV] = {s.st_rho, s.st_rho * sm, s.st_rho * s.v2, s.st_rho * s.w2, s.by2, s.bz2, s.e2};
  const bool outer = s.outer != 0, star = s.star != 0;
#pragma GCC unroll 7
  for (int k = 0; k < NV; ++k) {
    const real f_star = Fs[k] + sa * (Ust[k] - Us[k]);
    const real f_dbl = Fs[k] + ss * U2[k] - (ss - sa) * Ust[k] - sa * Us[k];
    F[k] = outer ? Fs[k] : (star ? f_star : f_dbl);
  }
  F[BY] *= c.sqrt_mu0;
  F[BZ] *= c.sqrt_mu0;
}

/// Wave speeds, star and inner states, and the region of one face; returns the largest
/// |signal speed|.
TW_ALWAYS_INLINE real hlld_select(const Consts& c, const HSide& L, const HSide& R, HSel& out) {
  const real bx = c.bx_h, sgn = c.sgn;

  const real cmax = std::max(L.cf, R.cf);
  const real sl = std::min(L.u, R.u) - cmax;
  const real sr = std::max(L.u, R.u) + cmax;
  const real speed = std::max(-sl, sr);

  const real dl = L.rho * (sl - L.u), dr = R.rho * (sr - R.u);
  const real inv_ddr = 1 / (dr - dl);
  const real sm = (dr * R.u - dl * L.u - R.pt + L.pt) * inv_ddr;
  const real pts = (dr * L.pt - dl * R.pt + dl * dr * (R.u - L.u)) * inv_ddr;

  const HStar Ls = hlld_star(c, L, sl, sm), Rs = hlld_star(c, R, sr, sm);
  const real sql = std::sqrt(Ls.rho), sqr = std::sqrt(Rs.rho);
  const real sls = sm - std::abs(bx) / sql;
  const real srs = sm + std::abs(bx) / sqr;

  // Which region the face lies in, tested in the generic solver's order.
  const bool outer_l = sl >= 0;
  const bool outer_r = !outer_l & (sr <= 0);
  const bool outer = outer_l | outer_r;
  const bool star_l = !outer & (sls >= 0);
  const bool star_r = !outer & !star_l & (srs <= 0);
  const bool star = star_l | star_r;
  const bool dbl = !outer & !star;
  const bool left = outer_l | star_l | (dbl & (sm >= 0));

  // Inner (double-star) states, eqs. (59)-(63) of Miyoshi & Kusano (2005).
  const real isum = 1 / (sql + sqr);
  const real v2 = (sql * Ls.v + sqr * Rs.v + (Rs.by - Ls.by) * sgn) * isum;
  const real w2 = (sql * Ls.w + sqr * Rs.w + (Rs.bz - Ls.bz) * sgn) * isum;
  const real by2 = (sql * Rs.by + sqr * Ls.by + sql * sqr * (Rs.v - Ls.v) * sgn) * isum;
  const real bz2 = (sql * Rs.bz + sqr * Ls.bz + sql * sqr * (Rs.w - Ls.w) * sgn) * isum;
  const real vb2 = sm * bx + v2 * by2 + w2 * bz2;

  // From here on only the side the face lies on.
  HSide s;
  s.rho = pick(left, L.rho, R.rho);
  s.u = pick(left, L.u, R.u);
  s.v = pick(left, L.v, R.v);
  s.w = pick(left, L.w, R.w);
  s.by = pick(left, L.by, R.by);
  s.bz = pick(left, L.bz, R.bz);
  s.e = pick(left, L.e, R.e);
  s.pt = pick(left, L.pt, R.pt);
  s.vb = pick(left, L.vb, R.vb);
  HStar st;
  st.rho = pick(left, Ls.rho, Rs.rho);
  st.v = pick(left, Ls.v, Rs.v);
  st.w = pick(left, Ls.w, Rs.w);
  st.by = pick(left, Ls.by, Rs.by);
  st.bz = pick(left, Ls.bz, Rs.bz);
  st.inv_sasm = pick(left, Ls.inv_sasm, Rs.inv_sasm);
  const real sa = pick(left, sl, sr);    // outer wave
  const real ss = pick(left, sls, srs);  // Alfvén wave
  const real sq = pick(left, sql, sqr);

  // Energy of the outer star state, eq. (48).
  const real st_vb = sm * bx + st.v * st.by + st.w * st.bz;
  const real st_e = ((sa - s.u) * s.e - s.pt * s.u + pts * sm + bx * (s.vb - st_vb)) * st.inv_sasm;
  // Energy of the inner state, eq. (63): minus on the left, plus on the right.
  const real de = sq * (st_vb - vb2) * sgn;
  const real e2 = left ? st_e - de : st_e + de;

  out = HSel{s.rho, s.u, s.v, s.w, s.by, s.bz, s.e, s.pt, s.vb, st.rho, st.v, st.w, st.by, st.bz, st_e,
             v2, w2, by2, bz2, e2, sm, sa, ss, outer ? real(1) : real(0), star ? real(1) : real(0)};
  return speed;
}

// ---------------------------------------------------------------------------------------
// HLL and Rusanov with the Mhd model functions (riemann.hpp, branch-free).

struct GSide {
  real smin, smax;  // signal_speeds
  real F[NV];       // flux
  real U[NV];       // cons_from_prim
};

template <bool Adiabatic, bool Disp>
TW_ALWAYS_INLINE GSide generic_side(const Consts& c, const real* W) {
  const real bx = c.bx, mu0 = c.mu0;
  const real rho = W[RHO], u = W[VX], v = W[VY], w = W[VZ], by = W[BY], bz = W[BZ];
  GSide s;
  // Mhd::fast_speed
  const real a2 = Adiabatic ? c.gamma * W[P] / W[RHO] : c.a_iso * c.a_iso;
  const real inv = 1 / (mu0 * W[RHO]);
  const real b2 = (bx * bx + W[BY] * W[BY] + W[BZ] * W[BZ]) * inv;
  const real bx2 = bx * bx * inv;
  real cf;
  if constexpr (Disp) {
    const real ec = c.eps * mu0;  // 1/c^2
    const real den = 1 + ec * b2;
    const real sum = a2 + b2 + ec * a2 * bx2;
    cf = std::sqrt((sum + std::sqrt(max0(sum * sum - 4 * den * a2 * bx2))) / (2 * den));
  } else {
    const real sum = a2 + b2;
    cf = std::sqrt(0.5 * (sum + std::sqrt(max0(sum * sum - 4 * a2 * bx2))));
  }
  s.smin = W[VX] - cf;
  s.smax = W[VX] + cf;
  // Mhd::flux and Mhd::cons_from_prim (magnetic_energy and total_energy inlined).
  const real inv_mu0 = 1 / mu0;
  const real pmag = (bx * bx + by * by + bz * bz) / (2 * mu0);
  const real ptot = W[P] + pmag;
  const real e = W[P] / (c.gamma - 1) + 0.5 * W[RHO] * (W[VX] * W[VX] + W[VY] * W[VY] + W[VZ] * W[VZ]) +
                 (bx * bx + W[BY] * W[BY] + W[BZ] * W[BZ]) / (2 * mu0);
  s.F[RHO] = rho * u;
  s.F[VX] = rho * u * u + ptot - bx * bx * inv_mu0;
  s.F[VY] = rho * u * v - bx * by * inv_mu0;
  s.F[VZ] = rho * u * w - bx * bz * inv_mu0;
  s.F[BY] = by * u - bx * v;
  s.F[BZ] = bz * u - bx * w;
  s.F[P] = Adiabatic ? (e + ptot) * u - bx * (u * bx + v * by + w * bz) * inv_mu0 : real(0);
  s.U[RHO] = rho;
  s.U[VX] = rho * W[VX];
  s.U[VY] = rho * W[VY];
  s.U[VZ] = rho * W[VZ];
  s.U[BY] = W[BY];
  s.U[BZ] = W[BZ];
  s.U[P] = Adiabatic ? e : real(0);
  if constexpr (Disp) {
    // Mhd::cons_from_prim: the field momentum and electric energy.
    const real bb = bx * bx + W[BY] * W[BY] + W[BZ] * W[BZ];
    const real ub = W[VX] * bx + W[VY] * W[BY] + W[VZ] * W[BZ];
    s.U[VX] = s.U[VX] + c.eps * (bb * W[VX] - ub * bx);
    s.U[VY] = s.U[VY] + c.eps * (bb * W[VY] - ub * W[BY]);
    s.U[VZ] = s.U[VZ] + c.eps * (bb * W[VZ] - ub * W[BZ]);
    // Mhd::flux: the electric stress eps (|E|^2/2 I - E E), x row.
    const EField ef = electric_field(c, W);
    const real e2 = ef.x * ef.x + ef.y * ef.y + ef.z * ef.z;
    s.F[VX] = s.F[VX] + c.eps * (0.5 * e2 - ef.x * ef.x);
    s.F[VY] = s.F[VY] - c.eps * ef.x * ef.y;
    s.F[VZ] = s.F[VZ] - c.eps * ef.x * ef.z;
    if constexpr (Adiabatic) s.U[P] = s.U[P] + 0.5 * c.eps * e2;  // electric_energy
  }
  return s;
}

template <bool Adiabatic, bool Disp>
TW_ALWAYS_INLINE real hll_face(const Consts& c, const real* WL, const real* WR, real* F) {
  const GSide a = generic_side<Adiabatic, Disp>(c, WL), b = generic_side<Adiabatic, Disp>(c, WR);
  const real sl = std::min(a.smin, b.smin), sr = std::max(a.smax, b.smax);
  const real speed = std::max(-sl, sr);
  const real inv = 1 / (sr - sl);
#pragma GCC unroll 7
  for (int k = 0; k < NV; ++k) {
    const real mid = (sr * a.F[k] - sl * b.F[k] + sl * sr * (b.U[k] - a.U[k])) * inv;
    F[k] = sl >= 0 ? a.F[k] : (sr <= 0 ? b.F[k] : mid);
  }
  return speed;
}

template <bool Adiabatic, bool Disp>
TW_ALWAYS_INLINE real rusanov_face(const Consts& c, const real* WL, const real* WR, real* F) {
  const GSide a = generic_side<Adiabatic, Disp>(c, WL), b = generic_side<Adiabatic, Disp>(c, WR);
  // RusanovFlux: the HLL bounds, then the larger magnitude.
  const real s = std::max(-std::min(a.smin, b.smin), std::max(a.smax, b.smax));
#pragma GCC unroll 7
  for (int k = 0; k < NV; ++k) F[k] = 0.5 * (a.F[k] + b.F[k]) - 0.5 * s * (b.U[k] - a.U[k]);
  return s;
}

// ---------------------------------------------------------------------------------------
// Flux over a block: face j has left state b.wl[.][j] and right state b.wr[.][j + 1].

TW_ALWAYS_INLINE void store_side(const HSide& s, real (*__restrict q)[BF], int j) {
  q[0][j] = s.by;
  q[1][j] = s.bz;
  q[2][j] = s.e;
  q[3][j] = s.pt;
  q[4][j] = s.vb;
  q[5][j] = s.cf;
}
TW_ALWAYS_INLINE HSide load_side(const real* W, const real (*__restrict q)[BF], int j) {
  HSide s;
  s.rho = W[RHO];
  s.u = W[VX];
  s.v = W[VY];
  s.w = W[VZ];
  s.p = W[P];
  s.by = q[0][j];
  s.bz = q[1][j];
  s.e = q[2][j];
  s.pt = q[3][j];
  s.vb = q[4][j];
  s.cf = q[5][j];
  return s;
}

TW_ALWAYS_INLINE void hlld_sides(const Consts& c, const real (*__restrict wl)[BF + 1],
                                 const real (*__restrict wr)[BF + 1], real (*__restrict ql)[BF],
                                 real (*__restrict qr)[BF], int nf) {
  for (int j = 0; j < nf; ++j) {
    real a[NV], b[NV];
#pragma GCC unroll 7
    for (int k = 0; k < NV; ++k) {
      a[k] = wl[k][j];
      b[k] = wr[k][j + 1];
    }
    store_side(hlld_side(c, a), ql, j);
    store_side(hlld_side(c, b), qr, j);
  }
}

/// The second pass of HLLD over a block: everything after the side quantities.
TW_ALWAYS_INLINE void hlld_rest(const Consts& c, const real (*__restrict wl)[BF + 1],
                                const real (*__restrict wr)[BF + 1], const real (*__restrict ql)[BF],
                                const real (*__restrict qr)[BF], real (*__restrict f)[BF], real* __restrict speed,
                                int nf) {
  for (int j = 0; j < nf; ++j) {
    real a[NV], b[NV], F[NV];
#pragma GCC unroll 7
    for (int k = 0; k < NV; ++k) {
      a[k] = wl[k][j];
      b[k] = wr[k][j + 1];
    }
    HSel q;
    speed[j] = hlld_select(c, load_side(a, ql, j), load_side(b, qr, j), q);
    hlld_flux(c, q, F);
#pragma GCC unroll 7
    for (int k = 0; k < NV; ++k) f[k][j] = F[k];
  }
}

template <FluxKind K, bool Adiabatic, bool Disp>
TW_ALWAYS_INLINE void block_fluxes(const Consts& c, Block& b, int nf) {
  if constexpr (K == FluxKind::hlld) {
    hlld_sides(c, b.wl, b.wr, b.side[0], b.side[1], nf);
    hlld_rest(c, b.wl, b.wr, b.side[0], b.side[1], b.f, b.speed, nf);
    return;
  }
  for (int j = 0; j < nf; ++j) {
    real wl[NV], wr[NV], f[NV];
#pragma GCC unroll 7
    for (int k = 0; k < NV; ++k) {
      wl[k] = b.wl[k][j];
      wr[k] = b.wr[k][j + 1];
    }
    real s;
    if constexpr (K == FluxKind::hll) s = hll_face<Adiabatic, Disp>(c, wl, wr, f);
    else s = rusanov_face<Adiabatic, Disp>(c, wl, wr, f);
#pragma GCC unroll 7
    for (int k = 0; k < NV; ++k) b.f[k][j] = f[k];
    b.speed[j] = s;
  }
}

template <FluxKind K, bool Adiabatic, bool Disp>
void fluxes_baseline(const Consts& c, Block& b, int nf) {
  block_fluxes<K, Adiabatic, Disp>(c, b, nf);
}
#if TW_HAVE_AVX2_CLONES
template <FluxKind K, bool Adiabatic, bool Disp>
TW_TARGET_AVX2 void fluxes_avx2(const Consts& c, Block& b, int nf) {
  block_fluxes<K, Adiabatic, Disp>(c, b, nf);
}
#endif
#if TW_HAVE_AVX512_CLONES
template <FluxKind K, bool Adiabatic, bool Disp>
TW_TARGET_AVX512 void fluxes_avx512(const Consts& c, Block& b, int nf) {
  block_fluxes<K, Adiabatic, Disp>(c, b, nf);
}
#endif

// ---------------------------------------------------------------------------------------
// Dispatch.

using ReconFn = void (*)(const real*, long, int, int, Block&);
using FluxFn = void (*)(const Consts&, Block&, int);

template <int Order, Limiter L>
ReconFn recon_fn(SimdIsa isa) {
#if TW_HAVE_AVX512_CLONES
  if (isa == SimdIsa::avx512) return &reconstruct_avx512<Order, L>;
#endif
#if TW_HAVE_AVX2_CLONES
  if (isa == SimdIsa::avx2) return &reconstruct_avx2<Order, L>;
#endif
  (void)isa;
  return &reconstruct_baseline<Order, L>;
}

ReconFn pick_recon(Reconstruction r, Limiter l, SimdIsa isa) {
  if (r == Reconstruction::first_order) return recon_fn<0, Limiter::none>(isa);
  switch (l) {
    case Limiter::minmod: return recon_fn<1, Limiter::minmod>(isa);
    case Limiter::mc: return recon_fn<1, Limiter::mc>(isa);
    case Limiter::van_leer: return recon_fn<1, Limiter::van_leer>(isa);
    case Limiter::none: return recon_fn<1, Limiter::none>(isa);
  }
  return nullptr;
}

template <FluxKind K, bool Adiabatic, bool Disp>
FluxFn flux_fn(SimdIsa isa) {
#if TW_HAVE_AVX512_CLONES
  if (isa == SimdIsa::avx512) return &fluxes_avx512<K, Adiabatic, Disp>;
#endif
#if TW_HAVE_AVX2_CLONES
  if (isa == SimdIsa::avx2) return &fluxes_avx2<K, Adiabatic, Disp>;
#endif
  (void)isa;
  return &fluxes_baseline<K, Adiabatic, Disp>;
}

template <FluxKind K>
FluxFn flux_variant(bool adiabatic, bool disp, SimdIsa isa) {
  if (adiabatic) return disp ? flux_fn<K, true, true>(isa) : flux_fn<K, true, false>(isa);
  return disp ? flux_fn<K, false, true>(isa) : flux_fn<K, false, false>(isa);
}

FluxFn pick_flux(FluxKind k, const Mhd& m, SimdIsa isa) {
  const bool adiabatic = m.closure == Closure::adiabatic;
  switch (k) {
    // HlldFlux does not use the model's functions, so the displacement current does not
    // change it (the run-file setup refuses that combination anyway).
    case FluxKind::hlld: return adiabatic ? flux_fn<FluxKind::hlld, true, false>(isa) : nullptr;
    case FluxKind::hll: return flux_variant<FluxKind::hll>(adiabatic, m.eps_disp > 0, isa);
    case FluxKind::rusanov: return flux_variant<FluxKind::rusanov>(adiabatic, m.eps_disp > 0, isa);
    case FluxKind::upwind: break;
  }
  return nullptr;
}

}  // namespace

int MhdBlockKernel::primitives(const Mhd& m, const Mhd::State* U, Mhd::State* W, Columns cols, int begin,
                               int end) {
  const bool adiabatic = m.closure == Closure::adiabatic, disp = m.eps_disp > 0;
  const SimdIsa isa = simd_isa();
  const PrimFn prim = adiabatic ? (disp ? prim_fn<true, true>(isa) : prim_fn<true, false>(isa))
                                : (disp ? prim_fn<false, true>(isa) : prim_fn<false, false>(isa));
  const Consts c = make_consts(m);
  CellBlock b;
  int bad = -1;
  for (int i0 = begin; i0 < end; i0 += BF) {
    const int nc = std::min(BF, end - i0);
    prim(c, U[i0].data(), W[i0].data(), cols.data + i0, cols.stride, nc, b);
    if (b.n_ok != nc)
      for (int j = 0; j < nc && bad < 0; ++j)
        if (b.ok[j] == 0) bad = i0 + j;
  }
  return bad;
}

bool MhdBlockKernel::applies(const Mhd& /*m*/) { return true; }

bool MhdBlockKernel::supports(const Mhd& m, Reconstruction r, Limiter /*l*/, FluxKind k) {
  if (!applies(m) || r == Reconstruction::weno5) return false;
  switch (k) {
    case FluxKind::hlld: return m.closure == Closure::adiabatic;
    case FluxKind::hll:
    case FluxKind::rusanov: return true;
    case FluxKind::upwind: return false;
  }
  return false;
}

real MhdBlockKernel::faces(const Mhd& m, Reconstruction r, Limiter l, FluxKind k, Columns cols, int f_begin,
                          int f_end, Mhd::State* F) {
  TW_ASSERT(supports(m, r, l, k), "scheme not supported by the block kernel");
  const SimdIsa isa = simd_isa();
  const ReconFn recon = pick_recon(r, l, isa);
  const FluxFn flux = pick_flux(k, m, isa);
  const Consts c = make_consts(m);
  real smax = 0;
  Block b;
  for (int f0 = f_begin; f0 < f_end; f0 += BF) {
    const int nf = std::min(BF, f_end - f0);
    recon(cols.data, cols.stride, f0, nf, b);
    flux(c, b, nf);
    for (int j = 0; j < nf; ++j) {
      real* out = F[f0 + j].data();
#pragma GCC unroll 7
      for (int q = 0; q < NV; ++q) out[q] = b.f[q][j];
      smax = std::max(smax, b.speed[j]);
    }
  }
  return smax;
}

void MhdBlockKernel::fluxes(const Mhd& m, FluxKind k, int n, const Mhd::State* WL,
                           const Mhd::State* WR, Mhd::State* F, real* speed) {
  const FluxFn flux = pick_flux(k, m, simd_isa());
  TW_CHECK(flux != nullptr, "flux kind has no block kernel");
  const Consts c = make_consts(m);
  Block b;
  for (int i0 = 0; i0 < n; i0 += BF) {
    const int nf = std::min(BF, n - i0);
    for (int j = 0; j < nf; ++j)
      for (int q = 0; q < NV; ++q) {
        b.wl[q][j] = WL[i0 + j][static_cast<std::size_t>(q)];
        b.wr[q][j + 1] = WR[i0 + j][static_cast<std::size_t>(q)];
      }
    flux(c, b, nf);
    for (int j = 0; j < nf; ++j) {
      for (int q = 0; q < NV; ++q) F[i0 + j][static_cast<std::size_t>(q)] = b.f[q][j];
      speed[i0 + j] = b.speed[j];
    }
  }
}

}  // namespace tw
