// Run directories that belong to one run of one case, with the real program on 2 ranks: the lock
// (a second run, stale locks, other hosts), another case's results (refused, replaced on request),
// what survives a fresh start, a restart and a divergence, pruning and --resume among other
// files, the iteration cap of a restarted run, and `check` making the checks `run` makes.
#include <gtest/gtest.h>
#include <sys/wait.h>
#include <unistd.h>

#include <filesystem>
#include <set>
#include <string>
#include <vector>

#include "io/csv_writer.hpp"
#include "program_runner.hpp"
#include "run_fixtures.hpp"

namespace fs = std::filesystem;
using namespace wallrans::test_support;

namespace {

const std::string channel_case = std::string(WALLRANS_SOURCE_DIR) + "/configs/channel_sa_re180.yaml";

ProgramResult run_np2(const fs::path& dir, const std::vector<std::string>& args, const std::string& label) {
  return run_program_mpi(2, dir, args, dir / "logs", label);
}

ProgramResult run_np1(const fs::path& dir, const std::vector<std::string>& args, const std::string& label) {
  return run_program(dir, args, dir / "logs", label);
}

std::set<std::string> names_in(const fs::path& dir) {
  std::set<std::string> names;
  for (const auto& entry : fs::directory_iterator(dir)) names.insert(entry.path().filename().string());
  return names;
}

bool has_fields(const fs::path& dir) { return fs::exists(dir / "fields.pvts"); }

}  // namespace

TEST(RunDirectory, SecondRunIntoAHeldDirectoryExitsTwoAtOnceNamingTheHolder) {
  ScratchDirectory scratch("wallrans_rundir_twice");
  write_text(scratch.path() / "endless.yaml", cavity_case("endless", 24, 1e-300, 1000000));
  const fs::path out = scratch.path() / "run";
  BackgroundProgram first(mpi_command(2, {"run", "endless.yaml", "--output-dir", "run", "--quiet"}),
                          scratch.path(), scratch.path() / "logs", "first");
  ASSERT_TRUE(wait_until([&] { return history_rows(out) > 20; }, 60)) << "the first run did not start";
  const std::string lock = read_text(out / "run.lock");
  ASSERT_NE(lock.find("pid "), std::string::npos) << lock;
  const std::string holder_pid = lines_of(lock.substr(lock.find("pid ") + 4))[0];

  const auto started = std::chrono::steady_clock::now();
  const auto second =
      run_np2(scratch.path(), {"run", "endless.yaml", "--output-dir", "run", "--quiet"}, "second");
  const double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - started).count();
  EXPECT_EQ(second.exit_status, 2);
  const auto lines = program_lines(second.err);
  ASSERT_EQ(lines.size(), 1u) << second.err;
  EXPECT_NE(lines[0].find("no other run is using"), std::string::npos) << lines[0];
  EXPECT_NE(lines[0].find("process " + holder_pid + " on host " + this_host()), std::string::npos)
      << lines[0];
  EXPECT_EQ(second.out, "");
  // "At once": before the solver is built (start-up of two MPI processes takes about a second).
  EXPECT_LT(seconds, 20.0);

  // The first run went on, untouched, and ends as its own.
  const int rows = history_rows(out);
  EXPECT_TRUE(wait_until([&] { return history_rows(out) > rows + 20; }, 60));
  ASSERT_TRUE(first.signal(SIGUSR1));
  const auto ended = first.wait();
  EXPECT_EQ(ended.exit_status, 5) << ended.err;
  EXPECT_EQ(json_field(out / "summary.json", "status"), "stopped");
  EXPECT_FALSE(fs::exists(out / "run.lock")) << "the lock goes with the run";
}

