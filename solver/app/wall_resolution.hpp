// Wall resolution of the closures that integrate to the wall (Spalart-Allmaras, Baldwin-Barth, the
// k equation, the mixing length with van Driest damping): they need the first cell centre inside
// the viscous sublayer, y+ <= 1. After a run the largest first-cell y+ is measured; before one,
// `check` estimates it from a turbulent flat-plate skin-friction correlation.
#pragma once

#include <mpi.h>

#include <optional>
#include <string>

#include "core/case_spec.hpp"
#include "coupling/flow_solver.hpp"
#include "grid/boundary.hpp"
#include "meshes/node_coordinates.hpp"

namespace wallrans {

/// The y+ the closures need at the first cell centre (common practice: y+ of order 1).
inline constexpr double wall_y_plus_limit = 1.0;

/// Local. Whether `model` integrates to the wall and so needs first-cell y+ <= 1 (every closure
/// but laminar).
bool needs_wall_resolution(const std::string& model);

/// The largest first-cell y+ of a run and where it is.
struct WallResolution {
  double y_plus = 0.0;
  Vec2 at;                ///< wall face centre [m]
  double distance = 0.0;  ///< wall to first cell centre [m]
  std::string place;      ///< "bottom side, face 12" or "face of a solid cell"
};

/// Collective. The largest first-cell y+ = d sqrt(|tau_w|) / nu over the no-slip wall faces of
/// `solver` (none: nullopt).
std::optional<WallResolution> worst_wall_resolution(MPI_Comm comm, const FlowSolver& solver, double nu);

/// Local. The warning for a run whose first-cell y+ exceeds wall_y_plus_limit: the value, where,
/// the model, and the first-cell distance that would give y+ = 1 there.
std::string wall_resolution_warning(const WallResolution& worst, const std::string& model);

/// Local (same on every rank). `check`'s estimate for a closure that needs wall resolution: the
/// first-cell y+ from the local skin friction of a turbulent flat plate, C_f = 0.0592 Re_x^(-1/5)
/// (1/7-power velocity profile with the Blasius friction law; e.g. Incropera & DeWitt,
/// Fundamentals of Heat and Mass Transfer, eq. 7.34, from memory; valid for 5e5 < Re_x < 1e7),
/// with x the distance along each wall segment from its start and U = flow.reference_velocity, and
/// the first-cell centre distance that gives y+ = 1. "" for laminar cases.
std::string first_cell_estimate(const CaseSpec& spec, const BoundaryMap& boundaries,
                                const NodeCoordinates& nodes);

}  // namespace wallrans
