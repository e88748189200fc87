#include "app/run_answers.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <limits>
#include <tuple>

#include "coupling/shear_sign_changes.hpp"
#include "core/error.hpp"
#include "io/csv_writer.hpp"
#include "io/gather.hpp"

namespace wallrans {

namespace {

// One wall face as gathered on rank 0.
struct Face {
  int segment, side, index, line;
  Vec2 centre, tangent, normal;
  double length, shear, cf, cp, pressure, first_cell_distance, y_plus;
  double s = 0.0;  // arc length from the first node of its run
};

constexpr int row_width = 17;

std::vector<double> face_row(const WallSample& w, double nu) {
  // The grid line the face lies on: node row j for bottom/top faces, node column i for left/right.
  const int line = w.side == Side::bottom ? w.cell_j
                   : w.side == Side::top  ? w.cell_j + 1
                   : w.side == Side::left ? w.cell_i
                                          : w.cell_i + 1;
  const double y_plus = w.first_cell_distance * std::sqrt(std::abs(w.shear_stress)) / nu;
  return {double(w.segment),
          double(static_cast<int>(w.side)),
          double(w.index),
          double(line),
          w.centre.x,
          w.centre.y,
          w.tangent.x,
          w.tangent.y,
          w.normal.x,
          w.normal.y,
          w.length,
          w.shear_stress,
          w.cf,
          w.cp,
          w.pressure,
          w.first_cell_distance,
          y_plus};
}

Face face_of(const std::vector<double>& r) {
  return Face{int(r[0]), int(r[1]), int(r[2]), int(r[3]), {r[4], r[5]}, {r[6], r[7]}, {r[8], r[9]},
              r[10],     r[11],     r[12],     r[13],     r[14],        r[15],        r[16]};
}

// Runs of faces: the same segment, side and grid line, with consecutive indices (a block side or
// one straight piece of a solid region's outline). Sorts `faces` and returns [begin, end) pairs.
std::vector<std::pair<size_t, size_t>> runs_of(std::vector<Face>& faces) {
  auto key = [](const Face& f) { return std::tuple(f.segment, f.side, f.line, f.index); };
  std::sort(faces.begin(), faces.end(), [&](const Face& a, const Face& b) { return key(a) < key(b); });
  std::vector<std::pair<size_t, size_t>> runs;
  for (size_t k = 0; k < faces.size(); ++k) {
    const bool continues = k > 0 && faces[k].segment == faces[k - 1].segment &&
                           faces[k].side == faces[k - 1].side && faces[k].line == faces[k - 1].line &&
                           faces[k].index == faces[k - 1].index + 1;
    if (continues)
      runs.back().second = k + 1;
    else
      runs.emplace_back(k, k + 1);
  }
  return runs;
}

std::string side_name(int side) { return to_string(static_cast<Side>(side)); }

WallAnswers describe_segment(const BoundaryMap& boundaries, const CaseSpec& spec, int segment) {
  WallAnswers w;
  w.segment = segment;
  if (segment < static_cast<int>(spec.boundaries.size())) {
    const BoundarySegmentSpec& s = boundaries.segments()[static_cast<size_t>(segment)];
    w.name = "boundaries[" + std::to_string(segment) + "]";
    w.side = s.patch.empty() ? to_string(s.side) : "patch '" + s.patch + "'";
    w.line = s.line;
  } else {
    w.name = "solid_regions";
    w.side = "solid faces";
    w.line = spec.solid_regions.empty() ? 0 : spec.solid_regions.front().line;
  }
  return w;
}

// Local (rank 0). Sums, extremes and sign changes of one segment's faces, in run order.
void add_faces(WallAnswers& w, const std::vector<Face>& faces,
               const std::vector<std::pair<size_t, size_t>>& runs, double reference_pressure) {
  double cf_sum = 0.0;
  w.cf_min = std::numeric_limits<double>::infinity();
  w.cf_max = -std::numeric_limits<double>::infinity();
  for (const auto& [begin, end] : runs) {
    if (faces[begin].segment != w.segment) continue;
    std::vector<double> s, shear;
    for (size_t k = begin; k < end; ++k) {
      const Face& f = faces[k];
      ++w.n_faces;
      w.length += f.length;
      w.friction_force = w.friction_force + (f.shear * f.length) * f.tangent;
      w.pressure_force = w.pressure_force + ((f.pressure - reference_pressure) * f.length) * f.normal;
      cf_sum += f.cf * f.length;
      if (f.cf < w.cf_min) std::tie(w.cf_min, w.cf_min_at) = std::pair(f.cf, f.centre);
      if (f.cf > w.cf_max) std::tie(w.cf_max, w.cf_max_at) = std::pair(f.cf, f.centre);
      if (f.y_plus > w.y_plus_max) std::tie(w.y_plus_max, w.y_plus_max_at) = std::pair(f.y_plus, f.centre);
      // The shear along the direction of increasing index (the direction of increasing s).
      const Vec2 along = end - begin < 2 ? f.tangent
                         : k + 1 < end   ? faces[k + 1].centre - f.centre
                                         : f.centre - faces[k - 1].centre;
      s.push_back(f.s);
      shear.push_back(dot(f.tangent, along) >= 0.0 ? f.shear : -f.shear);
    }
    for (const ShearSignChange& c : shear_sign_changes(s, shear)) {
      const Face& a = faces[begin + static_cast<size_t>(c.before)];
      const Face& b = c.fraction > 0.0 ? faces[begin + static_cast<size_t>(c.before) + 1] : a;
      w.shear_points.push_back(
          {a.centre + c.fraction * (b.centre - a.centre), c.s, side_name(a.side), c.is_separation});
    }
  }
  w.cf_mean = w.length > 0.0 ? cf_sum / w.length : 0.0;
}

void write_wall_csv(const std::filesystem::path& path, const std::vector<Face>& faces) {
  CsvWriter out(path.string(), {{"segment", CsvType::integer},
                                {"side", CsvType::text},
                                {"x"},
                                {"y"},
                                {"s"},
                                {"tangent_x"},
                                {"tangent_y"},
                                {"cf"},
                                {"cp"},
                                {"wall_shear_stress"},
                                {"first_cell_distance"},
                                {"first_cell_y_plus"}});
  for (const Face& f : faces) {
    out.mixed_row({double(f.segment), side_name(f.side), f.centre.x, f.centre.y, f.s, f.tangent.x,
                   f.tangent.y, f.cf, f.cp, f.shear, f.first_cell_distance, f.y_plus});
  }
}

// Collective. Bulk velocity, u_tau and Re_tau of a streamwise-periodic case; `wall_length` and
// `friction_x` (sums over every wall face) are used on rank 0 only.
PeriodicAnswers periodic_answers(const CaseSpec& spec, const FlowSolver& solver, double wall_length,
                                 double friction_x) {
  const Grid& grid = solver.grid();
  double volume = 0.0, flow = 0.0;
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      if (solver.solid()(i, j) != 0.0) continue;
      volume += grid.volume(i, j);
      flow += grid.volume(i, j) * solver.velocity().x(i, j);
    }
  }
  volume = grid.global_sum(volume);
  flow = grid.global_sum(flow);
  PeriodicAnswers p;
  const double nu = spec.flow.kinematic_viscosity;
  p.bulk_velocity = flow / volume;
  // The gradient applied now: periodic.mean_pressure_gradient, or where periodic.bulk_velocity
  // holds the flow rate, the one the controller converged to.
  p.mean_pressure_gradient = solver.periodic_driving().mean_pressure_gradient;
  p.driving_force = -p.mean_pressure_gradient + spec.flow.body_force.x;
  if (wall_length > 0.0) {
    // Force balance of the whole fluid, x direction: tau_w,mean * wall length = f * fluid area.
    p.half_height = volume / wall_length;
    p.u_tau = std::sqrt(std::abs(p.driving_force) * p.half_height);
    p.u_tau_wall_shear = std::sqrt(std::abs(friction_x) / wall_length);
    p.re_tau = p.u_tau * p.half_height / nu;
    p.re_bulk = p.bulk_velocity * 2.0 * p.half_height / nu;
    p.cf_bulk = p.bulk_velocity != 0.0 ? 2.0 * std::pow(p.u_tau / p.bulk_velocity, 2) : 0.0;
  }
  return p;
}

