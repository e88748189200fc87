// Builds the closure a case asks for.
#pragma once

#include <memory>
#include <string>

#include "core/case_spec.hpp"
#include "models/turbulence_model.hpp"

namespace wallrans {

/// Collective. Throws InputError (naming the case file and key) for an unknown model or a model
/// that needs a wall on a grid without one.
std::unique_ptr<TurbulenceModel> make_turbulence_model(const CaseSpec& spec, const Grid& grid,
                                                       const BoundaryMap& boundaries);

/// Local. The checks of make_turbulence_model without building the model (which allocates its
/// fields and solver): the same InputError for an unknown model or a missing wall.
void check_turbulence_model(const CaseSpec& spec, const BoundaryMap& boundaries);

/// Local. The number of transport equations the closure `model` solves (0 for laminar, mixing
/// length and unknown names).
int transport_equations(const std::string& model);

}  // namespace wallrans
