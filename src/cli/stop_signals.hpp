#pragma once
/// Stop requests from signals, shared by `tubewave run` and `tubewave sweep`.
///
/// SIGTERM and SIGUSR1 (what batch schedulers send before a time limit) and SIGINT (Ctrl-C)
/// ask the work to stop: a run stops after the current step, writes a checkpoint and ends
/// with exit code 3; a sweep lets its running cases end that way and starts no new one.
/// SIGINT is reset to its default action once caught, so a second Ctrl-C ends the process at
/// once (outputs are then left under their temporary names, never looking complete). The
/// handler only stores to lock-free atomics (async-signal-safe); the time loop reads them
/// between steps.
#include <atomic>
#include <csignal>

namespace tw::cli {

class StopOnSignals {
 public:
  /// Installs the handlers; the destructor puts the previous ones back.
  StopOnSignals();
  ~StopOnSignals();
  StopOnSignals(const StopOnSignals&) = delete;
  StopOnSignals& operator=(const StopOnSignals&) = delete;

  /// Set once any of the signals arrived.
  static std::atomic<bool>& requested();
  /// The number of the last signal that arrived (0: none).
  static std::atomic<int>& signal_number();

 private:
  struct sigaction old_[3] {};
};

}  // namespace tw::cli
