#include "app/profiles.hpp"

#include <cmath>
#include <cstdio>
#include <string>
#include <vector>

#include "io/csv_writer.hpp"
#include "io/gather.hpp"

namespace wallrans {

// Profiles along the grid column containing each station x, measured from the bottom wall:
// y (normal distance to the bottom wall face of the column), y+, U+ = u_t/u_tau, nu_t/nu.
void write_profiles(const CaseSpec& spec, const FlowSolver& solver, const std::filesystem::path& dir,
                    MPI_Comm comm) {
  const Grid& grid = solver.grid();
  int rank = 0;
  MPI_Comm_rank(comm, &rank);
  const double nu = spec.flow.kinematic_viscosity;
  for (size_t station = 0; station < spec.output.profiles_at_x.size(); ++station) {
    const double x = spec.output.profiles_at_x[station];
    int column = -1;
    for (int i = 0; i < grid.cells_x(); ++i)
      if (grid.node(i, 0).x <= x && x < grid.node(i + 1, 0).x) column = i;
    if (column < 0) {
      if (rank == 0)
        std::printf("wallrans: warning: profile station x = %g is outside the grid; skipped\n", x);
      continue;
    }
    // The bottom face of the column and its shear stress (owned by one rank, summed over all).
    const Vec2 a = grid.node(column, 0), b = grid.node(column + 1, 0);
    const Vec2 face_centre = 0.5 * (a + b);
    const Vec2 normal = (1.0 / norm(b - a)) * Vec2{-(b - a).y, (b - a).x};  // into the domain
    double tau = 0.0;
    for (const auto& w : solver.wall_samples())
      if (!w.on_solid && w.side == Side::bottom && w.index == column) tau = w.shear_stress;
    double tau_all = 0.0;
    MPI_Allreduce(&tau, &tau_all, 1, MPI_DOUBLE, MPI_SUM, comm);
    const double u_tau = std::sqrt(std::abs(tau_all));
    const Vec2 tangent{normal.y, -normal.x};
    std::vector<std::vector<double>> rows;
    if (column >= grid.x_begin() && column < grid.x_end()) {
      for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
        const Vec2 c = grid.centre(column, j);
        const double y = dot(c - face_centre, normal);
        const double ut = dot(solver.velocity()(column, j), tangent);
        const double nut = solver.eddy_viscosity()(column, j);
        rows.push_back(
            {c.x, c.y, y, u_tau > 0 ? y * u_tau / nu : 0.0, ut, u_tau > 0 ? ut / u_tau : 0.0, nut / nu});
      }
    }
    const auto all = gather_rows(comm, rows, 7);
    if (rank == 0) {
      CsvWriter out((dir / ("profile_" + std::to_string(station) + ".csv")).string(),
                    {"x", "y", "wall_distance", "y_plus", "u_tangential", "u_plus", "nut_over_nu"});
      for (const auto& row : all) out.row(row);
    }
  }
}

}  // namespace wallrans
