// PETSc log stages of our own: with -log_view, PETSc reports the time, flops and events of each
// stage separately, so a run's time splits into the phases of the outer iteration.
#pragma once

#include <petsclog.h>

namespace wallrans {

/// Local: the id of the PETSc log stage `name`, registered on first use. PETSc keeps the
/// registry and rejects a second registration of a name, so every later caller (a second solver
/// in the same process) gets the existing stage.
PetscLogStage log_stage(const char* name);

/// Local: pushes `stage` for the lifetime of the object. Time spent in a stage pushed inside it
/// counts to the inner stage only (PETSc pauses the outer one).
class ScopedLogStage {
 public:
  explicit ScopedLogStage(PetscLogStage stage);
  ~ScopedLogStage();
  ScopedLogStage(const ScopedLogStage&) = delete;
  ScopedLogStage& operator=(const ScopedLogStage&) = delete;
};

}  // namespace wallrans
