// Faults under the real program: a run directory that cannot be written, a disk that fills up
// while the run writes its checkpoint, and a linear solve of the model equation that breaks down.
#include <gtest/gtest.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cstdlib>
#include <filesystem>
#include <string>
#include <vector>

#include "program_runner.hpp"
#include "run_fixtures.hpp"

namespace fs = std::filesystem;
using namespace wallrans::test_support;

namespace {

// A small file system of its own (tmpfs) mounted at `path`, unmounted on destruction. Needs root
// with permission to mount; `error` says why not otherwise.
class TinyFileSystem {
 public:
  TinyFileSystem(const fs::path& path, const std::string& options) : path_(path) {
    fs::create_directories(path);
    if (geteuid() != 0) {
      error_ = "not running as root";
      return;
    }
    const std::string command = "mount -t tmpfs -o " + options + " tmpfs '" + path.string() + "' 2>/dev/null";
    mounted_ = std::system(command.c_str()) == 0;
    if (!mounted_) error_ = "mount -t tmpfs failed (no permission to mount here)";
  }
  TinyFileSystem(const TinyFileSystem&) = delete;
  TinyFileSystem& operator=(const TinyFileSystem&) = delete;
  ~TinyFileSystem() {
    if (mounted_ && std::system(("umount '" + path_.string() + "'").c_str()) != 0)
      ADD_FAILURE() << "cannot unmount " << path_;
  }
  bool mounted() const { return mounted_; }
  const std::string& error() const { return error_; }

 private:
  fs::path path_;
  bool mounted_ = false;
  std::string error_;
};

}  // namespace

// Root ignores permission bits, so as root the place is a read-only tmpfs; otherwise a directory
// without write permission.
TEST(Faults, UnwritableRunDirectoryIsBadInputAndNothingIsWritten) {
  ScratchDirectory scratch("wallrans_fault_readonly");
  write_text(scratch.path() / "cavity.yaml", cavity_case("cavity", 8, 1e-300, 3));
  const fs::path place = scratch.path() / "locked";
  std::unique_ptr<TinyFileSystem> read_only;
  if (geteuid() == 0) {
    read_only = std::make_unique<TinyFileSystem>(place, "ro,size=64k");
    if (!read_only->mounted()) GTEST_SKIP() << "needs a read-only tmpfs as root: " << read_only->error();
  } else {
    fs::create_directories(place);
    fs::permissions(place, fs::perms::owner_read | fs::perms::owner_exec);
  }
  struct Target {
    std::string output_dir, mention;
  };
  for (const Target& target : {Target{"locked/run", "expected a directory that can be created"},
                               Target{"locked", "expected a directory this run can write to"}}) {
    for (const char* command : {"check", "run"}) {
      // `run` on 2 ranks (every rank must refuse together), `check` on 1.
      const std::vector<std::string> args{command, "cavity.yaml", "--output-dir", target.output_dir};
      const auto result = command == std::string("run")
                              ? run_program_mpi(2, scratch.path(), args, scratch.path() / "logs", command)
                              : run_program(scratch.path(), args, scratch.path() / "logs", command);
      EXPECT_EQ(result.exit_status, 2) << command << " " << target.output_dir << ": " << result.err;
      std::vector<std::string> lines;
      for (const auto& line : lines_of(result.err))
        if (line.rfind("wallrans", 0) == 0) lines.push_back(line);
      ASSERT_EQ(lines.size(), 1u) << result.err;
      EXPECT_NE(lines[0].find("command line: --output-dir: " + target.mention), std::string::npos)
          << lines[0];
      EXPECT_TRUE(lines[0].find("Read-only file system") != std::string::npos ||
                  lines[0].find("Permission denied") != std::string::npos)
          << lines[0];
    }
  }
  EXPECT_TRUE(fs::is_empty(place));
  if (!read_only) fs::permissions(place, fs::perms::owner_all);
}

// The checkpoint at the end (about 59 kB for 24 x 24 cells) does not fit into a 48 kB file system
// that holds the run's small files (one 4 kB page each on tmpfs) and its history.
TEST(Faults, DiskFullDuringACheckpointFailsWithASummaryAndNoTornFile) {
  ScratchDirectory scratch("wallrans_fault_full");
  write_text(scratch.path() / "cavity.yaml", cavity_case("cavity", 24, 1e-300, 30));
  TinyFileSystem tiny(scratch.path() / "tiny", "size=48k");
  if (!tiny.mounted()) GTEST_SKIP() << "the disk-full test needs a tiny tmpfs: " << tiny.error();
  const auto result =
      run_program_mpi(2, scratch.path(), {"run", "cavity.yaml", "--output-dir", "tiny/run", "--quiet"},
                      scratch.path() / "logs", "full");
  EXPECT_EQ(result.exit_status, 1) << result.err;
  EXPECT_NE(result.err.find("tiny/run/checkpoint_30.h5: checkpoint not written ("), std::string::npos)
      << result.err;
  const fs::path out = scratch.path() / "tiny" / "run";
  EXPECT_EQ(json_field(out / "summary.json", "status"), "failed");
  EXPECT_NE(json_field(out / "summary.json", "detail").find("checkpoint not written"), std::string::npos);
  EXPECT_EQ(history_rows(out), 30) << "every completed iteration stays in the history";
  for (const auto& entry : fs::directory_iterator(out)) {
    const std::string name = entry.path().filename().string();
    EXPECT_FALSE(name.ends_with(".h5") || name.ends_with(".tmp")) << name << ": torn or leftover file";
  }
  EXPECT_FALSE(fs::exists(out / "run.lock"));
}

// The model equation's linear solve is checked like the momentum and pressure solves: a
// breakdown (here Richardson iteration without preconditioner, scaled 1000 times too far, which
// PETSc stops as diverged once the residual has grown 1e5-fold) is reported on the residual line.
TEST(Faults, TurbulenceLinearSolveBreakdownIsReported) {
  ScratchDirectory scratch("wallrans_fault_turbulence_solve");
  const std::string channel_case = std::string(WALLRANS_SOURCE_DIR) + "/configs/channel_sa_re180.yaml";
  const std::vector<std::string> run{"run", channel_case, "--output-dir", "run", "--max-iterations", "2"};
  const auto plain = run_program(scratch.path(), run, scratch.path() / "logs", "plain");
  ASSERT_EQ(plain.exit_status, 3) << plain.err;
  EXPECT_EQ(plain.out.find("a linear solve broke down"), std::string::npos) << plain.out;
  std::vector<std::string> broken = run;
  broken[3] = "broken";
  for (const char* option : {"-turbulence_ksp_type", "richardson", "-turbulence_ksp_richardson_scale", "1e3",
                             "-turbulence_pc_type", "none"})
    broken.push_back(option);
  const auto result = run_program(scratch.path(), broken, scratch.path() / "logs", "broken");
  EXPECT_EQ(result.exit_status, 3) << result.err;
  EXPECT_NE(result.out.find("(a linear solve broke down)"), std::string::npos) << result.out;
}
