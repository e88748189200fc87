// Checkpoint and restart end to end with the real program: bit-identical continuation,
// restarts across rank counts, a kill in the middle of writing, SIGTERM, bad checkpoints.
#include <gtest/gtest.h>
#include <signal.h>
#include <vtkCellData.h>
#include <vtkDataArray.h>
#include <vtkNew.h>
#include <vtkStructuredGrid.h>
#include <vtkXMLPStructuredGridReader.h>

#include <cmath>
#include <filesystem>
#include <string>
#include <vector>

#include "hill_case_text.hpp"
#include "io/csv_writer.hpp"
#include "program_runner.hpp"

namespace fs = std::filesystem;
using namespace wallrans::test_support;

namespace {

// The shipped SA channel at Re_tau 180 (4 x 128 cells; about 6000 iterations to converge).
const std::string channel_case = std::string(WALLRANS_SOURCE_DIR) + "/configs/channel_sa_re180.yaml";

std::vector<double> cell_array(const fs::path& pvts, const char* name) {
  vtkNew<vtkXMLPStructuredGridReader> reader;
  reader->SetFileName(pvts.string().c_str());
  reader->Update();
  vtkDataArray* array = reader->GetOutput()->GetCellData()->GetArray(name);
  std::vector<double> values;
  if (array == nullptr) return values;
  for (vtkIdType k = 0; k < array->GetNumberOfTuples(); ++k)
    for (int c = 0; c < array->GetNumberOfComponents(); ++c) values.push_back(array->GetComponent(k, c));
  return values;
}

ProgramResult run_mpi(int ranks, const fs::path& dir, const std::vector<std::string>& args,
                      const std::string& label, const std::string& environment = "") {
  return run_program_mpi(ranks, dir, args, dir / "logs", label, environment);
}

}  // namespace

TEST(Restart, StraightAndRestartedRunsAreBitIdentical) {
  ScratchDirectory scratch("wallrans_restart_bits");
  // 2N = 66 iterations straight, and N = 33 + restart + 33, on 2 ranks. 33 is off the pressure
  // preconditioner's rebuild cadence (every 10 iterations), so the restart must rebuild it from
  // the saved coefficients of iteration 31.
  auto straight = run_mpi(
      2, scratch.path(),
      {"run", channel_case, "--output-dir", "straight", "--max-iterations", "66", "--quiet"}, "straight");
  ASSERT_EQ(straight.exit_status, 3) << straight.err;  // iteration cap
  auto first =
      run_mpi(2, scratch.path(),
              {"run", channel_case, "--output-dir", "split", "--max-iterations", "33", "--quiet"}, "first");
  ASSERT_EQ(first.exit_status, 3) << first.err;
  ASSERT_TRUE(
      fs::exists(scratch.path() / "split" / "checkpoint_33.h5"));  // written at the end of a capped run
  // The cap counts the iterations of this run: 33 more.
  auto second = run_mpi(2, scratch.path(),
                        {"run", channel_case, "--output-dir", "split", "--max-iterations", "33", "--quiet",
                         "--restart", "split/checkpoint_33.h5"},
                        "second");
  ASSERT_EQ(second.exit_status, 3) << second.err;
  for (const char* name : {"velocity", "pressure", "eddy_viscosity", "nu_tilde"}) {
    const auto a = cell_array(scratch.path() / "straight" / "fields.pvts", name);
    const auto b = cell_array(scratch.path() / "split" / "fields.pvts", name);
    ASSERT_FALSE(a.empty()) << name;
    ASSERT_EQ(a.size(), b.size()) << name;
    size_t differing = 0;
    for (size_t k = 0; k < a.size(); ++k) differing += a[k] != b[k] ? 1 : 0;  // to the last bit
    EXPECT_EQ(differing, 0u) << name;
  }
  // The history of the restarted run continues the first part: iterations 1..66 once each.
  const auto history = wallrans::read_csv((scratch.path() / "split" / "residuals.csv").string());
  ASSERT_EQ(history.rows.size(), 66u);
  for (size_t k = 0; k < history.rows.size(); ++k) EXPECT_EQ(history.rows[k][0], double(k + 1));
}

