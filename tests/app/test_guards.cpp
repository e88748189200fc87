// Guards of the real program before anything large is allocated or anything is written: grid sizes
// beyond 32-bit indices, runs that do not fit into memory (with the estimate checked against the
// measured peak resident set), and PETSc options (grid resizing, the grid's own prefix, options
// nobody used, values PETSc refuses).
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

#include <chrono>
#include <cmath>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <regex>
#include <string>
#include <vector>

#include "program_runner.hpp"
#include "run_fixtures.hpp"

namespace fs = std::filesystem;
using namespace wallrans::test_support;

namespace {

ProgramResult run_np2(const fs::path& dir, const std::vector<std::string>& args, const std::string& label) {
  return run_program_mpi(2, dir, args, dir / "logs", label);
}

ProgramResult run_np1(const fs::path& dir, const std::vector<std::string>& args, const std::string& label) {
  return run_program(dir, args, dir / "logs", label);
}

// `check` on 1 rank and `run` on 2 ranks of `case_file` with `extra` arguments must both exit 2
// with one line of the program containing `fragment`, and leave `dir` as it was (the logs aside).
void expect_refused(const fs::path& dir, const std::string& case_file, const std::vector<std::string>& extra,
                    const std::string& fragment) {
  const auto before = snapshot(dir);
  for (const char* command : {"check", "run"}) {
    std::vector<std::string> args{command, case_file, "--output-dir", "run"};
    args.insert(args.end(), extra.begin(), extra.end());
    const auto result =
        command == std::string("run") ? run_np2(dir, args, "run") : run_np1(dir, args, "check");
    EXPECT_EQ(result.exit_status, 2) << command << ": " << result.out << result.err;
    const auto lines = program_lines(result.err);
    ASSERT_EQ(lines.size(), 1u) << command << ": " << result.err;
    EXPECT_NE(lines[0].find(fragment), std::string::npos) << command << ": " << lines[0];
    EXPECT_EQ(result.err.find("PETSC ERROR"), std::string::npos) << result.err;
    auto after = snapshot(dir);
    std::erase_if(after, [](const auto& entry) { return entry.first.rfind("logs", 0) == 0; });
    auto expected = before;
    std::erase_if(expected, [](const auto& entry) { return entry.first.rfind("logs", 0) == 0; });
    EXPECT_EQ(after, expected) << command << " wrote something";
  }
}

double mem_available_bytes() {
  std::ifstream in("/proc/meminfo");
  std::string name;
  double kib = 0.0;
  while (in >> name >> kib) {
    if (name == "MemAvailable:") return kib * 1024.0;
    in.ignore(1 << 20, '\n');
  }
  return 0.0;
}

// Peak resident set [B] of each rank of `wallrans args` on `ranks` ranks, measured by
// bench/peak_rss.py (getrusage of the wrapped process); `out` gets the program's stdout.
std::vector<double> peak_resident(const fs::path& dir, int ranks, const std::vector<std::string>& args,
                                  const std::string& label, std::string& out) {
  const std::string prefix = (dir / ("rss_" + label)).string();
  std::vector<std::string> command{"-n",
                                   std::to_string(ranks),
                                   "/usr/bin/python3",
                                   std::string(WALLRANS_SOURCE_DIR) + "/bench/peak_rss.py",
                                   prefix,
                                   WALLRANS_PROGRAM};
  command.insert(command.end(), args.begin(), args.end());
  const auto result = run_executable(WALLRANS_MPIEXEC, dir, command, dir / "logs", label);
  out = result.out;
  std::vector<double> bytes;
  for (int r = 0; r < ranks; ++r)
    bytes.push_back(std::atof(read_text(prefix + "." + std::to_string(r)).c_str()) * 1024.0);
  return bytes;
}

}  // namespace

TEST(Guards, AbsurdCellCountIsRefusedBeforeAnyAllocation) {
  ScratchDirectory scratch("wallrans_guard_cells");
  write_text(scratch.path() / "huge.yaml", cavity_case("huge", 200000, 1e-6, 10));
  expect_refused(
      scratch.path(), "huge.yaml", {},
      "huge.yaml:3: key 'grid.cells': expected at most 429496729 cells in all (PETSc's 32-bit indices "
      "address 5 matrix entries per cell), got 200000 x 200000 = 4e+10 cells");
}

TEST(Guards, RunThatCannotFitIntoMemoryIsRefusedWithTheEstimateAndWhatIsAvailable) {
  // 4e8 cells need several hundred GiB (about 1.8 kB per cell); a host with more cannot refuse.
  if (mem_available_bytes() > 400e9) GTEST_SKIP() << "this host has more than 400 GB available";
  ScratchDirectory scratch("wallrans_guard_memory");
  write_text(scratch.path() / "big.yaml", cavity_case("big", 20000, 1e-6, 10));
  const auto start = std::chrono::steady_clock::now();
  expect_refused(scratch.path(), "big.yaml", {},
                 "big.yaml:3: key 'grid.cells': expected a grid whose run fits into memory, got 4e+08 cells "
                 "needing about ");
  // Before the guard, `check` of this case took 67 s and 17 GB; now nothing is allocated, so the
  // four program starts (about half a second each) stay far below that.
  EXPECT_LT(std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count(), 30.0);
  const auto result = run_np1(scratch.path(), {"check", "big.yaml", "--output-dir", "run"}, "again");
  EXPECT_TRUE(
      std::regex_search(result.err, std::regex(R"(more on host \S+ \(1 rank\(s\) of about [0-9.]+ GiB, )"
                                               R"(\d+ B per cell\) with [0-9.]+ [kMGT]?i?B available )"
                                               R"(\((MemAvailable|cgroup limit .*)\); use more hosts)")))
      << result.err;
}

