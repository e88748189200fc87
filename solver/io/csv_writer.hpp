// Plain CSV tables (history, wall data, profiles): a streaming writer for rank-0 outputs and a
// reader for tests and tools.
#pragma once

#include <cstdio>
#include <memory>
#include <string>
#include <variant>
#include <vector>

namespace wallrans {

/// How a column's values are written: reals in "%.16e" form, integers without a decimal point,
/// text as given (unquoted).
enum class CsvType { real, integer, text };

struct CsvColumn {
  std::string name;
  CsvType type = CsvType::real;
};

/// One value of a row: a number (real or integer column) or a text (text column).
using CsvCell = std::variant<double, std::string>;

/// Writes a header line of column names, then one line per row(). Each row is flushed, so a run
/// that stops early still leaves every completed row on disk. Local: use it on one rank.
class CsvWriter {
 public:
  /// Local. Creates (truncates) `path` and writes the header; every column is real.
  CsvWriter(std::string path, std::vector<std::string> columns);
  /// Local. As above with typed columns. Column names must be non-empty and free of commas,
  /// quotes and line breaks (the file is written without quoting). Throws Error naming the path
  /// on failure.
  CsvWriter(std::string path, std::vector<CsvColumn> columns);

  /// Local. Appends one row of numbers: reals in "%.16e" form (17 significant digits, so doubles
  /// read back exactly), integer columns as whole numbers. Throws Error naming the path if the row
  /// length differs from the header, a table has text columns, an integer column gets a value
  /// that is not a whole number, or writing fails.
  void row(const std::vector<double>& values);
  /// Local. As above for tables with text columns: a text column takes a string without commas,
  /// quotes or line breaks, the other columns a number.
  void mixed_row(const std::vector<CsvCell>& cells);

  const std::string& path() const { return path_; }
  const std::vector<CsvColumn>& columns() const { return columns_; }

 private:
  struct CloseFile {
    void operator()(std::FILE* file) const noexcept { std::fclose(file); }
  };
  std::string format(size_t column, const CsvCell& cell) const;
  void write_line(const std::string& line);
  std::string path_;
  std::vector<CsvColumn> columns_;
  std::unique_ptr<std::FILE, CloseFile> file_;
};

/// A CSV file read back: column names, rows of numbers (NaN in text columns) and the fields of
/// every row as written.
struct CsvTable {
  std::vector<std::string> columns;
  std::vector<std::vector<double>> rows;
  std::vector<std::vector<std::string>> fields;
  /// The column's position; throws InputError naming the column if there is none.
  size_t column(const std::string& name) const;
};

/// Local. Reads a CSV file with one header line and numeric rows; blank lines are skipped and
/// spaces around fields ignored. Columns named in `text_columns` may hold any text. Throws
/// InputError "path:line: ..." on a missing file, a missing header, a row with the wrong number
/// of fields or a field of another column that is not a number.
CsvTable read_csv(const std::string& path, const std::vector<std::string>& text_columns = {});

}  // namespace wallrans
