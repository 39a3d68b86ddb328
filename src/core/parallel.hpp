#pragma once
/// When loops over cells run on several threads. Below a few thousand cells the cost of
/// starting and joining threads exceeds the work (measured: a 400-cell shock tube ran
/// 10x slower on 2 threads than on 1 on a loaded 2-core machine), so small grids run
/// serially. Results never depend on this: no loop has an order-dependent sum.
namespace tw {

/// Smallest number of loop iterations worth sharing between threads.
inline constexpr long parallel_min_iterations = 2048;

inline bool run_parallel(long iterations) { return iterations >= parallel_min_iterations; }

/// Values per chunk when a flat element-wise loop is shared between threads: each thread
/// runs the vectorised loop over whole chunks.
inline constexpr long flat_chunk = 1024;

}  // namespace tw
