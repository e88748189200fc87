// Test-only tool for test_checkpoint: writes <directory>/checkpoint_1.h5 completely, then starts
// <directory>/checkpoint_2.h5 with the writer's test switch that kills every rank (SIGKILL) after
// two datasets. Prints "checkpoint_1 complete" (rank 0) once the first file is in place.
#include <mpi.h>

#include <cstdio>
#include <exception>
#include <string>

#include "checkpoint_test_data.hpp"
#include "linear/petsc_session.hpp"

int main(int argc, char** argv) {
  wallrans::PetscSession session(&argc, &argv);
  int rank = 0;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  if (argc != 2) {
    if (rank == 0) std::fprintf(stderr, "usage: checkpoint_kill_writer <directory>\n");
    return 2;
  }
  using namespace wallrans;
  try {
    const std::string directory = argv[1];
    const Grid grid(MPI_COMM_WORLD, checkpoint_test::test_nodes(), false);
    checkpoint_test::TestArrays arrays = checkpoint_test::known_arrays(grid);
    CheckpointMetadata metadata;
    metadata.iteration = 1;
    metadata.model = "laminar";
    write_checkpoint(grid, directory + "/checkpoint_1.h5", metadata, arrays.cells(), arrays.layout,
                     arrays.boundary());
    if (rank == 0) {
      std::printf("checkpoint_1 complete\n");
      std::fflush(stdout);
    }
    metadata.iteration = 2;
    write_checkpoint(grid, directory + "/checkpoint_2.h5", metadata, arrays.cells(), arrays.layout,
                     arrays.boundary(), 2);
    if (rank == 0) std::printf("checkpoint_2 returned\n");
    return 0;
  } catch (const std::exception& e) {
    std::fprintf(stderr, "rank %d: %s\n", rank, e.what());
    return 1;
  }
}
