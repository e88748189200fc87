// The answers a case is run for, computed from the converged fields: per wall segment the forces
// per unit span, skin friction, first-cell y+ and the separation and reattachment points; per
// periodic case the bulk velocity, u_tau and Re_tau. Also writes wall.csv.
#pragma once

#include <mpi.h>

#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include "core/case_spec.hpp"
#include "coupling/flow_solver.hpp"
#include "grid/boundary.hpp"

namespace wallrans {

/// A separation or reattachment point (see shear_sign_changes).
struct ShearPoint {
  Vec2 at;           ///< position, interpolated linearly between face centres [m]
  double s = 0.0;    ///< arc length from the first node of its run of faces [m]
  std::string side;  ///< side of the run (for the solid walls: the side of the fluid cells)
  bool is_separation = false;
};

/// One wall segment: a case segment of kind wall, or all faces next to solid cells.
struct WallAnswers {
  int segment = -1;  ///< index into BoundaryMap::segments()
  std::string name;  ///< "boundaries[k]" or "solid_regions"
  std::string side;  ///< "bottom", ..., "patch 'name'" or "solid faces"
  int line = 0;      ///< case-file line of the segment (0 unknown)
  int n_faces = 0;
  double length = 0.0;  ///< wetted length [m]
  /// Force of the fluid on the wall per unit span and density [m^3/s^2]: sum of tau_w t L and of
  /// (p - p_ref) n L over the faces (n out of the fluid, t the tangent of wall.csv).
  Vec2 friction_force, pressure_force;
  double cf_mean = 0.0;  ///< length-weighted mean of Cf
  double cf_min = 0.0, cf_max = 0.0;
  Vec2 cf_min_at, cf_max_at;
  double y_plus_max = 0.0;  ///< largest first-cell y+ = d_1 sqrt(|tau_w|) / nu
  Vec2 y_plus_max_at;
  std::vector<ShearPoint> shear_points;  ///< separation and reattachment points, by run and s
};

/// A streamwise-periodic channel: what its imposed gradient and flow rate mean.
struct PeriodicAnswers {
  double bulk_velocity = 0.0;           ///< volume mean of u over the fluid cells [m/s]
  double half_height = 0.0;             ///< delta = fluid area / wetted wall length [m]
  double mean_pressure_gradient = 0.0;  ///< dp/dx applied at the end [m/s^2] (fixed, or held by the flow rate)
  double driving_force = 0.0;           ///< -dp/dx + flow.body_force.x per unit mass [m/s^2]
  double u_tau = 0.0;                   ///< sqrt(|driving_force| delta): the force balance [m/s]
  double u_tau_wall_shear = 0.0;        ///< sqrt(|friction force x| / wall length) [m/s]
  double re_tau = 0.0;                  ///< u_tau delta / nu
  double re_bulk = 0.0;                 ///< U_b 2 delta / nu
  double cf_bulk = 0.0;                 ///< 2 (u_tau / U_b)^2
};

struct RunAnswers {
  double reference_velocity = 1.0;        ///< U_ref of Cf and Cp [m/s]
  bool reference_velocity_given = false;  ///< false: the default, flow.reference_velocity not set
  std::vector<WallAnswers> walls;
  std::optional<PeriodicAnswers> periodic;
};

/// Collective. Computes the answers (complete on rank 0; the other ranks get the reference
/// velocity only) and, when `wall_csv` is set, writes that file on rank 0: one row per wall face,
/// sorted by segment and along each straight run of faces, with columns segment, side, x, y, s,
/// tangent_x, tangent_y, cf, cp, wall_shear_stress, first_cell_distance, first_cell_y_plus.
RunAnswers compute_answers(MPI_Comm comm, const CaseSpec& spec, const BoundaryMap& boundaries,
                           const FlowSolver& solver, const std::optional<std::filesystem::path>& wall_csv);

/// Local. The short table printed at the end of a run (one string per line).
std::vector<std::string> answers_table(const RunAnswers& answers);

}  // namespace wallrans
