// Error types and the single checking helper for library return codes.
#pragma once

#include <source_location>
#include <stdexcept>
#include <string>

namespace wallrans {

/// A runtime failure (library error, I/O failure, diverged state that cannot continue).
class Error : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

/// Bad user input (case file, mesh, restart file, command line). The message is one line,
/// starting with the offending file (and line) and stating what was expected.
class InputError : public Error {
 public:
  using Error::Error;
};

/// Throws Error if a PETSc call returned non-zero; adds PETSc's own message and the call site.
void check_petsc(int code, const std::source_location& where = std::source_location::current());

/// Throws Error if an MPI call returned non-zero.
void check_mpi(int code, const std::source_location& where = std::source_location::current());

}  // namespace wallrans
