// Grid files (our HDF5 layout, docs/grid-file.md): node coordinates and named boundary patches of
// one structured block, read collectively with parallel HDF5 and written by one rank.
#pragma once

#include <mpi.h>

#include <string>

#include "io/grid_file_content.hpp"

namespace wallrans {

/// Collective over `comm`. Reads the grid file <path> on every rank. Rank 0 first checks the
/// file's structure alone (serial driver), so a bad file throws the same one-line InputError on
/// every rank and no rank enters a collective HDF5 call with it: a missing, non-HDF5, unreadable
/// or truncated file, a wrong format marker or version, missing coordinates, coordinates that are
/// not 2-D floating point or differ in dimensions, fewer than 2 x 2 nodes, or a bad patch. Then
/// every rank opens the file with the MPI-IO driver and reads a disjoint band of node rows in one
/// collective transfer per coordinate; the bands are gathered so that each rank holds all nodes
/// (the Grid keeps the whole node array on every rank). Non-finite coordinates throw InputError.
GridFileContent read_grid_file(MPI_Comm comm, const std::string& path);

/// Collective over `comm`. Rank 0 writes `content` to <path> (grid_file_format::write_file:
/// built in memory, written under a temporary name and renamed); every rank returns or throws
/// the same error (InputError if <path> cannot be written).
void write_grid_file(MPI_Comm comm, const std::string& path, const GridFileContent& content);

}  // namespace wallrans
