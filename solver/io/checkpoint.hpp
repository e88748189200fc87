// Checkpoint files: cell and boundary arrays of a distributed grid with run metadata, written and
// read with parallel HDF5 on any rank count, plus an XDMF description and pruning of old files.
#pragma once

#include <mpi.h>

#include <functional>
#include <string>
#include <utility>
#include <vector>

#include "grid/grid.hpp"
#include "meshes/node_coordinates.hpp"

namespace wallrans {

/// What a checkpoint says about the run that wrote it. In the file: attributes of the root group
/// ("iteration", "turbulence_model", "turbulence_variant", "cells_x", "cells_y",
/// "grid_fingerprint", "case_hash", "program_version", "written_at") next to the format marker
/// "format" = "wallrans-checkpoint" and "format_version" = 3; each scalar is a double attribute of
/// the group "/scalars", kept in the order given. Every dataset carries the CRC-32 of its data
/// (zlib's, over the stored little-endian doubles in dataset order) as the attribute "crc32".
struct CheckpointMetadata {
  int iteration = 0;
  std::string model, variant;    ///< turbulence model and variant
  int cells_x = 0, cells_y = 0;  ///< filled by the writer from the grid
  std::string grid_fingerprint;  ///< filled by the writer: grid_fingerprint(grid.nodes())
  std::string case_hash;         ///< caller-provided hash of the resolved case text (see text_hash)
  std::string program_version;
  std::string written_at;  ///< filled by the writer: UTC, ISO 8601 ("2024-05-01T12:34:56Z")
  std::vector<std::pair<std::string, double>> scalars;  ///< e.g. residual references

  bool operator==(const CheckpointMetadata&) const = default;
};

/// A cell array: dataset "/fields/<name>" of cells_y x cells_x doubles, global (j, i) order. The
/// field is borrowed for the call (read only when writing).
struct CellArray {
  std::string name;
  Field* field;
};

/// The boundary faces a rank holds values for: their global ids (distinct within and across
/// ranks, in any order) out of `n_faces` boundary faces of the whole domain (the same on every
/// rank). Ids are the same on any rank count, so a file can be read on another one.
struct BoundaryLayout {
  std::vector<int> ids;
  int n_faces = 0;
};

/// A boundary array: dataset "/boundary/<name>" of n_faces doubles in global-id order. Entry k of
/// the vector belongs to the face with id layout.ids[k]. The vector is borrowed for the call.
struct BoundaryArray {
  std::string name;
  std::vector<double>* values;
};

/// Local. Hex digest (16 digits) of the 64-bit FNV-1a hash of the grid size and the node
/// coordinates' bytes (all as little-endian 64-bit words), so any change of a node, however small,
/// changes it.
std::string grid_fingerprint(const NodeCoordinates& nodes);

/// Local. Hex digest (16 digits) of the 64-bit FNV-1a hash of the bytes of `text`.
std::string text_hash(const std::string& text);

/// Collective over grid.comm(). Writes the checkpoint <path> with parallel HDF5 (MPI-IO driver):
/// the metadata attributes, "/fields/<name>" for each cell array and "/boundary/<name>" for each
/// boundary array (collective writes of each rank's owned cells and faces), and the node coordinates
/// "/grid/x", "/grid/y" ((cells_y + 1) x (cells_x + 1), each rank writing a disjoint block) and the
/// same interleaved, "/grid/xy" ((cells_y + 1) x (cells_x + 1) x 2, x first). The
/// file is written as "<path>.tmp", closed, fsynced and then renamed to <path> by rank 0, so a
/// crash never leaves a torn file under <path>; rank 0 creates the parent directory if missing.
/// Names must be non-empty, unique within their group and made of letters, digits, '_', '-' and
/// '.'; fields must belong to `grid`, boundary vectors must have one value per id of `layout` and
/// the ids must lie in [0, n_faces). Metadata is
/// taken from rank 0. Returns the metadata as stored (cells_x, cells_y, grid_fingerprint and
/// written_at filled in). Throws Error on every rank if any rank fails.
/// `abort_after_datasets` >= 0 is a TEST-ONLY switch: once that many datasets have been written,
/// every rank calls raise(SIGKILL), simulating a kill in the middle of writing.
CheckpointMetadata write_checkpoint(const Grid& grid, const std::string& path,
                                    const CheckpointMetadata& metadata, const std::vector<CellArray>& cells,
                                    const BoundaryLayout& layout, const std::vector<BoundaryArray>& boundary,
                                    int abort_after_datasets = -1);

/// Collective over `comm`. Rank 0 reads and validates the metadata of <path> and shares it. A path
/// that is missing, not a regular file, not HDF5, unreadable or truncated, or lacks the format
/// marker throws InputError "<path>: expected a wallrans checkpoint (HDF5 with attribute
/// 'format'), got ..." on every rank; another format version (version 1 files say to rerun the
/// case from the start) or a missing or mistyped metadata attribute throws InputError naming the
/// path and the attribute.
CheckpointMetadata read_checkpoint_metadata(MPI_Comm comm, const std::string& path);

/// Collective over grid.comm(). Reads every listed array of <path> into the owned cells (then
/// exchanges the ghosts of each field) and the entries of each boundary vector (resized to the
/// number of ids of `layout`), on any rank count. Rank 0 first validates the
/// file alone: bad files as in read_checkpoint_metadata, and a missing dataset, wrong dimensions or
/// a non-floating-point type throw InputError on every rank, naming the path, the dataset and the
/// expected and found dimensions. Nothing is modified unless every array was read.
void read_checkpoint(const Grid& grid, const std::string& path, const std::vector<CellArray>& cells,
                     const BoundaryLayout& layout, const std::vector<BoundaryArray>& boundary);

/// Collective over `comm`. Rank 0 reads every dataset of the groups "/fields", "/boundary" and
/// "/grid" of <path> whole (serial driver) and checks it as read_checkpoint does: its checksum
/// (attribute "crc32", required from format version 3 on) and finite values. Throws the same
/// one-line InputError on every rank, naming the file, the dataset and the first bad cell, face or
/// node. For `check`, which has no solver to read a checkpoint into.
void verify_checkpoint_data(MPI_Comm comm, const std::string& path);

/// Local (rank 0 calls it). Writes the XDMF (XML) description of a checkpoint written with these
/// metadata: a 2-D curvilinear mesh ("2DSMesh", geometry XY: the one interleaved array "/grid/xy",
/// the form both XDMF readers of the common viewer open; X_Y crashes its XDMF-3 reader) and
/// each "/fields/<name>" as a cell-centred scalar, referencing the HDF5 file by `h5_file_name`
/// (a bare file name in the same directory, so the pair can be moved together). Written under a
/// temporary name and renamed. Throws Error on failure or a name with '/' or ':'.
void write_checkpoint_xdmf(const std::string& xdmf_path, const std::string& h5_file_name,
                           const CheckpointMetadata& metadata, const std::vector<std::string>& field_names);

/// Local. Keeps the newest `keep` (>= 0) files <directory>/<prefix>_<iteration>.h5 by iteration
/// number (not by name) and deletes the older ones and their <prefix>_<iteration>.xmf. Only files
/// for which `belongs(path)` is true take part (default: all); other files, including leftover
/// "*.h5.tmp" files, are left alone. Throws Error on failure.
void prune_checkpoints(const std::string& directory, const std::string& prefix, int keep,
                       const std::function<bool(const std::string&)>& belongs = {});

}  // namespace wallrans
