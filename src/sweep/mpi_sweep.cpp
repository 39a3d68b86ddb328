#include "sweep/mpi_sweep.hpp"

#include <chrono>
#include <cmath>
#include <cstdlib>
#include <iostream>
#include <mutex>
#include <thread>

#include "core/error.hpp"
#include "sim/run.hpp"

#ifdef TUBEWAVE_HAVE_MPI
#include <mpi.h>
#endif

namespace tw::sweep::mpi {

int launched_world_size() {
  for (const char* v : {"OMPI_COMM_WORLD_SIZE", "PMI_SIZE"})
    if (const char* text = std::getenv(v)) {
      const int n = std::atoi(text);
      if (n > 0) return n;
    }
  return 0;
}

#ifdef TUBEWAVE_HAVE_MPI

namespace {

constexpr int tag_request = 101;  ///< worker -> rank 0: {case or -1, status, recorded, wall}
constexpr int tag_job = 102;      ///< rank 0 -> worker: {case or -1, measure_only}

double status_code(const std::string& status) {
  if (status == "completed") return 0;
  if (status == "interrupted") return 2;
  return 1;
}

const char* status_name(double code) {
  if (code == 0) return "completed";
  if (code == 2) return "interrupted";
  return "failed";
}

/// The record of a case another rank ran: from its file, else what the message says.
CaseRecord remote_record(const Sweep& s, const double msg[4], int rank) {
  const Case& c = s.cases.at(static_cast<std::size_t>(msg[0]));
  if (msg[2] != 0)
    if (auto r = read_record(s.case_file(c))) {
      r->index = c.index;
      return *r;
    }
  CaseRecord r;
  r.index = c.index;
  r.id = c.id;
  r.status = status_name(msg[1]);
  r.wall_seconds = msg[3];
  r.output = s.case_file(c);
  if (r.status == "failed") r.message = "not recorded; see the messages of rank " + std::to_string(rank);
  return r;
}

}  // namespace

bool built_with_mpi() { return true; }

Session::Session() {
  int provided = 0;
  MPI_Init_thread(nullptr, nullptr, MPI_THREAD_FUNNELED, &provided);
  MPI_Comm_rank(MPI_COMM_WORLD, &rank_);
  MPI_Comm_size(MPI_COMM_WORLD, &size_);
  if (provided < MPI_THREAD_FUNNELED && rank_ == 0)
    std::cerr << "tubewave: warning: the MPI library does not promise MPI_THREAD_FUNNELED; rank 0 runs cases on a "
                 "second thread that never calls MPI\n";
}

Session::~Session() { MPI_Finalize(); }

int Session::agree(int code) const {
  int out = code;
  MPI_Allreduce(&code, &out, 1, MPI_INT, MPI_MAX, MPI_COMM_WORLD);
  return out;
}

std::vector<CaseRecord> run_distributed(const Session& session, const Sweep& s, const std::vector<CasePlan>& plans,
                                        const std::vector<Job>& jobs, int threads, const std::atomic<bool>* stop,
                                        ProgressReporter* progress) {
  if (session.rank() != 0) {
    double msg[4] = {-1, 0, 0, 0};
    while (true) {
      MPI_Send(msg, 4, MPI_DOUBLE, 0, tag_request, MPI_COMM_WORLD);
      double job[2];
      MPI_Recv(job, 2, MPI_DOUBLE, 0, tag_job, MPI_COMM_WORLD, MPI_STATUS_IGNORE);
      if (job[0] < 0) break;
      const Case& c = s.cases.at(static_cast<std::size_t>(job[0]));
      CaseOptions co;
      co.threads = threads;
      co.stop = stop;
      co.measure_only = job[1] != 0;
      std::string hash;
      CaseRecord r;
      try {
        hash = fnv1a_hex(load_run_file(s.base, c.overrides).resolved_yaml());
        r = run_one_case(s, c, hash, co);
      } catch (const Error& e) {  // the run file reads differently here than on rank 0
        r.index = c.index;
        r.status = "failed";
        std::cerr << "tubewave: rank " << session.rank() << ": " << c.id << ": " << e.what() << "\n";
      }
      if (r.status == "failed" && !r.recorded)
        std::cerr << "tubewave: rank " << session.rank() << ": " << c.id << " failed: " << r.message << "\n";
      msg[0] = static_cast<double>(c.index);
      msg[1] = status_code(r.status);
      msg[2] = r.recorded ? 1 : 0;
      msg[3] = r.wall_seconds;
    }
    return {};
  }

  JobQueue queue(jobs);
  std::mutex m;
  std::vector<CaseRecord> records;
  auto keep = [&](CaseRecord r) {
    if (progress != nullptr) progress->finished(r);
    std::lock_guard lock(m);
    records.push_back(std::move(r));
  };
  // Rank 0 runs cases too, on a thread that never calls MPI.
  std::thread local([&] {
    while (auto job = queue.take(stop)) {
      CaseOptions co;
      co.threads = threads;
      co.stop = stop;
      co.measure_only = job->measure_only;
      keep(run_one_case(s, s.cases.at(job->index), plans.at(job->index).run_hash, co));
    }
  });
  int active = session.size() - 1;
  while (active > 0) {
    int flag = 0;
    MPI_Status st;
    MPI_Iprobe(MPI_ANY_SOURCE, tag_request, MPI_COMM_WORLD, &flag, &st);
    if (flag == 0) {
      std::this_thread::sleep_for(std::chrono::milliseconds(2));
      continue;
    }
    double msg[4];
    MPI_Recv(msg, 4, MPI_DOUBLE, st.MPI_SOURCE, tag_request, MPI_COMM_WORLD, MPI_STATUS_IGNORE);
    if (msg[0] >= 0) keep(remote_record(s, msg, st.MPI_SOURCE));
    const auto job = queue.take(stop);
    double reply[2] = {job ? static_cast<double>(job->index) : -1.0, job && job->measure_only ? 1.0 : 0.0};
    MPI_Send(reply, 2, MPI_DOUBLE, st.MPI_SOURCE, tag_job, MPI_COMM_WORLD);
    if (!job) --active;
  }
  local.join();
  return records;
}

#else  // built without MPI

bool built_with_mpi() { return false; }

Session::Session() { fail_internal("this tubewave was built without MPI"); }
Session::~Session() = default;
int Session::agree(int code) const { return code; }

std::vector<CaseRecord> run_distributed(const Session&, const Sweep&, const std::vector<CasePlan>&,
                                        const std::vector<Job>&, int, const std::atomic<bool>*, ProgressReporter*) {
  fail_internal("this tubewave was built without MPI");
}

#endif

}  // namespace tw::sweep::mpi
