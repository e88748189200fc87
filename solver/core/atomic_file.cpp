#include "core/atomic_file.hpp"

#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <memory>
#include <system_error>

#include "core/error.hpp"

namespace wallrans {

namespace {
struct CloseFile {
  void operator()(std::FILE* file) const noexcept { std::fclose(file); }
};
}  // namespace

void write_file_atomically(const std::filesystem::path& path, const std::string& bytes,
                           const std::string& what) {
  namespace fs = std::filesystem;
  fs::path temporary = path;
  temporary += ".tmp";
  std::unique_ptr<std::FILE, CloseFile> file(std::fopen(temporary.c_str(), "wb"));
  if (!file) {
    throw Error(what + ": cannot create '" + temporary.string() +
                "': " + std::generic_category().message(errno));
  }
  const bool written = std::fwrite(bytes.data(), 1, bytes.size(), file.get()) == bytes.size() &&
                       std::fflush(file.get()) == 0 && ::fsync(fileno(file.get())) == 0;
  int error = errno;
  const bool closed = std::fclose(file.release()) == 0;
  if (written && !closed) error = errno;
  std::error_code ignored;
  if (!written || !closed) {
    fs::remove(temporary, ignored);
    throw Error(what + ": cannot write '" + temporary.string() +
                "': " + std::generic_category().message(error));
  }
  std::error_code renamed;
  fs::rename(temporary, path, renamed);
  if (renamed) {
    fs::remove(temporary, ignored);
    throw Error(what + ": cannot rename '" + temporary.string() + "' to '" + path.string() +
                "': " + renamed.message());
  }
}

}  // namespace wallrans
