// The lock that gives a run directory to one run at a time: the file <directory>/run.lock, held
// with flock() by rank 0 for the whole run and naming its holder's host, process and start time.
#pragma once

#include <filesystem>
#include <optional>
#include <string>

namespace wallrans {

inline constexpr const char* lock_file_name = "run.lock";

/// Who holds (or held) a lock, as its file says.
struct LockHolder {
  std::string host;
  long pid = 0;
  std::string since;  ///< UTC, ISO 8601
  /// "process 1234 on host node7 since 2026-01-01T12:00:00Z".
  std::string describe() const;
};

class RunLock {
 public:
  /// Local. Takes <directory>/run.lock without waiting. A lock left by a dead process on this host
  /// (no flock held on it) is taken over; stale_holder() then names that process. Throws
  /// InputError naming `directory` and the holder if a live run holds it, or if its holder is on
  /// another host (that process cannot be checked from here); throws InputError if the file
  /// cannot be created or written (naming the system's reason).
  explicit RunLock(const std::filesystem::path& directory);
  RunLock(const RunLock&) = delete;
  RunLock& operator=(const RunLock&) = delete;
  /// Local. Releases the lock and deletes its file.
  ~RunLock();

  const std::optional<LockHolder>& stale_holder() const { return stale_; }

  /// Local. Without taking it: throws the InputError of the constructor if <directory>/run.lock is
  /// held by a live run or by a process on another host; returns quietly otherwise (no file,
  /// or a stale one). Writes nothing.
  static void check_free(const std::filesystem::path& directory);

 private:
  std::filesystem::path path_;
  int fd_ = -1;
  std::optional<LockHolder> stale_;
};

/// Local. This host's name (gethostname).
std::string host_name();

}  // namespace wallrans
