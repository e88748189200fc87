// Initialises PETSc (and MPI) for the lifetime of the object; built first in main.
#pragma once

namespace wallrans {

class PetscSession {
 public:
  PetscSession(int* argc, char*** argv);
  PetscSession(const PetscSession&) = delete;
  PetscSession& operator=(const PetscSession&) = delete;
  ~PetscSession();
};

}  // namespace wallrans
