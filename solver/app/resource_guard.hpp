// Resource guards, checked before anything large is allocated: grid sizes the solver cannot
// address are refused, and so is a run whose estimated memory does not fit into what each host
// has available (MemAvailable and the memory limits of the process's cgroups).
#pragma once

#include <mpi.h>

#include <filesystem>
#include <string>
#include <vector>

#include "core/case_spec.hpp"

namespace wallrans {

/// The most cells a grid may have: PETSc's 32-bit indices must address the 5 entries per row of a
/// 5-point matrix of the whole grid, 5 n < 2^31.
inline constexpr long long max_grid_cells = 429496729;

/// Local. Throws InputError "<case>:<line>: key 'grid.cells': expected at most 429496729 cells
/// ..., got ..." if cells_x * cells_y exceeds max_grid_cells (computed without overflow).
void check_cell_count(const CaseSpec& spec, long long cells_x, long long cells_y);

/// What is being sized: a whole run (solver and model, `run` and `check`), or the grid alone
/// (`write-grid`).
enum class MemoryUse { run, grid_only };

struct MemoryEstimate {
  double bytes_per_rank = 0.0;  ///< peak resident memory of the largest rank [B]
  double bytes_per_cell = 0.0;  ///< the part that grows with the rank's cells [B per cell]
  double cells = 0.0;           ///< cells of the whole grid
};

/// Local. Estimated peak resident memory of one rank (the largest) of a run of `spec` on a grid
/// of cells_x x cells_y cells split over `ranks` ranks (DEVELOPERS.md, Resource guards).
MemoryEstimate estimate_memory(const CaseSpec& spec, long long cells_x, long long cells_y, int ranks,
                               MemoryUse use);

/// One limit on the memory of this process: what is still available under it and its words.
struct MemoryLimit {
  double available_bytes = 0.0;
  std::string description;  ///< e.g. "MemAvailable" or "cgroup limit 2 GiB (/sys/fs/cgroup/...)"
};

/// Local. The memory limits of this process: MemAvailable of /proc/meminfo, and every cgroup
/// level (v1 memory controller or v2) from the process's cgroup up to the root that has a memory
/// limit, each with limit - usage + inactive file cache available. `root` is prepended to /proc
/// and /sys (tests give a directory tree of their own). Unreadable files are skipped.
std::vector<MemoryLimit> memory_limits(const std::filesystem::path& root = "/");

/// What check_memory reports: the estimate, the host that is fullest, its ranks and the limit.
struct MemoryVerdict {
  MemoryEstimate estimate;
  std::string host;
  int ranks_on_host = 1;
  double needed_bytes = 0.0;     ///< still to be allocated on that host by its ranks
  double available_bytes = 0.0;  ///< the tightest limit of that host
  std::string limit;             ///< its description
};

/// Collective. Estimates the memory of `use` and compares, host by host (ranks sharing memory),
/// what the host's ranks still have to allocate with the tightest memory limit of the host.
/// Throws the same InputError on every rank if some host cannot hold its ranks: "<origin>:
/// expected a grid whose run fits into memory, got ... needing about X on host H (N rank(s))
/// with Y available (limit); ...". `origin` names the case file, line and key of the grid.
MemoryVerdict check_memory(MPI_Comm comm, const CaseSpec& spec, long long cells_x, long long cells_y,
                           MemoryUse use, const std::string& origin);

/// Local. "1.5 GiB", "320 MiB", "12 kiB": bytes in binary units, 3 significant digits.
std::string format_bytes(double bytes);

}  // namespace wallrans
