// Test support for tests that launch the real `wallrans` program as a user would: a scratch
// directory, a process runner that captures stdout/stderr and the exit status, and file helpers.
#pragma once

#include <filesystem>
#include <map>
#include <string>
#include <vector>

namespace wallrans::test_support {

/// A fresh, uniquely named directory under the system temp directory, removed on destruction.
class ScratchDirectory {
 public:
  explicit ScratchDirectory(const std::string& prefix);
  ScratchDirectory(const ScratchDirectory&) = delete;
  ScratchDirectory& operator=(const ScratchDirectory&) = delete;
  ~ScratchDirectory();
  const std::filesystem::path& path() const { return path_; }

 private:
  std::filesystem::path path_;
};

/// What a finished program run left behind.
struct ProgramResult {
  int exit_status = -1;  ///< the process exit code; -1 if it did not exit normally
  std::string out;       ///< everything written to stdout
  std::string err;       ///< everything written to stderr
};

/// Runs `wallrans` with `arguments` in the working directory `directory`, directly (one process).
/// Stdout and stderr are captured in files under `capture_directory`, named after `label`.
ProgramResult run_program(const std::filesystem::path& directory, const std::vector<std::string>& arguments,
                          const std::filesystem::path& capture_directory, const std::string& label);

/// As run_program, for another program: `program` is its path (e.g. the CGNS converter).
ProgramResult run_executable(const std::string& program, const std::filesystem::path& directory,
                             const std::vector<std::string>& arguments,
                             const std::filesystem::path& capture_directory, const std::string& label);

/// As run_program, but under `mpiexec -n ranks` (the MPI launcher found by CMake).
ProgramResult run_program_mpi(int ranks, const std::filesystem::path& directory,
                              const std::vector<std::string>& arguments,
                              const std::filesystem::path& capture_directory, const std::string& label,
                              const std::string& environment = "");

/// The whole content of a file; empty if it cannot be read.
std::string read_text(const std::filesystem::path& path);

/// Writes `text` to `path`, creating the parent directories.
void write_text(const std::filesystem::path& path, const std::string& text);

/// Every entry below `directory` (relative path -> content; directories and other non-regular
/// entries get a fixed placeholder), for "nothing created or changed" checks.
std::map<std::string, std::string> snapshot(const std::filesystem::path& directory);

/// The 1-based number of the first line of `text` that contains `marker`; 0 if none does.
int line_containing(const std::string& text, const std::string& marker);

/// The lines of `text` (split at '\n'; a final newline does not start another line).
std::vector<std::string> lines_of(const std::string& text);

}  // namespace wallrans::test_support