// The estimate that `check` prints against the peak resident set of the run it describes (2 ranks,
// a cavity of 512 x 512 cells, 3 iterations with nested start and outputs). Tolerance 15%: the
// estimate's parts come from one heap profile, and the per-cell slopes measured for other cases
// spread by 6% either way (1752 to 1955 B per cell) with the fixed part between 60 and 64 MiB;
// 15% is that spread with margin for the allocator. `check` builds the grid but no solver: its
// grid (390 of about 1900 B per cell) and the fixed part come to about a third of the run's peak
// (64 + 28 against 64 + 250 MiB per rank), so it must stay below half of it.
TEST(Guards, MemoryEstimateAgreesWithThePeakResidentSetAndCheckBuildsNoSolver) {
  ScratchDirectory scratch("wallrans_guard_estimate");
  write_text(scratch.path() / "cavity.yaml", cavity_case("cavity", 512, 1e-300, 3));
  std::string check_out, run_out;
  const auto check =
      peak_resident(scratch.path(), 2, {"check", "cavity.yaml", "--output-dir", "run"}, "check", check_out);
  const auto run = peak_resident(scratch.path(), 2, {"run", "cavity.yaml", "--output-dir", "run", "--quiet"},
                                 "run", run_out);
  std::smatch match;
  ASSERT_TRUE(
      std::regex_search(check_out, match, std::regex(R"(memory \(estimate\): about ([0-9.]+) MiB per rank)")))
      << check_out;
  const double estimate = std::stod(match[1]) * 1024.0 * 1024.0;
  for (size_t r = 0; r < run.size(); ++r) {
    ASSERT_GT(run[r], 0.0) << "no measurement of rank " << r;
    EXPECT_LT(std::abs(estimate - run[r]) / run[r], 0.15)
        << "rank " << r << ": estimate " << estimate / 1048576 << " MiB, measured " << run[r] / 1048576
        << " MiB";
    EXPECT_LT(check[r], 0.5 * run[r])
        << "check " << check[r] / 1048576 << " MiB against run " << run[r] / 1048576;
  }
  std::printf("estimate %.1f MiB per rank; measured peaks: run %.1f / %.1f MiB, check %.1f / %.1f MiB\n",
              estimate / 1048576, run[0] / 1048576, run[1] / 1048576, check[0] / 1048576, check[1] / 1048576);
}

TEST(PetscOptions, OptionsThatWouldResizeTheGridAreRefusedBeforeAnythingIsWritten) {
  ScratchDirectory scratch("wallrans_options_grid");
  write_text(scratch.path() / "cavity.yaml", cavity_case("cavity", 16, 1e-300, 3));
  const std::string expected =
      "': expected no option that changes the grid (its cells and nodes come from the case "
      "file, key 'grid'), got one that resizes or reshapes it";
  expect_refused(scratch.path(), "cavity.yaml", {"-da_refine", "1"},
                 "command line: PETSc option '-da_refine 1" + expected);
  expect_refused(scratch.path(), "cavity.yaml", {"-da_grid_x", "200"},
                 "command line: PETSc option '-da_grid_x 200" + expected);
  expect_refused(scratch.path(), "cavity.yaml", {"-grid_da_refine_y", "2"},
                 "command line: PETSc option '-grid_da_refine_y 2" + expected);
  expect_refused(
      scratch.path(), "cavity.yaml", {"-da_processors_x", "2"},
      "command line: PETSc option '-da_processors_x 2': expected grid options with the grid's prefix -grid_");
  write_text(scratch.path() / "in_case.yaml",
             std::regex_replace(cavity_case("in_case", 16, 1e-300, 3), std::regex("report_every: 0"),
                                "report_every: 0, petsc_options: \"-da_grid_x 200\""));
  expect_refused(scratch.path(), "in_case.yaml", {},
                 "in_case.yaml: key 'iterations.petsc_options': PETSc option '-da_grid_x 200" + expected);
}