std::string number(double value) {
  char buffer[32];
  std::snprintf(buffer, sizeof buffer, "%.4g", value);
  return buffer;
}

}  // namespace

RunAnswers compute_answers(MPI_Comm comm, const CaseSpec& spec, const BoundaryMap& boundaries,
                           const FlowSolver& solver, const std::optional<std::filesystem::path>& wall_csv) {
  RunAnswers answers;
  answers.reference_velocity = spec.flow.reference_velocity;
  answers.reference_velocity_given = spec.flow.reference_velocity_given;
  const double nu = spec.flow.kinematic_viscosity;
  std::vector<std::vector<double>> rows;
  for (const WallSample& w : solver.wall_samples()) rows.push_back(face_row(w, nu));
  const auto all = gather_rows(comm, rows, row_width);
  int rank = 0;
  check_mpi(MPI_Comm_rank(comm, &rank));
  double wall_length = 0.0, friction_x = 0.0;
  if (rank == 0) {
    std::vector<Face> faces;
    for (const auto& row : all) faces.push_back(face_of(row));
    const auto runs = runs_of(faces);
    for (const auto& [begin, end] : runs) {
      double s = 0.5 * faces[begin].length;
      for (size_t k = begin; k < end; ++k) {
        if (k > begin) s += norm(faces[k].centre - faces[k - 1].centre);
        faces[k].s = s;
      }
    }
    for (int segment = 0; segment < static_cast<int>(boundaries.segments().size()); ++segment) {
      const bool has_faces =
          std::any_of(faces.begin(), faces.end(), [&](const Face& f) { return f.segment == segment; });
      if (!has_faces) continue;
      WallAnswers w = describe_segment(boundaries, spec, segment);
      add_faces(w, faces, runs, spec.flow.reference_pressure);
      wall_length += w.length;
      friction_x += w.friction_force.x;
      answers.walls.push_back(std::move(w));
    }
    if (wall_csv) write_wall_csv(*wall_csv, faces);
  }
  if (spec.periodic.axis == PeriodicAxis::x) {
    answers.periodic = periodic_answers(spec, solver, wall_length, friction_x);
    if (rank != 0) answers.periodic.reset();
  }
  return answers;
}

