#include "app/stop_signals.hpp"

namespace wallrans {

namespace {

constexpr int stop_signals[3] = {SIGTERM, SIGINT, SIGUSR1};

// A signal handler may only store to a lock-free flag of static storage, so this is the
// program's one piece of global state: the number of the first stop signal, 0 if none.
volatile std::sig_atomic_t received = 0;

extern "C" void note_stop(int signal) {
  if (received == 0) received = signal;
}

}  // namespace

StopSignals::StopSignals() {
  received = 0;
  struct sigaction action {};
  action.sa_handler = note_stop;
  sigemptyset(&action.sa_mask);
  action.sa_flags = SA_RESTART;  // system calls in flight (file writes, MPI) carry on
  for (int k = 0; k < 3; ++k) sigaction(stop_signals[k], &action, &previous_[k]);
}

StopSignals::~StopSignals() {
  for (int k = 0; k < 3; ++k) sigaction(stop_signals[k], &previous_[k], nullptr);
}

bool StopSignals::requested() const { return received != 0; }

std::string StopSignals::name() const {
  switch (received) {
    case SIGTERM:
      return "SIGTERM";
    case SIGINT:
      return "SIGINT";
    case SIGUSR1:
      return "SIGUSR1";
    default:
      return "";
  }
}

}  // namespace wallrans
