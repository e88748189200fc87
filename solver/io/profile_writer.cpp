// Profile tables along grid columns, measured from the column's lowest boundary face, with the
// wall row, gathered on rank 0.
#include "io/profile_writer.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdio>
#include <string>
#include <vector>

#include "io/csv_writer.hpp"
#include "io/gather.hpp"

namespace wallrans {

namespace {

// The lower boundary face of a grid column: the block's bottom face, or where solid cells lie
// below, the face on top of them.
struct BottomFace {
  Vec2 centre, a, b;
  double shear_stress = 0.0;  // signed, as WallSample::shear_stress (0 if not a wall)
  bool is_wall = false;       // a no-slip wall (a wall segment or a solid cell below)
  Vec2 wall_velocity;
};

// Collective. The lowest bottom-side boundary face of column i over all ranks; false if the
// column has none (every cell solid).
bool bottom_face(const CaseSpec& spec, const FlowSolver& solver, int i, BottomFace& out) {
  const BoundaryFace* lowest = nullptr;
  for (const BoundaryFace& f : solver.boundary_faces())
    if (f.side == Side::bottom && f.index == i && (!lowest || f.centre.y < lowest->centre.y)) lowest = &f;
  std::array<double, 10> data{};
  if (lowest) {
    const BoundaryFace& f = *lowest;
    // The faces next to solid cells form one extra wall segment at rest after the case's ones.
    const bool is_case_segment = f.segment >= 0 && static_cast<size_t>(f.segment) < spec.boundaries.size();
    const bool is_wall =
        f.on_solid ||
        (is_case_segment && spec.boundaries[static_cast<size_t>(f.segment)].kind == BoundaryKind::wall);
    const Vec2 velocity =
        is_wall && !f.on_solid ? spec.boundaries[static_cast<size_t>(f.segment)].velocity : Vec2{};
    double tau = 0.0;
    for (const WallSample& w : solver.wall_samples())
      if (w.side == Side::bottom && w.index == i && w.on_solid == f.on_solid) tau = w.shear_stress;
    data = {f.centre.x, f.centre.y,          f.a.x,      f.a.y,     f.b.x, f.b.y,
            tau,        is_wall ? 1.0 : 0.0, velocity.x, velocity.y};
  }
  MPI_Comm comm = solver.grid().comm();
  int rank = 0;
  MPI_Comm_rank(comm, &rank);
  struct {
    double y;
    int rank;
  } mine{lowest ? lowest->centre.y : HUGE_VAL, rank}, best{};
  MPI_Allreduce(&mine, &best, 1, MPI_DOUBLE_INT, MPI_MINLOC, comm);
  if (best.y == HUGE_VAL) return false;
  MPI_Bcast(data.data(), static_cast<int>(data.size()), MPI_DOUBLE, best.rank, comm);
  out = {{data[0], data[1]}, {data[2], data[3]}, {data[4], data[5]}, data[6],
         data[7] != 0.0,     {data[8], data[9]}};
  return true;
}

}  // namespace

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
    BottomFace face;
    if (column < 0 || !bottom_face(spec, solver, column, face)) {
      if (rank == 0)
        std::printf("wallrans: warning: profile station x = %g is outside the grid or its fluid; skipped\n",
                    x);
      continue;
    }
    const Vec2 normal =
        (1.0 / norm(face.b - face.a)) * Vec2{-(face.b - face.a).y, (face.b - face.a).x};  // inwards
    const double u_tau = std::sqrt(std::abs(face.shear_stress));
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
    if (rank == 0 && face.is_wall) add_row(face.centre, 0.0, face.wall_velocity, 0.0, 0.0);
    if (column >= grid.x_begin() && column < grid.x_end()) {
      for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
        if (solver.solid()(column, j) != 0.0) continue;
        const Vec2 c = grid.centre(column, j);
        add_row(c, dot(c - face.centre, normal), solver.velocity()(column, j),
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
