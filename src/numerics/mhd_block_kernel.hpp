#pragma once
/// The fused face kernel of MHD: reconstruction (first order or PLM with any limiter, with
/// the positivity fallback) and the numerical flux (HLLD, HLL or Rusanov) for a range of
/// faces in one pass, written so that the compiler vectorises it.
///
/// Why: the generic operator passes one face at a time through `HlldFlux` and friends,
/// with branches that differ from face to face, so nothing vectorises; on one core that
/// left the MHD step at about half of its target rate. Here faces are processed in blocks
/// of `block_faces`: the cell values of a block are transposed to one array per variable,
/// reconstructed, and the Riemann solver runs branch-free over the block (every wave
/// region is computed and the right one selected per face), so each instruction works on
/// 2 (SSE2) or 4 (AVX2) faces at once.
///
/// Contract: for every scheme `supports()` accepts, the fluxes and the largest signal
/// speed are bitwise identical to the generic passes (`FvOperator` reconstruction +
/// `HlldFlux` / `HllFlux` / `RusanovFlux`): each face performs the same IEEE operations in
/// the same order; only the branches became selects. That needs no FP contraction and no
/// -ffast-math (the project compiles with -ffp-contract=off). tests/numerics checks it on
/// random and degenerate states for every instruction set this processor supports.
#include "core/simd_isa.hpp"
#include "models/mhd.hpp"
#include "numerics/flux_kind.hpp"
#include "numerics/reconstruction.hpp"

namespace tw {

struct MhdBlockKernel {
  /// Faces (or cells) per block; the operator hands whole blocks to threads.
  static constexpr int block_faces = 64;

  /// Cell values as one array per variable (structure of arrays), ghost cells included:
  /// variable k of cell c (c >= -Grid::n_ghost) is data[k * stride + c]. The operator owns
  /// the storage (columns_size() reals) and keeps it in step with its primitive field.
  struct Columns {
    real* data = nullptr;
    long stride = 0;
  };
  /// Reals needed for the columns of a grid with n_total cells (ghosts included).
  static long columns_size(long n_total) { return n_total * Mhd::n_vars; }

  /// Primitive variables W[i] = m.prim_from_cons(U[i]) for the cells i in [begin, end)
  /// (arrays indexed like Field), written to W and to the columns. Returns the first of
  /// those cells whose state is not m.admissible, or -1. Any scheme, either closure.
  static int primitives(const Mhd& m, const Mhd::State* U, Mhd::State* W, Columns cols, int begin, int end);

  /// True when the kernel reproduces the generic passes for this choice: first order or
  /// PLM (any limiter); HLLD (adiabatic closure, as the generic solver), HLL or Rusanov
  /// (either closure). WENO5 and other fluxes use the generic passes.
  static bool supports(const Mhd& m, Reconstruction r, Limiter l, FluxKind k);

  /// Numerical fluxes F[f] for the faces f in [f_begin, f_end) from the primitive cell
  /// values in the columns (cells f_begin-2 .. f_end must be current, ghost cells
  /// included). Returns the largest |signal speed| of those faces (0 if none).
  static real faces(const Mhd& m, Reconstruction r, Limiter l, FluxKind k, Columns cols, int f_begin,
                    int f_end, Mhd::State* F);

  /// The numerical flux alone, for n faces with the given left and right primitive face
  /// states (no reconstruction): F[i] and speed[i] as the generic solver would return for
  /// (WL[i], WR[i]). For tests and for callers that bring their own face states.
  static void fluxes(const Mhd& m, FluxKind k, int n, const Mhd::State* WL, const Mhd::State* WR,
                     Mhd::State* F, real* speed);
};

}  // namespace tw