TEST(Restart, AcrossRankCountsConvergesToTheSameSolution) {
  ScratchDirectory scratch("wallrans_restart_ranks");
  auto reference =
      run_mpi(1, scratch.path(), {"run", channel_case, "--output-dir", "reference", "--quiet"}, "reference");
  ASSERT_EQ(reference.exit_status, 0) << reference.err;
  for (const auto& [from, to] : {std::pair{2, 1}, std::pair{1, 2}}) {
    const std::string dir = "from" + std::to_string(from) + "to" + std::to_string(to);
    auto part =
        run_mpi(from, scratch.path(),
                {"run", channel_case, "--output-dir", dir, "--max-iterations", "300", "--quiet"}, dir + "_a");
    ASSERT_EQ(part.exit_status, 3) << part.err;
    auto rest = run_mpi(
        to, scratch.path(),
        {"run", channel_case, "--output-dir", dir, "--quiet", "--restart", dir + "/checkpoint_300.h5"},
        dir + "_b");
    ASSERT_EQ(rest.exit_status, 0) << rest.err;
    const auto a = cell_array(scratch.path() / "reference" / "fields.pvts", "velocity");
    const auto b = cell_array(scratch.path() / dir / "fields.pvts", "velocity");
    ASSERT_EQ(a.size(), b.size());
    double worst = 0;
    for (size_t k = 0; k < a.size(); ++k) worst = std::max(worst, std::abs(a[k] - b[k]));
    // Both converged to the case's residual drop 1e-8; velocities ~20 u_tau agree to 1e-5 u_tau.
    EXPECT_LT(worst, 1e-5) << dir;
  }
}

TEST(Restart, KillDuringCheckpointLeavesThePreviousOneIntact) {
  ScratchDirectory scratch("wallrans_restart_kill");
  // Checkpoints every 20 iterations; the test-only switch kills every rank after 3 datasets of
  // the checkpoint of iteration 40.
  write_text(scratch.path() / "every20.yaml", read_text(channel_case) + "checkpoint: {every: 20, keep: 5}\n");
  auto killed = run_mpi(2, scratch.path(),
                        {"run", "every20.yaml", "--output-dir", "run", "--max-iterations", "100", "--quiet"},
                        "killed", "WALLRANS_TEST_KILL_IN_CHECKPOINT=40:3");
  EXPECT_NE(killed.exit_status, 0);
  EXPECT_NE(killed.exit_status, 3);
  EXPECT_TRUE(fs::exists(scratch.path() / "run" / "checkpoint_20.h5"));
  EXPECT_FALSE(fs::exists(scratch.path() / "run" / "checkpoint_40.h5"));
  auto resumed = run_mpi(2, scratch.path(),
                         {"run", "every20.yaml", "--output-dir", "run", "--max-iterations", "25", "--quiet",
                          "--restart", "run/checkpoint_20.h5"},
                         "resumed");
  EXPECT_EQ(resumed.exit_status, 3) << resumed.err;
}

TEST(Restart, SigtermWritesARestartableCheckpointAndExitsFive) {
  ScratchDirectory scratch("wallrans_restart_sigterm");
  const fs::path out = scratch.path() / "run";
  BackgroundProgram run(program_command({"run", channel_case, "--output-dir", out.string(), "--quiet"}),
                        scratch.path(), scratch.path() / "logs", "sigterm");
  // Wait until the run is well under way (history rows appear), then send what a scheduler sends.
  ASSERT_TRUE(wait_until([&] { return history_rows(out) > 50; }, 60));
  ASSERT_TRUE(run.signal(SIGTERM));
  const auto stopped = run.wait();
  EXPECT_EQ(stopped.exit_status, 5) << stopped.err;  // documented: stopped with a checkpoint
  int checkpoints = 0;
  std::string newest;
  for (const auto& entry : fs::directory_iterator(out)) {
    if (entry.path().extension() == ".h5") {
      ++checkpoints;
      newest = entry.path().string();
    }
  }
  ASSERT_EQ(checkpoints, 1);
  EXPECT_NE(read_text(out / "summary.json").find("\"stopped_early\": true"), std::string::npos);
  EXPECT_EQ(json_field(out / "summary.json", "status"), "stopped");
  auto resumed = run_program(
      scratch.path(),
      {"run", channel_case, "--output-dir", "run", "--quiet", "--restart", newest, "--max-iterations", "80"},
      scratch.path() / "logs", "resumed");
  EXPECT_TRUE(resumed.exit_status == 3 || resumed.exit_status == 0) << resumed.err;
}

