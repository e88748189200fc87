// Test helper: builds grid, boundaries, the case's turbulence model and the solver for a spec,
// and iterates to convergence (or the iteration cap).
#pragma once

#include <memory>

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

/// Collective over `comm`. `setup` may install sources or boundary functions before iterating.
template <typename Setup>
CaseRun run_case_on(MPI_Comm comm, const CaseSpec& spec, Setup&& setup) {
  CaseRun run;
  run.grid = std::make_unique<Grid>(comm, generate_nodes(spec.grid), spec.periodic.axis == PeriodicAxis::x);
  run.boundaries = std::make_unique<BoundaryMap>(spec, run.grid->nodes());
  run.model = make_turbulence_model(spec, *run.grid, *run.boundaries);
  run.solver = std::make_unique<FlowSolver>(spec, *run.grid, *run.boundaries, *run.model);
  setup(*run.solver);
  do {
    run.status = run.solver->iterate();
    run.converged = run.solver->converged(run.status);
  } while (!run.converged && run.status.iteration < spec.iterations.max);
  return run;
}

template <typename Setup>
CaseRun run_case(const CaseSpec& spec, Setup&& setup) {
  return run_case_on(MPI_COMM_WORLD, spec, std::forward<Setup>(setup));
}

inline CaseRun run_case(const CaseSpec& spec) {
  return run_case(spec, [](FlowSolver&) {});
}

}  // namespace wallrans::test_support
