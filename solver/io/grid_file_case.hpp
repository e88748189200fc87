// A case's grid from a grid file: orientation repair, the periodic check, and the case's boundary
// segments resolved against the file's patches; and the patches that describe a case's segments.
#pragma once

#include <mpi.h>

#include <string>
#include <vector>

#include "core/case_spec.hpp"
#include "grid/boundary.hpp"
#include "io/grid_file_content.hpp"
#include "meshes/node_coordinates.hpp"

namespace wallrans {

/// The nodes of a file grid, ready for Grid, and the segments to build its BoundaryMap from.
struct CaseGrid {
  NodeCoordinates nodes;
  /// spec.boundaries with each patch segment turned into its side and face range, and the side
  /// segments moved with a reversed j direction (a left-handed file); patch names are kept.
  std::vector<BoundarySegmentSpec> segments;
  std::string note;  ///< what was repaired ("" if nothing), for the terminal
};

/// Collective over `comm`. Reads spec.grid.file (read_grid_file), checks that every cell has the
/// same non-zero orientation and reverses j if all are clockwise (with a note), checks a periodic
/// x direction (at least 2 cells, left and right sides a fixed translation apart) and resolves the
/// segments. Throws InputError (the same on every rank): file problems name the grid file;
/// segment problems name the case file, the segment's line and key 'boundaries[k].patch'.
CaseGrid load_case_grid(MPI_Comm comm, const CaseSpec& spec);

/// Local. Patches describing the segments of `boundaries`: one per run of consecutive faces of a
/// segment on its side, named after the segment's patch if it has one and "<side>_<kind>"
/// otherwise (a run or name that repeats gets "_2", "_3", ...), with the segment's kind.
std::vector<GridPatch> case_patches(const BoundaryMap& boundaries);

}  // namespace wallrans
