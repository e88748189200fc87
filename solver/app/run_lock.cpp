#include "app/run_lock.hpp"

#include <fcntl.h>
#include <sys/file.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <csignal>
#include <sstream>
#include <system_error>

#include "core/error.hpp"
#include "core/utc_time.hpp"

namespace wallrans {

namespace fs = std::filesystem;

namespace {

std::string errno_text(int error) { return std::generic_category().message(error); }

std::string read_all(int fd) {
  std::string text;
  char buffer[512];
  if (lseek(fd, 0, SEEK_SET) != 0) return text;
  for (ssize_t n; (n = read(fd, buffer, sizeof buffer)) > 0;) text.append(buffer, static_cast<size_t>(n));
  return text;
}

// The file holds "host <name>", "pid <n>" and "since <time>" lines; an empty file names nobody.
std::optional<LockHolder> parse(const std::string& text) {
  LockHolder holder;
  std::istringstream in(text);
  std::string key;
  while (in >> key) {
    if (key == "host")
      in >> holder.host;
    else if (key == "pid")
      in >> holder.pid;
    else if (key == "since")
      in >> holder.since;
  }
  if (holder.host.empty() && holder.pid == 0) return std::nullopt;
  return holder;
}

bool is_alive_here(const LockHolder& holder) {
  return holder.pid > 0 && (kill(static_cast<pid_t>(holder.pid), 0) == 0 || errno == EPERM);
}

[[noreturn]] void throw_held(const fs::path& directory, const std::optional<LockHolder>& holder) {
  const std::string lock = (directory / lock_file_name).string();
  std::string got = holder ? "one held by " + holder->describe() : "one held by a run that is starting";
  if (holder && holder->host != host_name())
    got +=
        " (a process on another host cannot be checked from here; delete " + lock + " if that run has ended)";
  throw InputError(directory.string() + ": expected a run directory that no other run is using, got " + got);
}

enum class Verdict { free, held, stale };

// What the lock file open as `fd` says, taking its flock if nobody holds it (kept on `stale` or
// `free`; the caller releases it when only checking).
Verdict examine(int fd, std::optional<LockHolder>& holder) {
  const int locked = flock(fd, LOCK_EX | LOCK_NB);
  const int error = errno;
  holder = parse(read_all(fd));  // read after locking: a starting holder writes after its flock
  if (locked != 0 && error == EWOULDBLOCK) return Verdict::held;
  const bool lockable = locked == 0;  // some file systems do not support flock: judge by the pid
  if (!holder) return Verdict::free;
  if (holder->host != host_name()) return Verdict::held;
  if (!lockable && is_alive_here(*holder)) return Verdict::held;
  return Verdict::stale;
}

}  // namespace

std::string LockHolder::describe() const {
  return "process " + std::to_string(pid) + " on host " + host + (since.empty() ? "" : " since " + since);
}

std::string host_name() {
  char name[256] = {};
  if (gethostname(name, sizeof name - 1) != 0) return "unknown";
  return name;
}

RunLock::RunLock(const fs::path& directory) : path_(directory / lock_file_name) {
  // A releasing run deletes the file while holding its flock, so a lock taken on a file that is
  // no longer at the path is worthless: try again on the new file.
  for (int attempt = 0; attempt < 5; ++attempt) {
    const int fd = open(path_.c_str(), O_RDWR | O_CREAT | O_CLOEXEC, 0644);
    if (fd < 0) {
      const int error = errno;
      throw InputError(directory.string() + ": expected a run directory this run can write to, got '" +
                       path_.string() + "': " + errno_text(error));
    }
    std::optional<LockHolder> holder;
    const Verdict verdict = examine(fd, holder);
    struct stat opened {
    }, named{};
    const bool same_file = fstat(fd, &opened) == 0 && stat(path_.c_str(), &named) == 0 &&
                           opened.st_dev == named.st_dev && opened.st_ino == named.st_ino;
    if (verdict == Verdict::held) {
      close(fd);
      throw_held(directory, holder);
    }
    if (!same_file) {
      close(fd);
      continue;
    }
    if (verdict == Verdict::stale) stale_ = holder;
    const std::string text =
        "host " + host_name() + "\npid " + std::to_string(getpid()) + "\nsince " + utc_now() + "\n";
    if (ftruncate(fd, 0) != 0 ||
        pwrite(fd, text.data(), text.size(), 0) != static_cast<ssize_t>(text.size()) || fsync(fd) != 0) {
      const int error = errno;
      close(fd);
      unlink(path_.c_str());
      throw InputError(directory.string() + ": expected a run directory this run can write to, got '" +
                       path_.string() + "': " + errno_text(error));
    }
    fd_ = fd;
    return;
  }
  throw_held(directory, std::nullopt);
}

RunLock::~RunLock() {
  if (fd_ < 0) return;
  struct stat opened {
  }, named{};
  if (fstat(fd_, &opened) == 0 && stat(path_.c_str(), &named) == 0 && opened.st_dev == named.st_dev &&
      opened.st_ino == named.st_ino)
    unlink(path_.c_str());
  close(fd_);
}

void RunLock::check_free(const fs::path& directory) {
  const fs::path path = directory / lock_file_name;
  const int fd = open(path.c_str(), O_RDONLY | O_CLOEXEC);
  if (fd < 0) return;  // no lock file (or none we could read: the claim will say why)
  std::optional<LockHolder> holder;
  const Verdict verdict = examine(fd, holder);
  close(fd);  // also drops a flock taken by examine
  if (verdict == Verdict::held) throw_held(directory, holder);
}

}  // namespace wallrans
