// The case file's keys, section by section: the one list the loader's key checks and the
// case-file reference (configs/README.md, its key, type, default and range columns) are made of.
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace wallrans {

/// One key of a case file. `section` is the top-level key it belongs to ("" for the top level;
/// "boundaries" and "solid_regions" for the keys of each list entry). type, fallback (the default)
/// and range are the texts of the reference table's columns.
struct CaseKey {
  std::string_view section, key, type, fallback, range;
};

/// Local. Every key of every section, in the order of the reference.
const std::vector<CaseKey>& case_keys();

/// Local. The keys `section` accepts, in reference order (for yaml_reader's Section).
std::vector<std::string> keys_of(std::string_view section);

/// Local. The reference table's row of `key` up to its last column:
/// "| `key` | type | default | range |" (the meaning column follows in configs/README.md).
std::string reference_row_start(const CaseKey& key);

}  // namespace wallrans
