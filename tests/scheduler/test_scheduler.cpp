// The batch script (tools/cluster_job.sh) under a real scheduler: a private single-node Slurm
// (single_node_slurm.sh: munge key, slurm.conf for this host, slurmctld and slurmd) runs a 2-rank
// case; the job is stopped by the signal Slurm sends before its time limit (USR1 to the batch
// shell) and resubmits itself, or by `scancel --signal=TERM --full` and is submitted again; either
// way the run converges at the iteration of an uninterrupted run with the same residuals to the
// last bit. Skipped, with the reason, where Slurm cannot start (not root, packages missing).
#include <gtest/gtest.h>

#include <cstdlib>
#include <filesystem>
#include <iostream>
#include <memory>
#include <regex>
#include <string>
#include <vector>

#include "io/csv_writer.hpp"
#include "program_runner.hpp"
#include "run_fixtures.hpp"

namespace fs = std::filesystem;
using namespace wallrans::test_support;

namespace {

const std::string slurm_script = WALLRANS_SOURCE_DIR "/tests/scheduler/single_node_slurm.sh";
const std::string batch_script = WALLRANS_SOURCE_DIR "/tools/cluster_job.sh";

// The private Slurm of this test program, started once for all tests and stopped at the end.
class Scheduler : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    scratch_ = std::make_unique<ScratchDirectory>("wallrans_scheduler");
    const fs::path dir = scratch_->path() / "slurm";
    const ProgramResult started = run_executable(slurm_script, scratch_->path(), {"start", dir.string()},
                                                 scratch_->path(), "slurm_start");
    if (started.exit_status == 0) {
      // Every client below (sbatch, scancel, scontrol) and every job (sbatch exports the
      // environment) talk to this Slurm.
      setenv("SLURM_CONF", (dir / "slurm.conf").c_str(), 1);
    } else {
      skip_reason_ = started.exit_status == 77 ? started.err
                                               : "single_node_slurm.sh start exited " +
                                                     std::to_string(started.exit_status) + ": " + started.err;
    }
  }
  static void TearDownTestSuite() {
    if (skip_reason_.empty()) {
      (void)run_executable(slurm_script, scratch_->path(), {"stop", (scratch_->path() / "slurm").string()},
                           scratch_->path(), "slurm_stop");
    }
    scratch_.reset();
  }
  void SetUp() override {
    if (!skip_reason_.empty()) GTEST_SKIP() << skip_reason_;
  }

  static std::unique_ptr<ScratchDirectory> scratch_;
  static std::string skip_reason_;
};
std::unique_ptr<ScratchDirectory> Scheduler::scratch_;
std::string Scheduler::skip_reason_;

// The case of every test: about 400 iterations to a residual drop of 1e-8 on 2 ranks (a few
// seconds), so a signal after 60 iterations arrives well before the end.
void write_case(const fs::path& dir) {
  write_text(dir / "cavity.yaml", cavity_case("cavity", 24, 1e-8, 20000));
}

// Submits the batch script from `dir` with `settings` (NAME=value) exported to the job; returns
// the job id.
std::string submit(const fs::path& dir, const std::vector<std::string>& settings, const std::string& label) {
  std::string exported = "--export=ALL";
  for (const std::string& setting : settings) exported += "," + setting;
  const ProgramResult submitted =
      run_executable("sbatch", dir, {"--parsable", exported, batch_script}, dir / "logs", label);
  EXPECT_EQ(submitted.exit_status, 0) << submitted.err;
  const std::string id = submitted.out.substr(0, submitted.out.find_first_of(";\n"));
  EXPECT_FALSE(id.empty()) << submitted.out;
  return id;
}

std::vector<std::string> job_settings(bool resubmit) {
  return {"CASE_FILE=cavity.yaml",
          "RUN_DIR=run",
          "RANKS=2",
          std::string("WALLRANS=") + WALLRANS_PROGRAM,
          std::string("MPIRUN=") + WALLRANS_MPIEXEC,
          "STOP_GRACE_SECONDS=5",
          std::string("RESUBMIT=") + (resubmit ? "1" : "0")};
}

// `scontrol show job` field `key` (e.g. JobState, ExitCode) of job `id`; "" if unknown.
std::string job_field(const fs::path& dir, const std::string& id, const std::string& key) {
  const ProgramResult shown = run_executable("scontrol", dir, {"show", "job", id}, dir / "logs", "scontrol");
  std::smatch match;
  const std::regex field("(^|\\s)" + key + "=(\\S+)");
  return std::regex_search(shown.out, match, field) ? match[2].str() : "";
}

// Waits until job `id` has ended; returns its state (COMPLETED, FAILED, ...).
std::string wait_for_end(const fs::path& dir, const std::string& id, double seconds) {
  std::string state;
  wait_until(
      [&] {
        state = job_field(dir, id, "JobState");
        return !state.empty() && state != "PENDING" && state != "RUNNING" && state != "COMPLETING" &&
               state != "CONFIGURING";
      },
      seconds);
  return state;
}

// The job's log (#SBATCH --output=wallrans-%j.log in the submission directory); its lines of the
// batch script and of wallrans are printed for the test's output.
std::string job_log(const fs::path& dir, const std::string& id) {
  const std::string log = read_text(dir / ("wallrans-" + id + ".log"));
  for (const std::string& line : lines_of(log)) {
    if (line.rfind("cluster_job:", 0) == 0 || line.rfind("wallrans:", 0) == 0 ||
        line.rfind("Submitted", 0) == 0)
      std::cout << "job " << id << ": " << line << "\n";
  }
  return log;
}

