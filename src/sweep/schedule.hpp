#pragma once
/// Running the cases of a sweep: the work list (most expensive first), progress with an
/// ETA, and the local mode (several cases at once in one process, threads split between
/// them). The MPI mode (mpi_sweep.hpp) uses the same work list and progress.
///
/// Order: cases are handed out in decreasing estimated cost (cells x steps x a per-model
/// factor, from `tubewave check`'s estimate), the longest-processing-time-first rule: with
/// dynamic hand-out the long cases start early and the short ones fill the gaps at the end
/// (R. L. Graham 1969, "Bounds on multiprocessing timing anomalies", SIAM J. Appl. Math.
/// 17, 416 [from memory]: within 4/3 of the optimal finishing time).
///
/// Threads (local mode): a case started when w workers are idle and p cases wait gets
/// floor(free threads / (1 + min(p, idle workers))) threads, at least 1: all cases at one
/// thread each while there are more cases than threads (cases scale perfectly, threads of
/// one small case do not: loops below 2048 cells run serially anyway), and the whole
/// machine for a case that runs alone.
#include <atomic>
#include <chrono>
#include <iosfwd>
#include <mutex>
#include <optional>
#include <vector>

#include "sweep/case_run.hpp"
#include "sweep/sweep_file.hpp"

namespace tw::sweep {

/// One case to run.
struct Job {
  std::size_t index = 0;      ///< the case
  bool measure_only = false;  ///< the run is complete; measure and record it again
  double cost = 1;
};

/// The cases that must run (not done; failed ones only with `retry_failed`), most
/// expensive first (ties in case order).
[[nodiscard]] std::vector<Job> make_jobs(const std::vector<CasePlan>& plans, bool retry_failed);

/// Hands out jobs in order to any thread. Thread-safe.
class JobQueue {
 public:
  explicit JobQueue(std::vector<Job> jobs) : jobs_(std::move(jobs)) {}
  /// The next job, or nothing when all are handed out or `stop` is set.
  std::optional<Job> take(const std::atomic<bool>* stop = nullptr);
  [[nodiscard]] std::size_t remaining();

 private:
  std::mutex m_;
  std::vector<Job> jobs_;
  std::size_t next_ = 0;
};

/// One line per finished case: "[done/total] ID status in T s (values); ETA". The ETA
/// scales the elapsed time by the estimated cost still to run over the cost done. Thread-safe.
class ProgressReporter {
 public:
  /// `already`: cases complete before this session; `jobs`: what this session runs.
  ProgressReporter(const Sweep& s, std::size_t already, const std::vector<Job>& jobs, std::ostream& out);
  void finished(const CaseRecord& r);

 private:
  const Sweep& s_;
  std::ostream& out_;
  std::mutex m_;
  std::chrono::steady_clock::time_point t0_;
  std::size_t done_ = 0, total_ = 0;
  double cost_done_ = 0, cost_total_ = 0;
  std::vector<double> cost_of_;  ///< by case index (0 for cases not in this session)
};

struct LocalOptions {
  int jobs = 0;     ///< cases at once (0: as many as threads)
  int threads = 0;  ///< threads in all (0: omp_get_max_threads())
  const std::atomic<bool>* stop = nullptr;
};

/// Run `jobs` in this process, several at once. Returns the records of the cases run.
[[nodiscard]] std::vector<CaseRecord> run_local(const Sweep& s, const std::vector<CasePlan>& plans,
                                                const std::vector<Job>& jobs, const LocalOptions& opt,
                                                ProgressReporter& progress);

/// Workers and threads per case the local mode uses for `n_jobs` cases (for messages).
struct LocalShape {
  int workers = 1, threads = 1;
};
[[nodiscard]] LocalShape local_shape(const LocalOptions& opt, std::size_t n_jobs);

}  // namespace tw::sweep
