#include "linear/petsc_session.hpp"

#include <petscsys.h>

#include "core/error.hpp"

namespace wallrans {

PetscSession::PetscSession(int* argc, char*** argv) {
  // No options file; no PETSc help text of its own on our command line.
  check_petsc(PetscInitialize(argc, argv, nullptr, nullptr));
}

PetscSession::~PetscSession() { (void)PetscFinalize(); }

}  // namespace wallrans
