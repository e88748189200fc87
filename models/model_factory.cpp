#include "models/model_factory.hpp"

#include "core/error.hpp"
#include "models/baldwin_barth.hpp"
#include "models/k_equation.hpp"
#include "models/mixing_length.hpp"
#include "models/spalart_allmaras.hpp"
#include "models/wall_bounded_model.hpp"

namespace wallrans {

namespace {

[[noreturn]] void unknown_model(const CaseSpec& spec) {
  const std::string where = spec.source_file.empty() ? std::string("case") : spec.source_file;
  throw InputError(
      where + ":" + std::to_string(spec.turbulence.line) +
      ": key 'turbulence.model': expected laminar, mixing_length, k_equation, spalart_allmaras or "
      "baldwin_barth, got " +
      spec.turbulence.model);
}

}  // namespace

std::unique_ptr<TurbulenceModel> make_turbulence_model(const CaseSpec& spec, const Grid& grid,
                                                       const BoundaryMap& boundaries) {
  const std::string& model = spec.turbulence.model;
  if (model == "laminar") return std::make_unique<LaminarModel>(grid);
  if (model == "spalart_allmaras") return std::make_unique<SpalartAllmaras>(spec, grid, boundaries);
  if (model == "baldwin_barth") return std::make_unique<BaldwinBarth>(spec, grid, boundaries);
  if (model == "k_equation") return std::make_unique<KEquation>(spec, grid, boundaries);
  if (model == "mixing_length") return std::make_unique<MixingLength>(spec, grid, boundaries);
  unknown_model(spec);
}

void check_turbulence_model(const CaseSpec& spec, const BoundaryMap& boundaries) {
  const std::string& model = spec.turbulence.model;
  if (model == "laminar") return;
  if (model != "spalart_allmaras" && model != "baldwin_barth" && model != "k_equation" &&
      model != "mixing_length")
    unknown_model(spec);
  require_wall(spec, boundaries);
}

int transport_equations(const std::string& model) {
  return model == "spalart_allmaras" || model == "baldwin_barth" || model == "k_equation" ? 1 : 0;
}

}  // namespace wallrans
