// Profile tables along grid columns, with the wall row, gathered on rank 0.
#include "io/profile_writer.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <string>
#include <vector>

#include "io/csv_writer.hpp"
#include "io/gather.hpp"

namespace wallrans {

void write_profiles(const CaseSpec& spec, const FlowSolver& solver, const TurbulenceModel& model,
                    const std::filesystem::path& directory, MPI_Comm comm) {
  const Grid& grid = solver.grid();
  int rank = 0;
  MPI_Comm_rank(comm, &rank);
  const double nu = spec.flow.kinematic_viscosity;
  std::vector<std::string> columns{
      "x", "y", "wall_distance", "y_plus", "u_tangential", "u_plus", "nut_over_nu", "u", "v"};
  const std::string variable = model_variable_column(spec.turbulence.model);
  const Field* variable_field = nullptr;
  for (const auto& [name, field] : model.output_fields())
    if (!variable.empty() && name == variable) variable_field = field;
  if (variable_field) columns.push_back(variable);
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
    auto add_row = [&](Vec2 at, double y, Vec2 velocity, double nut, double variable_value) {
      const double ut = dot(velocity, tangent);
      std::vector<double> row{
          at.x,     at.y,       y,         u_tau > 0 ? y * u_tau / nu : 0.0, ut, u_tau > 0 ? ut / u_tau : 0.0,
          nut / nu, velocity.x, velocity.y};
      if (variable_field) row.push_back(variable_value);
      rows.push_back(std::move(row));
    };
    for (const BoundaryFace& f : solver.boundary_faces()) {
      if (f.on_solid || f.side != Side::bottom || f.index != column) continue;
      if (f.segment < 0 || static_cast<size_t>(f.segment) >= spec.boundaries.size()) continue;
      const BoundarySegmentSpec& segment = spec.boundaries[static_cast<size_t>(f.segment)];
      if (segment.kind == BoundaryKind::wall) add_row(f.centre, 0.0, segment.velocity, 0.0, 0.0);
    }
    if (column >= grid.x_begin() && column < grid.x_end()) {
      for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
        const Vec2 c = grid.centre(column, j);
        add_row(c, dot(c - face_centre, normal), solver.velocity()(column, j),
                solver.eddy_viscosity()(column, j), variable_field ? (*variable_field)(column, j) : 0.0);
      }
    }
    auto all = gather_rows(comm, rows, static_cast<int>(columns.size()));
    if (rank == 0) {
      std::sort(all.begin(), all.end(), [](const auto& p, const auto& q) { return p[1] < q[1]; });
      CsvWriter out((directory / ("profile_" + std::to_string(station) + ".csv")).string(), columns);
      for (const auto& row : all) out.row(row);
    }
  }
}

}  // namespace wallrans