TEST(Restart, BadCheckpointsGiveOneLineAndChangeNothing) {
  ScratchDirectory scratch("wallrans_restart_bad");
  auto good = run_program(scratch.path(),
                          {"run", channel_case, "--output-dir", "run", "--max-iterations", "10", "--quiet"},
                          scratch.path() / "logs", "good");
  ASSERT_EQ(good.exit_status, 3) << good.err;
  const fs::path checkpoint = scratch.path() / "run" / "checkpoint_10.h5";
  ASSERT_TRUE(fs::exists(checkpoint));
  // Wrong file type, truncated file, other grid size, other model: each its own message.
  write_text(scratch.path() / "text.h5", "not an HDF5 file\n");
  const std::string bytes = read_text(checkpoint);
  write_text(scratch.path() / "truncated.h5", bytes.substr(0, bytes.size() / 2));
  write_text(scratch.path() / "coarse.yaml",
             read_text(channel_case)
                 .replace(read_text(channel_case).find("cells: [4, 128]"), 15, "cells: [4, 64] "));
  std::string laminar = read_text(channel_case);
  laminar.replace(laminar.find("model: spalart_allmaras"), 23, "model: mixing_length  ");
  laminar.replace(laminar.find("variant: negative"), 17, "outer_length: 1.0");
  write_text(scratch.path() / "other_model.yaml", laminar);
  std::string stretched = read_text(channel_case);
  stretched.replace(stretched.find("first_cell_height: "), 19, "first_cell_height: 1.5e-3 #");
  write_text(scratch.path() / "stretched.yaml", stretched);  // same size, other nodes
  struct Bad {
    std::string case_file, restart, mention;
  };
  const std::vector<Bad> bad = {{channel_case, "text.h5", "expected a wallrans checkpoint"},
                                {channel_case, "truncated.h5", "truncated.h5"},
                                {"coarse.yaml", "run/checkpoint_10.h5", "grid size"},
                                {"stretched.yaml", "run/checkpoint_10.h5", "grid fingerprint"},
                                {"other_model.yaml", "run/checkpoint_10.h5", "turbulence model"},
                                {channel_case, "missing.h5", "missing.h5"}};
  const auto before = snapshot(scratch.path() / "run");
  for (const auto& b : bad) {
    auto result = run_program(scratch.path(),
                              {"run", b.case_file, "--output-dir", "run", "--quiet", "--restart", b.restart},
                              scratch.path() / "logs", "bad");
    EXPECT_EQ(result.exit_status, 2) << b.restart << ": " << result.err;
    EXPECT_EQ(lines_of(result.err).size(), 1u) << result.err;
    EXPECT_NE(result.err.find(b.mention), std::string::npos) << result.err;
    EXPECT_EQ(snapshot(scratch.path() / "run"), before) << "the run directory must stay untouched";
  }
}

TEST(Restart, CheckpointOpensWithStandardTools) {
  ScratchDirectory scratch("wallrans_restart_tools");
  auto run = run_program(scratch.path(),
                         {"run", channel_case, "--output-dir", "run", "--max-iterations", "5", "--quiet"},
                         scratch.path() / "logs", "run");
  ASSERT_EQ(run.exit_status, 3) << run.err;
  const std::string h5 = (scratch.path() / "run" / "checkpoint_5.h5").string();
  EXPECT_EQ(std::system(("h5ls -r '" + h5 + "' > /dev/null").c_str()), 0);
  EXPECT_EQ(std::system(("h5dump -A '" + h5 + "' > /dev/null").c_str()), 0);
  const std::string python =
      "/usr/bin/python3 -c \"import h5py,sys; f=h5py.File(sys.argv[1],'r'); "
      "assert f['fields/velocity_x'].shape == (128, 4); assert f['fields/model_nu_tilde'].shape == (128, "
      "4)\" '" +
      h5 + "'";
  EXPECT_EQ(std::system(python.c_str()), 0);
  EXPECT_TRUE(fs::exists(scratch.path() / "run" / "checkpoint_5.xmf"));
}

TEST(Restart, WallClockBudgetStopsWithACheckpoint) {
  ScratchDirectory scratch("wallrans_restart_walltime");
  // The shipped plate needs about 200 iterations (several seconds on one rank); a 1 s budget
  // stops it early (the channel converges in under a second now).
  const std::string plate_case = std::string(WALLRANS_SOURCE_DIR) + "/configs/plate_sa.yaml";
  auto run =
      run_program(scratch.path(), {"run", plate_case, "--output-dir", "run", "--quiet", "--walltime", "1"},
                  scratch.path() / "logs", "budget");
  EXPECT_EQ(run.exit_status, 5) << run.out << run.err;
  EXPECT_NE(run.out.find("wall-clock budget"), std::string::npos) << run.out;
  bool found = false;
  for (const auto& entry : fs::directory_iterator(scratch.path() / "run"))
    found |= entry.path().extension() == ".h5";
  EXPECT_TRUE(found);
}