TEST(RunDirectory, StaleLockOfAnEndedRunIsTakenOverWithANote) {
  ScratchDirectory scratch("wallrans_rundir_stale");
  // A process that has ended: its pid is free (and nobody holds the lock file's flock).
  const pid_t child = fork();
  if (child == 0) _exit(0);
  int status = 0;
  ASSERT_EQ(waitpid(child, &status, 0), child);
  write_text(scratch.path() / "run" / "run.lock",
             "host " + this_host() + "\npid " + std::to_string(child) + "\nsince 2026-01-01T00:00:00Z\n");
  const auto result = run_np1(
      scratch.path(), {"run", channel_case, "--output-dir", "run", "--max-iterations", "5"}, "after_stale");
  EXPECT_EQ(result.exit_status, 3) << result.err;
  EXPECT_NE(result.out.find("took over the lock of an ended run (process " + std::to_string(child) +
                            " on host " + this_host()),
            std::string::npos)
      << result.out;
  EXPECT_FALSE(fs::exists(scratch.path() / "run" / "run.lock"));
  EXPECT_EQ(json_field(scratch.path() / "run" / "summary.json", "status"), "capped");
}

TEST(RunDirectory, LockOfAProcessOnAnotherHostIsRefused) {
  ScratchDirectory scratch("wallrans_rundir_remote");
  const std::string lock = "host other-node.example\npid 4242\nsince 2026-01-01T00:00:00Z\n";
  write_text(scratch.path() / "run" / "run.lock", lock);
  for (const char* command : {"check", "run"}) {
    const auto result = run_np1(scratch.path(), {command, channel_case, "--output-dir", "run"}, command);
    EXPECT_EQ(result.exit_status, 2) << command;
    const auto lines = program_lines(result.err);
    ASSERT_EQ(lines.size(), 1u) << result.err;
    EXPECT_NE(lines[0].find("process 4242 on host other-node.example"), std::string::npos) << lines[0];
    EXPECT_NE(lines[0].find("another host"), std::string::npos) << lines[0];
  }
  EXPECT_EQ(read_text(scratch.path() / "run" / "run.lock"), lock);
  EXPECT_EQ(names_in(scratch.path() / "run"), std::set<std::string>{"run.lock"});
}

TEST(RunDirectory, AnotherCasesResultsAreRefusedThenReplacedOnRequest) {
  ScratchDirectory scratch("wallrans_rundir_foreign");
  const fs::path out = scratch.path() / "run";
  ASSERT_EQ(run_np2(scratch.path(), {"run", channel_case, "--output-dir", "run", "--max-iterations", "12"},
                    "channel")
                .exit_status,
            3);
  ASSERT_TRUE(fs::exists(out / "profile_x0.25.csv"));  // the channel writes a profile; the cavity does not
  write_text(scratch.path() / "cavity.yaml", cavity_case("cavity", 16, 1e-300, 7));
  const auto before = snapshot(out);
  for (const char* command : {"check", "run"}) {
    // `run` on 2 ranks (every rank must refuse together), `check` on 1.
    const auto refused =
        command == std::string("run")
            ? run_np2(scratch.path(), {command, "cavity.yaml", "--output-dir", "run"}, command)
            : run_np1(scratch.path(), {command, "cavity.yaml", "--output-dir", "run"}, command);
    EXPECT_EQ(refused.exit_status, 2) << command;
    const auto lines = program_lines(refused.err);
    ASSERT_EQ(lines.size(), 1u) << refused.err;
    EXPECT_NE(lines[0].find("results of another case ('channel_sa_re180')"), std::string::npos) << lines[0];
    EXPECT_NE(lines[0].find("--replace-results"), std::string::npos) << lines[0];
    EXPECT_EQ(snapshot(out), before) << command << " changed the other case's results";
  }
  const auto replaced =
      run_np2(scratch.path(), {"run", "cavity.yaml", "--output-dir", "run", "--replace-results"}, "replace");
  EXPECT_EQ(replaced.exit_status, 3) << replaced.err;
  EXPECT_NE(replaced.out.find("deleted"), std::string::npos) << replaced.out;
  // Only the cavity's files: its own checkpoint, no channel checkpoint or profile.
  const std::set<std::string> expected{"case.resolved.yaml",
                                       "checkpoint_7.h5",
                                       "checkpoint_7.xmf",
                                       "fields.pvd",
                                       "fields.pvts",
                                       "fields_0.vts",
                                       "fields_1.vts",
                                       "progress.log",
                                       "residuals.csv",
                                       "run_identity.txt",
                                       "summary.json",
                                       "wall.csv",
                                       "logs"};
  std::set<std::string> found = names_in(out);
  found.insert("logs");
  EXPECT_EQ(found, expected);
  EXPECT_EQ(json_field(out / "summary.json", "title"), "cavity");
  EXPECT_NE(read_text(out / "run_identity.txt").find("title cavity"), std::string::npos);
}

