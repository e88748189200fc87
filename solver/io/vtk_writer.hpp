// Cell fields of a distributed grid as VTK XML structured-grid files: one piece per rank plus the
// parallel index (.pvts) that ParaView and VTK's readers use to reassemble the whole grid.
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
/// Rank 0 creates the directory if missing. Every file is written under a temporary name and
/// renamed, so a crash never leaves a torn file under the final name. Names must be non-empty,
/// unique, distinct from the two grid quantities and free of XML markup characters; fields must
/// belong to `grid`. Throws wallrans::Error on every rank if any rank fails. Returns the path of
/// the .pvts file (the same string on every rank).
std::string write_vtk_fields(const Grid& grid, const std::vector<NamedScalar>& scalars,
                             const std::vector<NamedVector>& vectors, const std::string& directory,
                             const std::string& basename);

}  // namespace wallrans
