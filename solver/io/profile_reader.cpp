// Inflow profile tables: the columns a segment needs, checked row by row.
#include "io/profile_reader.hpp"

#include <cerrno>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <system_error>
#include <vector>

#include "core/error.hpp"
#include "io/csv_writer.hpp"
#include "io/yaml_reader.hpp"

namespace wallrans {

InflowProfile read_inflow_profile(const std::string& path, const std::string& coordinate_column,
                                  const std::string& variable_column, const std::string& model,
                                  double shift) {
  const std::string expected_file = path + ": expected a readable profile file (CSV), got ";
  std::error_code status;
  if (std::filesystem::is_directory(path, status)) throw InputError(expected_file + "a directory");
  {
    errno = 0;
    std::ifstream probe(path);
    if (!probe) {
      throw InputError(expected_file + (errno != 0 ? std::generic_category().message(errno)
                                                   : "a file that cannot be opened"));
    }
  }
  const CsvTable table = read_csv(path);
  std::vector<std::string> wanted{coordinate_column, "u", "v"};
  if (!variable_column.empty()) wanted.push_back(variable_column);
  std::vector<size_t> index;
  for (const std::string& name : wanted) {
    size_t k = 0;
    while (k < table.columns.size() && table.columns[k] != name) ++k;
    if (k == table.columns.size()) {
      std::string expected = "columns " + coordinate_column + ", u, v";
      if (!variable_column.empty())
        expected += " and " + variable_column + " (the variable of model " + model + ")";
      std::string got;
      for (const auto& column : table.columns) got += (got.empty() ? "" : ", ") + column;
      throw InputError(path + ":1: expected " + expected + ", got " + got + " (no column '" + name + "')");
    }
    index.push_back(k);
  }
  if (table.rows.size() < 2) {
    throw InputError(path + ": expected at least 2 rows to interpolate between, got " +
                     std::to_string(table.rows.size()));
  }
  InflowProfile profile;
  profile.file = path;
  profile.shift = shift;
  profile.coordinate_column = coordinate_column;
  profile.variable_column = variable_column;
  std::vector<double>* targets[] = {&profile.coordinate, &profile.u, &profile.v, &profile.model_variable};
  for (size_t r = 0; r < table.rows.size(); ++r) {
    const std::string row = path + ": row " + std::to_string(r + 1) + " (after the header): column '";
    for (size_t c = 0; c < index.size(); ++c) {
      const double value = table.rows[r][index[c]];
      if (!std::isfinite(value))
        throw InputError(row + wanted[c] + "': expected a finite number, got " +
                         yaml_reader::number_text(value));
      targets[c]->push_back(c == 0 ? value + shift : value);
    }
    if (r > 0 && !(profile.coordinate[r] > profile.coordinate[r - 1])) {
      throw InputError(row + coordinate_column +
                       "': expected coordinates increasing strictly from row to row, got " +
                       yaml_reader::number_text(profile.coordinate[r] - shift) + " after " +
                       yaml_reader::number_text(profile.coordinate[r - 1] - shift));
    }
  }
  return profile;
}

}  // namespace wallrans
