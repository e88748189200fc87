// Shared parts of the fuzz targets: the bytes of one input in a file, the check that a rejection
// is the one-line InputError of our contract, and the report of a finding.
#pragma once

#include <cstddef>
#include <cstdint>
#include <exception>
#include <string>

#include "core/error.hpp"

namespace wallrans::fuzz {

/// Local. Starts MPI once for the process (singleton, no launcher) with Open MPI's own signal
/// handlers off, so a crash reaches the sanitizer's and libFuzzer's handlers; MPI ends at exit.
void start_mpi();

/// Local. Starts PETSc once for the process (and MPI through start_mpi), without PETSc's signal
/// handler; PETSc ends at exit.
void start_petsc();

/// Local. A file of this process (in /dev/shm when it exists, else the temp directory), named
/// after `stem` and the process id, rewritten with the bytes of each input; removed at the end.
class InputFile {
 public:
  explicit InputFile(const std::string& stem);
  InputFile(const InputFile&) = delete;
  InputFile& operator=(const InputFile&) = delete;
  ~InputFile();
  const std::string& path() const { return path_; }
  /// Replaces the file's content with `size` bytes from `data`.
  void write(const uint8_t* data, size_t size) const;

 private:
  std::string path_;
};

/// Local. Prints `what` as a broken contract and aborts, so libFuzzer keeps the input as a crash
/// (and a replay fails).
[[noreturn]] void finding(const std::string& what);

/// Local. A rejection message must be non-empty, one line (no line feed, carriage return, vertical
/// tab or form feed) and name `file`; a finding otherwise.
void check_rejection_message(const std::string& message, const std::string& file);

/// Local. Runs `read` and returns true if it accepted the input. An InputError is a rejection
/// (its message checked by check_rejection_message, false returned); any other exception is a
/// finding: bad input must never end as a runtime failure (exit 1) or a crash.
template <typename Read>
bool accepts(const std::string& file, Read&& read) {
  try {
    read();
    return true;
  } catch (const InputError& e) {
    check_rejection_message(e.what(), file);
  } catch (const std::exception& e) {
    finding(std::string("not an InputError: ") + e.what());
  }
  return false;
}

}  // namespace wallrans::fuzz
