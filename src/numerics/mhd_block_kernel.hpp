#pragma once
/// The block kernels of MHD: the finite-volume operator's hot passes for Mhd, written so
/// that the compiler vectorises them.
///
/// - primitives(): conservative -> primitive variables and the admissibility check, over a
///   block of cells (pass 1 of FvOperator); it also writes the primitive field as one
///   array per variable (the "columns"), which the face kernel reads without transposing.
/// - faces(): reconstruction (first order, or PLM with any limiter and the positivity
///   fallback) and the numerical flux (HLLD, HLL or Rusanov) over a block of faces
///   (passes 3 and 4), in one sweep.
///
/// Why: the generic operator handles one cell or face at a time through the model's
/// functions and `HlldFlux`, with branches that differ from face to face, so nothing
/// vectorises; that left the MHD step at about half of its target rate on one core. Here
/// cells and faces are processed in blocks of `block_faces`, one array per variable
/// (structure of arrays), and the Riemann solver is branch-free (every wave region is
/// computed and the right one selected per face), so each instruction works on 2 (SSE2),
/// 4 (AVX2) or 8 (AVX-512) faces at once. The loops are compiled for each instruction set
/// and chosen at run time (core/simd_isa.hpp).
///
/// Contract: wherever `applies()` / `supports()` accept the model and scheme, the results
/// (primitive states, first inadmissible cell, fluxes, largest signal speed) are bitwise
/// identical to the generic passes (`Mhd` + `FvOperator` reconstruction + `HlldFlux` /
/// `HllFlux` / `RusanovFlux`): each cell and face performs the same IEEE operations in
/// the same order; only the branches became selects. That needs no FP contraction and no
/// -ffast-math (the project compiles with -ffp-contract=off).
/// tests/numerics/test_mhd_block_kernel.cpp checks it on random, degenerate and
/// inadmissible states for every instruction set the processor supports.
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

  /// True when the kernels mirror this configuration of the model (every one the Mhd type
  /// can express today, the displacement current included). A new Mhd term that the
  /// kernels do not reproduce must make this false while it is active.
  static bool applies(const Mhd& m);

  /// Primitive variables W[i] = m.prim_from_cons(U[i]) for the cells i in [begin, end)
  /// (arrays indexed like Field), written to W and to the columns. Returns the first of
  /// those cells whose state is not m.admissible, or -1. Any scheme, either closure.
  static int primitives(const Mhd& m, const Mhd::State* U, Mhd::State* W, Columns cols, int begin, int end);

  /// True when faces() reproduces the generic passes for this choice: applies(m), and first
  /// order or PLM (any limiter); HLLD (adiabatic closure, as the generic solver), HLL or
  /// Rusanov (either closure). WENO5 and other fluxes use the generic passes.
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
