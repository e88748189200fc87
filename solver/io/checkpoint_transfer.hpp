// The part of each checkpoint dataset a rank transfers and the collective transfers, shared by
// the checkpoint writer and reader. Internal to the checkpoint library (includes hdf5.h).
#pragma once

#include <mpi.h>

#include <cstdint>
#include <string>
#include <vector>

#include "grid/grid.hpp"
#include "io/checkpoint.hpp"
#include "io/hdf5_handles.hpp"

namespace wallrans::checkpoint_transfer {

// One rank's part of a dataset: the global dimensions and the start and size of the block this
// rank transfers (all sizes zero on a rank that owns none of it), or for a 1-D dataset of
// boundary faces the sorted ids of the elements it transfers.
struct Block {
  std::vector<hsize_t> global, start, count;
  bool by_id = false;
  std::vector<hsize_t> ids;
  size_t size() const {
    if (by_id) return ids.size();
    size_t n = 1;
    for (const hsize_t c : count) n *= static_cast<size_t>(c);
    return n;
  }
};

// This rank's boundary faces sorted by global id: the ids and, for each, its position in the
// caller's vectors. Transfers run in this order, the order in which HDF5 visits a selection.
struct FaceOrder {
  std::vector<hsize_t> ids;
  std::vector<size_t> positions;
};

/// Local. This rank's block of a cells_y x cells_x cell dataset.
Block cell_block(const Grid& grid);
/// Local. This rank's block of the (cells_y + 1) x (cells_x + 1) node datasets: the nodes of its
/// cells without the far column/row unless it owns the last cells, so the blocks are disjoint.
Block node_block(const Grid& grid);
/// Local. The faces of `layout` in increasing id order.
FaceOrder face_order(const BoundaryLayout& layout);
/// Local. This rank's elements of an n_faces boundary dataset.
Block face_block(const BoundaryLayout& layout, const FaceOrder& order);

/// Local. Selects `block` in `file_space` (nothing if it is empty) and returns the matching
/// contiguous memory space.
Hdf5Space select_block(hid_t file_space, const Block& block);
/// Local. Property lists: collective MPI-IO transfers, and the MPI-IO driver on `comm`.
Hdf5PropertyList collective_transfer();
Hdf5PropertyList parallel_access(MPI_Comm comm);

/// Collective. Creates dataset `name` in `group` (64-bit little-endian floats, no fill pass),
/// writes this rank's block of `values` collectively and the dataset's checksum `crc`
/// (checkpoint_checksum::dataset_crc32 of the values) as its attribute "crc32".
void write_dataset(hid_t group, const std::string& name, const Block& block,
                   const std::vector<double>& values, hid_t transfer, uint32_t crc);
/// Collective. Reads this rank's block of dataset `dataset_path` (already validated by rank 0).
std::vector<double> read_dataset(hid_t file, const std::string& dataset_path, const Block& block,
                                 hid_t transfer);

/// Local. The owned cells of `field` in block order (j-major, i fastest).
std::vector<double> owned_values(const Grid& grid, const Field& field);
/// Local. The node coordinates (x or y) of this rank's node block.
std::vector<double> node_values(const Grid& grid, const Block& block, bool want_x);

}  // namespace wallrans::checkpoint_transfer
