// Cell fields of a distributed grid as VTK XML structured-grid files: one piece per rank plus the
// parallel index (.pvts) that VTK readers and viewers use to reassemble the whole grid; the same
// fields averaged to the nodes as point data (contour plots need them); and the .pvd collection
// that makes a time series of several such files.
#pragma once

#include <string>
#include <vector>

#include "grid/grid.hpp"

namespace wallrans {

/// A cell scalar to write, borrowed for the duration of the call.
struct NamedScalar {
  std::string name;
  const Field* field;
};

/// A cell 2-vector to write (stored as 3 components with z = 0), borrowed for the call.
struct NamedVector {
  std::string name;
  const VectorField* field;
};

/// Collective over grid.comm(). Writes <directory>/<basename>_<rank>.vts (this rank's owned cells,
/// with nodes [x_begin, x_end] x [y_begin, y_end] as points, z = 0, extent k = 0..0) and, on
/// rank 0, the index <directory>/<basename>.pvts listing every piece with its extent. Cell data:
/// each scalar, each vector as 3 components, plus "cell_volume" [m^2] and "cell_index" (i, j).
/// Point data: each scalar and vector under the same name, averaged at each node over the (up to
/// four) cells around it, leaving out cells where `excluded` (if given) is non-zero unless all
/// of a node's cells are such cells.
/// Rank 0 creates the directory if missing. Every file is written under a temporary name and
/// renamed, so a crash never leaves a torn file under the final name. Names must be non-empty,
/// unique, distinct from the two grid quantities and free of XML markup characters; fields must
/// belong to `grid`. Throws wallrans::Error on every rank if any rank fails. Returns the path of
/// the .pvts file (the same string on every rank).
std::string write_vtk_fields(const Grid& grid, const std::vector<NamedScalar>& scalars,
                             const std::vector<NamedVector>& vectors, const std::string& directory,
                             const std::string& basename, const Field* excluded = nullptr);

/// One data set of a time series: its time value and its file, relative to the series file.
struct SeriesEntry {
  double time;
  std::string file;
};

/// Local (one rank). Writes the VTK collection file `path` (.pvd) listing `entries` in the order
/// given, under a temporary name and renamed. File names must be free of XML markup characters.
/// Throws Error naming the path on failure.
void write_vtk_series(const std::string& path, const std::vector<SeriesEntry>& entries);

}  // namespace wallrans
