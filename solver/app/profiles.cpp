#include "app/profiles.hpp"

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

}  // namespace

std::string profile_file_name(double x) {
  char buffer[48];
  std::snprintf(buffer, sizeof buffer, "profile_x%.6g.csv", x);
  return buffer;
}

std::vector<std::string> write_profiles(const CaseSpec& spec, const FlowSolver& solver,
                                        const std::filesystem::path& dir, MPI_Comm comm) {
  const Grid& grid = solver.grid();
  int rank = 0;
  check_mpi(MPI_Comm_rank(comm, &rank));
  const double nu = spec.flow.kinematic_viscosity;
  std::vector<std::string> warnings;
  std::set<std::string> written;
  for (const double x : spec.output.profiles_at_x) {
    const std::string name = profile_file_name(x);
    int column = -1;
    for (int i = 0; i < grid.cells_x(); ++i)
      if (grid.node(i, 0).x <= x && x < grid.node(i + 1, 0).x) column = i;
    if (column < 0) {
      warnings.push_back("wallrans: warning: profile station x = " + std::to_string(x) +
                         " is outside the grid; skipped");
      continue;
    }
    if (!written.insert(name).second) {
      warnings.push_back("wallrans: warning: profile station x = " + std::to_string(x) +
                         " gives the file name " + name + " of an earlier station; skipped");
      continue;
    }
    const std::vector<ColumnWall> walls = column_walls(spec, solver, column, comm);
    const Vec2 a = grid.node(column, 0), b = grid.node(column + 1, 0);
    const Vec2 bottom_centre = 0.5 * (a + b);
    const Vec2 bottom_normal = (1.0 / norm(b - a)) * Vec2{(b - a).y, -(b - a).x};  // out of the domain
    std::vector<std::vector<double>> rows;
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
        if (nearest == nullptr) {
          const double y = dot(bottom_centre - c, bottom_normal);
          rows.push_back({c.x, c.y, y, nan, u.x, nan, nut / nu, bottom_centre.x, bottom_centre.y});
          continue;
        }
        const double ut = dot(u, nearest->tangent) - nearest->wall_speed;
        const double u_tau = nearest->u_tau;
        rows.push_back({c.x, c.y, distance, u_tau > 0 ? distance * u_tau / nu : nan, ut,
                        u_tau > 0 ? ut / u_tau : nan, nut / nu, nearest->centre.x, nearest->centre.y});
      }
    }
    const auto all = gather_rows(comm, rows, 9);
    if (rank == 0) {
      CsvWriter out((dir / name).string(), {"x", "y", "wall_distance", "y_plus", "u_tangential", "u_plus",
                                            "nut_over_nu", "wall_x", "wall_y"});
      for (const auto& row : all) out.row(row);
    }
  }
  return warnings;
}

}  // namespace wallrans
