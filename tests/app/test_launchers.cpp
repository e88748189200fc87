// Signals, launchers and hard kills with the real program on 2 ranks under the MPI launcher: a
// signal to the launcher (TERM, USR1), to one rank, a SIGKILL with checkpoints on the wall-clock
// cadence, and the batch script (tools/cluster_job.sh) stopping, resuming and deciding from the
// summary.
#include <gtest/gtest.h>
#include <signal.h>

#include <cstdlib>
#include <filesystem>
#include <string>
#include <vector>

#include "io/csv_writer.hpp"
#include "program_runner.hpp"
#include "run_fixtures.hpp"

namespace fs = std::filesystem;
using namespace wallrans::test_support;

namespace {

// A run that goes on until it is stopped (see cavity_case).
void write_endless_case(const fs::path& dir, const std::string& extra = "") {
  write_text(dir / "endless.yaml", cavity_case("endless", 24, 1e-300, 1000000, extra));
}

// Starts the endless case on 2 ranks into <dir>/run and waits until it iterates.
std::unique_ptr<BackgroundProgram> start_endless(const fs::path& dir, const std::string& label) {
  auto program = std::make_unique<BackgroundProgram>(
      mpi_command(2, {"run", "endless.yaml", "--output-dir", "run", "--quiet"}), dir, dir / "logs", label);
  EXPECT_TRUE(wait_until([&] { return history_rows(dir / "run") > 20; }, 60)) << "the run did not start";
  return program;
}

bool launcher_is_open_mpi() {
  // Open MPI 4's launcher reports "mpiexec (OpenRTE) 4.1.4 ... http://www.open-mpi.org/...".
  const std::string command =
      std::string("'") + WALLRANS_MPIEXEC + "' --version 2>&1 | grep -Eqi 'open ?mpi|openrte|open-mpi'";
  return std::system(command.c_str()) == 0;
}

int checkpoint_iteration(const std::string& file_name) {
  return std::stoi(file_name.substr(11, file_name.size() - 14));  // checkpoint_<N>.h5
}

// The run in <dir>/run stopped cleanly: summary "stopped" naming a checkpoint that exists, and a
// run resumed from it continues from that iteration.
void expect_stopped_and_resumable(const fs::path& dir) {
  const fs::path out = dir / "run";
  EXPECT_EQ(json_field(out / "summary.json", "status"), "stopped");
  const std::string checkpoint = json_field(out / "summary.json", "checkpoint");
  ASSERT_TRUE(fs::exists(out / checkpoint)) << checkpoint;
  EXPECT_FALSE(fs::exists(out / "run.lock"));
  const int iteration = checkpoint_iteration(checkpoint);
  const auto resumed = run_program_mpi(
      2, dir, {"run", "endless.yaml", "--output-dir", "run", "--quiet", "--resume", "--max-iterations", "3"},
      dir / "logs", "resumed");
  EXPECT_EQ(resumed.exit_status, 3) << resumed.err;
  EXPECT_NE(
      resumed.out.find("restarted from run/" + checkpoint + " at iteration " + std::to_string(iteration)),
      std::string::npos)
      << resumed.out;
  EXPECT_EQ(history_rows(out), iteration + 3);
}

}  // namespace

// Open MPI's mpirun answers a TERM (or INT) of its own by sending the ranks CONT, then TERM one
// second later, and exits with its own code 1 (orte clean_abort); the ranks still stop with a
// checkpoint. README (Signals and launchers) documents this.
TEST(Launcher, TermToTheLauncherStopsWithACheckpointAndSummaryStopped) {
  ScratchDirectory scratch("wallrans_launch_term");
  write_endless_case(scratch.path());
  auto run = start_endless(scratch.path(), "term");
  ASSERT_TRUE(run->signal(SIGTERM));
  const auto result = run->wait();
  EXPECT_EQ(result.exit_status, launcher_is_open_mpi() ? 1 : 5) << result.err;
  EXPECT_NE(json_field(scratch.path() / "run" / "summary.json", "detail").find("SIGTERM"), std::string::npos);
  expect_stopped_and_resumable(scratch.path());
}

