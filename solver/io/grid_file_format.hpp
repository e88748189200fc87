// The grid-file layout's local parts on one process with the serial (sec2) driver: validation of
// a file's structure, reading it whole and writing it. Compiled into the solver (against the
// parallel HDF5) and into the CGNS converter (against the serial HDF5); includes hdf5.h, so it
// is included from .cpp files only.
#pragma once

#include <string>
#include <vector>

#include "io/grid_file_content.hpp"
#include "io/hdf5_handles.hpp"

namespace wallrans::grid_file_format {

/// What rank 0 learns from a file before any coordinate is read.
struct Header {
  int cells_x = 0, cells_y = 0;
  std::vector<GridPatch> patches;
};

/// Local. The start of every "not a grid file" message: "<path>: expected a wallrans grid file
/// (HDF5 with attribute 'format' = 'wallrans-grid'), got ".
std::string expected_grid_file(const std::string& path);

/// Local. Opens <path> read-only and checks the format marker and version. Throws InputError
/// "<path>: expected a wallrans grid file (HDF5 with attribute 'format' = 'wallrans-grid'), got
/// ..." for a missing, non-HDF5, unreadable or truncated file or a missing or wrong marker, and
/// "<path>: attribute 'format_version': expected 1, got ..." for another version.
Hdf5File open_for_reading(const std::string& path);

/// Local. Checks the coordinate datasets (present, 2-D floating point, equal dimensions, at least
/// 2 x 2 nodes, fewer than 2^31 nodes) and reads and checks the patches of an open file; every
/// failure is an InputError naming `path` and the dataset or patch.
Header read_header(hid_t file, const std::string& path);

/// Local. Reads a whole file: open_for_reading, read_header, the coordinates, check_content.
GridFileContent read_file(const std::string& path);

/// Local. Checks `content` (check_content, at least one cell each way) and writes it to <path>:
/// the file is built in memory, then written under a temporary name, forced to disk and renamed,
/// so a failure never leaves a partial file under <path>. Throws InputError naming <path> if it
/// cannot be written.
void write_file(const std::string& path, const GridFileContent& content);

}  // namespace wallrans::grid_file_format
