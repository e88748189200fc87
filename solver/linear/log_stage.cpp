// PETSc log stages of our own (see log_stage.hpp).
#include "linear/log_stage.hpp"

#include "core/error.hpp"

namespace wallrans {

PetscLogStage log_stage(const char* name) {
  PetscLogStage stage = -1;
  check_petsc(PetscLogStageGetId(name, &stage));
  if (stage < 0) check_petsc(PetscLogStageRegister(name, &stage));
  return stage;
}

ScopedLogStage::ScopedLogStage(PetscLogStage stage) { check_petsc(PetscLogStagePush(stage)); }

// Pop fails only if the stack is empty, which the push in the constructor rules out.
ScopedLogStage::~ScopedLogStage() { (void)PetscLogStagePop(); }

}  // namespace wallrans
