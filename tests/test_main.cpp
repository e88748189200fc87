// GoogleTest main that owns the PETSc/MPI session; only rank 0 prints test results.
#include <gtest/gtest.h>
#include <mpi.h>

#include "linear/petsc_session.hpp"

int main(int argc, char** argv) {
  wallrans::PetscSession session(&argc, &argv);
  ::testing::InitGoogleTest(&argc, argv);
  int rank = 0;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  if (rank != 0) {
    auto& listeners = ::testing::UnitTest::GetInstance()->listeners();
    delete listeners.Release(listeners.default_result_printer());
  }
  return RUN_ALL_TESTS();
}
