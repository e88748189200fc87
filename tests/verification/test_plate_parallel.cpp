// Parallel consistency of the turbulent flat plate (SA): the shipped case, coarsened by 2 in
// each direction for run time, on all ranks of MPI_COMM_WORLD and on one rank (MPI_COMM_SELF)
// gives the same wall shear stress along the whole plate to the outer-iteration tolerance
// (residual drop 1e-6 of the case; stated as 1e-4 relative).
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>

#include "case_runner.hpp"
#include "io/case_loader.hpp"

using namespace wallrans;

TEST(PlateParallel, WorldMatchesSingleRank) {
  int size = 1;
  MPI_Comm_size(MPI_COMM_WORLD, &size);
  if (size < 2) GTEST_SKIP() << "run with 2 ranks";
  CaseSpec spec = load_case_file(std::string(WALLRANS_SOURCE_DIR) + "/configs/plate_sa.yaml");
  spec.grid.cells_x /= 2;
  spec.grid.cells_y /= 2;
  spec.grid.run_up_cells /= 2;
  spec.grid.first_cell_height = *spec.grid.first_cell_height * 2.0;
  spec.grid.leading_edge_spacing = *spec.grid.leading_edge_spacing * 2.0;
  // On this coarse grid the shipped velocity relaxation (0.95) with a diffusive share of 0.1
  // stalls in a limit cycle near a residual drop of 1e-3 (measured); 0.9 converges. The answer
  // does not depend on the relaxation (test_relaxation_independence).
  spec.iterations.relax_velocity = 0.9;
  auto world = test_support::run_case_on(MPI_COMM_WORLD, spec, [](FlowSolver&) {});
  auto single = test_support::run_case_on(MPI_COMM_SELF, spec, [](FlowSolver&) {});
  ASSERT_TRUE(world.converged);
  ASSERT_TRUE(single.converged);
  const auto& a = world.solver->wall_shear();
  const auto& b = single.solver->wall_shear();
  ASSERT_EQ(a.size(), b.size());
  double worst = 0.0;
  for (size_t k = 0; k < a.size(); ++k) worst = std::max(worst, std::abs(a[k] - b[k]) / b[k]);
  if (world.grid->rank() == 0)
    std::printf("plate: max relative wall-shear difference, %d ranks vs 1 rank: %.2e (%zu wall faces)\n",
                size, worst, a.size());
  EXPECT_LT(worst, 1e-4);
}