// USR1 is forwarded by mpirun to every rank, which then ends through MPI_Finalize with code 5:
// the launcher exits 5, and without an abort.
TEST(Launcher, Usr1ToTheLauncherExitsFive) {
  ScratchDirectory scratch("wallrans_launch_usr1");
  write_endless_case(scratch.path());
  auto run = start_endless(scratch.path(), "usr1");
  ASSERT_TRUE(run->signal(SIGUSR1));
  const auto result = run->wait();
  EXPECT_EQ(result.exit_status, 5) << result.err;
  EXPECT_EQ(result.err.find("MPI_ABORT"), std::string::npos) << result.err;
  expect_stopped_and_resumable(scratch.path());
}

// A signal that reaches one rank only (as from a node's own kill) stops every rank together.
TEST(Launcher, TermToOneRankStopsEveryRankWithExitFive) {
  ScratchDirectory scratch("wallrans_launch_one_rank");
  write_endless_case(scratch.path());
  auto run = start_endless(scratch.path(), "one_rank");
  std::vector<int> ranks;
  ASSERT_TRUE(wait_until([&] { return (ranks = program_children(run->pid())).size() == 2; }, 10));
  ASSERT_EQ(kill(ranks[1], SIGTERM), 0);
  const auto result = run->wait();
  EXPECT_EQ(result.exit_status, 5) << result.err;
  EXPECT_EQ(result.err.find("MPI_ABORT"), std::string::npos) << result.err;
  expect_stopped_and_resumable(scratch.path());
}

// A hard kill (lost node, out-of-memory killer) loses at most the work since the last checkpoint
// of the wall-clock cadence (default 600 s; here 0.3 s to keep the test short, and no iteration
// cadence): the stale lock is taken over and the run continues from that checkpoint.
TEST(Launcher, SigkillLosesOnlyTheWorkSinceTheLastTimedCheckpoint) {
  ScratchDirectory scratch("wallrans_launch_sigkill");
  write_endless_case(scratch.path(), "checkpoint: {every: 0, every_seconds: 0.3}\n");
  const fs::path out = scratch.path() / "run";
  auto run = start_endless(scratch.path(), "killed");
  auto newest = [&] {
    int best = -1;
    for (const auto& entry : fs::directory_iterator(out)) {
      const std::string name = entry.path().filename().string();
      if (name.starts_with("checkpoint_") && name.ends_with(".h5"))
        best = std::max(best, checkpoint_iteration(name));
    }
    return best;
  };
  ASSERT_TRUE(wait_until([&] { return newest() > 0; }, 30)) << "no checkpoint on the wall-clock cadence";
  const int first_seen = newest();
  ASSERT_TRUE(wait_until([&] { return newest() > first_seen; }, 30))
      << "the cadence wrote only one checkpoint";
  // Every rank at once, as when the node is lost (a rank killed alone lets the others fail or
  // stop in their own time).
  std::vector<int> ranks = program_children(run->pid());
  ASSERT_EQ(ranks.size(), 2u);
  for (const int rank : ranks) ASSERT_EQ(kill(rank, SIGKILL), 0);
  const auto killed = run->wait();
  EXPECT_NE(killed.exit_status, 0);
  EXPECT_EQ(json_field(out / "summary.json", "status"), "running") << "no ending was recorded";
  EXPECT_TRUE(fs::exists(out / "run.lock"));
  const int last = newest();

  const auto resumed = run_program_mpi(
      2, scratch.path(),
      {"run", "endless.yaml", "--output-dir", "run", "--quiet", "--resume", "--max-iterations", "4"},
      scratch.path() / "logs", "resumed");
  EXPECT_EQ(resumed.exit_status, 3) << resumed.err;
  EXPECT_NE(resumed.out.find("took over the lock of an ended run"), std::string::npos) << resumed.out;
  EXPECT_NE(resumed.out.find("at iteration " + std::to_string(last)), std::string::npos) << resumed.out;
  const auto history = wallrans::read_csv((out / "residuals.csv").string());
  ASSERT_EQ(history.rows.size(), static_cast<size_t>(last + 4));
  for (size_t k = 0; k < history.rows.size(); ++k) EXPECT_EQ(history.rows[k][0], double(k + 1));
}

