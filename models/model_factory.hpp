// Builds the closure a case asks for.
#pragma once

#include <memory>

#include "core/case_spec.hpp"
#include "models/turbulence_model.hpp"

namespace wallrans {

/// Collective. Throws InputError (naming the case file and key) for an unknown model or a model
/// that needs a wall on a grid without one.
std::unique_ptr<TurbulenceModel> make_turbulence_model(const CaseSpec& spec, const Grid& grid,
                                                       const BoundaryMap& boundaries);

}  // namespace wallrans
