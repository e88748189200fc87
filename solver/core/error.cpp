// Implementation of the library return-code checks.
#include "core/error.hpp"

#include <mpi.h>
#include <petscsys.h>

namespace wallrans {

namespace {
std::string site(const std::source_location& where) {
  return std::string(where.file_name()) + ":" + std::to_string(where.line()) + " (" + where.function_name() +
         ")";
}
}  // namespace

void check_petsc(int code, const std::source_location& where) {
  if (code == 0) return;
  const char* text = nullptr;
  PetscErrorMessage(static_cast<PetscErrorCode>(code), &text, nullptr);
  throw Error("PETSc error " + std::to_string(code) + " (" + (text ? text : "unknown") + ") at " +
              site(where));
}

void check_mpi(int code, const std::source_location& where) {
  if (code == MPI_SUCCESS) return;
  char text[MPI_MAX_ERROR_STRING];
  int length = 0;
  MPI_Error_string(code, text, &length);
  throw Error("MPI error (" + std::string(text, static_cast<size_t>(length)) + ") at " + site(where));
}

}  // namespace wallrans
