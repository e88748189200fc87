// Writes the seed inputs of the HDF5 fuzz targets with the current writers, so seeds always have
// the current format: <dir>/checkpoint/ (checkpoints of the fuzz target's grid and arrays) and
// <dir>/grid_file/ (grid files with and without patches). Usage: fuzz_make_seeds <dir>
#include <mpi.h>

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <numeric>
#include <string>
#include <vector>

#include "fuzz_checkpoint_layout.hpp"
#include "grid/grid.hpp"
#include "io/checkpoint.hpp"
#include "io/grid_file.hpp"
#include "linear/petsc_session.hpp"

namespace {

using namespace wallrans;
namespace fs = std::filesystem;

void write_checkpoints(const fs::path& directory) {
  const Grid grid(MPI_COMM_SELF, fuzz::checkpoint_nodes(), false);
  std::vector<Field> fields;
  fields.reserve(fuzz::checkpoint_cell_arrays.size());
  std::vector<CellArray> cells;
  for (size_t k = 0; k < fuzz::checkpoint_cell_arrays.size(); ++k) {
    fields.emplace_back(grid, 0.0);
    for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
      for (int i = grid.x_begin(); i < grid.x_end(); ++i)
        fields.back()(i, j) = std::sin(1.0 + k + i + 10.0 * j);
    }
    cells.push_back({fuzz::checkpoint_cell_arrays[k], &fields.back()});
  }
  BoundaryLayout layout;
  layout.n_faces = fuzz::checkpoint_faces;
  layout.ids.resize(static_cast<size_t>(layout.n_faces));
  std::iota(layout.ids.begin(), layout.ids.end(), 0);
  std::vector<double> flux(layout.ids.size());
  for (size_t k = 0; k < flux.size(); ++k) flux[k] = std::cos(static_cast<double>(k));
  CheckpointMetadata metadata;
  metadata.iteration = 42;
  metadata.model = "spalart_allmaras";
  metadata.variant = "standard";
  metadata.case_hash = text_hash("fuzz seed");
  metadata.program_version = WALLRANS_VERSION;
  metadata.scalars = {{"reference_u", 1.5}, {"reference_mass", 0.25}};
  write_checkpoint(grid, (directory / "seed_checkpoint.h5").string(), metadata, cells, layout,
                   {{fuzz::checkpoint_boundary_arrays[0], &flux}});
  metadata.scalars.clear();
  write_checkpoint(grid, (directory / "seed_checkpoint_no_scalars.h5").string(), metadata, cells, layout, {});
}

void write_grid_files(const fs::path& directory) {
  GridFileContent content;
  content.nodes.cells_x = 3;
  content.nodes.cells_y = 2;
  for (int j = 0; j <= 2; ++j) {
    for (int i = 0; i <= 3; ++i) content.nodes.nodes.push_back({i + 0.1 * j, j * 0.5});
  }
  write_grid_file(MPI_COMM_SELF, (directory / "seed_grid_plain.h5").string(), content);
  content.patches = {{"inlet", Side::left, 0, 1, "inflow"},
                     {"floor", Side::bottom, 0, 2, "wall"},
                     {"lid", Side::top, 1, 2, ""}};
  write_grid_file(MPI_COMM_SELF, (directory / "seed_grid_patches.h5").string(), content);
}

}  // namespace

int main(int argc, char** argv) {
  if (argc != 2) {
    std::fprintf(stderr, "usage: fuzz_make_seeds <directory>\n");
    return 2;
  }
  try {
    const PetscSession session(&argc, &argv);
    const fs::path root(argv[1]);
    fs::create_directories(root / "checkpoint");
    fs::create_directories(root / "grid_file");
    write_checkpoints(root / "checkpoint");
    write_grid_files(root / "grid_file");
  } catch (const std::exception& e) {
    std::fprintf(stderr, "fuzz_make_seeds: %s\n", e.what());
    return 1;
  }
  return 0;
}
