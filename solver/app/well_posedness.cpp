// The mass balance of a domain without a pressure boundary.
#include "app/well_posedness.hpp"

#include <cmath>
#include <cstdio>

#include "core/error.hpp"
#include "discretization/boundary_conditions.hpp"
#include "grid/solid_cells.hpp"

namespace wallrans {

void check_flux_balance(const CaseSpec& spec, const BoundaryMap& boundaries) {
  const BoundaryConditions conditions(boundaries.segments(), spec.flow.reference_pressure);
  if (conditions.has_fixed_pressure()) return;
  double net = 0.0, inflow = 0.0, outflow = 0.0;  // outward fluxes [m^2/s]
  int first_line = 0;
  for (const BoundaryFace& face : boundaries.faces()) {
    const BoundaryCondition& condition = conditions.of(face);
    if (condition.flux_prediction() != FluxPrediction::prescribed) continue;
    const double flux = dot(condition.face_velocity(face, {0.0, 0.0}, 0.0), face.area);
    net += flux;
    (flux < 0.0 ? inflow : outflow) += std::abs(flux);
    if (flux != 0.0 && first_line == 0) first_line = boundaries.spec(face).line;
  }
  // Rounding: n face fluxes summed with relative error 1e-16 each stay below 1e-10 of the sum of
  // their magnitudes for n up to 1e6 faces; 1e-9 leaves a margin and is far below any real
  // imbalance.
  if (std::abs(net) <= 1e-9 * (inflow + outflow)) return;
  char figures[160];
  std::snprintf(figures, sizeof figures,
                "a net %s of %.4g m^2/s (in %.4g, out %.4g through prescribed faces)",
                net < 0.0 ? "inflow" : "outflow", std::abs(net), inflow, outflow);
  throw InputError(case_location(spec, first_line) +
                   ": key 'boundaries': expected the prescribed volume fluxes of a domain without an outflow "
                   "or opening boundary to balance, got " +
                   figures + "; add an outflow or opening boundary where the flow may leave");
}

}  // namespace wallrans
