#include "sweep/schedule.hpp"

#include <omp.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <ostream>
#include <thread>

#include "core/error.hpp"

namespace tw::sweep {

namespace {

std::string seconds_text(double s) {
  char buf[32];
  if (!std::isfinite(s)) return "-";
  if (s < 100) std::snprintf(buf, sizeof buf, "%.3g s", s);
  else if (s < 6000) std::snprintf(buf, sizeof buf, "%.1f min", s / 60);
  else std::snprintf(buf, sizeof buf, "%.1f h", s / 3600);
  return buf;
}

}  // namespace

std::vector<Job> make_jobs(const std::vector<CasePlan>& plans, bool retry_failed) {
  std::vector<Job> jobs;
  for (std::size_t i = 0; i < plans.size(); ++i) {
    const auto st = plans[i].state;
    if (st == CasePlan::State::done) continue;
    if (st == CasePlan::State::failed && !retry_failed) continue;
    jobs.push_back({i, st == CasePlan::State::remeasure, plans[i].cost});
  }
  std::stable_sort(jobs.begin(), jobs.end(), [](const Job& a, const Job& b) {
    // A measure-only job costs little next to a run.
    const double ca = a.measure_only ? 0 : a.cost, cb = b.measure_only ? 0 : b.cost;
    return ca > cb;
  });
  return jobs;
}

std::optional<Job> JobQueue::take(const std::atomic<bool>* stop) {
  std::lock_guard lock(m_);
  if ((stop != nullptr && stop->load()) || next_ >= jobs_.size()) return std::nullopt;
  return jobs_[next_++];
}

std::size_t JobQueue::remaining() {
  std::lock_guard lock(m_);
  return jobs_.size() - next_;
}

ProgressReporter::ProgressReporter(const Sweep& s, std::size_t already, const std::vector<Job>& jobs, std::ostream& out)
    : s_(s), out_(out), t0_(std::chrono::steady_clock::now()), done_(already), total_(already + jobs.size()),
      cost_of_(s.cases.size(), 0.0) {
  for (const auto& j : jobs) {
    const double c = j.measure_only ? 0.01 * j.cost : j.cost;
    cost_of_[j.index] = c;
    cost_total_ += c;
  }
}

void ProgressReporter::finished(const CaseRecord& r) {
  std::lock_guard lock(m_);
  ++done_;
  cost_done_ += cost_of_.at(r.index);
  const double elapsed = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0_).count();
  const double left = cost_total_ - cost_done_;
  const double eta = cost_done_ > 0 ? elapsed * left / cost_done_ : std::nan("");
  const std::size_t w = std::to_string(total_).size();
  std::string done = std::to_string(done_);
  done = std::string(w - std::min(w, done.size()), ' ') + done;
  std::string line = "tubewave: sweep: [" + done + "/" + std::to_string(total_) + "] " + r.id + " " + r.status +
                     " in " + seconds_text(r.wall_seconds) + " (" + s_.cases.at(r.index).describe(s_.parameters) + ")";
  if (r.status != "completed" && !r.message.empty()) line += ": " + r.message;
  line += "; elapsed " + seconds_text(elapsed) + ", ETA " + (done_ == total_ ? std::string("-") : seconds_text(eta));
  out_ << line << "\n" << std::flush;
}

LocalShape local_shape(const LocalOptions& opt, std::size_t n_jobs) {
  LocalShape sh;
  const int total = opt.threads > 0 ? opt.threads : omp_get_max_threads();
  const int want = opt.jobs > 0 ? opt.jobs : total;
  sh.workers = static_cast<int>(std::max<std::size_t>(1, std::min<std::size_t>(static_cast<std::size_t>(want), n_jobs)));
  sh.threads = std::max(1, total / sh.workers);
  return sh;
}

std::vector<CaseRecord> run_local(const Sweep& s, const std::vector<CasePlan>& plans, const std::vector<Job>& jobs,
                                  const LocalOptions& opt, ProgressReporter& progress) {
  const int total_threads = opt.threads > 0 ? opt.threads : omp_get_max_threads();
  const LocalShape shape = local_shape(opt, jobs.size());
  JobQueue queue(jobs);
  std::mutex m;
  int threads_in_use = 0, busy = 0;
  std::vector<CaseRecord> records;

  auto worker = [&]() {
    while (true) {
      int threads = 1;
      std::optional<Job> job;
      {
        std::lock_guard lock(m);
        job = queue.take(opt.stop);
        if (!job) return;
        ++busy;
        const std::size_t waiting = queue.remaining();
        const int idle = shape.workers - busy;
        const int slots = 1 + static_cast<int>(std::min<std::size_t>(waiting, static_cast<std::size_t>(std::max(0, idle))));
        threads = std::max(1, (total_threads - threads_in_use) / slots);
        threads_in_use += threads;
      }
      CaseOptions co;
      co.threads = threads;
      co.stop = opt.stop;
      co.measure_only = job->measure_only;
      const Case& c = s.cases.at(job->index);
      CaseRecord r = run_one_case(s, c, plans.at(job->index).run_hash, co);
      progress.finished(r);
      std::lock_guard lock(m);
      threads_in_use -= threads;
      --busy;
      records.push_back(std::move(r));
    }
  };
  if (shape.workers == 1) {
    worker();  // on this thread: no thread of its own for a sequential sweep
  } else {
    std::vector<std::thread> pool;
    for (int w = 0; w < shape.workers; ++w) pool.emplace_back(worker);
    for (auto& t : pool) t.join();
  }
  return records;
}

}  // namespace tw::sweep