namespace {

// A step of solid cells (x < 1, y < 0.5) in a 3 m x 1 m channel with the SA model: the faces next
// to the solid cells carry boundary values and fluxes in the checkpoint. `step_end` moves the
// step's downstream face.
std::string solid_step_case(const std::string& step_end = "1.0") {
  return "title: solid_step\n"
         "flow: {kinematic_viscosity: 1.0e-3, initial_velocity: [1.0, 0.0]}\n"
         "grid: {generator: channel, cells: [30, 10], length: 3.0, height: 1.0}\n"
         "solid_regions:\n"
         "  - {x: [0.0, " +
         step_end +
         "], y: [0.0, 0.5]}\n"
         "boundaries:\n"
         "  - {side: left, from: 0.5, kind: inflow, velocity: [1.0, 0.0]}\n"
         "  - {side: left, to: 0.5, kind: wall}\n"
         "  - {side: right, kind: outflow}\n"
         "  - {side: bottom, kind: wall}\n"
         "  - {side: top, kind: wall}\n"
         "turbulence: {model: spalart_allmaras}\n"
         "iterations: {max: 2000, report_every: 0}\n";
}

}  // namespace

TEST(Restart, SolidRegionRestartsBitIdenticallyOnAnyRankCount) {
  ScratchDirectory scratch("wallrans_restart_solid");
  write_text(scratch.path() / "solid.yaml", solid_step_case());
  // Straight 24 iterations and 12 + restart + 12, on 2 ranks (12 is off the preconditioner's
  // rebuild cadence, as in the channel test above).
  auto straight = run_mpi(
      2, scratch.path(),
      {"run", "solid.yaml", "--output-dir", "straight", "--max-iterations", "24", "--quiet"}, "straight");
  ASSERT_EQ(straight.exit_status, 3) << straight.err;
  auto first =
      run_mpi(2, scratch.path(),
              {"run", "solid.yaml", "--output-dir", "split", "--max-iterations", "12", "--quiet"}, "first");
  ASSERT_EQ(first.exit_status, 3) << first.err;
  // The 2-rank checkpoint read on 1 rank and written again at once (no iteration): every
  // dataset, the boundary arrays by boundary-face id included, must come back bit for bit.
  auto one_rank = run_mpi(1, scratch.path(),
                          {"run", "solid.yaml", "--output-dir", "one", "--max-iterations", "0", "--quiet",
                           "--restart", "split/checkpoint_12.h5"},
                          "one_rank");
  ASSERT_EQ(one_rank.exit_status, 3) << one_rank.err;
  const std::string compare =
      "/usr/bin/python3 -c \"import h5py, sys\n"
      "a = h5py.File(sys.argv[1], 'r'); b = h5py.File(sys.argv[2], 'r')\n"
      "for group in ('fields', 'boundary'):\n"
      "    assert sorted(a[group]) == sorted(b[group]), (group, sorted(a[group]), sorted(b[group]))\n"
      "    for name in a[group]:\n"
      "        assert a[group][name][()].tobytes() == b[group][name][()].tobytes(), (group, name)\n"
      "assert 'solid' in a['fields'] and a['fields/solid'][()].sum() == 50\n"
      "flux = a['boundary/boundary_flux'][()]\n"
      "assert flux.shape == (30 + 20 + 10 + 10 + 5 + 5,) and abs(flux).max() > 0\" '" +
      (scratch.path() / "split" / "checkpoint_12.h5").string() + "' '" +
      (scratch.path() / "one" / "checkpoint_12.h5").string() + "'";
  EXPECT_EQ(std::system(compare.c_str()), 0) << compare;
  // Continued on 2 ranks, from the 2-rank checkpoint and from its 1-rank copy: both equal the
  // straight run to the last bit.
  auto second = run_mpi(2, scratch.path(),
                        {"run", "solid.yaml", "--output-dir", "split", "--max-iterations", "12", "--quiet",
                         "--restart", "split/checkpoint_12.h5"},
                        "second");
  ASSERT_EQ(second.exit_status, 3) << second.err;
  auto via_one = run_mpi(2, scratch.path(),
                         {"run", "solid.yaml", "--output-dir", "via_one", "--max-iterations", "12", "--quiet",
                          "--restart", "one/checkpoint_12.h5"},
                         "via_one");
  ASSERT_EQ(via_one.exit_status, 3) << via_one.err;
  for (const char* dir : {"split", "via_one"}) {
    for (const char* name : {"velocity", "pressure", "eddy_viscosity", "nu_tilde", "solid"}) {
      const auto a = cell_array(scratch.path() / "straight" / "fields.pvts", name);
      const auto b = cell_array(scratch.path() / dir / "fields.pvts", name);
      ASSERT_FALSE(a.empty()) << name;
      ASSERT_EQ(a.size(), b.size()) << name;
      size_t differing = 0;
      for (size_t k = 0; k < a.size(); ++k) differing += a[k] != b[k] ? 1 : 0;
      EXPECT_EQ(differing, 0u) << dir << " " << name;
    }
    // Wall data, the faces on the step included.
    EXPECT_EQ(read_text(scratch.path() / dir / "wall.csv"),
              read_text(scratch.path() / "straight" / "wall.csv"))
        << dir;
  }
  // The solid field marks the 10 x 5 step cells.
  double n_solid = 0.0;
  for (double flag : cell_array(scratch.path() / "straight" / "fields.pvts", "solid")) n_solid += flag;
  EXPECT_EQ(n_solid, 50.0);
  // A case whose step is one column shorter has as many boundary faces, but on other cells: its
  // restart from this checkpoint is refused with one line, and nothing is written.
  write_text(scratch.path() / "shorter.yaml", solid_step_case("0.9"));
  const auto before = snapshot(scratch.path() / "split");
  auto mismatch = run_program(
      scratch.path(),
      {"run", "shorter.yaml", "--output-dir", "shorter", "--quiet", "--restart", "split/checkpoint_12.h5"},
      scratch.path() / "logs", "mismatch");
  EXPECT_EQ(mismatch.exit_status, 2) << mismatch.err;
  EXPECT_EQ(lines_of(mismatch.err).size(), 1u) << mismatch.err;
  EXPECT_NE(
      mismatch.err.find("shorter.yaml:5: key 'solid_regions': expected the solid cells of the checkpoint, "
                        "got 5 cells that differ"),
      std::string::npos)
      << mismatch.err;
  EXPECT_EQ(snapshot(scratch.path() / "split"), before);
  EXPECT_FALSE(fs::exists(scratch.path() / "shorter"));
}