TEST(RunDirectory, FilesOfOursWithoutAnIdentityAreAnUnknownCase) {
  ScratchDirectory scratch("wallrans_rundir_unknown");
  write_text(scratch.path() / "run" / "residuals.csv", "iteration\n1\n");
  write_text(scratch.path() / "run" / "notes.txt", "the user's own file\n");
  const auto refused = run_np1(scratch.path(), {"run", channel_case, "--output-dir", "run"}, "unknown");
  EXPECT_EQ(refused.exit_status, 2);
  EXPECT_NE(refused.err.find("results of an unknown case"), std::string::npos) << refused.err;
  const auto replaced = run_np1(
      scratch.path(),
      {"run", channel_case, "--output-dir", "run", "--replace-results", "--max-iterations", "3"}, "ok");
  EXPECT_EQ(replaced.exit_status, 3) << replaced.err;
  EXPECT_EQ(read_text(scratch.path() / "run" / "notes.txt"), "the user's own file\n") << "not ours: kept";
}

TEST(RunDirectory, RestartFileInsideADirectoryToBeReplacedIsRefused) {
  ScratchDirectory scratch("wallrans_rundir_replace_restart");
  ASSERT_EQ(
      run_np1(scratch.path(), {"run", channel_case, "--output-dir", "run", "--max-iterations", "4"}, "a")
          .exit_status,
      3);
  // The same grid and model with another viscosity is another case whose restart would fit.
  std::string other = read_text(channel_case);
  other.replace(other.find("title: channel_sa_re180"), 23, "title: channel_other    ");
  write_text(scratch.path() / "other.yaml", other);
  const auto before = snapshot(scratch.path() / "run");
  const auto result = run_np1(
      scratch.path(),
      {"run", "other.yaml", "--output-dir", "run", "--replace-results", "--restart", "run/checkpoint_4.h5"},
      "refused");
  EXPECT_EQ(result.exit_status, 2);
  EXPECT_TRUE(result.err.rfind("wallrans: error: command line: --restart 'run/checkpoint_4.h5': expected a "
                               "checkpoint outside",
                               0) == 0)
      << result.err;
  EXPECT_EQ(snapshot(scratch.path() / "run"), before);
}

TEST(RunDirectory, FreshRunOfTheSameCaseLeavesOnlyItsOwnResults) {
  ScratchDirectory scratch("wallrans_rundir_fresh");
  const std::string every5 = read_text(channel_case) + "checkpoint: {every: 5, keep: 3}\n";
  write_text(scratch.path() / "every5.yaml", every5);
  ASSERT_EQ(
      run_np1(scratch.path(), {"run", "every5.yaml", "--output-dir", "run", "--max-iterations", "30"}, "long")
          .exit_status,
      3);
  // Started afresh, the same case must not keep the longer run's checkpoints 20..30 (pruning
  // would otherwise delete the new run's own lower-numbered ones) or its summary.
  const auto again = run_np1(scratch.path(),
                             {"run", "every5.yaml", "--output-dir", "run", "--max-iterations", "8"}, "short");
  EXPECT_EQ(again.exit_status, 3) << again.err;
  EXPECT_NE(again.out.find("starting afresh deleted"), std::string::npos) << again.out;
  std::set<std::string> checkpoints;
  for (const auto& name : names_in(scratch.path() / "run"))
    if (name.ends_with(".h5")) checkpoints.insert(name);
  EXPECT_EQ(checkpoints, (std::set<std::string>{"checkpoint_5.h5", "checkpoint_8.h5"}));
  EXPECT_EQ(history_rows(scratch.path() / "run"), 8);
  EXPECT_NE(read_text(scratch.path() / "run" / "summary.json").find("\"iterations\": 8,"), std::string::npos);
}

