#include "cli/stop_signals.hpp"

namespace tw::cli {

namespace {

std::atomic<bool> stop_requested{false};
std::atomic<int> stop_signal{0};
static_assert(std::atomic<bool>::is_always_lock_free && std::atomic<int>::is_always_lock_free);

constexpr int handled[3] = {SIGTERM, SIGUSR1, SIGINT};

extern "C" void tubewave_on_stop_signal(int sig) {
  stop_signal.store(sig);
  stop_requested.store(true);
}

}  // namespace

StopOnSignals::StopOnSignals() {
  for (int i = 0; i < 3; ++i) {
    struct sigaction sa {};
    sa.sa_handler = tubewave_on_stop_signal;
    sigemptyset(&sa.sa_mask);
    sa.sa_flags = SA_RESTART | (handled[i] == SIGINT ? SA_RESETHAND : 0);
    sigaction(handled[i], &sa, &old_[i]);
  }
}

StopOnSignals::~StopOnSignals() {
  for (int i = 0; i < 3; ++i) sigaction(handled[i], &old_[i], nullptr);
}

std::atomic<bool>& StopOnSignals::requested() { return stop_requested; }
std::atomic<int>& StopOnSignals::signal_number() { return stop_signal; }

}  // namespace tw::cli
