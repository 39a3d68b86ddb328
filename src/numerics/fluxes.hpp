#pragma once
/// The catalogue of numerical fluxes and which model can use which.
///
/// A run file names a flux ("rusanov", "hll", "hlld", "upwind"); `flux_type_t<M, K>` maps
/// that name to the solver type used with model M. The defaults are the generic solvers;
/// a model may specialise FluxFor to supply its own (a two-fluid model applying HLL per
/// fluid, a linear model's exact upwind flux). A kind with `void` as its type is not
/// available for that model, which the run-file setup reports as bad input.
#include <string>
#include <type_traits>
#include <vector>

#include "numerics/flux_kind.hpp"
#include "numerics/hlld.hpp"
#include "numerics/mhd_block_kernel.hpp"
#include "numerics/riemann.hpp"

namespace tw {

/// Solver type for model M and flux kind K; specialise for model-specific solvers.
template <class M, FluxKind K>
struct FluxFor {
  using type = void;
};
template <class M>
struct FluxFor<M, FluxKind::rusanov> {
  using type = RusanovFlux;
};
template <class M>
struct FluxFor<M, FluxKind::hll> {
  using type = HllFlux;
};
template <>
struct FluxFor<Mhd, FluxKind::hlld> {
  using type = HlldFlux;
};

template <class M, FluxKind K>
using flux_type_t = typename FluxFor<M, K>::type;

/// Optional block kernels for model M: its primitive conversion, and reconstruction plus
/// numerical flux, over blocks of cells and faces in vectorised loops. `void` (the
/// default) means the operator uses its generic passes. A kernel type provides (see
/// MhdBlockKernel in numerics/mhd_block_kernel.hpp for the full contract):
///   static constexpr int block_faces;     cells or faces per block
///   struct Columns { real* data; long stride; };  the field, one array per variable
///   static long columns_size(long n_total);
///   static bool applies(const M&);        the kernels mirror this configuration
///   static int primitives(const M&, const State* U, State* W, Columns, int begin, int end);
///   static bool supports(const M&, Reconstruction, Limiter, FluxKind);
///   static real faces(const M&, Reconstruction, Limiter, FluxKind, Columns, int f_begin,
///                     int f_end, State* F);
/// It must reproduce the generic passes bitwise wherever applies()/supports() are true;
/// elsewhere the operator falls back to the generic passes.
template <class M>
struct BlockKernelFor {
  using type = void;
};
template <>
struct BlockKernelFor<Mhd> {
  using type = MhdBlockKernel;
};

template <class M>
using block_kernel_t = typename BlockKernelFor<M>::type;

template <class M, FluxKind K>
inline constexpr bool flux_supported_v = !std::is_void_v<flux_type_t<M, K>>;

template <class M>
bool flux_supported(FluxKind k) {
  switch (k) {
    case FluxKind::rusanov: return flux_supported_v<M, FluxKind::rusanov>;
    case FluxKind::hll: return flux_supported_v<M, FluxKind::hll>;
    case FluxKind::hlld: return flux_supported_v<M, FluxKind::hlld>;
    case FluxKind::upwind: return flux_supported_v<M, FluxKind::upwind>;
  }
  return false;
}

}  // namespace tw

// Model-specific solvers that register themselves with FluxFor (after the catalogue above).
#include "numerics/twofluid_flux.hpp"  // IWYU pragma: export
#include "numerics/linear_flux.hpp"    // IWYU pragma: export