TEST(RunDirectory, DivergedRunLeavesSummaryDivergedAndNoFieldsThatLookCurrent) {
  ScratchDirectory scratch("wallrans_rundir_diverged");
  // Re 1000 with central differences: SIMPLEC (default relaxation) runs; plain SIMPLE without
  // pressure relaxation (relax_velocity 0.9, relax_pressure 1) diverges within a few dozen
  // iterations (Patankar 1980, sec. 6.7: SIMPLE needs pressure under-relaxation). Relaxation is
  // not part of the case, so both share one run directory.
  const std::string base =
      "title: cavity_re1000\nflow: {kinematic_viscosity: 0.001}\ngrid: {generator: cavity, cells: [24, 24]}\n"
      "boundaries:\n  - {side: top, kind: wall, velocity: [1.0, 0.0]}\n  - {side: bottom, kind: wall}\n"
      "  - {side: left, kind: wall}\n  - {side: right, kind: wall}\n";
  write_text(scratch.path() / "steady.yaml",
             base + "iterations: {coupling: simplec, max: 20, report_every: 0, convection: central}\n");
  write_text(scratch.path() / "unstable.yaml", base +
                                                   "iterations: {coupling: simple, relax_velocity: 0.9, "
                                                   "relax_pressure: 1.0, max: 500, report_every: 0, "
                                                   "convection: central}\n");
  const fs::path out = scratch.path() / "run";
  ASSERT_EQ(run_np2(scratch.path(), {"run", "steady.yaml", "--output-dir", "run"}, "steady").exit_status, 3);
  ASSERT_TRUE(has_fields(out));
  const auto diverged = run_np2(
      scratch.path(), {"run", "unstable.yaml", "--output-dir", "run", "--restart", "run/checkpoint_20.h5"},
      "unstable");
  EXPECT_EQ(diverged.exit_status, 4) << diverged.err;
  EXPECT_EQ(program_lines(diverged.err).size(), 0u)
      << "a divergence is an outcome, not an abort: " << diverged.err;
  EXPECT_EQ(diverged.err.find("MPI_ABORT"), std::string::npos) << diverged.err;
  EXPECT_EQ(json_field(out / "summary.json", "status"), "diverged");
  EXPECT_NE(json_field(out / "summary.json", "detail").find("diverged at iteration"), std::string::npos);
  EXPECT_NE(read_text(out / "summary.json").find("\"converged\": false"), std::string::npos);
  EXPECT_FALSE(has_fields(out)) << "the steady run's fields would look like this run's result";
  EXPECT_FALSE(fs::exists(out / "wall.csv"));
  EXPECT_TRUE(fs::exists(out / "checkpoint_20.h5")) << "the last good state is kept";
}

TEST(RunDirectory, PruningAndResumeTouchOnlyThisCasesCheckpoints) {
  ScratchDirectory scratch("wallrans_rundir_prune");
  // Another case's checkpoint with a higher number than any of this case's, copied in.
  write_text(scratch.path() / "cavity.yaml", cavity_case("cavity", 8, 1e-300, 40));
  ASSERT_EQ(run_np1(scratch.path(), {"run", "cavity.yaml", "--output-dir", "other"}, "other").exit_status, 3);
  write_text(scratch.path() / "every4.yaml", read_text(channel_case) + "checkpoint: {every: 4, keep: 1}\n");
  ASSERT_EQ(
      run_np2(scratch.path(), {"run", "every4.yaml", "--output-dir", "run", "--max-iterations", "4"}, "first")
          .exit_status,
      3);
  fs::copy_file(scratch.path() / "other" / "checkpoint_40.h5", scratch.path() / "run" / "checkpoint_40.h5");
  const auto resumed =
      run_np2(scratch.path(),
              {"run", "every4.yaml", "--output-dir", "run", "--max-iterations", "8", "--resume"}, "resumed");
  EXPECT_EQ(resumed.exit_status, 3) << resumed.err;
  EXPECT_NE(resumed.out.find("restarted from run/checkpoint_4.h5 at iteration 4"), std::string::npos)
      << resumed.out;
  std::set<std::string> checkpoints;
  for (const auto& name : names_in(scratch.path() / "run"))
    if (name.ends_with(".h5")) checkpoints.insert(name);
  // keep: 1 leaves this case's newest (12) and never the other case's file.
  EXPECT_EQ(checkpoints, (std::set<std::string>{"checkpoint_12.h5", "checkpoint_40.h5"}));
}

