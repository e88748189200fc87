// Single-zone 2-D structured grids in CGNS files (Debian's serial libcgns) to and from the content
// of our grid files. Part of the converter only: libcgns links the serial HDF5.
#pragma once

#include <string>

#include "io/grid_file_content.hpp"

namespace wallrans {

/// Local. Reads the one zone of the one base of the CGNS file <path>: it must be structured with
/// cell dimension 2, have CoordinateX and CoordinateY (a CoordinateZ must be constant), and each
/// BC_t of its ZoneBC must be a PointRange of vertices (GridLocation Vertex) along one side of
/// the zone; it becomes a patch of the same name, with a kind derived from its BCType where one
/// fits (wall, inflow, outflow, slip, opening). Everything else (flow solutions, connectivity,
/// BC data) is ignored. Throws InputError "<path>: ...: expected ..., got ..." otherwise.
GridFileContent read_cgns_grid(const std::string& path);

/// Local. Writes `content` as a CGNS file (HDF5 storage): one base "wallrans" (cell and physical
/// dimension 2), one structured zone "block" with CoordinateX and CoordinateY in double
/// precision, and one BC_t per patch (PointRange of vertices, BCType from the patch kind,
/// BCTypeUserDefined without one). Written under "<path>.tmp" and renamed, so a failure leaves
/// no partial file under <path>. Throws InputError naming <path> if it cannot be written.
void write_cgns_grid(const std::string& path, const GridFileContent& content);

}  // namespace wallrans
