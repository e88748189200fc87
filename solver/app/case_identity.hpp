// Which case a run directory and its checkpoints belong to: a hash of the discrete problem, blind
// to the settings that only steer how a run gets to its answer.
#pragma once

#include <string>

#include "core/case_spec.hpp"

namespace wallrans {

/// Local. 16 hex digits: the FNV-1a hash (text_hash) of the resolved case with the settings that do
/// not change the converged discrete solution reset to their defaults: the case file's path, the
/// iteration controls (cap, residual drop, report cadence), the solution procedure (coupling,
/// relaxation factors and shares, pressure set-up cadence, PETSc options; the converged answer
/// does not depend on them, see DEVELOPERS.md, Face fluxes), and the `checkpoint` and `output`
/// sections. Everything else (flow, grid, boundaries, model, convection schemes) is the case.
std::string case_identity(const CaseSpec& spec);

}  // namespace wallrans
