// Set-up checks of cases that cannot have a steady solution whatever the iteration does.
#pragma once

#include "core/case_spec.hpp"
#include "grid/boundary.hpp"

namespace wallrans {

/// Local (same on every rank). In a domain without a pressure boundary (no outflow or opening:
/// closed or periodic), mass can only enter and leave through faces of prescribed velocity, so
/// their volume fluxes must sum to zero; otherwise continuity has no solution and the mass
/// residual stays at its start. Throws InputError naming the case file, the line of the first
/// segment with a prescribed flux and the net inflow.
void check_flux_balance(const CaseSpec& spec, const BoundaryMap& boundaries);

}  // namespace wallrans
