// Checksums and value checks of checkpoint datasets: the stored CRC-32 is zlib's CRC of the known
// values (computed here from their defining functions), overwritten bytes and non-finite values
// are refused on reading (parallel read and the serial verification of `check`), and files of
// format version 2 (no checksums) are still read.
#include <gtest/gtest.h>
#include <mpi.h>
#include <zlib.h>

#include <bit>
#include <cmath>
#include <cstdio>
#include <limits>
#include <string>
#include <vector>

#include "checkpoint_test_data.hpp"
#include "checkpoint_test_support.hpp"
#include "io/checkpoint.hpp"
#include "io/hdf5_handles.hpp"

using namespace wallrans;
using namespace wallrans::checkpoint_test;

namespace {

// zlib's CRC-32 of doubles as little-endian bytes (the machine's order, checked below).
uint32_t crc_of(const std::vector<double>& values) {
  static_assert(std::endian::native == std::endian::little);
  return static_cast<uint32_t>(crc32(0L, reinterpret_cast<const Bytef*>(values.data()),
                                     static_cast<uInt>(values.size() * sizeof(double))));
}

uint32_t stored_crc(hid_t file, const std::string& dataset_path) {
  const Hdf5Dataset dataset(H5Dopen2(file, dataset_path.c_str(), H5P_DEFAULT));
  EXPECT_TRUE(dataset) << dataset_path;
  const Hdf5Attribute attribute(H5Aopen(dataset.get(), "crc32", H5P_DEFAULT));
  EXPECT_TRUE(attribute) << dataset_path << " has no attribute crc32";
  uint32_t crc = 0;
  EXPECT_GE(H5Aread(attribute.get(), H5T_NATIVE_UINT32, &crc), 0);
  return crc;
}

// Rank 0: overwrites 8 bytes of dataset `dataset_path`'s data in the file, at element `element`.
void overwrite_element(const std::string& path, const std::string& dataset_path, int element, double value) {
  if (world_rank() != 0) return;
  haddr_t offset = HADDR_UNDEF;
  {
    const Hdf5File file(H5Fopen(path.c_str(), H5F_ACC_RDONLY, H5P_DEFAULT));
    const Hdf5Dataset dataset(H5Dopen2(file.get(), dataset_path.c_str(), H5P_DEFAULT));
    offset = H5Dget_offset(dataset.get());  // contiguous layout: the data are one block of bytes
  }
  ASSERT_NE(offset, HADDR_UNDEF);
  std::FILE* raw = std::fopen(path.c_str(), "r+b");
  ASSERT_NE(raw, nullptr);
  ASSERT_EQ(std::fseek(raw, static_cast<long>(offset) + 8L * element, SEEK_SET), 0);
  ASSERT_EQ(std::fwrite(&value, sizeof value, 1, raw), 1u);
  ASSERT_EQ(std::fclose(raw), 0);
}

}  // namespace

TEST(CheckpointChecksum, EveryDatasetCarriesZlibsCrc32OfTheKnownValues) {
  const ScratchDirectory scratch;
  const Grid grid(MPI_COMM_WORLD, test_nodes(), false);
  const std::string path = scratch.file("known.h5");
  TestArrays arrays = known_arrays(grid);
  write_checkpoint(grid, path, CheckpointMetadata{}, arrays.cells(), arrays.layout, arrays.boundary());
  if (world_rank() != 0) return;
  const Hdf5File file(H5Fopen(path.c_str(), H5F_ACC_RDONLY, H5P_DEFAULT));
  ASSERT_TRUE(file);
  for (int k = 0; k < 3; ++k) {
    std::vector<double> values;  // row-major: j slow, i fast
    for (int j = 0; j < ny; ++j)
      for (int i = 0; i < nx; ++i) values.push_back(cell_value(k, i, j));
    EXPECT_EQ(stored_crc(file.get(), std::string("/fields/") + cell_names[k]), crc_of(values))
        << cell_names[k];
  }
  for (int k = 0; k < 2; ++k) {
    std::vector<double> values;
    for (int id = 0; id < n_faces; ++id) values.push_back(face_value(k, id));
    EXPECT_EQ(stored_crc(file.get(), std::string("/boundary/") + boundary_names[k]), crc_of(values));
  }
  const NodeCoordinates nodes = test_nodes();
  std::vector<double> x;
  for (const Vec2& node : nodes.nodes) x.push_back(node.x);
  EXPECT_EQ(stored_crc(file.get(), "/grid/x"), crc_of(x));
}

TEST(CheckpointChecksum, OverwrittenDataBytesAreRefusedAndNothingIsRead) {
  const ScratchDirectory scratch;
  const Grid grid(MPI_COMM_WORLD, test_nodes(), false);
  const std::string path = scratch.file("damaged.h5");
  TestArrays known = known_arrays(grid);
  write_checkpoint(grid, path, CheckpointMetadata{}, known.cells(), known.layout, known.boundary());
  overwrite_element(path, "/fields/v", 13, 0.25);
  MPI_Barrier(MPI_COMM_WORLD);
  TestArrays arrays(grid, not_set);
  const std::string message = input_error(
      path, [&] { read_checkpoint(grid, path, arrays.cells(), arrays.layout, arrays.boundary()); });
  expect_contains(message, "dataset '/fields/v': expected the data its checksum was written for (crc32 0x");
  expect_contains(message, "the file was changed or damaged after it was written");
  for (const double value : arrays.fields[0].data()) ASSERT_TRUE(std::isnan(value)) << "nothing is read";
  expect_contains(input_error(path, [&] { verify_checkpoint_data(MPI_COMM_WORLD, path); }),
                  "dataset '/fields/v': expected the data its checksum was written for");
}

