#include "app/case_identity.hpp"

#include "io/case_loader.hpp"
#include "io/checkpoint.hpp"

namespace wallrans {

std::string case_identity(const CaseSpec& spec) {
  CaseSpec problem = spec;
  const IterationSpec defaults;
  problem.source_file.clear();
  problem.iterations.coupling = defaults.coupling;
  problem.iterations.max = defaults.max;
  problem.iterations.residual_drop = defaults.residual_drop;
  problem.iterations.relax_velocity = defaults.relax_velocity;
  problem.iterations.relax_pressure = defaults.relax_pressure;
  problem.iterations.relax_diffusive_part = defaults.relax_diffusive_part;
  problem.iterations.pressure_setup_every = defaults.pressure_setup_every;
  problem.iterations.coarse_grids = defaults.coarse_grids;
  problem.iterations.coarse_residual_drop = defaults.coarse_residual_drop;
  problem.iterations.coarse_max = defaults.coarse_max;
  problem.iterations.report_every = defaults.report_every;
  problem.iterations.petsc_options.clear();
  const TurbulenceSpec turbulence_defaults;
  problem.turbulence.relax = turbulence_defaults.relax;
  problem.turbulence.relax_diffusive_part = turbulence_defaults.relax_diffusive_part;
  problem.turbulence.line = 0;
  problem.grid.line = 0;
  for (auto& segment : problem.boundaries) segment.line = 0;
  problem.checkpoint = CheckpointSpec{};
  problem.output = OutputSpec{};
  return text_hash(resolved_case_yaml(problem));
}

}  // namespace wallrans
