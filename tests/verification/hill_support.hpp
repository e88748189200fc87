// Test helpers for the periodic hill: the bottom-wall shear on every rank, the flow rate through
// every section x = const, and the case of configs/hill_sa.yaml on a grid of a given size.
#pragma once

#include <mpi.h>

#include <algorithm>
#include <string>
#include <vector>

#include "coupling/flow_solver.hpp"
#include "io/case_loader.hpp"

namespace wallrans::test_support {

/// True on rank 0 of MPI_COMM_WORLD (the rank that prints).
inline bool is_root() {
  int rank = 0;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  return rank == 0;
}

/// The shipped hill case with `cells` and a first-cell height scaled from the shipped grid
/// (192 x 96, 1e-3 h) in proportion to the rows, so a coarser grid keeps its wall-normal growth.
inline CaseSpec hill_case(int cells_x, int cells_y) {
  CaseSpec spec = load_case_file(std::string(WALLRANS_SOURCE_DIR) + "/configs/hill_sa.yaml");
  const double rows = spec.grid.cells_y;
  spec.grid.first_cell_height = *spec.grid.first_cell_height * rows / cells_y;
  spec.grid.cells_x = cells_x;
  spec.grid.cells_y = cells_y;
  return spec;
}

struct WallShear {
  std::vector<double> x, tau;  ///< bottom-wall face centres (increasing x) and shear stress
};

/// Collective. The shear stress of the bottom-wall faces, sorted by x, on every rank.
inline WallShear bottom_wall_shear(const FlowSolver& solver, MPI_Comm comm) {
  std::vector<double> local;  // pairs (x, tau)
  for (const WallSample& w : solver.wall_samples()) {
    if (w.on_solid || w.side != Side::bottom) continue;
    local.push_back(w.centre.x);
    local.push_back(w.shear_stress);
  }
  int size = 1;
  MPI_Comm_size(comm, &size);
  const int count = static_cast<int>(local.size());
  std::vector<int> counts(size), offsets(size, 0);
  MPI_Allgather(&count, 1, MPI_INT, counts.data(), 1, MPI_INT, comm);
  for (int r = 1; r < size; ++r) offsets[r] = offsets[r - 1] + counts[r - 1];
  std::vector<double> all(offsets.back() + counts.back());
  MPI_Allgatherv(local.data(), count, MPI_DOUBLE, all.data(), counts.data(), offsets.data(), MPI_DOUBLE,
                 comm);
  std::vector<std::pair<double, double>> pairs;
  for (size_t k = 0; k + 1 < all.size(); k += 2) pairs.push_back({all[k], all[k + 1]});
  std::sort(pairs.begin(), pairs.end());
  WallShear out;
  for (const auto& [x, tau] : pairs) {
    out.x.push_back(x);
    out.tau.push_back(tau);
  }
  return out;
}

/// Collective. Flow rate [m^2/s] through each section x = const: the east faces of column i,
/// for i = 0 .. cells_x - 1 (the last is the periodic side x = 0), on every rank.
inline std::vector<double> section_flow_rates(const FlowSolver& solver, MPI_Comm comm) {
  const Grid& grid = solver.grid();
  std::vector<double> local(grid.cells_x(), 0.0), all(grid.cells_x(), 0.0);
  for (int j = grid.y_begin(); j < grid.y_end(); ++j)
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) local[i] += solver.flux_east()(i, j);
  MPI_Allreduce(local.data(), all.data(), grid.cells_x(), MPI_DOUBLE, MPI_SUM, comm);
  return all;
}

}  // namespace wallrans::test_support
