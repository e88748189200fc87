// The signals that ask a run to stop cleanly: SIGTERM and SIGINT (what schedulers and Ctrl-C
// send) and SIGUSR1 (which OpenMPI's mpirun forwards to every rank and then exits with the
// ranks' own code; it turns SIGTERM into an abort with code 1 instead, see README).
#pragma once

#include <csignal>
#include <string>

namespace wallrans {

class StopSignals {
 public:
  /// Local. Installs the handlers (replacing PETSc's for these signals) until destruction.
  StopSignals();
  StopSignals(const StopSignals&) = delete;
  StopSignals& operator=(const StopSignals&) = delete;
  ~StopSignals();

  /// Local. Whether one of the signals has arrived since construction.
  bool requested() const;
  /// Local. The name of the first signal that arrived ("SIGTERM", ...), empty if none.
  std::string name() const;

 private:
  struct sigaction previous_[3];
};

}  // namespace wallrans