// The grid's own prefix reaches the grid: the decomposition it asks for is the one the pieces of
// the fields show (2 ranks split the 24 x 24 cells in x or in y).
TEST(PetscOptions, TheGridReadsItsOwnPrefix) {
  ScratchDirectory scratch("wallrans_options_prefix");
  write_text(scratch.path() / "cavity.yaml", cavity_case("cavity", 24, 1e-300, 2));
  for (const auto& [px, py] : {std::pair{"2", "1"}, std::pair{"1", "2"}}) {
    const std::string out = std::string("split_") + px + py;
    const auto result = run_np2(
        scratch.path(),
        {"run", "cavity.yaml", "--output-dir", out, "-grid_da_processors_x", px, "-grid_da_processors_y", py},
        out);
    ASSERT_EQ(result.exit_status, 3) << result.err;
    EXPECT_EQ(result.out.find("nobody used"), std::string::npos) << result.out;
    // The first piece's extent (nodes) in the index file: "0 12 0 24 0 0" for a split in x.
    std::smatch match;
    const std::string index = read_text(scratch.path() / out / "fields.pvts");
    ASSERT_TRUE(std::regex_search(index, match, std::regex(R"(<Piece Extent="(\d+) (\d+) (\d+) (\d+))")))
        << index;
    EXPECT_EQ(std::stoi(match[2]) - std::stoi(match[1]), std::string(px) == "2" ? 12 : 24) << index;
    EXPECT_EQ(std::stoi(match[4]) - std::stoi(match[3]), std::string(py) == "2" ? 12 : 24) << index;
  }
}

TEST(PetscOptions, OptionsNobodyUsedAreNamedInAWarningOnTheTerminalAndInTheSummary) {
  ScratchDirectory scratch("wallrans_options_unused");
  write_text(scratch.path() / "cavity.yaml",
             std::regex_replace(
                 cavity_case("cavity", 16, 1e-300, 3), std::regex("report_every: 0"),
                 "report_every: 0, petsc_options: \"-momentum_ksp_typ gmres -pressure_ksp_rtol 1e-3\""));
  const std::vector<std::string> options{"-pressure_ksp_rtoll",  "1e-3", "-momentum_ksp_max_it", "50",
                                         "-turbulence_ksp_type", "gmres"};
  // -turbulence_ksp_type is spelt right, but a laminar case has no model equation to solve.
  const std::string warning =
      "PETSc option(s) nobody used: -momentum_ksp_typ, -pressure_ksp_rtoll, -turbulence_ksp_type (misspelt, "
      "or meant "
      "for a solver this case does not have)";
  std::vector<std::string> run{"run", "cavity.yaml", "--output-dir", "run"};
  run.insert(run.end(), options.begin(), options.end());
  const auto result = run_np2(scratch.path(), run, "run");
  EXPECT_EQ(result.exit_status, 3) << result.err;
  EXPECT_NE(result.out.find("wallrans: warning: " + warning + "\n"), std::string::npos) << result.out;
  const auto summary = nlohmann::json::parse(read_text(scratch.path() / "run" / "summary.json"));
  EXPECT_EQ(summary["warnings"], nlohmann::json::array({warning})) << summary.dump(2);
  std::vector<std::string> check{"check", "cavity.yaml", "--output-dir", "fresh"};
  check.insert(check.end(), options.begin(), options.end());
  const auto checked = run_np1(scratch.path(), check, "check");
  EXPECT_EQ(checked.exit_status, 0) << checked.err;
  EXPECT_NE(checked.out.find("  warning: " + warning + "\n"), std::string::npos) << checked.out;
}

TEST(PetscOptions, AValuePetscRefusesIsOneLineAndExitTwoBeforeAnythingIsWritten) {
  ScratchDirectory scratch("wallrans_options_values");
  write_text(scratch.path() / "cavity.yaml", cavity_case("cavity", 16, 1e-300, 3));
  expect_refused(
      scratch.path(), "cavity.yaml", {"-pressure_ksp_type", "nonsense"},
      "command line: PETSc option '-pressure_ksp_type nonsense': expected a value PETSc accepts, got "
      "'nonsense' (Unable to find requested KSP type nonsense)");
  // Read only when the block-Jacobi preconditioner sets up its sub-solver (the first solve).
  expect_refused(
      scratch.path(), "cavity.yaml", {"-momentum_sub_pc_type", "foo"},
      "command line: PETSc option '-momentum_sub_pc_type foo': expected a value PETSc accepts, got 'foo'");
  expect_refused(
      scratch.path(), "cavity.yaml", {"-pressure_pc_hypre_boomeramg_relax_type_all", "foo"},
      "command line: PETSc option '-pressure_pc_hypre_boomeramg_relax_type_all foo': expected a value "
      "PETSc accepts, got 'foo' (Unknown option foo for -pressure_pc_hypre_boomeramg_relax_type_all.");
  write_text(scratch.path() / "bad_number.yaml",
             std::regex_replace(cavity_case("bad_number", 16, 1e-300, 3), std::regex("report_every: 0"),
                                "report_every: 0, petsc_options: \"-momentum_ksp_rtol abc\""));
  expect_refused(
      scratch.path(), "bad_number.yaml", {},
      "bad_number.yaml: key 'iterations.petsc_options': PETSc option '-momentum_ksp_rtol abc': expected "
      "a value PETSc accepts, got 'abc' (Input string abc has no numeric value)");
}
