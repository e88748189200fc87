// A small curved grid with patches, and a list of bad grid files, shared by the library test of
// grid files (parallel HDF5) and the program test (which links the serial HDF5 copy of the layout
// code), so both check the same files.
#pragma once

#include <functional>
#include <string>
#include <vector>

#include "io/grid_file_content.hpp"

namespace wallrans::test_support {

/// A right-handed 6 x 4 grid with curved j lines (nodes given by formulas here, not by a
/// generator) and one patch on each side, the bottom split in two.
GridFileContent sample_grid();

/// One bad grid file: `write(path)` creates it (or nothing, for a missing file); reading it must
/// fail with a one-line message naming the file and containing each of `mentions`.
struct BadGridFile {
  std::string name;
  std::function<void(const std::string& path)> write;
  std::vector<std::string> mentions;
};

/// At least one bad file per rule of docs/grid-file.md: missing, not HDF5, no or wrong marker,
/// wrong version, missing coordinates, mismatched or wrong dimensions, too few nodes, integer or
/// non-finite coordinates, bad patches, a zero-area cell and a folded cell. Local; call on one rank.
std::vector<BadGridFile> bad_grid_files();

}  // namespace wallrans::test_support
