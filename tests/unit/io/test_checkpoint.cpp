// Checkpoint files: bit-exact round trips (also across rank counts), metadata, fingerprints, bad
// files, a kill in the middle of writing, inspection with HDF5's tools, h5py and an XML parser,
// and pruning. Expected values come from the defining functions in checkpoint_test_data.hpp.
#include <gtest/gtest.h>
#include <mpi.h>
#include <sys/wait.h>
#include <unistd.h>

#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <ctime>
#include <filesystem>
#include <fstream>
#include <iomanip>
#include <random>
#include <regex>
#include <set>
#include <sstream>
#include <string>
#include <tuple>
#include <vector>

#include "checkpoint_test_data.hpp"
#include "checkpoint_test_support.hpp"
#include "core/error.hpp"
#include "io/checkpoint.hpp"
#include "io/hdf5_handles.hpp"

extern char** environ;

using namespace wallrans;
using namespace wallrans::checkpoint_test;
namespace fs = std::filesystem;

namespace {

CheckpointMetadata sample_metadata() {
  CheckpointMetadata metadata;
  metadata.iteration = 1234;
  metadata.model = "spalart_allmaras";
  metadata.variant = "";
  metadata.case_hash = text_hash("grid:\n  cells: [10, 7]\n");
  metadata.program_version = "0.1.0";
  // Not in name order: the order given must survive.
  metadata.scalars = {{"residual_u", 1.0 / 3.0}, {"residual_p", -2.5e-300}, {"continuity", 7.0}};
  return metadata;
}

// Checks fields read into arrays that started as NaN: owned cells and the ghosts a star-stencil
// exchange fills (periodic ghosts wrap) equal the known values bit for bit, and so do the values
// of this rank's boundary faces.
void expect_known_values(const Grid& grid, const TestArrays& arrays) {
  int n_wrong = 0;
  auto check = [&](double found, double expected, const std::string& where) {
    if (found == expected) return;
    if (++n_wrong <= 5) ADD_FAILURE() << where << ": found " << found << ", expected " << expected;
  };
  for (size_t k = 0; k < arrays.fields.size(); ++k) {
    for (int j = grid.gy_begin(); j < grid.gy_end(); ++j) {
      for (int i = grid.gx_begin(); i < grid.gx_end(); ++i) {
        const bool owned_row = j >= grid.y_begin() && j < grid.y_end();
        const bool owned_column = i >= grid.x_begin() && i < grid.x_end();
        if (!owned_row && !owned_column) continue;  // corner ghosts: not part of a star exchange
        const int wrapped = (i + grid.cells_x()) % grid.cells_x();
        check(arrays.fields[k](i, j), cell_value(static_cast<int>(k), wrapped, j),
              std::string(cell_names[k]) + "(" + std::to_string(i) + ", " + std::to_string(j) + ")");
      }
    }
  }
  for (size_t k = 0; k < arrays.face_values.size(); ++k) {
    ASSERT_EQ(arrays.face_values[k].size(), arrays.layout.ids.size());
    for (size_t n = 0; n < arrays.layout.ids.size(); ++n) {
      const int id = arrays.layout.ids[n];
      check(arrays.face_values[k][n], face_value(static_cast<int>(k), id),
            std::string(boundary_names[k]) + " of face " + std::to_string(id));
    }
  }
  EXPECT_EQ(n_wrong, 0);
}

// Collective: writes the known arrays of `grid` to `path`.
CheckpointMetadata write_known(const Grid& grid, const std::string& path) {
  TestArrays arrays = known_arrays(grid);
  return write_checkpoint(grid, path, sample_metadata(), arrays.cells(), arrays.layout, arrays.boundary());
}

// Collective: reads `path` into NaN arrays on `grid` and checks them against the known values.
void read_and_expect_known(const Grid& grid, const std::string& path) {
  TestArrays arrays(grid, not_set);
  read_checkpoint(grid, path, arrays.cells(), arrays.layout, arrays.boundary());
  expect_known_values(grid, arrays);
}

std::string quoted(const std::string& text) {
  std::string out = "'";
  for (const char c : text) out += c == '\'' ? std::string("'\\''") : std::string(1, c);
  return out + "'";
}

std::string read_text(const fs::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

// Runs `command` through the shell with stdout and stderr captured; returns the exit status
// (-1 if it did not exit normally, e.g. killed).
int run(const std::string& command, const fs::path& out, const fs::path& err) {
  const std::string full =
      command + " >" + quoted(out.string()) + " 2>" + quoted(err.string()) + " </dev/null";
  const int status = std::system(full.c_str());
  return status != -1 && WIFEXITED(status) ? WEXITSTATUS(status) : -1;
}

// Environment prefix for launching a new MPI job from inside this MPI process: the parent job's
// launcher variables must not leak into it (OpenMPI would try to join the parent job and fail).
std::string fresh_launcher_environment() {
  std::string prefix = "env";
  for (char** entry = environ; *entry != nullptr; ++entry) {
    const std::string variable = *entry;
    const std::string name = variable.substr(0, variable.find('='));
    for (const char* launcher : {"OMPI_", "PMIX_", "OPAL_", "ORTE_"}) {
      if (name.rfind(launcher, 0) == 0) prefix += " -u " + name;
    }
  }
  return prefix +
         " OMPI_ALLOW_RUN_AS_ROOT=1 OMPI_ALLOW_RUN_AS_ROOT_CONFIRM=1 OMPI_MCA_rmaps_base_oversubscribe=1 ";
}

std::string full_precision(double value) {
  char text[40];
  std::snprintf(text, sizeof text, "%.17g", value);
  return text;
}

}  // namespace

class CheckpointRoundTrip : public ::testing::TestWithParam<bool> {};

TEST_P(CheckpointRoundTrip, BitExactOnOwnedCellsGhostsAndBoundaryFaces) {
  const ScratchDirectory scratch;
  const Grid grid(MPI_COMM_WORLD, test_nodes(), GetParam());
  const std::string path = scratch.file("nested/run/state_1234.h5");  // the writer creates the folders
  write_known(grid, path);
  if (world_rank() == 0) {
    EXPECT_TRUE(fs::is_regular_file(path));
    EXPECT_FALSE(fs::exists(path + ".tmp"));
  }
  read_and_expect_known(grid, path);
}

INSTANTIATE_TEST_SUITE_P(PeriodicOrNot, CheckpointRoundTrip, ::testing::Values(false, true));

TEST(CheckpointRankCount, WorldWrittenReadOnOneRankAndOneRankWrittenReadOnWorld) {
  const ScratchDirectory scratch;
  const Grid world(MPI_COMM_WORLD, test_nodes(), false);
  write_known(world, scratch.file("world.h5"));
  {
    const Grid alone(MPI_COMM_SELF, test_nodes(), false);  // every rank reads the whole file alone
    read_and_expect_known(alone, scratch.file("world.h5"));
    write_known(alone, scratch.file("alone_" + std::to_string(world_rank()) + ".h5"));
  }
  MPI_Barrier(MPI_COMM_WORLD);
  for (int rank = 0; rank < world_size(); ++rank) {
    read_and_expect_known(world, scratch.file("alone_" + std::to_string(rank) + ".h5"));
  }
}

TEST(CheckpointMetadata, RoundTripIncludingScalarsInOrder) {
  const ScratchDirectory scratch;
  const NodeCoordinates nodes = test_nodes();
  const Grid grid(MPI_COMM_WORLD, nodes, false);
  const auto before = std::chrono::system_clock::now();
  const CheckpointMetadata stored = write_known(grid, scratch.file("meta.h5"));
  const CheckpointMetadata read = read_checkpoint_metadata(MPI_COMM_WORLD, scratch.file("meta.h5"));
  EXPECT_EQ(read, stored);

  const CheckpointMetadata given = sample_metadata();
  EXPECT_EQ(read.iteration, 1234);
  EXPECT_EQ(read.model, given.model);
  EXPECT_EQ(read.variant, "");
  EXPECT_EQ(read.case_hash, given.case_hash);
  EXPECT_EQ(read.program_version, "0.1.0");
  EXPECT_EQ(read.scalars, given.scalars);  // names, order and bit-exact values
  EXPECT_EQ(read.cells_x, nx);
  EXPECT_EQ(read.cells_y, ny);
  EXPECT_EQ(read.grid_fingerprint, grid_fingerprint(nodes));

  // written_at: UTC ISO 8601, between the start of the write and now.
  ASSERT_TRUE(std::regex_match(read.written_at, std::regex(R"(\d{4}-\d\d-\d\dT\d\d:\d\d:\d\dZ)")))
      << read.written_at;
  std::tm parts{};
  std::istringstream(read.written_at) >> std::get_time(&parts, "%Y-%m-%dT%H:%M:%SZ");
  const auto written = std::chrono::system_clock::from_time_t(timegm(&parts));
  EXPECT_GE(written, std::chrono::floor<std::chrono::seconds>(before));
  EXPECT_LE(written, std::chrono::system_clock::now());
}

TEST(GridFingerprint, ChangesWhenOneNodeMovesByOnePicometreOrTheShapeChanges) {
  const NodeCoordinates nodes = test_nodes();
  const std::string reference = grid_fingerprint(nodes);
  EXPECT_TRUE(std::regex_match(reference, std::regex("[0-9a-f]{16}"))) << reference;
  EXPECT_EQ(grid_fingerprint(test_nodes()), reference);

  NodeCoordinates moved = nodes;
  moved.at(3, 2).x += 1e-12;
  ASSERT_NE(moved.at(3, 2).x, nodes.at(3, 2).x);
  EXPECT_NE(grid_fingerprint(moved), reference);

  NodeCoordinates reshaped = nodes;  // same bytes, read as another grid shape
  std::swap(reshaped.cells_x, reshaped.cells_y);
  EXPECT_NE(grid_fingerprint(reshaped), reference);
}

TEST(TextHash, MatchesPublishedFnv1a64Vectors) {
  // Test vectors of the 64-bit FNV-1a hash from Fowler, Noll and Vo's reference test suite.
  EXPECT_EQ(text_hash(""), "cbf29ce484222325");
  EXPECT_EQ(text_hash("a"), "af63dc4c8601ec8c");
  EXPECT_EQ(text_hash("foobar"), "85944171f73967e8");
}

TEST(CheckpointBadFiles, EachGivesOneLineInputErrorNamingFileAndExpectation) {
  const ScratchDirectory scratch;
  const Grid grid(MPI_COMM_WORLD, test_nodes(), false);
  const std::string valid = scratch.file("valid.h5");
  write_known(grid, valid);
  write_known(grid, scratch.file("missing_dataset.h5"));
  const std::string text = scratch.file("text.h5"), bare = scratch.file("bare.h5"),
                    other = scratch.file("other.h5"), truncated = scratch.file("truncated.h5"),
                    missing = scratch.file("missing_dataset.h5");
  if (world_rank() == 0) {
    std::ofstream(text) << "this is a text file, not a checkpoint\n";
    {
      // An HDF5 file with a dataset and an attribute, but no format marker.
      const Hdf5File file(H5Fcreate(bare.c_str(), H5F_ACC_TRUNC, H5P_DEFAULT, H5P_DEFAULT));
      ASSERT_TRUE(file);
      const hsize_t dims[1] = {4};
      const Hdf5Space space(H5Screate_simple(1, dims, nullptr));
      const Hdf5Dataset data(
          H5Dcreate2(file.get(), "data", H5T_IEEE_F64LE, space.get(), H5P_DEFAULT, H5P_DEFAULT, H5P_DEFAULT));
      ASSERT_TRUE(data);
    }
    {
      // Another program's HDF5 file that happens to use an attribute named "format".
      const Hdf5File file(H5Fcreate(other.c_str(), H5F_ACC_TRUNC, H5P_DEFAULT, H5P_DEFAULT));
      ASSERT_TRUE(file);
      const Hdf5Type type(H5Tcopy(H5T_C_S1));
      H5Tset_size(type.get(), 6);
      const Hdf5Space scalar(H5Screate(H5S_SCALAR));
      const Hdf5Attribute format(
          H5Acreate2(file.get(), "format", type.get(), scalar.get(), H5P_DEFAULT, H5P_DEFAULT));
      ASSERT_GE(H5Awrite(format.get(), type.get(), "image"), 0);
    }
    {
      const std::string bytes = read_text(valid);
      std::ofstream(truncated, std::ios::binary) << bytes.substr(0, bytes.size() / 2);
    }
    {
      const Hdf5File file(H5Fopen(missing.c_str(), H5F_ACC_RDWR, H5P_DEFAULT));
      ASSERT_TRUE(file);
      ASSERT_GE(H5Ldelete(file.get(), "/fields/v", H5P_DEFAULT), 0);
    }
  }
  MPI_Barrier(MPI_COMM_WORLD);

  const std::string not_checkpoint = "expected a wallrans checkpoint (HDF5 with attribute 'format'), got ";
  TestArrays arrays(grid, not_set);
  auto read_metadata = [](const std::string& path) {
    return [path] { read_checkpoint_metadata(MPI_COMM_WORLD, path); };
  };
  auto read_arrays = [&](const std::string& path) {
    return [&, path] { read_checkpoint(grid, path, arrays.cells(), arrays.layout, arrays.boundary()); };
  };

  expect_contains(input_error(text, read_metadata(text)), not_checkpoint + "a file that is not HDF5");
  expect_contains(input_error(text, read_arrays(text)), not_checkpoint + "a file that is not HDF5");
  expect_contains(input_error(bare, read_metadata(bare)),
                  not_checkpoint + "an HDF5 file without attribute 'format'");
  expect_contains(input_error(other, read_arrays(other)), not_checkpoint + "attribute 'format' = 'image'");
  const std::string cut = input_error(truncated, read_metadata(truncated));
  expect_contains(cut, not_checkpoint + "an unreadable or truncated HDF5 file");
  expect_contains(input_error(truncated, read_arrays(truncated)), not_checkpoint);
  const std::string nowhere = scratch.file("does_not_exist.h5");
  expect_contains(input_error(nowhere, read_metadata(nowhere)), not_checkpoint + "no such file");
  expect_contains(input_error(nowhere, read_arrays(nowhere)), not_checkpoint + "no such file");
  const std::string folder = scratch.path().string();
  expect_contains(input_error(folder, read_metadata(folder)), not_checkpoint + "a directory");

  // One dataset deleted: the metadata are fine, the arrays name the dataset.
  EXPECT_EQ(read_checkpoint_metadata(MPI_COMM_WORLD, missing).iteration, 1234);
  const std::string gone = input_error(missing, read_arrays(missing));
  expect_contains(gone, "dataset '/fields/v'");
  expect_contains(gone, "expected 7 x 10 (cells_y x cells_x)");
  expect_contains(gone, "got no such dataset");

  // A checkpoint of another grid size: expected and found dimensions.
  const Grid wider(MPI_COMM_WORLD, test_nodes(12, ny), false);
  TestArrays wide_arrays(wider, not_set);
  const std::string sizes = input_error(valid, [&] {
    read_checkpoint(wider, valid, wide_arrays.cells(), wide_arrays.layout, wide_arrays.boundary());
  });
  expect_contains(sizes, "dataset '/fields/u'");
  expect_contains(sizes, "expected 7 x 12 (cells_y x cells_x) floating-point values, got 7 x 10");
  const std::string face_sizes = input_error(valid, [&] {
    std::vector<double> values;
    read_checkpoint(wider, valid, {}, {{}, n_faces + 4}, {{"tau_wall", &values}});
  });
  expect_contains(face_sizes,
                  "dataset '/boundary/tau_wall': expected 38 (boundary faces) floating-point values, got 34");

  // Nothing was modified by the failed reads.
  for (const Field& field : arrays.fields) {
    for (const double value : field.data()) ASSERT_TRUE(std::isnan(value));
  }
}

TEST(CheckpointBadFiles, AVersionOneFileNamesBothVersionsAndSaysToRerunFromTheStart) {
  const ScratchDirectory scratch;
  const Grid grid(MPI_COMM_WORLD, test_nodes(), false);
  const std::string old = scratch.file("version_1.h5");
  write_known(grid, old);
  if (world_rank() == 0) {
    // Readers check the version before any dataset, so the marker alone makes a version-1 file.
    const Hdf5File file(H5Fopen(old.c_str(), H5F_ACC_RDWR, H5P_DEFAULT));
    ASSERT_TRUE(file);
    const Hdf5Attribute version(H5Aopen(file.get(), "format_version", H5P_DEFAULT));
    ASSERT_TRUE(version);
    const int one = 1;
    ASSERT_GE(H5Awrite(version.get(), H5T_NATIVE_INT, &one), 0);
  }
  MPI_Barrier(MPI_COMM_WORLD);
  const std::string message = input_error(old, [&] { read_checkpoint_metadata(MPI_COMM_WORLD, old); });
  expect_contains(message, old + ": attribute 'format_version': expected 2 or 3, got 1");
  expect_contains(message, "rerun the case from the start");
  TestArrays arrays(grid, not_set);
  expect_contains(
      input_error(old, [&] { read_checkpoint(grid, old, arrays.cells(), arrays.layout, arrays.boundary()); }),
      "expected 2 or 3, got 1");
  for (const double value : arrays.fields[0].data()) ASSERT_TRUE(std::isnan(value));
}

TEST(CheckpointAgreement, ABadRequestOnOneRankFailsEveryRankAndWritesNothing) {
  const ScratchDirectory scratch;
  const Grid grid(MPI_COMM_WORLD, test_nodes(), false);
  TestArrays arrays = known_arrays(grid);
  if (world_rank() == world_size() - 1) arrays.face_values[0].resize(3);  // only the last rank is wrong
  const std::string path = scratch.file("never.h5");
  std::string message;
  try {
    write_checkpoint(grid, path, sample_metadata(), arrays.cells(), arrays.layout, arrays.boundary());
  } catch (const Error& e) {
    message = e.what();
  }
  expect_contains(message, "boundary array 'tau_wall' has 3 values, expected ");
  expect_contains(message, " (one per boundary face id)");
  MPI_Barrier(MPI_COMM_WORLD);
  EXPECT_FALSE(fs::exists(path));
  EXPECT_FALSE(fs::exists(path + ".tmp"));

  // A face id outside the domain's faces on the last rank only.
  TestArrays outside = known_arrays(grid);
  if (world_rank() == world_size() - 1) outside.layout.ids.back() = n_faces;
  message.clear();
  try {
    write_checkpoint(grid, path, sample_metadata(), outside.cells(), outside.layout, outside.boundary());
  } catch (const Error& e) {
    message = e.what();
  }
  expect_contains(message, "boundary face id 34 is repeated or outside [0, 34)");
  EXPECT_FALSE(fs::exists(path));

  // Only rank 0 sees that the parent "folder" is a regular file; every rank fails.
  const std::string blocker = scratch.file("blocker");
  if (world_rank() == 0) std::ofstream(blocker) << "not a folder";
  MPI_Barrier(MPI_COMM_WORLD);
  TestArrays good = known_arrays(grid);
  EXPECT_THROW(write_checkpoint(grid, blocker + "/state.h5", sample_metadata(), good.cells(), good.layout,
                                good.boundary()),
               Error);

  // A read request that is wrong on the last rank only: every rank fails and nothing changes.
  const std::string valid = scratch.file("valid.h5");
  write_known(grid, valid);
  TestArrays target(grid, not_set);
  std::vector<CellArray> request = target.cells();
  if (world_rank() == world_size() - 1) request[1].field = nullptr;
  EXPECT_THROW(read_checkpoint(grid, valid, request, target.layout, target.boundary()), Error);
  for (const double value : target.fields[0].data()) ASSERT_TRUE(std::isnan(value));
}

TEST(CheckpointKill, KilledWriterLeavesPreviousCheckpointIntactAndNoFileUnderTheNewName) {
  if (world_size() != 1) GTEST_SKIP() << "starts its own 2-rank job; runs in the 1-rank binary";
  const ScratchDirectory scratch;
  const std::string command = fresh_launcher_environment() + quoted(WALLRANS_MPIEXEC) + " " +
                              WALLRANS_MPIEXEC_NUMPROC_FLAG + " 2 " + quoted(WALLRANS_KILL_WRITER) + " " +
                              quoted(scratch.path().string());
  const int status = run(command, scratch.path() / "writer.out", scratch.path() / "writer.err");
  const std::string out = read_text(scratch.path() / "writer.out");
  EXPECT_NE(status, 0) << "the writer was not killed\n" << out << read_text(scratch.path() / "writer.err");
  EXPECT_NE(out.find("checkpoint_1 complete"), std::string::npos)
      << out << read_text(scratch.path() / "writer.err");
  EXPECT_EQ(out.find("checkpoint_2 returned"), std::string::npos) << out;

  EXPECT_FALSE(fs::exists(scratch.file("checkpoint_2.h5")));
  EXPECT_TRUE(fs::exists(scratch.file("checkpoint_2.h5.tmp"))) << "the kill did not happen while writing";
  const Grid grid(MPI_COMM_WORLD, test_nodes(), false);
  EXPECT_EQ(read_checkpoint_metadata(MPI_COMM_WORLD, scratch.file("checkpoint_1.h5")).iteration, 1);
  read_and_expect_known(grid, scratch.file("checkpoint_1.h5"));
}

TEST(CheckpointTools, HdfToolsH5pyAndXdmfReadTheFiles) {
  const ScratchDirectory scratch;
  const Grid grid(MPI_COMM_WORLD, test_nodes(), false);
  const std::string h5 = scratch.file("state_42.h5"), xmf = scratch.file("state_42.xmf");
  const CheckpointMetadata stored = write_known(grid, h5);
  if (world_rank() == 0) {
    write_checkpoint_xdmf(xmf, "state_42.h5", stored, {cell_names.begin(), cell_names.end()});
    const fs::path out = scratch.path() / "tool.out", err = scratch.path() / "tool.err";

    ASSERT_EQ(run(quoted(WALLRANS_H5LS) + " -r " + quoted(h5), out, err), 0) << read_text(err);
    const std::string listing = read_text(out);
    for (const std::string name : {"/fields/u ", "/fields/v ", "/fields/nu_t ", "/boundary/tau_wall ",
                                   "/boundary/q_face ", "/grid/x ", "/grid/y ", "/grid/xy ", "/scalars "}) {
      expect_contains(listing, name);
    }
    expect_contains(listing, "Dataset {7, 10}");
    expect_contains(listing, "Dataset {8, 11}");
    expect_contains(listing, "Dataset {8, 11, 2}");
    expect_contains(listing, "Dataset {34}");

    ASSERT_EQ(run(quoted(WALLRANS_H5DUMP) + " -A " + quoted(h5), out, err), 0) << read_text(err);
    const std::string dump = read_text(out);
    expect_contains(dump, "ATTRIBUTE \"format\"");
    expect_contains(dump, "\"wallrans-checkpoint\"");
    expect_contains(dump, "ATTRIBUTE \"format_version\"");
    expect_contains(dump, "DATASET \"nu_t\"");

    const std::string script = std::string(WALLRANS_SOURCE_DIR) + "/tests/unit/io/inspect_checkpoint.py";
    const std::string python = quoted(WALLRANS_H5PY_PYTHON) + " " + quoted(script);
    for (const auto& [k, i, j] : {std::tuple{1, 3, 5}, std::tuple{2, 9, 0}, std::tuple{0, 0, 6}}) {
      const std::string check = python + " dataset " + quoted(h5) + " /fields/" + cell_names[k] + " " +
                                std::to_string(ny) + " " + std::to_string(nx) + " " + std::to_string(j) +
                                " " + std::to_string(i) + " " + full_precision(cell_value(k, i, j));
      EXPECT_EQ(run(check, out, err), 0) << check << "\n" << read_text(err);
    }
    // Boundary values sit at their global id, whatever order a rank listed its faces in.
    for (const auto& [k, id] : {std::pair{0, 0}, std::pair{1, 17}, std::pair{0, n_faces - 1}}) {
      const std::string check = python + " boundary " + quoted(h5) + " /boundary/" + boundary_names[k] + " " +
                                std::to_string(n_faces) + " " + std::to_string(id) + " " +
                                full_precision(face_value(k, id));
      EXPECT_EQ(run(check, out, err), 0) << check << "\n" << read_text(err);
    }
    const std::string wrong = python + " dataset " + quoted(h5) + " /fields/u " + std::to_string(ny) + " " +
                              std::to_string(nx) + " 1 1 " +
                              full_precision(cell_value(0, 1, 1) * (1 + 1e-15));
    EXPECT_NE(run(wrong, out, err), 0) << "the h5py check cannot fail";

    // The geometry is one interleaved array, the form the common viewer's XDMF-3 reader opens
    // (measured: it crashes on X_Y, two arrays, and on a JOIN of them).
    const std::string description = read_text(xmf);
    expect_contains(description, "<Geometry GeometryType=\"XY\">");
    expect_contains(description, "<DataItem Dimensions=\"8 11 2\"");
    expect_contains(description, "state_42.h5:/grid/xy</DataItem>");
    EXPECT_EQ(description.find("X_Y"), std::string::npos);
    EXPECT_EQ(run(python + " xdmf " + quoted(xmf), out, err), 0) << read_text(err);
    EXPECT_EQ(read_text(out), std::to_string(1 + cell_names.size()) + "\n");  // xy and each field
  }
}

TEST(PruneCheckpoints, KeepsTheNewestByIterationNumberNotByName) {
  if (world_rank() != 0) return;  // local function; one rank is enough
  std::random_device entropy;
  const fs::path folder = fs::temp_directory_path() / ("wallrans_prune_test_" + std::to_string(entropy()));
  ASSERT_TRUE(fs::create_directory(folder));
  const std::set<std::string> checkpoints = {"ckpt_7.h5",   "ckpt_99.h5",   "ckpt_99.xmf",
                                             "ckpt_100.h5", "ckpt_100.xmf", "ckpt_1000.h5"};
  const std::set<std::string> unrelated = {"ckpt_5.h5.tmp",  "other_3.h5", "ckpt_x.h5",      "ckpt_.h5",
                                           "ckpt_12.h5.bak", "ckpt_-4.h5", "my_ckpt_2000.h5"};
  for (const auto& names : {checkpoints, unrelated}) {
    for (const std::string& name : names) std::ofstream(folder / name) << name;
  }
  auto listing = [&folder] {
    std::set<std::string> names;
    for (const auto& entry : fs::directory_iterator(folder)) names.insert(entry.path().filename().string());
    return names;
  };

  prune_checkpoints(folder.string(), "ckpt", 2);
  std::set<std::string> expected = unrelated;
  expected.insert({"ckpt_1000.h5", "ckpt_100.h5", "ckpt_100.xmf"});
  EXPECT_EQ(listing(), expected);

  prune_checkpoints(folder.string(), "ckpt", 0);
  EXPECT_EQ(listing(), unrelated);
  EXPECT_THROW(prune_checkpoints(folder.string(), "ckpt", -1), Error);
  EXPECT_THROW(prune_checkpoints((folder / "absent").string(), "ckpt", 1), Error);
  fs::remove_all(folder);
}
