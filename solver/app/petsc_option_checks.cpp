// PETSc options checked before the grid and the solvers are built: grid options by name, solver
// options by trying them on a small system with the solvers' own defaults.
#include "app/petsc_option_checks.hpp"

#include <petscksp.h>

#include <algorithm>
#include <array>

#include "core/error.hpp"
#include "coupling/flow_solver.hpp"
#include "linear/petsc_handles.hpp"
#include "linear/solver_options.hpp"
#include "models/model_factory.hpp"
#include "models/scalar_transport.hpp"

namespace wallrans {

namespace {

bool starts_with(const std::string& text, const char* prefix) { return text.rfind(prefix, 0) == 0; }

// Option names (without '-' and the grid prefix) with which the DMDA would change its size, shape,
// boundary types or ghost layers behind the node coordinates.
bool reshapes_grid(const std::string& name) {
  constexpr std::array<const char*, 8> families{"da_grid_", "da_refine", "da_overlap", "da_stencil",
                                                "da_dof",   "da_bd_",    "dm_refine",  "dm_coarsen"};
  return std::any_of(families.begin(), families.end(), [&](const char* f) { return starts_with(name, f); });
}

void check_grid_option(const GivenOption& option) {
  const std::string shown = option.name + (option.value.empty() ? "" : " " + option.value);
  const std::string head = option.source + ": PETSc option '" + shown + "': expected ";
  const bool is_prefixed = starts_with(option.name, "-grid_");
  const std::string name = option.name.substr(is_prefixed ? 6 : 1);
  if (!is_prefixed && !starts_with(name, "da_") && !starts_with(name, "dm_")) return;
  if (reshapes_grid(name)) {
    throw InputError(head +
                     "no option that changes the grid (its cells and nodes come from the case file, key " +
                     "'grid'), got one that resizes or reshapes it");
  }
  if (is_prefixed && (name == "dm_mat_type" || name == "dm_vec_type")) {
    throw InputError(head + "the grid's matrix and vector types unchanged (wallrans fills 5-point AIJ " +
                     "matrices itself), got another type");
  }
  if (!is_prefixed) {
    throw InputError(head +
                     "grid options with the grid's prefix -grid_ (e.g. -grid_da_processors_x 2), got one " +
                     "that reaches nothing");
  }
}

// Collective. Sets up and runs a solver with options prefix `prefix` on a tridiagonal system of
// two unknowns per rank (symmetric positive definite, so CG and AMG apply) with `options`.
void probe(MPI_Comm comm, const SolverOptions& options, const std::string& prefix, const std::string& what) {
  int rank = 0, size = 1;
  check_mpi(MPI_Comm_rank(comm, &rank));
  check_mpi(MPI_Comm_size(comm, &size));
  const PetscInt n_local = 2, n = n_local * size, first = n_local * rank;
  OwnedMat a;
  check_petsc(MatCreateAIJ(comm, n_local, n_local, n, n, 3, nullptr, 1, nullptr, a.out()));
  for (PetscInt row = first; row < first + n_local; ++row) {
    check_petsc(MatSetValue(a.get(), row, row, 2.0, INSERT_VALUES));
    if (row > 0) check_petsc(MatSetValue(a.get(), row, row - 1, -1.0, INSERT_VALUES));
    if (row + 1 < n) check_petsc(MatSetValue(a.get(), row, row + 1, -1.0, INSERT_VALUES));
  }
  check_petsc(MatAssemblyBegin(a.get(), MAT_FINAL_ASSEMBLY));
  check_petsc(MatAssemblyEnd(a.get(), MAT_FINAL_ASSEMBLY));
  OwnedVec b, x;
  check_petsc(MatCreateVecs(a.get(), x.out(), b.out()));
  check_petsc(VecSet(b.get(), 1.0));
  OwnedKsp ksp;
  check_petsc(KSPCreate(comm, ksp.out()));
  check_petsc(KSPSetOptionsPrefix(ksp.get(), prefix.c_str()));
  check_petsc(KSPSetOperators(ksp.get(), a.get(), a.get()));
  options.use(what, [&] {
    PetscErrorCode code = KSPSetFromOptions(ksp.get());
    return code ? code : KSPSolve(ksp.get(), b.get(), x.get());
  });
}

}  // namespace

void check_grid_options(const CaseSpec& spec) {
  for (const GivenOption& option : command_line_options()) check_grid_option(option);
  for (const GivenOption& option :
       parse_petsc_options(spec.iterations.petsc_options, case_options_source(spec.source_file)))
    check_grid_option(option);
}

std::vector<std::string> probe_solver_options(MPI_Comm comm, const CaseSpec& spec) {
  const CaseOptionsText text{spec.iterations.petsc_options, spec.source_file};
  const SolverOptions flow(text, FlowSolver::default_options());
  probe(comm, flow, "momentum_", "momentum solver");
  probe(comm, flow, "pressure_", "pressure solver");
  if (transport_equations(spec.turbulence.model) == 0) return options_used_by_none({&flow});
  const SolverOptions model(text, ScalarTransport::default_options("turbulence_"));
  probe(comm, model, "turbulence_", "turbulence-model solver");
  return options_used_by_none({&flow, &model});
}

std::string unused_options_warning(const std::vector<std::string>& names) {
  if (names.empty()) return "";
  std::string list;
  for (const std::string& name : names) list += (list.empty() ? "" : ", ") + name;
  return "PETSc option(s) nobody used: " + list +
         " (misspelt, or meant for a solver this case does not have)";
}

}  // namespace wallrans
