#pragma once
/// Sweeps under MPI (`mpirun -np N tubewave sweep SWEEP.yaml`): dynamic scheduling by a
/// dispatcher on rank 0. This file and mpi_sweep.cpp are the only MPI code in tubewave;
/// without MPI at build time (TUBEWAVE_WITH_MPI=OFF, or no MPI found) the same functions
/// exist, report that MPI is absent, and the sweep runs locally.
///
/// Protocol: every rank runs cases. Rank 0's main thread is the dispatcher: it polls for
/// requests (MPI_Iprobe, then sleeps 2 ms, so it takes no core from the cases) and answers
/// each with the next case of the shared work list (most expensive first), or with "stop";
/// a second thread on rank 0 takes cases from the same list directly. Other ranks send a
/// request carrying the result of their previous case (index, status, wall time) and wait
/// for the answer. Case files are written by the rank that runs the case (the output folder
/// must be on a file system every rank sees); rank 0 reads their records for the summary.
/// Only rank 0's main thread calls MPI (MPI_THREAD_FUNNELED).
#include <atomic>
#include <vector>

#include "sweep/case_run.hpp"
#include "sweep/schedule.hpp"
#include "sweep/sweep_file.hpp"

namespace tw::sweep::mpi {

/// True when this tubewave was built with MPI.
[[nodiscard]] bool built_with_mpi();

/// The number of processes an MPI launcher started together with this one, from the
/// environment it sets (Open MPI: OMPI_COMM_WORLD_SIZE; MPICH Hydra and PMI-based
/// launchers: PMI_SIZE), or 0 when there is none. A sweep started as one of several
/// processes runs in MPI mode; one process alone (mpirun -np 1, or a batch system that sets
/// these variables for a single task) runs locally.
[[nodiscard]] int launched_world_size();

/// MPI_Init_thread (funneled) on construction, MPI_Finalize on destruction. Construct only
/// when built_with_mpi(); otherwise the constructor throws InternalError.
class Session {
 public:
  Session();
  Session(const Session&) = delete;
  Session& operator=(const Session&) = delete;
  ~Session();
  [[nodiscard]] int rank() const { return rank_; }
  [[nodiscard]] int size() const { return size_; }
  /// The largest of every rank's `code` (all ranks must call it).
  [[nodiscard]] int agree(int code) const;

 private:
  int rank_ = 0, size_ = 1;
};

/// Run the sweep's jobs on every rank of `session`. Rank 0 passes the work list and the
/// progress reporter and gets the records of the cases run in this session (read from
/// their files for cases other ranks ran); other ranks pass empty lists and get nothing.
/// `threads`: OpenMP threads per case on this rank.
[[nodiscard]] std::vector<CaseRecord> run_distributed(const Session& session, const Sweep& s,
                                                      const std::vector<CasePlan>& plans, const std::vector<Job>& jobs,
                                                      int threads, const std::atomic<bool>* stop,
                                                      ProgressReporter* progress);

}  // namespace tw::sweep::mpi
