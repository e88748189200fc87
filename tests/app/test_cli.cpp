// The wallrans program end to end on bad input: every bad case file and command line must end
// with exit status 2, exactly one stderr line "wallrans: error: <file>[:<line>]: ... expected ...",
// and nothing written. Also `check`, `version` and the help of every command on good input.
#include <gtest/gtest.h>

#include <filesystem>
#include <stdexcept>
#include <string>
#include <vector>

#include "program_runner.hpp"

using namespace wallrans::test_support;
namespace fs = std::filesystem;

namespace {

constexpr int exit_bad_input = 2;
const std::string error_prefix = "wallrans: error: ";

// A valid case, one key per line so each can be located; the variants below change one thing.
const std::string good_case =
    "title: cli_case\n"
    "flow:\n"
    "  kinematic_viscosity: 0.01\n"
    "grid:\n"
    "  generator: cavity\n"
    "  cells: [8, 8]\n"
    "boundaries:\n"
    "  - {side: top, kind: wall, velocity: [1.0, 0.0]}\n"
    "  - {side: bottom, kind: wall}\n"
    "  - {side: left, kind: wall}\n"
    "  - {side: right, kind: wall}\n"
    "iterations:\n"
    "  max: 50\n"
    "  report_every: 0\n"
    "output:\n"
    "  directory: out_default\n";

// `text` with its only occurrence of `from` replaced by `to`.
std::string with(const std::string& text, const std::string& from, const std::string& to) {
  const auto at = text.find(from);
  if (at == std::string::npos || text.find(from, at + 1) != std::string::npos) {
    throw std::logic_error("test case template: '" + from + "' must occur exactly once");
  }
  return text.substr(0, at) + to + text.substr(at + from.size());
}

struct BadCase {
  std::string name;                   // the case file is <name>.yaml
  std::string text;                   // its content; not written when is_missing
  std::string line_marker;            // the message names the line containing this; "" = no line
  std::vector<std::string> mentions;  // the message must contain each (dotted key, other lines, ...)
  bool is_missing = false;            // the case file does not exist
};

void PrintTo(const BadCase& bad, std::ostream* out) { *out << bad.name; }

std::vector<BadCase> bad_cases() {
  std::vector<BadCase> cases;
  // A sibling key indented less than the previous mapping's entries is a YAML syntax error there.
  cases.push_back({"malformed_yaml", with(good_case, "grid:\n", " grid:\n"), " grid:", {"valid YAML"}});
  cases.push_back({"unknown_key",
                   with(good_case, "  cells: [8, 8]\n", "  cells: [8, 8]\n  smoothing: 3\n"),
                   "smoothing",
                   {"key 'grid.smoothing'", "unknown key"}});
  cases.push_back({"wrong_type",
                   with(good_case, "  max: 50\n", "  max: fifty\n"),
                   "max: fifty",
                   {"key 'iterations.max'", "an integer"}});
  cases.push_back({"negative_viscosity",
                   with(good_case, "0.01", "-0.01"),
                   "kinematic_viscosity",
                   {"key 'flow.kinematic_viscosity'", "> 0", "-0.01"}});
  cases.push_back(
      {"zero_cells", with(good_case, "[8, 8]", "[0, 8]"), "cells:", {"key 'grid.cells'", "[0, 8]"}});
  cases.push_back({"unknown_kind",
                   with(good_case, "kind: wall}\n  - {side: left", "kind: floor}\n  - {side: left"),
                   "floor",
                   {"key 'boundaries[1].kind'", "floor"}});
  {
    const std::string text = with(good_case, "  - {side: bottom, kind: wall}\n",
                                  "  - {side: bottom, kind: wall, to: 0.6}\n"
                                  "  - {side: bottom, kind: slip, from: 0.4}\n");
    // The later segment is reported at its own line and names the earlier one's line.
    cases.push_back(
        {"overlapping_segments",
         text,
         "from: 0.4",
         {"key 'boundaries[", "side 'bottom'", "line " + std::to_string(line_containing(text, "to: 0.6"))}});
  }
  cases.push_back({"uncovered_gap",
                   with(good_case, "  - {side: bottom, kind: wall}\n",
                        "  - {side: bottom, kind: wall, to: 0.4}\n"
                        "  - {side: bottom, kind: wall, from: 0.6}\n"),
                   "to: 0.4",  // reported at the first segment of the side
                   {"key 'boundaries'", "side 'bottom'"}});
  cases.push_back({"segment_on_periodic_side",
                   with(with(good_case, "generator: cavity", "generator: channel"), "boundaries:\n",
                        "periodic: {axis: x}\nboundaries:\n"),
                   "side: left",
                   {"key 'boundaries[2].side'", "periodic"}});
  cases.push_back(
      {"segment_covering_no_face",
       with(good_case, "  - {side: bottom, kind: wall}\n",
            "  - {side: bottom, kind: wall}\n  - {side: bottom, kind: slip, from: 2.0, to: 3.0}\n"),
       "from: 2.0",
       {"key 'boundaries[", "at least one face"}});
  // Two-sided clustering over 8 cells allows a first cell of at most 1/8 of the side.
  cases.push_back({"impossible_first_cell_height",
                   with(good_case, "  cells: [8, 8]\n", "  cells: [8, 8]\n  first_cell_height: 0.5\n"),
                   "grid:",  // reported at the grid section
                   {"key 'grid.first_cell_height'"}});
  // Solid regions: each bad one stops the run at its own line.
  auto with_solid = [](const std::string& text, const std::string& regions) {
    return with(text, "iterations:\n", "solid_regions:\n" + regions + "iterations:\n");
  };
  cases.push_back({"solid_index_beyond_the_grid",
                   with_solid(good_case, "  - {i: [2, 8], j: [0, 3]}\n"),
                   "i: [2, 8]",
                   {"key 'solid_regions[0].i'", "grid.cells_x = 8", "[2, 8]"}});
  cases.push_back({"solid_box_outside_the_grid",
                   with_solid(good_case, "  - {j: [0, 1]}\n  - {x: [1.5, 2.0], y: [0.0, 1.0]}\n"),
                   "x: [1.5, 2.0]",
                   {"key 'solid_regions[1]'", "at least one cell centre", "x 0 to 1"}});
  {
    // A channel with an inflow on the left; the solid block touches the inflow faces.
    const std::string flow_through =
        with(with(good_case, "  - {side: left, kind: wall}\n",
                  "  - {side: left, kind: inflow, velocity: [1.0, 0.0]}\n"),
             "  - {side: right, kind: wall}\n", "  - {side: right, kind: outflow}\n");
    cases.push_back(
        {"solid_covering_an_inflow_face",
         with_solid(flow_through, "  - {x: [0.0, 0.3], y: [0.0, 0.3]}\n"),
         "x: [0.0, 0.3]",
         {"key 'solid_regions[0]'", "inflow",
          "boundaries[2] (line " + std::to_string(line_containing(flow_through, "inflow")) + ")"}});
  }
  cases.push_back({"solid_leaving_no_fluid",
                   with_solid(good_case, "  - {j: [0, 3]}\n  - {j: [4, 7]}\n"),
                   "j: [0, 3]",  // reported at the first region
                   {"key 'solid_regions'", "at least one fluid cell"}});
  cases.push_back({"solid_cutting_the_fluid_in_two",
                   with_solid(good_case, "  - {i: [3, 4]}\n"),
                   "i: [3, 4]",
                   {"key 'solid_regions'", "one region connected through faces", "cut off"}});
  cases.push_back({"solid_region_without_a_range",
                   with_solid(good_case, "  - {}\n"),
                   "  - {}",
                   {"key 'solid_regions[0]'", "at least one of i, j"}});
  cases.push_back({"missing_case_file", "", "", {}, true});
  return cases;
}

bool has_one_line(const std::string& text) {
  return !text.empty() && text.back() == '\n' && text.find('\n') == text.size() - 1;
}

class BadCaseFile : public ::testing::TestWithParam<BadCase> {};

TEST_P(BadCaseFile, ExitsTwoWithOneLineAndWritesNothing) {
  const BadCase& bad = GetParam();
  const ScratchDirectory scratch("wallrans_cli_" + bad.name);
  const fs::path run_directory = scratch.path() / "run";
  fs::create_directories(run_directory);
  const std::string file = bad.name + ".yaml";
  if (!bad.is_missing) write_text(run_directory / file, bad.text);
  const auto before = snapshot(run_directory);

  const std::string output = "out_" + bad.name;
  const ProgramResult result =
      run_program(run_directory, {"run", file, "--output-dir", output}, scratch.path() / "logs", bad.name);

  EXPECT_EQ(result.exit_status, exit_bad_input);
  EXPECT_EQ(result.out, "");
  ASSERT_TRUE(has_one_line(result.err)) << result.err;
  const std::string& message = result.err;
  EXPECT_EQ(message.rfind(error_prefix, 0), 0u) << message;
  EXPECT_NE(message.find(file), std::string::npos) << message;
  if (!bad.line_marker.empty()) {
    const int line = line_containing(bad.text, bad.line_marker);
    ASSERT_GT(line, 0) << "marker not in the case text: " << bad.line_marker;
    EXPECT_NE(message.find(file + ":" + std::to_string(line) + ":"), std::string::npos) << message;
  }
  EXPECT_NE(message.find("expected"), std::string::npos) << message;
  for (const auto& mention : bad.mentions) EXPECT_NE(message.find(mention), std::string::npos) << mention;

  EXPECT_FALSE(fs::exists(run_directory / output));
  EXPECT_EQ(snapshot(run_directory), before) << "the failed run wrote or changed files";
}

INSTANTIATE_TEST_SUITE_P(Program, BadCaseFile, ::testing::ValuesIn(bad_cases()),
                         [](const ::testing::TestParamInfo<BadCase>& info) { return info.param.name; });

// Under MPI every rank validates the same input and fails; only rank 0 may print. The launcher adds
// its own report of the non-zero exit, so only the program's own lines ("wallrans...") are counted.
TEST(Program, BadCaseOnTwoRanksPrintsOneLineOnce) {
  const ScratchDirectory scratch("wallrans_cli_np2");
  const fs::path run_directory = scratch.path() / "run";
  BadCase bad;
  for (const auto& candidate : bad_cases()) {
    if (candidate.name == "overlapping_segments") bad = candidate;
  }
  ASSERT_FALSE(bad.text.empty());
  write_text(run_directory / "overlap.yaml", bad.text);
  const auto before = snapshot(run_directory);
  const std::vector<std::string> arguments = {"run", "overlap.yaml", "--output-dir", "out"};

  const ProgramResult serial = run_program(run_directory, arguments, scratch.path() / "logs", "np1");
  const ProgramResult parallel = run_program_mpi(2, run_directory, arguments, scratch.path() / "logs", "np2");

  EXPECT_EQ(parallel.exit_status, exit_bad_input);
  std::vector<std::string> program_lines;
  for (const auto& line : lines_of(parallel.err)) {
    if (line.rfind("wallrans", 0) == 0) program_lines.push_back(line);
  }
  ASSERT_EQ(program_lines.size(), 1u) << parallel.err;
  EXPECT_EQ(program_lines[0] + "\n", serial.err);
  EXPECT_EQ(parallel.out, "");
  EXPECT_FALSE(fs::exists(run_directory / "out"));
  EXPECT_EQ(snapshot(run_directory), before);
}

struct BadCommandLine {
  std::string name;
  std::vector<std::string> arguments;
  std::vector<std::string> mentions;
};

void PrintTo(const BadCommandLine& bad, std::ostream* out) { *out << bad.name; }

class BadArguments : public ::testing::TestWithParam<BadCommandLine> {};

TEST_P(BadArguments, ExitsTwoWithOneLineAndWritesNothing) {
  const BadCommandLine& bad = GetParam();
  const ScratchDirectory scratch("wallrans_cli_" + bad.name);
  const fs::path run_directory = scratch.path() / "run";
  // A valid case file, so a wrongly accepted command line would run and write out_default.
  write_text(run_directory / "good.yaml", good_case);
  const auto before = snapshot(run_directory);

  const ProgramResult result = run_program(run_directory, bad.arguments, scratch.path() / "logs", bad.name);

  EXPECT_EQ(result.exit_status, exit_bad_input);
  EXPECT_EQ(result.out, "");
  ASSERT_TRUE(has_one_line(result.err)) << result.err;
  EXPECT_EQ(result.err.rfind(error_prefix + "command line: ", 0), 0u) << result.err;
  EXPECT_NE(result.err.find("expected"), std::string::npos) << result.err;
  for (const auto& mention : bad.mentions) EXPECT_NE(result.err.find(mention), std::string::npos) << mention;
  EXPECT_EQ(snapshot(run_directory), before);
}

INSTANTIATE_TEST_SUITE_P(
    Program, BadArguments,
    ::testing::Values(
        BadCommandLine{"unknown_option", {"run", "good.yaml", "--bogus"}, {"'--bogus'"}},
        BadCommandLine{"non_numeric_iterations",
                       {"run", "good.yaml", "--max-iterations", "abc"},
                       {"--max-iterations", "'abc'"}},
        BadCommandLine{"negative_iterations", {"run", "good.yaml", "--max-iterations", "-1"}, {"'-1'"}},
        BadCommandLine{"option_without_value", {"run", "good.yaml", "--output-dir"}, {"--output-dir"}},
        BadCommandLine{"no_command", {}, {"command"}},
        BadCommandLine{"unknown_command", {"frobnicate", "good.yaml"}, {"'frobnicate'"}},
        BadCommandLine{"two_case_files", {"run", "good.yaml", "good.yaml"}, {"one case file"}},
        BadCommandLine{"no_case_file", {"check"}, {"one case file"}},
        BadCommandLine{
            "walltime_not_a_number", {"run", "good.yaml", "--walltime", "1h"}, {"--walltime", "'1h'"}},
        BadCommandLine{"walltime_zero", {"run", "good.yaml", "--walltime", "0"}, {"--walltime", "'0'"}},
        BadCommandLine{"walltime_without_value", {"run", "good.yaml", "--walltime"}, {"--walltime"}},
        BadCommandLine{"resume_and_restart",
                       {"run", "good.yaml", "--resume", "--restart", "x.h5"},
                       {"--resume", "--restart"}},
        BadCommandLine{
            "petsc_option_before_the_case", {"run", "-pressure_ksp_rtol", "1e-3"}, {"-pressure_ksp_rtol"}},
        BadCommandLine{"option_before_the_command", {"--quiet", "run", "good.yaml"}, {"'--quiet'"}},
        BadCommandLine{"write_grid_one_argument", {"write-grid", "good.yaml"}, {"write-grid", "got 1"}},
        BadCommandLine{
            "write_grid_option_of_run", {"write-grid", "good.yaml", "g.h5", "--quiet"}, {"'--quiet'"}},
        BadCommandLine{"version_with_an_argument", {"version", "now"}, {"'now'"}}),
    [](const ::testing::TestParamInfo<BadCommandLine>& info) { return info.param.name; });

TEST(Program, CheckDescribesValidCaseAndWritesNothing) {
  const ScratchDirectory scratch("wallrans_cli_check");
  const fs::path run_directory = scratch.path() / "run";
  write_text(run_directory / "good.yaml", good_case);
  const auto before = snapshot(run_directory);

  const ProgramResult result =
      run_program(run_directory, {"check", "good.yaml"}, scratch.path() / "logs", "check");

  EXPECT_EQ(result.exit_status, 0);
  EXPECT_EQ(result.err, "");
  EXPECT_NE(result.out.find("good.yaml"), std::string::npos) << result.out;
  EXPECT_NE(result.out.find("valid"), std::string::npos) << result.out;
  EXPECT_NE(result.out.find("8 x 8 cells"), std::string::npos) << result.out;
  EXPECT_EQ(snapshot(run_directory), before);
}

// Typed options: --walltime takes decimals like checkpoint.walltime, and PETSc options follow our
// own arguments (check makes every check of run and writes nothing).
TEST(Program, CheckAcceptsDecimalWalltimeAndPetscOptions) {
  const ScratchDirectory scratch("wallrans_cli_typed");
  const fs::path run_directory = scratch.path() / "run";
  write_text(run_directory / "good.yaml", good_case);
  const auto before = snapshot(run_directory);
  const ProgramResult result =
      run_program(run_directory,
                  {"check", "good.yaml", "--walltime", "2.5", "--max-iterations", "7", "--output-dir",
                   "elsewhere", "-pressure_ksp_rtol", "1e-3", "-turbulence_ksp_type", "gmres"},
                  scratch.path() / "logs", "typed");
  EXPECT_EQ(result.exit_status, 0) << result.err;
  EXPECT_EQ(result.err, "");
  EXPECT_NE(result.out.find("elsewhere"), std::string::npos) << result.out;
  EXPECT_EQ(snapshot(run_directory), before);
}

// The help of the program and of each command: exit 0, nothing on stderr, nothing written; the
// help of run and check lists every option, the PETSc prefixes and (run) the outputs.
TEST(Program, HelpOfEveryCommandListsItsOptions) {
  const ScratchDirectory scratch("wallrans_cli_help");
  const auto before = snapshot(scratch.path());
  const std::vector<std::string> run_options = {
      "--output-dir",      "--max-iterations", "--quiet",    "--restart",  "--resume",
      "--replace-results", "--walltime",       "-momentum_", "-pressure_", "-turbulence_"};
  const std::vector<std::string> outputs = {"summary.json", "progress.log",      "residuals.csv",
                                            "fields.pvd",   "wall.csv",          "profile_x",
                                            "checkpoint_",  "case.resolved.yaml"};
  struct Help {
    std::vector<std::string> arguments;
    std::vector<std::string> mentions;
  };
  std::vector<std::string> run_mentions = run_options;
  run_mentions.insert(run_mentions.end(), outputs.begin(), outputs.end());
  const std::vector<Help> helps = {
      {{"--help"}, {"run", "check", "write-grid", "version", "Exit codes"}},
      {{"-h"}, {"run", "check", "write-grid", "version"}},
      {{"run", "--help"}, run_mentions},
      {{"run", "configs/none.yaml", "--help"}, run_options},
      {{"check", "--help"}, run_options},
      {{"write-grid", "--help"}, {"CASE.yaml GRID.h5", "docs/grid-file.md"}},
      {{"version", "--help"}, {"version"}},
  };
  for (const Help& help : helps) {
    const ProgramResult result = run_program(scratch.path(), help.arguments, scratch.path() / "logs", "help");
    std::string label;
    for (const auto& a : help.arguments) label += a + " ";
    EXPECT_EQ(result.exit_status, 0) << label << result.err;
    EXPECT_EQ(result.err, "") << label;
    for (const auto& mention : help.mentions)
      EXPECT_NE(result.out.find(mention), std::string::npos) << label << ": no '" << mention << "' in\n"
                                                             << result.out;
  }
  fs::remove_all(scratch.path() / "logs");
  EXPECT_EQ(snapshot(scratch.path()), before);
}

TEST(Program, VersionPrintsTheBuildVersion) {
  const ScratchDirectory scratch("wallrans_cli_version");
  const ProgramResult result = run_program(scratch.path(), {"version"}, scratch.path() / "logs", "version");
  EXPECT_EQ(result.exit_status, 0);
  EXPECT_EQ(result.out, std::string("wallrans ") + WALLRANS_VERSION + "\n");
  EXPECT_EQ(result.err, "");
}

}  // namespace
