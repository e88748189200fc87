// Fuzz target: checkpoint bytes -> a file -> read_checkpoint_metadata and read_checkpoint (the
// restart path) on one rank. A bad file must end in a one-line InputError naming it, never in a
// crash, a hang or another exception.
#include <mpi.h>

#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <memory>
#include <numeric>
#include <string>
#include <vector>

#include "fuzz_checkpoint_layout.hpp"
#include "fuzz_support.hpp"
#include "grid/grid.hpp"
#include "io/checkpoint.hpp"

namespace {

using namespace wallrans;

// What every input is read into; made once (PETSc and the grid outlive all inputs).
struct Reader {
  Grid grid{MPI_COMM_SELF, fuzz::checkpoint_nodes(), false};
  std::vector<Field> fields;
  std::vector<std::vector<double>> boundary_values;
  BoundaryLayout layout;
  std::vector<CellArray> cells;
  std::vector<BoundaryArray> boundary;

  Reader() {
    fields.reserve(fuzz::checkpoint_cell_arrays.size());
    for (const std::string& name : fuzz::checkpoint_cell_arrays) {
      fields.emplace_back(grid);
      cells.push_back({name, &fields.back()});
    }
    boundary_values.resize(fuzz::checkpoint_boundary_arrays.size());
    for (size_t k = 0; k < boundary_values.size(); ++k) {
      boundary.push_back({fuzz::checkpoint_boundary_arrays[k], &boundary_values[k]});
    }
    layout.n_faces = fuzz::checkpoint_faces;
    layout.ids.resize(static_cast<size_t>(layout.n_faces));
    std::iota(layout.ids.begin(), layout.ids.end(), 0);
  }
};

const fuzz::InputFile input("wallrans_fuzz_checkpoint");
Reader* reader = nullptr;

}  // namespace

extern "C" int LLVMFuzzerInitialize(int*, char***) {
  fuzz::start_petsc();
  reader = new Reader();
  // Destroyed at exit before PETSc ends (exit handlers run in reverse order of registration).
  std::atexit([] { delete reader; });
  return 0;
}

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  const std::string& path = input.path();
  input.write(data, size);
  if (!fuzz::accepts(path, [&] { (void)read_checkpoint_metadata(MPI_COMM_SELF, path); })) return 0;
  (void)fuzz::accepts(
      path, [&] { read_checkpoint(reader->grid, path, reader->cells, reader->layout, reader->boundary); });
  return 0;
}
