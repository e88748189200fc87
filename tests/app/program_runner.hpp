// Test support for tests that launch the real `wallrans` program as a user would: a scratch
// directory, a process runner that captures stdout/stderr and the exit status, and file helpers.
#pragma once

#include <filesystem>
#include <functional>
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

/// A program started in the background with its stdout and stderr captured in files, so a test
/// can signal it (or its processes) while it runs. Killed (SIGKILL) and reaped on destruction if
/// it is still running.
class BackgroundProgram {
 public:
  /// Starts `argv` (argv[0] is the executable's path) in `directory`, with `environment`
  /// ("NAME=value" entries) added to the test's own.
  BackgroundProgram(const std::vector<std::string>& argv, const std::filesystem::path& directory,
                    const std::filesystem::path& capture_directory, const std::string& label,
                    const std::vector<std::string>& environment = {});
  BackgroundProgram(const BackgroundProgram&) = delete;
  BackgroundProgram& operator=(const BackgroundProgram&) = delete;
  ~BackgroundProgram();

  int pid() const { return pid_; }
  /// Sends `signal` to the process; false if it has already been reaped.
  bool signal(int signal) const;
  /// Waits for the process to end and returns its exit status and output (status -1, and the
  /// signal in `terminating_signal`, if a signal ended it).
  ProgramResult wait();
  int terminating_signal() const { return terminating_signal_; }

 private:
  int pid_ = -1;
  int terminating_signal_ = 0;
  std::filesystem::path out_, err_;
};

/// The argument vector `mpiexec -n ranks <wallrans> arguments...` (the launcher found by CMake).
std::vector<std::string> mpi_command(int ranks, const std::vector<std::string>& arguments);

/// The argument vector `<wallrans> arguments...`.
std::vector<std::string> program_command(const std::vector<std::string>& arguments);

/// The process ids of the running `wallrans` processes whose parent is `parent` (the ranks a
/// launcher started), in increasing order.
std::vector<int> program_children(int parent);

/// Polls `condition` every 20 ms until it holds or `seconds` have passed; returns whether it held.
bool wait_until(const std::function<bool()>& condition, double seconds);

/// The number of data rows in <directory>/residuals.csv (0 if it does not exist yet).
int history_rows(const std::filesystem::path& directory);

/// The value of the top-level string field "key" of a JSON file written by wallrans ("" if the
/// file is missing or not JSON, or the field is absent or not a string).
std::string json_field(const std::filesystem::path& path, const std::string& key);

/// This machine's host name.
std::string this_host();

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

/// The program's own lines of `text` (those starting "wallrans"; under a launcher stderr also
/// holds the launcher's notice of a non-zero exit).
std::vector<std::string> program_lines(const std::string& text);

}  // namespace wallrans::test_support