std::vector<std::string> answers_table(const RunAnswers& a) {
  std::vector<std::string> lines;
  char buffer[320];
  const std::string reference = "U_ref = " + number(a.reference_velocity) + " m/s" +
                                (a.reference_velocity_given ? " (flow.reference_velocity)"
                                                            : " (default: flow.reference_velocity not set)");
  if (!a.walls.empty()) {
    lines.push_back("answers per unit span (force / density [m^3/s^2]); Cf = 2 tau_w / U_ref^2 with " +
                    reference);
    std::snprintf(buffer, sizeof buffer, "  %-30s %6s %11s %11s %11s %11s %11s %10s %10s %10s %8s", "wall",
                  "faces", "length", "friction_x", "friction_y", "pressure_x", "pressure_y", "cf_mean",
                  "cf_min", "cf_max", "y+_max");
    lines.push_back(buffer);
    for (const WallAnswers& w : a.walls) {
      std::snprintf(buffer, sizeof buffer,
                    "  %-30s %6d %11.4e %11.4e %11.4e %11.4e %11.4e %10.3e %10.3e %10.3e %8.3g",
                    (w.name + " " + w.side).substr(0, 30).c_str(), w.n_faces, w.length, w.friction_force.x,
                    w.friction_force.y, w.pressure_force.x, w.pressure_force.y, w.cf_mean, w.cf_min, w.cf_max,
                    w.y_plus_max);
      lines.push_back(buffer);
      // The first few separation and reattachment points; summary.json lists them all.
      constexpr size_t shown = 4;
      for (size_t k = 0; k < std::min(shown, w.shear_points.size()); ++k) {
        const ShearPoint& p = w.shear_points[k];
        lines.push_back("    " + std::string(p.is_separation ? "separation" : "reattachment") +
                        " at x = " + number(p.at.x) + ", y = " + number(p.at.y) + " (" + p.side + " faces)");
      }
      if (w.shear_points.size() > shown)
        lines.push_back("    ... " + std::to_string(w.shear_points.size() - shown) +
                        " more sign change(s) of the wall shear in summary.json");
    }
  }
  if (a.periodic) {
    const PeriodicAnswers& p = *a.periodic;
    lines.push_back(
        "periodic channel: U_b = " + number(p.bulk_velocity) + " m/s, u_tau = " + number(p.u_tau) +
        " m/s (from the wall shear " + number(p.u_tau_wall_shear) + "), Re_tau = " + number(p.re_tau) +
        ", Re_b = U_b 2 delta / nu = " + number(p.re_bulk) + ", Cf_b = " + number(p.cf_bulk) +
        ", dp/dx = " + number(p.mean_pressure_gradient) + " m/s^2, delta = " + number(p.half_height) + " m");
  }
  return lines;
}

}  // namespace wallrans
