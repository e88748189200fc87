// First-cell y+ after a run (measured) and before it (flat-plate correlation).
#include "app/wall_resolution.hpp"

#include <cmath>
#include <cstdio>
#include <map>

#include "app/text_format.hpp"
#include "core/error.hpp"
#include "discretization/boundary_conditions.hpp"

namespace wallrans {

namespace {

std::string number(double value) { return significant(value, 3); }

std::string place_of(Side side, int index, bool on_solid) {
  return on_solid ? "a face of a solid cell"
                  : std::string(to_string(side)) + " side, face " + std::to_string(index);
}

// Turbulent flat plate, local skin friction C_f = 0.0592 Re_x^(-1/5), valid 5e5 < Re_x < 1e7
// (first_cell_estimate's header names the source).
constexpr double plate_cf_coefficient = 0.0592, plate_re_min = 5e5, plate_re_max = 1e7;

}  // namespace

bool needs_wall_resolution(const std::string& model) { return model != "laminar"; }

std::optional<WallResolution> worst_wall_resolution(MPI_Comm comm, const FlowSolver& solver, double nu) {
  struct {
    double y_plus;
    int rank;
  } worst{-1.0, 0};
  check_mpi(MPI_Comm_rank(comm, &worst.rank));
  WallResolution local;
  for (const WallSample& w : solver.wall_samples()) {
    const double y_plus = w.first_cell_distance * std::sqrt(std::abs(w.shear_stress)) / nu;
    if (y_plus > worst.y_plus) {
      worst.y_plus = y_plus;
      local = {y_plus, w.centre, w.first_cell_distance, place_of(w.side, w.index, w.on_solid)};
    }
  }
  check_mpi(MPI_Allreduce(MPI_IN_PLACE, &worst, 1, MPI_DOUBLE_INT, MPI_MAXLOC, comm));
  if (worst.y_plus < 0.0) return std::nullopt;
  double figures[4] = {local.y_plus, local.at.x, local.at.y, local.distance};
  check_mpi(MPI_Bcast(figures, 4, MPI_DOUBLE, worst.rank, comm));
  std::string place = local.place;
  int length = static_cast<int>(place.size());
  check_mpi(MPI_Bcast(&length, 1, MPI_INT, worst.rank, comm));
  place.resize(static_cast<size_t>(length));
  check_mpi(MPI_Bcast(place.data(), length, MPI_CHAR, worst.rank, comm));
  return WallResolution{figures[0], {figures[1], figures[2]}, figures[3], place};
}

std::string wall_resolution_warning(const WallResolution& worst, const std::string& model) {
  // At fixed wall shear y+ grows linearly with the distance, so y+ = 1 needs d / y+.
  return "first-cell y+ reaches " + number(worst.y_plus) + " on the wall at x = " + number(worst.at.x) +
         ", y = " + number(worst.at.y) + " (" + worst.place + "); model " + model +
         " integrates to the wall and needs y+ <= 1 there: a first-cell centre distance of about " +
         number(worst.distance / worst.y_plus) + " m (now " + number(worst.distance) + " m)";
}

std::string first_cell_estimate(const CaseSpec& spec, const BoundaryMap& boundaries,
                                const NodeCoordinates& nodes) {
  if (!needs_wall_resolution(spec.turbulence.model)) return "";
  const BoundaryConditions conditions(boundaries.segments(), spec.flow.reference_pressure);
  const double u = spec.flow.reference_velocity, nu = spec.flow.kinematic_viscosity;
  std::map<int, double> run_length;  // distance along each wall segment so far [m]
  struct Worst {
    double y_plus = -1.0, x = 0.0, re_x = 0.0, distance = 0.0, needed = 0.0;
    Vec2 at;
  } worst;
  double longest_re = 0.0;
  for (const BoundaryFace& face : boundaries.faces()) {
    if (!conditions.of(face).is_wall()) continue;
    const double length = norm(face.area);
    double& s = run_length[face.segment];
    const double x = s + 0.5 * length;  // from the segment's start to the face centre
    s += length;
    const Vec2 centre = 0.25 * (nodes.at(face.i, face.j) + nodes.at(face.i + 1, face.j) +
                                nodes.at(face.i + 1, face.j + 1) + nodes.at(face.i, face.j + 1));
    const double distance = std::abs(dot(centre - face.centre, (1.0 / length) * face.area));
    const double re_x = u * x / nu;
    longest_re = std::max(longest_re, re_x);
    if (re_x < plate_re_min || re_x > plate_re_max) continue;
    const double u_tau = u * std::sqrt(0.5 * plate_cf_coefficient * std::pow(re_x, -0.2));
    const double y_plus = distance * u_tau / nu;
    if (y_plus > worst.y_plus) worst = {y_plus, x, re_x, distance, nu / u_tau, face.centre};
  }
  const std::string source =
      "turbulent flat plate C_f = 0.0592 Re_x^-1/5 (1/7-power law with the Blasius friction law; Incropera & "
      "DeWitt eq. 7.34, from memory)";
  if (worst.y_plus < 0.0) {
    return "  wall resolution: not estimated: Re_x along the walls reaches " + number(longest_re) +
           ", outside 5e5..1e7 where the " + source + " holds\n";
  }
  return "  wall resolution (estimate, " + source + "): first-cell y+ up to " + number(worst.y_plus) +
         " at x = " + number(worst.at.x) + ", y = " + number(worst.at.y) + " (Re_x = " + number(worst.re_x) +
         "); y+ = 1 there needs a first-cell centre distance of " + number(worst.needed) +
         " m (first cell height about " + number(2.0 * worst.needed) + " m; now " + number(worst.distance) +
         " m)\n";
}

}  // namespace wallrans