TEST(CheckpointChecksum, NonFiniteValuesAreRefusedEvenWithAMatchingChecksum) {
  const ScratchDirectory scratch;
  const Grid grid(MPI_COMM_WORLD, test_nodes(), false);
  TestArrays arrays = known_arrays(grid);
  // Cell (3, 2) of "u" is NaN wherever that cell is owned; the writer's checksum covers it.
  if (3 >= grid.x_begin() && 3 < grid.x_end() && 2 >= grid.y_begin() && 2 < grid.y_end())
    arrays.fields[0](3, 2) = std::numeric_limits<double>::quiet_NaN();
  const std::string cells_path = scratch.file("nan_cell.h5");
  write_checkpoint(grid, cells_path, CheckpointMetadata{}, arrays.cells(), arrays.layout, arrays.boundary());
  TestArrays back(grid, not_set);
  expect_contains(
      input_error(cells_path,
                  [&] { read_checkpoint(grid, cells_path, back.cells(), back.layout, back.boundary()); }),
      "dataset '/fields/u': expected finite values, got a non-finite value at cell (3, 2)");
  expect_contains(input_error(cells_path, [&] { verify_checkpoint_data(MPI_COMM_WORLD, cells_path); }),
                  "dataset '/fields/u': expected finite values, got a non-finite value at cell (3, 2)");

  // An infinite boundary value of the face with id 5, and a NaN scalar.
  TestArrays faces = known_arrays(grid);
  for (size_t n = 0; n < faces.layout.ids.size(); ++n)
    if (faces.layout.ids[n] == 5) faces.face_values[1][n] = std::numeric_limits<double>::infinity();
  const std::string faces_path = scratch.file("inf_face.h5");
  write_checkpoint(grid, faces_path, CheckpointMetadata{}, faces.cells(), faces.layout, faces.boundary());
  expect_contains(
      input_error(faces_path,
                  [&] { read_checkpoint(grid, faces_path, back.cells(), back.layout, back.boundary()); }),
      "dataset '/boundary/q_face': expected finite values, got a non-finite value at face id 5");
  CheckpointMetadata metadata;
  metadata.scalars = {{"reference", std::numeric_limits<double>::quiet_NaN()}};
  const std::string scalar_path = scratch.file("nan_scalar.h5");
  write_checkpoint(grid, scalar_path, metadata, faces.cells(), faces.layout, {});
  expect_contains(input_error(scalar_path, [&] { read_checkpoint_metadata(MPI_COMM_WORLD, scalar_path); }),
                  "attribute 'reference' of '/scalars': expected a finite number, got nan");
}

TEST(CheckpointChecksum, VersionTwoFilesAreReadUnverifiedAndVersionThreeNeedsTheChecksum) {
  const ScratchDirectory scratch;
  const Grid grid(MPI_COMM_WORLD, test_nodes(), false);
  const std::string old = scratch.file("version_2.h5"), stripped = scratch.file("stripped.h5");
  TestArrays known = known_arrays(grid);
  write_checkpoint(grid, old, CheckpointMetadata{}, known.cells(), known.layout, known.boundary());
  write_checkpoint(grid, stripped, CheckpointMetadata{}, known.cells(), known.layout, known.boundary());
  if (world_rank() == 0) {
    for (const std::string& path : {old, stripped}) {
      const Hdf5File file(H5Fopen(path.c_str(), H5F_ACC_RDWR, H5P_DEFAULT));
      for (const char* name : cell_names)
        ASSERT_GE(
            H5Adelete_by_name(file.get(), (std::string("/fields/") + name).c_str(), "crc32", H5P_DEFAULT), 0);
      if (path == old) {
        const Hdf5Attribute version(H5Aopen(file.get(), "format_version", H5P_DEFAULT));
        const int two = 2;
        ASSERT_GE(H5Awrite(version.get(), H5T_NATIVE_INT, &two), 0);
      }
    }
  }
  MPI_Barrier(MPI_COMM_WORLD);
  TestArrays arrays(grid, not_set);
  read_checkpoint(grid, old, arrays.cells(), arrays.layout, arrays.boundary());
  EXPECT_EQ(arrays.fields[2](grid.x_begin(), grid.y_begin()), cell_value(2, grid.x_begin(), grid.y_begin()));
  expect_contains(
      input_error(stripped,
                  [&] { read_checkpoint(grid, stripped, arrays.cells(), arrays.layout, arrays.boundary()); }),
      "dataset '/fields/u': expected attribute 'crc32' (format version 3), got none");
}
