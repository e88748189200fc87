// A run directory that belongs to one run of one case. What it holds is judged before anything is
// built (by `run` and `check` alike); then the run claims it: takes its lock, removes the results
// that must not survive into this run and marks it with the case it belongs to.
#pragma once

#include <mpi.h>

#include <filesystem>
#include <functional>
#include <memory>
#include <optional>
#include <string>

#include "app/run_lock.hpp"

namespace wallrans {

inline constexpr const char* identity_file_name = "run_identity.txt";

/// What a run directory holds.
enum class DirectoryContent {
  empty,            ///< missing, empty, or holding no file of ours
  same_case,        ///< results of this case (its identity file names this case)
  other_case,       ///< results of another case (its identity file names another case)
  unknown_results,  ///< files of ours but no readable identity file
};

struct RunDirectoryRequest {
  std::filesystem::path path;
  std::string origin;  ///< where the path came from: "command line: --output-dir" or "<case>: key '...'"
  std::string case_id, title, case_file;
  bool replace_results = false;        ///< --replace-results: delete another case's results first
  std::optional<std::string> restart;  ///< the checkpoint the run starts from, if any
};

/// Collective. Judges `request.path` and writes nothing: it must be a directory (or creatable as
/// one), writable, not in use by another run (RunLock::check_free), and hold no other case's
/// results unless `replace_results`, in which case it must not hold the restart checkpoint.
/// Throws the same one-line InputError on every rank. Returns what the directory holds.
DirectoryContent inspect_run_directory(MPI_Comm comm, const RunDirectoryRequest& request);

/// Local. Whether `name` is a file a run writes into its directory (checkpoints and their
/// descriptions, fields and fields.pvd, residuals.csv, progress.log, wall.csv, profiles,
/// summary.json, case.resolved.yaml, the identity file, and the temporary copies of each).
bool is_run_output(const std::string& name);

class RunDirectory {
 public:
  /// Collective. Claims the directory: creates it, takes its lock on rank 0 (held until
  /// destruction), judges it again under the lock, then removes the results that must not survive
  /// into this run and writes the identity file. On a fresh start (`restart_iteration` < 0) or
  /// over another case's results (with `replace_results`) every file of ours goes; on a restart
  /// from iteration R the summary, final fields, wall data and profiles go, and so do the fields
  /// and checkpoints of iterations after R (checkpoints only if `is_case_checkpoint`, so another
  /// case's files are never touched) and leftover temporary files. Rank 0 prints a note for a
  /// taken-over stale lock and for removed files. Throws InputError (or Error if a file cannot be
  /// removed) on every rank; the lock is then released.
  RunDirectory(MPI_Comm comm, const RunDirectoryRequest& request, int restart_iteration,
               const std::function<bool(const std::string&)>& is_case_checkpoint);
  RunDirectory(const RunDirectory&) = delete;
  RunDirectory& operator=(const RunDirectory&) = delete;
  /// Local. Releases the lock (rank 0) and deletes the lock file.
  ~RunDirectory();

  const std::filesystem::path& path() const { return path_; }

  /// Local (rank 0; others do nothing). Deletes our leftover temporary files (after a failed
  /// write), so a full disk has room for the summary. Never throws.
  void remove_temporaries() const noexcept;

 private:
  std::filesystem::path path_;
  int rank_ = 0;
  std::unique_ptr<RunLock> lock_;
};

}  // namespace wallrans