TEST(Launcher, DefaultWallClockCadenceIsTenMinutes) {
  ScratchDirectory scratch("wallrans_launch_default");
  write_text(scratch.path() / "short.yaml", cavity_case("short", 8, 1e-300, 2));
  const auto result = run_program(scratch.path(), {"run", "short.yaml", "--output-dir", "run"},
                                  scratch.path() / "logs", "short");
  EXPECT_EQ(result.exit_status, 3) << result.err;
  EXPECT_NE(read_text(scratch.path() / "run" / "case.resolved.yaml").find("every_seconds: 600"),
            std::string::npos);
}

// The batch script run as the scheduler would (bash, no scheduler needed): a TERM to the batch
// shell is passed on, the shell waits for wallrans and decides from summary.json; submitted
// again it resumes from the checkpoint and converges at the same iteration, to the last bit of
// the residuals, as an uninterrupted run (restarts are bit-identical on the same rank count).
TEST(Launcher, BatchScriptStopsResumesAndDecidesFromTheSummary) {
  ScratchDirectory scratch("wallrans_launch_batch");
  // About 240 iterations (a second or two) to a residual drop of 1e-8.
  write_text(scratch.path() / "cavity.yaml", cavity_case("cavity", 16, 1e-8, 20000));
  const auto reference =
      run_program_mpi(2, scratch.path(), {"run", "cavity.yaml", "--output-dir", "reference"},
                      scratch.path() / "logs", "reference");
  ASSERT_EQ(reference.exit_status, 0) << reference.err;
  const auto reference_history =
      wallrans::read_csv((scratch.path() / "reference" / "residuals.csv").string());

  const std::vector<std::string> job{"/bin/bash", std::string(WALLRANS_SOURCE_DIR) + "/tools/cluster_job.sh"};
  const std::vector<std::string> environment{"CASE_FILE=cavity.yaml",
                                             "RUN_DIR=run",
                                             "RANKS=2",
                                             std::string("WALLRANS=") + WALLRANS_PROGRAM,
                                             std::string("MPIRUN=") + WALLRANS_MPIEXEC,
                                             "STOP_GRACE_SECONDS=5"};
  {
    BackgroundProgram first(job, scratch.path(), scratch.path() / "logs", "job1", environment);
    ASSERT_TRUE(wait_until([&] { return history_rows(scratch.path() / "run") > 60; }, 60));
    ASSERT_TRUE(first.signal(SIGTERM));
    const auto stopped = first.wait();
    EXPECT_EQ(stopped.exit_status, 5) << stopped.out << stopped.err;
    EXPECT_NE(stopped.out.find("cluster_job: stopped with checkpoint run/checkpoint_"), std::string::npos)
        << stopped.out;
    EXPECT_EQ(json_field(scratch.path() / "run" / "summary.json", "status"), "stopped");
    ASSERT_LT(history_rows(scratch.path() / "run"), static_cast<int>(reference_history.rows.size()));
  }
  BackgroundProgram second(job, scratch.path(), scratch.path() / "logs", "job2", environment);
  const auto finished = second.wait();
  EXPECT_EQ(finished.exit_status, 0) << finished.out << finished.err;
  EXPECT_NE(finished.out.find("restarted from run/checkpoint_"), std::string::npos) << finished.out;
  EXPECT_NE(finished.out.find("cluster_job: converged"), std::string::npos) << finished.out;
  const auto history = wallrans::read_csv((scratch.path() / "run" / "residuals.csv").string());
  ASSERT_EQ(history.rows.size(), reference_history.rows.size());
  for (size_t column = 0; column < 4; ++column)  // iteration and the three normalised residuals
    EXPECT_EQ(history.rows.back()[column], reference_history.rows.back()[column]) << column;
}
