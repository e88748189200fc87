// Checksums and value checks of checkpoint datasets: each dataset carries the CRC-32 (zlib's,
// the ISO-HDLC polynomial) of its stored bytes, IEEE-754 little-endian doubles in dataset order,
// as the attribute "crc32"; restarts verify it and refuse non-finite values. Internal to the
// checkpoint library (includes hdf5.h).
#pragma once

#include <mpi.h>

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "io/checkpoint_transfer.hpp"
#include "io/hdf5_handles.hpp"

namespace wallrans::checkpoint_checksum {

inline constexpr const char* attribute = "crc32";

/// Local. CRC-32 of `n` doubles as stored (little-endian bytes), continuing `crc` (0 to start).
uint32_t crc32_of(const double* values, size_t n, uint32_t crc = 0);

/// Collective. CRC-32 of a whole dataset from each rank's `block` of `values` (block order): the
/// CRC of every run of consecutive elements is combined on rank 0 in dataset order (zlib's
/// crc32_combine) and shared. The blocks of all ranks must cover the dataset once.
uint32_t dataset_crc32(MPI_Comm comm, const checkpoint_transfer::Block& block,
                       const std::vector<double>& values);

/// Collective on a file opened with the MPI-IO driver (every rank passes the same value), local
/// otherwise. Writes the attribute "crc32" (unsigned 32-bit) on `dataset`.
void write_crc32(hid_t dataset, uint32_t crc);

/// Local. The attribute "crc32" of `dataset`, or nothing if it has none. Throws InputError
/// "<label>: attribute 'crc32': expected one unsigned 32-bit integer, got ..." for another kind.
std::optional<uint32_t> read_crc32(hid_t dataset, const std::string& label);

/// Local. "0x1234abcd".
std::string hex(uint32_t crc);

/// Collective. The smallest dataset index (row-major over `block.global`, or the face id) of a
/// non-finite value in any rank's block, or -1 if all are finite.
long long first_non_finite(MPI_Comm comm, const checkpoint_transfer::Block& block,
                           const std::vector<double>& values);

/// Local. How a dataset index reads in messages: "cell (i, j)" for cells_y x cells_x datasets,
/// "node (i, j)" for node datasets, "face id k" for boundary arrays.
std::string index_text(const checkpoint_transfer::Block& block, long long index, const char* element);

}  // namespace wallrans::checkpoint_checksum
