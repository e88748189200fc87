// Test helper: builds grid, boundaries, closure (laminar unless asked otherwise) and solver for a
// spec and iterates to convergence (or the iteration cap).
#pragma once

#include <concepts>
#include <cstdio>
#include <cstdlib>
#include <memory>
#include <utility>

#include "coupling/flow_solver.hpp"
#include "grid/boundary.hpp"
#include "models/model_factory.hpp"

namespace wallrans::test_support {

struct CaseRun {
  std::unique_ptr<Grid> grid;
  std::unique_ptr<BoundaryMap> boundaries;
  std::unique_ptr<TurbulenceModel> model;
  std::unique_ptr<FlowSolver> solver;
  IterationStatus status;
  bool converged = false;
};

/// Which closure run_case builds: laminar (nu_t = 0, whatever the spec says) or the model the
/// spec names, through make_turbulence_model.
enum class Closure { laminar, from_spec };

/// Collective. `setup` may install sources or boundary functions before iterating.
template <typename Setup>
CaseRun run_case(const CaseSpec& spec, Closure closure, Setup&& setup) {
  CaseRun run;
  run.grid = std::make_unique<Grid>(MPI_COMM_WORLD, generate_nodes(spec.grid),
                                    spec.periodic.axis == PeriodicAxis::x);
  run.boundaries = std::make_unique<BoundaryMap>(spec, run.grid->nodes());
  if (closure == Closure::from_spec) {
    run.model = make_turbulence_model(spec, *run.grid, *run.boundaries);
  } else {
    run.model = std::make_unique<LaminarModel>(*run.grid);
  }
  run.solver = std::make_unique<FlowSolver>(spec, *run.grid, *run.boundaries, *run.model);
  setup(*run.solver);
  do {
    run.status = run.solver->iterate();
    run.converged = run.solver->converged(run.status);
    if (std::getenv("DBG") && (run.status.iteration % 50 == 0 || run.status.iteration < 30))
      std::printf("%d %g %g %g\n", run.status.iteration, run.status.normalised.u, run.status.normalised.v,
                  run.status.normalised.continuity);
  } while (!run.converged && run.status.iteration < spec.iterations.max);
  return run;
}

/// Collective. Laminar closure (the laminar verification cases).
template <typename Setup>
requires std::invocable<Setup&, FlowSolver&> CaseRun run_case(const CaseSpec& spec, Setup&& setup) {
  return run_case(spec, Closure::laminar, std::forward<Setup>(setup));
}

inline CaseRun run_case(const CaseSpec& spec, Closure closure = Closure::laminar) {
  return run_case(spec, closure, [](FlowSolver&) {});
}

}  // namespace wallrans::test_support
