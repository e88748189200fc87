// PETSc log stages of our own: one stage per name however often it is asked for, and scoped
// pushes that nest and pop in order, also when a std::optional switches from phase to phase.
#include <gtest/gtest.h>

#include <optional>

#include "core/error.hpp"
#include "linear/log_stage.hpp"

using namespace wallrans;

namespace {

PetscLogStage current_stage() {
  PetscStageLog log = nullptr;
  check_petsc(PetscLogGetStageLog(&log));
  int stage = -1;
  check_petsc(PetscStageLogGetCurrent(log, &stage));
  return stage;
}

}  // namespace

TEST(LogStage, OneStagePerName) {
  const PetscLogStage a = log_stage("wr_unit_a");
  EXPECT_GE(a, 0);
  EXPECT_EQ(log_stage("wr_unit_a"), a);  // a second registration would be a PETSc error
  EXPECT_NE(log_stage("wr_unit_b"), a);
}

TEST(LogStage, ScopesNestAndPop) {
  const PetscLogStage outside = current_stage();
  const PetscLogStage a = log_stage("wr_unit_a"), b = log_stage("wr_unit_b");
  {
    const ScopedLogStage outer(a);
    EXPECT_EQ(current_stage(), a);
    {
      const ScopedLogStage inner(b);
      EXPECT_EQ(current_stage(), b);
    }
    EXPECT_EQ(current_stage(), a);
  }
  EXPECT_EQ(current_stage(), outside);
}

TEST(LogStage, OptionalSwitchesPhases) {
  const PetscLogStage outside = current_stage();
  const PetscLogStage a = log_stage("wr_unit_a"), b = log_stage("wr_unit_b");
  {
    std::optional<ScopedLogStage> phase;
    phase.emplace(a);
    EXPECT_EQ(current_stage(), a);
    phase.emplace(b);  // pops a first: the stack does not grow
    EXPECT_EQ(current_stage(), b);
    phase.reset();
    EXPECT_EQ(current_stage(), outside);
    phase.emplace(a);
  }
  EXPECT_EQ(current_stage(), outside);
}
