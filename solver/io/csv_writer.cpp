// CSV writing with checked stdio calls, and a strict reader that reports file:line.
#include "io/csv_writer.hpp"

#include <cerrno>
#include <charconv>
#include <fstream>
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

}  // namespace

CsvWriter::CsvWriter(std::string path, std::vector<std::string> columns)
    : path_(std::move(path)), columns_(std::move(columns)) {
  if (columns_.empty()) throw Error(path_ + ": a CSV file needs at least one column");
  for (const auto& name : columns_) {
    if (name.empty() || name.find_first_of(",\"\r\n") != std::string::npos) {
      throw Error(path_ + ": column name '" + name +
                  "' must be non-empty and free of commas, quotes and line breaks");
    }
  }
  file_.reset(std::fopen(path_.c_str(), "w"));
  if (!file_) throw Error(path_ + ": cannot create CSV file: " + errno_text());
  std::string header;
  for (size_t k = 0; k < columns_.size(); ++k) header += (k ? "," : "") + columns_[k];
  header += '\n';
  if (std::fputs(header.c_str(), file_.get()) < 0 || std::fflush(file_.get()) != 0) {
    throw Error(path_ + ": cannot write CSV header: " + errno_text());
  }
}

void CsvWriter::row(const std::vector<double>& values) {
  if (values.size() != columns_.size()) {
    throw Error(path_ + ": CSV row has " + std::to_string(values.size()) + " values, header has " +
                std::to_string(columns_.size()) + " columns");
  }
  for (size_t k = 0; k < values.size(); ++k) {
    if (std::fprintf(file_.get(), k + 1 < values.size() ? "%.16e," : "%.16e\n", values[k]) < 0) {
      throw Error(path_ + ": cannot write CSV row: " + errno_text());
    }
  }
  if (std::fflush(file_.get()) != 0) throw Error(path_ + ": cannot write CSV row: " + errno_text());
}

CsvTable read_csv(const std::string& path) {
  std::ifstream in(path);
  if (!in) throw InputError(path + ": cannot open CSV file");
  CsvTable table;
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
      }
      have_header = true;
      continue;
    }
    if (fields.size() != table.columns.size()) {
      throw InputError(where + "expected " + std::to_string(table.columns.size()) + " fields, got " +
                       std::to_string(fields.size()));
    }
    std::vector<double> values(fields.size());
    for (size_t k = 0; k < fields.size(); ++k) {
      const std::string_view field = fields[k];
      const auto [end, status] = std::from_chars(field.data(), field.data() + field.size(), values[k]);
      if (field.empty() || status != std::errc() || end != field.data() + field.size()) {
        throw InputError(where + "column '" + table.columns[k] + "': expected a number, got '" +
                         std::string(field) + "'");
      }
    }
    table.rows.push_back(std::move(values));
  }
  if (in.bad()) throw InputError(path + ": read error");
  if (!have_header) throw InputError(path + ":1: missing header line");
  return table;
}

}  // namespace wallrans
