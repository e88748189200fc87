// Profile tables along grid columns, each cell measured from the nearest wall of its column, with
// the wall row of the column's lowest face, gathered on rank 0.
#include "io/profile_writer.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdio>
#include <limits>
#include <set>
#include <string>
#include <tuple>
#include <utility>
#include <vector>

#include "core/error.hpp"
#include "io/csv_writer.hpp"
#include "io/gather.hpp"

namespace wallrans {

namespace {

constexpr double nan = std::numeric_limits<double>::quiet_NaN();

// A wall face of the profile's column, known on every rank.
struct ColumnWall {
  Vec2 centre, normal, tangent;  // normal out of the fluid
  double u_tau;                  // sqrt(|tau_w|)
  double wall_speed;             // wall velocity along the tangent
};

// Collective. The wall faces (block side or next to a solid cell) on the bottom or top of the
// cells of `column`, from every rank.
std::vector<ColumnWall> column_walls(const CaseSpec& spec, const FlowSolver& solver, int column,
                                     MPI_Comm comm) {
  std::vector<double> mine;
  for (const WallSample& w : solver.wall_samples()) {
    if (w.cell_i != column || (w.side != Side::bottom && w.side != Side::top)) continue;
    const Vec2 wall_velocity = w.segment >= 0 && w.segment < static_cast<int>(spec.boundaries.size())
                                   ? spec.boundaries[static_cast<size_t>(w.segment)].velocity
                                   : Vec2{0.0, 0.0};
    mine.insert(mine.end(), {w.centre.x, w.centre.y, w.normal.x, w.normal.y, w.tangent.x, w.tangent.y,
                             std::sqrt(std::abs(w.shear_stress)), dot(wall_velocity, w.tangent)});
  }
  int size = 1;
  check_mpi(MPI_Comm_size(comm, &size));
  int count = static_cast<int>(mine.size());
  std::vector<int> counts(static_cast<size_t>(size)), offsets(static_cast<size_t>(size));
  check_mpi(MPI_Allgather(&count, 1, MPI_INT, counts.data(), 1, MPI_INT, comm));
  int total = 0;
  for (int k = 0; k < size; ++k) {
    offsets[static_cast<size_t>(k)] = total;
    total += counts[static_cast<size_t>(k)];
  }
  std::vector<double> all(static_cast<size_t>(total));
  check_mpi(MPI_Allgatherv(mine.data(), count, MPI_DOUBLE, all.data(), counts.data(), offsets.data(),
                           MPI_DOUBLE, comm));
  std::vector<ColumnWall> walls;
  for (size_t k = 0; k + 8 <= all.size(); k += 8)
    walls.push_back(
        {{all[k], all[k + 1]}, {all[k + 2], all[k + 3]}, {all[k + 4], all[k + 5]}, all[k + 6], all[k + 7]});
  return walls;
}

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

std::string profile_file_name(double x) {
  char buffer[48];
  std::snprintf(buffer, sizeof buffer, "profile_x%.6g.csv", x);
  return buffer;
}

int profile_column(const Grid& grid, double x) {
  int column = -1;
  for (int i = 0; i < grid.cells_x(); ++i)
    if (grid.node(i, 0).x <= x && x < grid.node(i + 1, 0).x) column = i;
  return column;
}

std::vector<std::string> write_profiles(const CaseSpec& spec, const FlowSolver& solver,
                                        const TurbulenceModel& model, const std::filesystem::path& directory,
                                        MPI_Comm comm) {
  const Grid& grid = solver.grid();
  int rank = 0;
  check_mpi(MPI_Comm_rank(comm, &rank));
  const double nu = spec.flow.kinematic_viscosity;
  std::vector<std::string> columns{"x",      "y",           "wall_distance", "y_plus", "u_tangential",
                                   "u_plus", "nut_over_nu", "wall_x",        "wall_y", "u",
                                   "v"};
  const std::string variable = model_variable_column(spec.turbulence.model);
  const Field* variable_field = nullptr;
  for (const auto& [name, field] : model.output_fields())
    if (!variable.empty() && name == variable) variable_field = field;
  if (variable_field) columns.push_back(variable);
  std::vector<std::string> warnings;
  std::set<std::string> written;
  for (const double x : spec.output.profiles_at_x) {
    const std::string name = profile_file_name(x);
    const int column = profile_column(grid, x);
    BottomFace face;
    if (column < 0 || !bottom_face(spec, solver, column, face)) {
      warnings.push_back("wallrans: warning: profile station x = " + std::to_string(x) +
                         " is outside the grid or its fluid; skipped");
      continue;
    }
    if (!written.insert(name).second) {
      warnings.push_back("wallrans: warning: profile station x = " + std::to_string(x) +
                         " gives the file name " + name + " of an earlier station; skipped");
      continue;
    }
    const std::vector<ColumnWall> walls = column_walls(spec, solver, column, comm);
    const Vec2 bottom_normal =
        (1.0 / norm(face.b - face.a)) * Vec2{(face.b - face.a).y, -(face.b - face.a).x};  // out of the fluid
    std::vector<std::vector<double>> rows;
    auto add_row = [&](Vec2 at, double distance, double ut, double u_tau, Vec2 wall, Vec2 velocity,
                       double nut, double variable_value) {
      std::vector<double> row{at.x,      at.y,
                              distance,  u_tau > 0 ? distance * u_tau / nu : nan,
                              ut,        u_tau > 0 ? ut / u_tau : nan,
                              nut / nu,  wall.x,
                              wall.y,    velocity.x,
                              velocity.y};
      if (variable_field) row.push_back(variable_value);
      rows.push_back(std::move(row));
    };
    if (rank == 0 && face.is_wall) {
      const double u_tau = std::sqrt(std::abs(face.shear_stress));
      add_row(face.centre, 0.0, 0.0, u_tau, face.centre, face.wall_velocity, 0.0, 0.0);
    }
    if (column >= grid.x_begin() && column < grid.x_end()) {
      for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
        if (solver.solid()(column, j) != 0.0) continue;
        const Vec2 c = grid.centre(column, j);
        // The nearest wall whose fluid side this cell is on (distance along the wall normal).
        const ColumnWall* nearest = nullptr;
        double distance = std::numeric_limits<double>::infinity();
        for (const ColumnWall& w : walls) {
          const double d = dot(w.centre - c, w.normal);
          if (d > 0.0 && d < distance) std::tie(nearest, distance) = std::pair(&w, d);
        }
        const Vec2 u = solver.velocity()(column, j);
        const double nut = solver.eddy_viscosity()(column, j);
        const double value = variable_field ? (*variable_field)(column, j) : 0.0;
        if (nearest == nullptr) {
          add_row(c, dot(face.centre - c, bottom_normal), u.x, 0.0, face.centre, u, nut, value);
          continue;
        }
        add_row(c, distance, dot(u, nearest->tangent) - nearest->wall_speed, nearest->u_tau, nearest->centre,
                u, nut, value);
      }
    }
    auto all = gather_rows(comm, rows, static_cast<int>(columns.size()));
    if (rank == 0) {
      std::sort(all.begin(), all.end(), [](const auto& p, const auto& q) { return p[1] < q[1]; });
      CsvWriter out((directory / name).string(), columns);
      for (const auto& row : all) out.row(row);
    }
  }
  return warnings;
}

}  // namespace wallrans