TEST(RunDirectory, IterationCapCountsTheIterationsOfThisRun) {
  ScratchDirectory scratch("wallrans_rundir_cap");
  ASSERT_EQ(
      run_np1(scratch.path(), {"run", channel_case, "--output-dir", "run", "--max-iterations", "10"}, "a")
          .exit_status,
      3);
  // A restart with the same cap runs 10 more iterations (not 0, as when the cap counted from 0).
  const auto more = run_np1(scratch.path(),
                            {"run", channel_case, "--output-dir", "run", "--max-iterations", "10",
                             "--restart", "run/checkpoint_10.h5"},
                            "b");
  EXPECT_EQ(more.exit_status, 3) << more.err;
  const std::string summary = read_text(scratch.path() / "run" / "summary.json");
  EXPECT_NE(summary.find("\"first_iteration\": 10,"), std::string::npos) << summary;
  EXPECT_NE(summary.find("\"iterations\": 20,"), std::string::npos) << summary;
  const auto history = wallrans::read_csv((scratch.path() / "run" / "residuals.csv").string());
  ASSERT_EQ(history.rows.size(), 20u);
  EXPECT_EQ(history.rows.back()[0], 20.0);
}

// `check` makes every check `run` makes before iterating: same exit code, same one line, and
// neither writes anything.
struct Mismatch {
  std::string name;
  std::vector<std::string> arguments;  // after the command and the case file
  std::string mention;
};

class CheckAgreesWithRun : public ::testing::TestWithParam<Mismatch> {};

TEST_P(CheckAgreesWithRun, SameOneLineErrorAndNothingWritten) {
  const Mismatch& bad = GetParam();
  ScratchDirectory scratch("wallrans_check_" + bad.name);
  write_text(scratch.path() / "a_file", "not a directory\n");
  write_text(scratch.path() / "restart_missing.yaml",
             read_text(channel_case) + "checkpoint: {restart_from: gone.h5}\n");
  fs::create_directories(scratch.path() / "logs");
  const auto before = snapshot(scratch.path());
  std::vector<std::string> messages;
  for (const char* command : {"check", "run"}) {
    std::vector<std::string> args{command};
    args.insert(args.end(), bad.arguments.begin(), bad.arguments.end());
    const auto result = run_program(scratch.path(), args, scratch.path() / "logs_out", command);
    EXPECT_EQ(result.exit_status, 2) << command << ": " << result.err;
    EXPECT_EQ(lines_of(result.err).size(), 1u) << result.err;
    EXPECT_NE(result.err.find(bad.mention), std::string::npos) << result.err;
    messages.push_back(result.err);
  }
  EXPECT_EQ(messages[0], messages[1]);
  fs::remove_all(scratch.path() / "logs_out");
  EXPECT_EQ(snapshot(scratch.path()), before);
}

INSTANTIATE_TEST_SUITE_P(
    Program, CheckAgreesWithRun,
    ::testing::Values(
        Mismatch{"missing_restart", {channel_case, "--restart", "missing.h5"}, "missing.h5"},
        Mismatch{"missing_restart_in_case", {"restart_missing.yaml"}, "gone.h5"},
        Mismatch{"output_is_a_file", {channel_case, "--output-dir", "a_file"}, "which is a file"},
        Mismatch{"output_under_a_file", {channel_case, "--output-dir", "a_file/run"}, "not a directory"},
        Mismatch{"resume_and_restart", {channel_case, "--resume", "--restart", "x.h5"}, "--resume"}),
    [](const ::testing::TestParamInfo<Mismatch>& info) { return info.param.name; });
