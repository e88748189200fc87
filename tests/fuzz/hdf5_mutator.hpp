// Structure-aware mutation of HDF5 files for the fuzz targets of the checkpoint and grid-file
// readers: each mutation edits the file through the HDF5 library (an attribute's type or value, a
// dataset's shape, type or values, objects deleted, moved, replaced or linked), so every input
// stays a well-formed HDF5 file with hostile content for our readers. Byte-level damage of the
// HDF5 structure itself finds memory errors inside HDF5 1.10 within minutes (tests/fuzz/README.md),
// which no reader of ours can prevent; WALLRANS_FUZZ_RAW=1 switches back to it.
#pragma once

#include <cstddef>
#include <cstdint>

namespace wallrans::fuzz {

/// Local. Replaces the HDF5 file image data[0, size) by a mutant of at most `max_size` bytes,
/// chosen by `seed`, and returns its size. An image HDF5 cannot open, or a mutant that would not
/// fit, is left as it is (its size is returned). With WALLRANS_FUZZ_RAW=1 in the environment,
/// libFuzzer's own byte mutations are used instead.
size_t mutate_hdf5_image(uint8_t* data, size_t size, size_t max_size, unsigned int seed);

}  // namespace wallrans::fuzz
