// Private PETSc options databases: a case's options reach only its own solvers (a second solver in
// the process does not inherit them, the process-wide database stays untouched), options nobody
// read are listed by name, and a value PETSc refuses is a one-line InputError naming the option.
#include <gtest/gtest.h>
#include <petscksp.h>

#include <algorithm>
#include <string>
#include <vector>

#include "core/case_spec.hpp"
#include "core/error.hpp"
#include "coupling/flow_solver.hpp"
#include "grid/boundary.hpp"
#include "linear/petsc_handles.hpp"
#include "linear/solver_options.hpp"
#include "unit/io/input_error_of.hpp"

using namespace wallrans;
using wallrans::test_support::input_error_of;

namespace {

// A lid-driven cavity of 16 x 16 cells (laminar, Re 100) with the given case-file options.
CaseSpec cavity(const std::string& petsc_options) {
  CaseSpec spec;
  spec.flow.kinematic_viscosity = 0.01;
  spec.grid.generator = GridGenerator::cavity;
  spec.grid.cells_x = spec.grid.cells_y = 16;
  BoundarySegmentSpec lid;
  lid.side = Side::top;
  lid.velocity = {1.0, 0.0};
  spec.boundaries.push_back(lid);
  for (const Side side : {Side::bottom, Side::left, Side::right}) {
    BoundarySegmentSpec wall;
    wall.side = side;
    spec.boundaries.push_back(wall);
  }
  spec.iterations.petsc_options = petsc_options;
  return spec;
}

// The KSP type a solver with `prefix` gets from `options`.
std::string ksp_type(const SolverOptions& options, const std::string& prefix) {
  OwnedKsp ksp;
  check_petsc(KSPCreate(PETSC_COMM_WORLD, ksp.out()));
  check_petsc(KSPSetOptionsPrefix(ksp.get(), prefix.c_str()));
  options.use("test solver", [&] { return KSPSetFromOptions(ksp.get()); });
  KSPType type = nullptr;
  check_petsc(KSPGetType(ksp.get(), &type));
  return type;
}

}  // namespace

TEST(SolverOptions, CaseOptionsStayInTheirOwnDatabase) {
  const SolverOptions first({"-pressure_ksp_type gmres", "a.yaml"}, {{"-pressure_ksp_type", "cg"}});
  const SolverOptions second({"", "b.yaml"}, {{"-pressure_ksp_type", "cg"}});
  EXPECT_EQ(ksp_type(first, "pressure_"), "gmres") << "the case file overrides the default";
  EXPECT_EQ(ksp_type(second, "pressure_"), "cg") << "the second solver keeps its default";
  PetscBool in_process_database = PETSC_TRUE;
  ASSERT_EQ(PetscOptionsHasName(nullptr, nullptr, "-pressure_ksp_type", &in_process_database), 0);
  EXPECT_FALSE(in_process_database) << "case options must not reach PETSc's process-wide database";
}

// The same through two real flow solvers in one process: the first case limits its pressure solve
// to one iteration; the second case, without options, must not inherit that limit.
TEST(SolverOptions, SecondFlowSolverDoesNotInheritTheFirstCasesOptions) {
  auto pressure_iterations = [](const CaseSpec& spec) {
    const Grid grid(PETSC_COMM_WORLD, generate_nodes(spec.grid), false);
    const BoundaryMap boundaries(spec, grid.nodes());
    LaminarModel model(grid);
    FlowSolver solver(spec, grid, boundaries, model);
    (void)solver.iterate();
    return solver.iterate().pressure_iterations;  // one pressure solve per outer iteration
  };
  const CaseSpec limited = cavity("-pressure_ksp_max_it 1");
  const CaseSpec plain = cavity("");
  EXPECT_EQ(pressure_iterations(limited), 1);
  // BoomerAMG-preconditioned CG to the default relative tolerance 1e-2 takes more than one
  // iteration on this system (it would be one only if the first case's limit leaked).
  EXPECT_GT(pressure_iterations(plain), 1);
}

TEST(SolverOptions, GivenOptionsThatNothingReadAreListedByName) {
  const SolverOptions options({"-momentum_ksp_typ gmres -momentum_ksp_rtol 1e-3", "case.yaml"},
                              {{"-momentum_ksp_type", "bcgs"}, {"-momentum_pc_type", "bjacobi"}});
  (void)ksp_type(options, "momentum_");
  const std::vector<std::string> unused = options.unused();
  EXPECT_EQ(unused, std::vector<std::string>{"-momentum_ksp_typ"})
      << "the misspelt option only: read options and defaults are not listed";
  EXPECT_EQ(options_used_by_none({&options, nullptr}), unused);
}

TEST(SolverOptions, ARefusedValueIsOneInputErrorNamingTheOptionAndWhereItWasGiven) {
  const SolverOptions bad_type({"-pressure_ksp_type nonsense", "case.yaml"}, {});
  const std::string type_message = input_error_of([&] { (void)ksp_type(bad_type, "pressure_"); });
  EXPECT_EQ(
      type_message,
      "case.yaml: key 'iterations.petsc_options': PETSc option '-pressure_ksp_type nonsense': expected a "
      "value PETSc accepts, got 'nonsense' (Unable to find requested KSP type nonsense)");
  const SolverOptions bad_number({"-pressure_ksp_rtol abc", "case.yaml"}, {});
  const std::string number_message = input_error_of([&] { (void)ksp_type(bad_number, "pressure_"); });
  EXPECT_NE(
      number_message.find("PETSc option '-pressure_ksp_rtol abc': expected a value PETSc accepts, got 'abc'"),
      std::string::npos)
      << number_message;
  EXPECT_EQ(number_message.find('\n'), std::string::npos);
  // Options PETSc cannot take in at all: an options file that does not exist.
  const std::string parse_message = input_error_of([] {
    (void)parse_petsc_options("-options_file /nonexistent/options.txt", case_options_source("case.yaml"));
  });
  EXPECT_EQ(
      parse_message.rfind("case.yaml: key 'iterations.petsc_options': expected PETSc options (-name [value] "
                          "...), got '-options_file /nonexistent/options.txt'",
                          0),
      0u)
      << parse_message;
}

// A user's -..._relax_type_all covers the three smoother legs: our defaults for them must go, or
// hypre would apply them after it and silently ignore the user's choice.
TEST(SolverOptions, RelaxTypeAllTakesBackTheDefaultsOfTheLegs) {
  const std::vector<std::pair<std::string, std::string>> defaults{
      {"-pressure_pc_hypre_boomeramg_relax_type_down", "SOR/Jacobi"},
      {"-pressure_pc_hypre_boomeramg_relax_type_up", "backward-SOR/Jacobi"},
      {"-pressure_pc_hypre_boomeramg_relax_type_coarse", "Gaussian-elimination"}};
  auto has = [](const SolverOptions& options, const std::string& name) {
    PetscBool found = PETSC_FALSE;
    options.use("query", [&] { return PetscOptionsHasName(nullptr, nullptr, name.c_str(), &found); });
    return found == PETSC_TRUE;
  };
  const SolverOptions plain({"", "a.yaml"}, defaults);
  const SolverOptions all({"-pressure_pc_hypre_boomeramg_relax_type_all Jacobi", "b.yaml"}, defaults);
  for (const char* leg : {"down", "up", "coarse"}) {
    const std::string name = std::string("-pressure_pc_hypre_boomeramg_relax_type_") + leg;
    EXPECT_TRUE(has(plain, name)) << name;
    EXPECT_FALSE(has(all, name)) << name;
  }
  EXPECT_TRUE(has(all, "-pressure_pc_hypre_boomeramg_relax_type_all"));
}
