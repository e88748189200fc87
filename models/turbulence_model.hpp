// The seam between the mean-flow solver and the turbulence closures: once per outer iteration
// the solver hands the current mean flow to the model, which advances its own equation(s) and
// returns the eddy viscosity. The coupling code never knows which model runs.
#pragma once

#include <memory>
#include <string>
#include <utility>
#include <vector>

#include "discretization/boundary_conditions.hpp"
#include "grid/boundary.hpp"
#include "grid/boundary_faces.hpp"
#include "grid/grid.hpp"
#include "linear/solver_options.hpp"

namespace wallrans {

/// Read-only view of the mean flow handed to a model.
struct MeanFlowView {
  const Grid& grid;
  const BoundaryMap& boundaries;
  const BoundaryConditions& conditions;             ///< the condition of each boundary face
  const std::vector<BoundaryFace>& boundary_faces;  ///< owned boundary faces (owned_boundary_faces order)
  const std::vector<double>& boundary_flux;         ///< outward volume flux of each of those faces [m^2/s]
  const VectorField& velocity;
  const VectorField& grad_u;              ///< gradient of the x velocity component
  const VectorField& grad_v;              ///< gradient of the y velocity component
  const Field& flux_east;                 ///< volume flux through the interior east face of each cell [m^2/s]
  const Field& flux_north;                ///< volume flux through the interior north face of each cell
  const std::vector<double>& wall_shear;  ///< |tau_w| [m^2/s^2] of every wall face, global wall-face order
  double kinematic_viscosity;
};

struct ModelResidual {
  std::string name;
  double value;  ///< absolute residual norm of the model equation
};

class TurbulenceModel {
 public:
  virtual ~TurbulenceModel() = default;
  virtual std::string name() const = 0;
  /// Collective: advance the model equation(s) one outer iteration, then refresh eddy_viscosity().
  virtual void update(const MeanFlowView& flow) = 0;
  /// Eddy viscosity nu_t [m^2/s] in the ghosted range (ghosts current after update()).
  virtual const Field& eddy_viscosity() const = 0;
  virtual std::vector<ModelResidual> residuals() const { return {}; }
  /// Whether the model's linear solves of the last update() converged (reaching the iteration
  /// cap is tolerated, as for the momentum and pressure solves; a breakdown is not).
  virtual bool linear_solves_converged() const { return true; }
  /// Krylov iterations of the model's linear solves in the last update() (0 without equations).
  virtual int linear_iterations() const { return 0; }
  /// Every cell field the model needs to continue bit-identically after a restart (its
  /// variables, the eddy viscosity and any lagged state), named for the checkpoint; borrowed.
  virtual std::vector<std::pair<std::string, Field*>> restart_state() { return {}; }
  /// The PETSc options database of the model's linear solver (null if it has none), so that
  /// options nobody used can be reported.
  virtual const SolverOptions* solver_options() const { return nullptr; }
  /// Cell fields worth writing (model variable, wall distance, y+), borrowed.
  virtual std::vector<std::pair<std::string, const Field*>> output_fields() const { return {}; }
};

/// Laminar flow: nu_t = 0.
class LaminarModel final : public TurbulenceModel {
 public:
  explicit LaminarModel(const Grid& grid) : nut_(grid, 0.0) {}
  std::string name() const override { return "laminar"; }
  void update(const MeanFlowView&) override {}
  const Field& eddy_viscosity() const override { return nut_; }

 private:
  Field nut_;
};

}  // namespace wallrans
