// Crash-safe replacement of a small file.
#pragma once

#include <filesystem>
#include <string>

namespace wallrans {

/// Local. Writes `bytes` to "<path>.tmp", forces it to disk, then renames it to `path`. The rename
/// replaces the old file atomically on POSIX file systems, so a reader (or a crash) sees either the
/// previous complete file or the new complete file, never a torn one. Throws Error starting with
/// `what` on failure (the temporary file is removed).
void write_file_atomically(const std::filesystem::path& path, const std::string& bytes,
                           const std::string& what);

}  // namespace wallrans
