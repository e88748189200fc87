// CSV writing with checked stdio calls, and a strict reader that reports file:line.
#include "io/csv_writer.hpp"

#include <algorithm>
#include <cerrno>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <limits>
#include <string_view>
#include <system_error>

#include "core/error.hpp"

namespace wallrans {

namespace {

std::string errno_text() { return std::generic_category().message(errno); }

std::string_view trim(std::string_view text) {
  const auto first = text.find_first_not_of(" \t\r");
  if (first == std::string_view::npos) return {};
  const auto last = text.find_last_not_of(" \t\r");
  return text.substr(first, last - first + 1);
}

std::vector<std::string_view> split_fields(std::string_view line) {
  std::vector<std::string_view> fields;
  size_t start = 0;
  while (true) {
    const size_t comma = line.find(',', start);
    fields.push_back(trim(line.substr(start, comma == std::string_view::npos ? comma : comma - start)));
    if (comma == std::string_view::npos) return fields;
    start = comma + 1;
  }
}

bool is_plain_text(const std::string& text) { return text.find_first_of(",\"\r\n") == std::string::npos; }

std::vector<CsvColumn> real_columns(std::vector<std::string> names) {
  std::vector<CsvColumn> columns;
  for (auto& name : names) columns.push_back({std::move(name), CsvType::real});
  return columns;
}

}  // namespace

CsvWriter::CsvWriter(std::string path, std::vector<std::string> columns)
    : CsvWriter(std::move(path), real_columns(std::move(columns))) {}

CsvWriter::CsvWriter(std::string path, std::vector<CsvColumn> columns)
    : path_(std::move(path)), columns_(std::move(columns)) {
  if (columns_.empty()) throw Error(path_ + ": a CSV file needs at least one column");
  for (const auto& column : columns_) {
    if (column.name.empty() || !is_plain_text(column.name)) {
      throw Error(path_ + ": column name '" + column.name +
                  "' must be non-empty and free of commas, quotes and line breaks");
    }
  }
  file_.reset(std::fopen(path_.c_str(), "w"));
  if (!file_) throw Error(path_ + ": cannot create CSV file: " + errno_text());
  std::string header;
  for (size_t k = 0; k < columns_.size(); ++k) {
    if (k > 0) header += ',';
    header += columns_[k].name;
  }
  write_line(header);
}

std::string CsvWriter::format(size_t column, const CsvCell& cell) const {
  const CsvColumn& c = columns_[column];
  const std::string where = path_ + ": column '" + c.name + "': ";
  if (c.type == CsvType::text) {
    const auto* text = std::get_if<std::string>(&cell);
    if (text == nullptr || !is_plain_text(*text))
      throw Error(where + "expected a text without commas, quotes or line breaks");
    return *text;
  }
  const auto* value = std::get_if<double>(&cell);
  if (value == nullptr) throw Error(where + "expected a number, got a text");
  char buffer[40];
  if (c.type == CsvType::integer) {
    // Whole numbers up to 2^53 are exact in a double.
    if (!(std::abs(*value) <= 9007199254740992.0) || std::trunc(*value) != *value)
      throw Error(where + "expected a whole number, got " + std::to_string(*value));
    std::snprintf(buffer, sizeof buffer, "%lld", static_cast<long long>(*value));
  } else {
    std::snprintf(buffer, sizeof buffer, "%.16e", *value);
  }
  return buffer;
}

void CsvWriter::write_line(const std::string& line) {
  if (std::fputs(line.c_str(), file_.get()) < 0 || std::fputc('\n', file_.get()) == EOF ||
      std::fflush(file_.get()) != 0)
    throw Error(path_ + ": cannot write CSV row: " + errno_text());
}

void CsvWriter::row(const std::vector<double>& values) {
  mixed_row(std::vector<CsvCell>(values.begin(), values.end()));
}

void CsvWriter::mixed_row(const std::vector<CsvCell>& cells) {
  if (cells.size() != columns_.size()) {
    throw Error(path_ + ": CSV row has " + std::to_string(cells.size()) + " values, header has " +
                std::to_string(columns_.size()) + " columns");
  }
  std::string line;
  for (size_t k = 0; k < cells.size(); ++k) {
    if (k > 0) line += ',';
    line += format(k, cells[k]);
  }
  write_line(line);
}

size_t CsvTable::column(const std::string& name) const {
  const auto found = std::find(columns.begin(), columns.end(), name);
  if (found == columns.end()) throw InputError("CSV table: expected a column '" + name + "', got none");
  return static_cast<size_t>(found - columns.begin());
}

CsvTable read_csv(const std::string& path, const std::vector<std::string>& text_columns) {
  std::ifstream in(path);
  if (!in) throw InputError(path + ": cannot open CSV file");
  CsvTable table;
  std::vector<bool> is_text;
  std::string line;
  int line_number = 0;
  bool have_header = false;
  while (std::getline(in, line)) {
    ++line_number;
    const std::string_view content = trim(line);
    if (content.empty()) continue;
    const auto fields = split_fields(content);
    const std::string where = path + ":" + std::to_string(line_number) + ": ";
    if (!have_header) {
      for (const auto field : fields) {
        if (field.empty()) throw InputError(where + "empty column name in the header");
        table.columns.emplace_back(field);
        is_text.push_back(std::find(text_columns.begin(), text_columns.end(), field) != text_columns.end());
      }
      have_header = true;
      continue;
    }
    if (fields.size() != table.columns.size()) {
      throw InputError(where + "expected " + std::to_string(table.columns.size()) + " fields, got " +
                       std::to_string(fields.size()));
    }
    std::vector<double> values(fields.size(), std::numeric_limits<double>::quiet_NaN());
    for (size_t k = 0; k < fields.size(); ++k) {
      if (is_text[k]) continue;
      const std::string_view field = fields[k];
      const auto [end, status] = std::from_chars(field.data(), field.data() + field.size(), values[k]);
      if (field.empty() || status != std::errc() || end != field.data() + field.size()) {
        throw InputError(where + "column '" + table.columns[k] + "': expected a number, got '" +
                         std::string(field) + "'");
      }
    }
    table.rows.push_back(std::move(values));
    table.fields.emplace_back(fields.begin(), fields.end());
  }
  if (in.bad()) throw InputError(path + ": read error");
  if (!have_header) throw InputError(path + ":1: missing header line");
  return table;
}

}  // namespace wallrans