// An uninterrupted run of the case on 2 ranks, outside the scheduler.
wallrans::CsvTable reference_history(const fs::path& dir) {
  const ProgramResult reference =
      run_program_mpi(2, dir, {"run", "cavity.yaml", "--output-dir", "reference"}, dir / "logs", "reference");
  EXPECT_EQ(reference.exit_status, 0) << reference.err;
  return wallrans::read_csv((dir / "reference" / "residuals.csv").string());
}

// The run in <dir>/run ended where the reference did, with the same residuals to the last bit.
void expect_reference_answer(const fs::path& dir, const wallrans::CsvTable& reference) {
  EXPECT_EQ(json_field(dir / "run" / "summary.json", "status"), "converged");
  const auto history = wallrans::read_csv((dir / "run" / "residuals.csv").string());
  ASSERT_EQ(history.rows.size(), reference.rows.size());
  for (size_t column = 0; column < 4; ++column)  // iteration and the three normalised residuals
    EXPECT_EQ(history.rows.back()[column], reference.rows.back()[column]) << column;
}

}  // namespace

TEST_F(Scheduler, TimeLimitSignalStopsTheJobWhichResubmitsItselfAndConverges) {
  const fs::path dir = scratch_->path() / "time_limit";
  write_case(dir);
  const auto reference = reference_history(dir);

  const std::string first = submit(dir, job_settings(true), "submit");
  ASSERT_TRUE(wait_until([&] { return history_rows(dir / "run") > 60; }, 120))
      << "the job did not start iterating; state " << job_field(dir, first, "JobState");
  ASSERT_LT(history_rows(dir / "run"), static_cast<int>(reference.rows.size()) - 60);
  // What Slurm sends at --signal=B:USR1@300 before the time limit: USR1 to the batch shell only.
  const ProgramResult signalled =
      run_executable("scancel", dir, {"--batch", "--signal=USR1", first}, dir / "logs", "scancel");
  ASSERT_EQ(signalled.exit_status, 0) << signalled.err;

  EXPECT_EQ(wait_for_end(dir, first, 120), "FAILED");
  EXPECT_EQ(job_field(dir, first, "ExitCode"), "5:0");  // the script's decision: stopped
  const std::string first_log = job_log(dir, first);
  EXPECT_NE(first_log.find("cluster_job: USR1 received"), std::string::npos) << first_log;
  EXPECT_NE(first_log.find("cluster_job: stopped with checkpoint run/checkpoint_"), std::string::npos)
      << first_log;
  std::smatch resubmission;
  ASSERT_TRUE(std::regex_search(first_log, resubmission, std::regex("Submitted batch job (\\d+)")))
      << first_log;
  EXPECT_NE(first_log.find("cluster_job: resubmitted"), std::string::npos) << first_log;

  const std::string second = resubmission[1].str();
  EXPECT_EQ(wait_for_end(dir, second, 300), "COMPLETED");
  EXPECT_EQ(job_field(dir, second, "ExitCode"), "0:0");
  const std::string second_log = job_log(dir, second);
  EXPECT_NE(second_log.find("restarted from run/checkpoint_"), std::string::npos) << second_log;
  EXPECT_NE(second_log.find("cluster_job: converged"), std::string::npos) << second_log;
  expect_reference_answer(dir, reference);
}

TEST_F(Scheduler, CancelWithTermStopsTheJobCleanlyAndASecondSubmissionConverges) {
  const fs::path dir = scratch_->path() / "cancel";
  write_case(dir);
  const auto reference = reference_history(dir);

  const std::string first = submit(dir, job_settings(true), "submit1");
  ASSERT_TRUE(wait_until([&] { return history_rows(dir / "run") > 60; }, 120))
      << "the job did not start iterating; state " << job_field(dir, first, "JobState");
  ASSERT_LT(history_rows(dir / "run"), static_cast<int>(reference.rows.size()) - 60);
  // TERM to every process of the job (batch shell, launcher, ranks), as a user's cancel does.
  const ProgramResult signalled =
      run_executable("scancel", dir, {"--full", "--signal=TERM", first}, dir / "logs", "scancel");
  ASSERT_EQ(signalled.exit_status, 0) << signalled.err;

  EXPECT_EQ(wait_for_end(dir, first, 120), "FAILED");
  EXPECT_EQ(job_field(dir, first, "ExitCode"), "5:0");
  const std::string first_log = job_log(dir, first);
  EXPECT_NE(first_log.find("cluster_job: TERM received"), std::string::npos) << first_log;
  EXPECT_NE(first_log.find("cluster_job: stopped with checkpoint run/checkpoint_"), std::string::npos)
      << first_log;
  // A cancel is not the time limit: the job does not resubmit itself.
  EXPECT_EQ(first_log.find("Submitted batch job"), std::string::npos) << first_log;
  EXPECT_EQ(json_field(dir / "run" / "summary.json", "status"), "stopped");

  const std::string second = submit(dir, job_settings(false), "submit2");
  EXPECT_EQ(wait_for_end(dir, second, 300), "COMPLETED");
  EXPECT_EQ(job_field(dir, second, "ExitCode"), "0:0");
  const std::string second_log = job_log(dir, second);
  EXPECT_NE(second_log.find("restarted from run/checkpoint_"), std::string::npos) << second_log;
  EXPECT_NE(second_log.find("cluster_job: converged"), std::string::npos) << second_log;
  expect_reference_answer(dir, reference);
}
