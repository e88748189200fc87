// Resource guards: the memory limits read from /proc and cgroup files (v1 and v2 trees written
// here, so each expected value is limit - usage + inactive file cache of the files), and the cell
// count that 32-bit PETSc indices can address.
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <random>
#include <string>

#include "app/resource_guard.hpp"
#include "core/error.hpp"

using namespace wallrans;
namespace fs = std::filesystem;

namespace {

class FakeRoot {
 public:
  FakeRoot() {
    std::random_device entropy;
    path_ = fs::temp_directory_path() /
            ("wallrans_guard_" + std::to_string(entropy()) + std::to_string(entropy()));
    fs::create_directories(path_);
  }
  ~FakeRoot() {
    std::error_code ignored;
    fs::remove_all(path_, ignored);
  }
  void write(const std::string& relative, const std::string& text) const {
    fs::create_directories((path_ / relative).parent_path());
    std::ofstream(path_ / relative) << text;
  }
  const fs::path& path() const { return path_; }

 private:
  fs::path path_;
};

constexpr double kib = 1024.0, mib = 1024.0 * 1024.0;

}  // namespace

TEST(MemoryLimits, MemAvailableAndEveryLimitedLevelOfACgroupV2Tree) {
  FakeRoot root;
  root.write("proc/meminfo", "MemTotal:       24683664 kB\nMemFree:  100 kB\nMemAvailable:   2000000 kB\n");
  root.write("proc/self/mounts", "proc /proc proc rw 0 0\ncgroup2 /sys/fs/cgroup cgroup2 rw,nosuid 0 0\n");
  root.write("proc/self/cgroup", "0::/jobs/job42/step0\n");
  // The job limits memory to 512 MiB (300 MiB used, 20 MiB inactive file cache); its step and
  // the root have no limit ("max" and no file).
  root.write("sys/fs/cgroup/jobs/job42/memory.max", "536870912\n");
  root.write("sys/fs/cgroup/jobs/job42/memory.current", "314572800\n");
  root.write("sys/fs/cgroup/jobs/job42/memory.stat",
             "anon 1\nfile 2\ninactive_file 20971520\nactive_file 3\n");
  root.write("sys/fs/cgroup/jobs/job42/step0/memory.max", "max\n");
  root.write("sys/fs/cgroup/jobs/job42/step0/memory.current", "1000\n");
  const auto limits = memory_limits(root.path());
  ASSERT_EQ(limits.size(), 2u);
  EXPECT_EQ(limits[0].description, "MemAvailable");
  EXPECT_DOUBLE_EQ(limits[0].available_bytes, 2000000 * kib);
  EXPECT_DOUBLE_EQ(limits[1].available_bytes, (512.0 - 300.0 + 20.0) * mib);
  EXPECT_EQ(limits[1].description, "cgroup limit 512 MiB in /sys/fs/cgroup/jobs/job42");
}

TEST(MemoryLimits, CgroupV1MemoryControllerOfAHybridMachine) {
  FakeRoot root;
  root.write("proc/meminfo", "MemAvailable:   8000000 kB\n");
  root.write("proc/self/mounts",
             "cgroup /sys/fs/cgroup/cpu cgroup rw,relatime,cpu 0 0\n"
             "cgroup /sys/fs/cgroup/memory cgroup rw,relatime,memory 0 0\n"
             "cgroup2 /sys/fs/cgroup/unified cgroup2 rw,relatime 0 0\n");
  root.write("proc/self/cgroup", "4:memory:/batch/7\n1:cpu:/\n0::/\n");
  // v1 writes "unlimited" as the largest page-aligned 64-bit value.
  root.write("sys/fs/cgroup/memory/memory.limit_in_bytes", "9223372036854771712\n");
  root.write("sys/fs/cgroup/memory/memory.usage_in_bytes", "5000000\n");
  root.write("sys/fs/cgroup/memory/batch/7/memory.limit_in_bytes", "1073741824\n");
  root.write("sys/fs/cgroup/memory/batch/7/memory.usage_in_bytes", "1048576000\n");
  root.write("sys/fs/cgroup/memory/batch/7/memory.stat",
             "cache 5\ninactive_file 9\ntotal_inactive_file 4194304\n");
  const auto limits = memory_limits(root.path());
  ASSERT_EQ(limits.size(), 2u);
  EXPECT_DOUBLE_EQ(limits[0].available_bytes, 8000000 * kib);
  EXPECT_DOUBLE_EQ(limits[1].available_bytes, 1073741824.0 - 1048576000.0 + 4194304.0);
  EXPECT_EQ(limits[1].description, "cgroup limit 1 GiB in /sys/fs/cgroup/memory/batch/7");
}

TEST(MemoryLimits, NothingReadableMeansNoLimits) {
  FakeRoot root;
  EXPECT_TRUE(memory_limits(root.path()).empty());
}

TEST(CellCount, AtMostWhat32BitIndicesAddressForAFivePointMatrix) {
  CaseSpec spec;
  spec.source_file = "case.yaml";
  spec.grid.line = 7;
  // 5 n < 2^31: n = 429496729 is the largest count (5 n = 2147483645).
  EXPECT_NO_THROW(check_cell_count(spec, 429496729, 1));
  EXPECT_NO_THROW(check_cell_count(spec, 20000, 20000));
  try {
    check_cell_count(spec, 200000, 200000);
    ADD_FAILURE() << "no InputError";
  } catch (const InputError& e) {
    EXPECT_EQ(
        std::string(e.what()),
        "case.yaml:7: key 'grid.cells': expected at most 429496729 cells in all (PETSc's 32-bit indices "
        "address 5 matrix entries per cell), got 200000 x 200000 = 4e+10 cells");
  }
  EXPECT_THROW(check_cell_count(spec, 429496730, 1), InputError);
}

TEST(FormatBytes, BinaryUnitsWithThreeDigits) {
  EXPECT_EQ(format_bytes(512.0), "512 B");
  EXPECT_EQ(format_bytes(1536.0), "1.5 kiB");
  EXPECT_EQ(format_bytes(695.0 * 1024 * 1024 * 1024), "695 GiB");
}
