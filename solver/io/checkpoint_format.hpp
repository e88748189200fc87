// The checkpoint file layout (group, dataset and attribute names) and its local, serial parts:
// metadata attributes, validation of a file by one rank, and metadata packing for broadcasts.
// Internal to the checkpoint library (includes hdf5.h).
#pragma once

#include <string>
#include <vector>

#include "io/checkpoint.hpp"
#include "io/hdf5_handles.hpp"

namespace wallrans::checkpoint_format {

inline constexpr const char* marker = "wallrans-checkpoint";
/// Version 3: every dataset carries the attribute "crc32" (io/checkpoint_checksum.hpp). Version 2
/// (the same layout without checksums) is still read, unverified.
inline constexpr int version = 3;
inline constexpr int oldest_readable_version = 2;
inline constexpr const char* fields_group = "fields";
inline constexpr const char* boundary_group = "boundary";
inline constexpr const char* grid_group = "grid";
inline constexpr const char* scalars_group = "scalars";

/// Local. True if `name` may be a dataset or scalar name: non-empty, letters, digits, '_', '-',
/// '.', and not "." or "..".
bool is_valid_name(const std::string& name);

/// Collective on a parallel file (same metadata on every rank), local otherwise. Writes the format
/// marker, the metadata attributes and the "/scalars" group.
void write_metadata(hid_t file, const CheckpointMetadata& metadata);

/// Local. The start of every "not a checkpoint" message: "<path>: expected a wallrans checkpoint
/// (HDF5 with attribute 'format'), got ".
std::string expected_checkpoint(const std::string& path);

/// Local. Opens <path> read-only with the serial driver and checks the format marker and version.
/// Throws InputError "<path>: expected a wallrans checkpoint (HDF5 with attribute 'format'), got
/// ..." for a missing, non-HDF5, unreadable or truncated file or a missing or wrong marker, and
/// "<path>: attribute 'format_version': expected 2 or 3, got ..." for another version, which goes
/// to `found_version` if given.
Hdf5File open_for_validation(const std::string& path, int* found_version = nullptr);

/// Local. Reads and validates the metadata of an open checkpoint; InputError names `path`.
CheckpointMetadata read_metadata(hid_t file, const std::string& path);

/// Local. Checks that dataset `dataset_path` ("/fields/u") exists, holds floating-point values and
/// has dimensions `expected` (`meaning` says what they are, e.g. "cells_y x cells_x"). Throws
/// InputError naming `path`, the dataset, the expected and the found dimensions.
void check_dataset(hid_t file, const std::string& path, const std::string& dataset_path,
                   const std::vector<unsigned long long>& expected, const std::string& meaning);

/// Local. Byte image of the metadata for a broadcast between ranks of one program, and back.
std::string pack(const CheckpointMetadata& metadata);
CheckpointMetadata unpack(const std::string& bytes);

}  // namespace wallrans::checkpoint_format
