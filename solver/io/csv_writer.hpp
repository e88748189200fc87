// Plain CSV tables (history, wall data, profiles): a streaming writer for rank-0 outputs and a
// reader for tests and tools.
#pragma once

#include <cstdio>
#include <memory>
#include <string>
#include <vector>

namespace wallrans {

/// Writes a header line of column names, then one line of numbers per row(). Each row is flushed,
/// so a run that stops early still leaves every completed row on disk. Local: use it on one rank.
class CsvWriter {
 public:
  /// Local. Creates (truncates) `path` and writes the header. Column names must be non-empty and
  /// free of commas, quotes and line breaks (the file is written without quoting). Throws Error
  /// naming the path on failure.
  CsvWriter(std::string path, std::vector<std::string> columns);

  /// Local. Appends one row in "%.16e" form (17 significant digits, so doubles read back exactly).
  /// Throws Error naming the path if the row length differs from the header or writing fails.
  void row(const std::vector<double>& values);

  const std::string& path() const { return path_; }
  const std::vector<std::string>& columns() const { return columns_; }

 private:
  struct CloseFile {
    void operator()(std::FILE* file) const noexcept { std::fclose(file); }
  };
  std::string path_;
  std::vector<std::string> columns_;
  std::unique_ptr<std::FILE, CloseFile> file_;
};

/// A CSV file read back: column names and rows of numbers.
struct CsvTable {
  std::vector<std::string> columns;
  std::vector<std::vector<double>> rows;
};

/// Local. Reads a CSV file with one header line and numeric rows; blank lines are skipped and
/// spaces around fields ignored. Throws InputError "path:line: ..." on a missing file, a missing
/// header, a row with the wrong number of fields or a field that is not a number.
CsvTable read_csv(const std::string& path);

}  // namespace wallrans
