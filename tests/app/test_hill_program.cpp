// The periodic hill held at a flow rate, run by the program on 2 ranks (64 x 32 with the nested
// start, which carries the gradient from grid to grid): the converged gradient and bulk velocity in
// summary.json and on the terminal, and the mass balance there.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdlib>
#include <string>

#include "hill_case_text.hpp"
#include "program_runner.hpp"

using namespace wallrans::test_support;

namespace {

// The number after "key": in a JSON text; NaN if absent.
double json_value(const std::string& json, const std::string& key) {
  const size_t at = json.find("\"" + key + "\": ");
  if (at == std::string::npos) return std::nan("");
  return std::strtod(json.c_str() + at + key.size() + 4, nullptr);
}

}  // namespace

TEST(HillProgram, SummaryReportsTheConvergedGradientAndTheHeldBulkVelocity) {
  ScratchDirectory scratch("wallrans_hill_program");
  write_text(
      scratch.path() / "hill.yaml",
      hill_case_text({{"cells:", "[64, 32]"}, {"first_cell_height:", "3.0e-3"}, {"coarse_grids:", "2"}}));
  const ProgramResult run = run_program_mpi(2, scratch.path(), {"run", "hill.yaml", "--output-dir", "run"},
                                            scratch.path() / "logs", "hill");
  ASSERT_EQ(run.exit_status, 0) << run.out << run.err;
  const std::string summary = read_text(scratch.path() / "run" / "summary.json");
  SCOPED_TRACE(summary);
  // Held to 1e-6 (issue 8); the controller sets the mean over the sections each iteration, and
  // the crest section differs from it by the cells' mass imbalance (below 1e-10 of the flow).
  EXPECT_NEAR(json_value(summary, "bulk_velocity"), 1.0, 1e-6);
  EXPECT_EQ(json_value(summary, "target_bulk_velocity"), 1.0);
  EXPECT_NEAR(json_value(summary, "section_height"), 2.035, 1e-9);  // 3.035 h - h above the crest
  EXPECT_LT(json_value(summary, "mean_pressure_gradient"), 0.0);    // driven in +x
  EXPECT_EQ(json_value(summary, "net_outflow"), 0.0);
  EXPECT_LT(json_value(summary, "cells_abs_sum_relative"), 1e-10);  // issue 8, at convergence
  EXPECT_NE(run.out.find("wallrans: periodic driving: mean pressure gradient dp/dx = "), std::string::npos)
      << run.out;
  EXPECT_NE(run.out.find("wallrans: coarse grid 16 x 8"), std::string::npos) << run.out;
}