TEST(Restart, FlowRateControlIsPartOfTheRestartState) {
  // The periodic hill held at a flow rate (48 x 24): the mean pressure gradient is adjusted every
  // iteration, so a restart must carry it. 40 iterations straight against 23 + restart + 17 on 2
  // ranks (23 is off the preconditioner's cadence). Without the nested start: its coarse grids'
  // iteration budget is capped by --max-iterations, so runs capped at 23 and at 40 would start
  // their fine grids from different states.
  ScratchDirectory scratch("wallrans_restart_hill");
  write_text(
      scratch.path() / "hill.yaml",
      hill_case_text({{"cells:", "[48, 24]"}, {"first_cell_height:", "4.0e-3"}, {"coarse_grids:", "0"}}));
  auto straight = run_mpi(
      2, scratch.path(),
      {"run", "hill.yaml", "--output-dir", "straight", "--max-iterations", "40", "--quiet"}, "hill_straight");
  ASSERT_EQ(straight.exit_status, 3) << straight.err;
  auto first = run_mpi(2, scratch.path(),
                       {"run", "hill.yaml", "--output-dir", "split", "--max-iterations", "23", "--quiet"},
                       "hill_first");
  ASSERT_EQ(first.exit_status, 3) << first.err;
  auto second = run_mpi(2, scratch.path(),
                        {"run", "hill.yaml", "--output-dir", "split", "--max-iterations", "17", "--quiet",
                         "--restart", "split/checkpoint_23.h5"},
                        "hill_second");
  ASSERT_EQ(second.exit_status, 3) << second.err;
  for (const char* name : {"velocity", "pressure", "nu_tilde"}) {
    const auto a = cell_array(scratch.path() / "straight" / "fields.pvts", name);
    const auto b = cell_array(scratch.path() / "split" / "fields.pvts", name);
    ASSERT_FALSE(a.empty()) << name;
    ASSERT_EQ(a, b) << name;  // to the last bit
  }
  // The gradient in the summaries, printed with 12 digits, is the same text.
  auto gradient = [&](const char* run) {
    const std::string summary = read_text(scratch.path() / run / "summary.json");
    const size_t at = summary.find("\"mean_pressure_gradient\": ");
    return at == std::string::npos ? std::string("missing") : summary.substr(at, summary.find(',', at) - at);
  };
  EXPECT_NE(gradient("straight"), "missing");
  EXPECT_EQ(gradient("straight"), gradient("split"));
}
