// Resource guards: the cell-count limit of 32-bit indices, the memory estimate of a run, and the
// memory limits of this host (MemAvailable, cgroup v1 and v2 limits).
#include "app/resource_guard.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <limits>
#include <sstream>

#include "app/text_format.hpp"
#include "core/error.hpp"
#include "io/rank_agreement.hpp"
#include "models/model_factory.hpp"

namespace wallrans {

namespace {

namespace fs = std::filesystem;

// Peak resident memory per cell of a run, by part [B per cell]. The parts are the allocations of
// a heap profile (valgrind massif at the peak of a 3-iteration run with nested start and outputs:
// the laminar cavity on 256 x 256 cells and the Spalart-Allmaras plate on 352 x 192, 1 rank);
// DEVELOPERS.md, Resource guards, compares the sums with the peak resident set at two grid sizes.
constexpr double grid_bytes = 390.0;     // metrics: 2 FaceGeometry (120 B), centre and volume (24 B);
                                         // the DMDA's index maps and scatters (126 B)
constexpr double flow_bytes = 440.0;     // 28 ghosted cell fields, face terms (6 doubles), right-hand
                                         // sides, continuity scale, boundary-face slots (4 ints)
constexpr double matrix_bytes = 125.0;   // 5-point AIJ: 5 entries x (8 B value + 4 B column), row
                                         // bookkeeping of both blocks, 5 stencil positions (4 B)
constexpr double gradient_bytes = 50.0;  // least-squares fit: 3 doubles, 4 face slots
constexpr double mean_flow_solver_bytes = 530.0;    // Krylov vectors (GMRES, CG), ILU(0) factor of
                                                    // momentum, BoomerAMG hierarchy of the pressure
                                                    // (hypre's memory complexity about 3 here);
                                                    // GMRES instead of BiCGStab: +95 B, measured
                                                    // as the peak resident set of the 352 x 192
                                                    // plate (+6.2 MiB)
constexpr double equation_transport_bytes = 180.0;  // a model equation's fields, face terms, gradient
constexpr double equation_solver_bytes = 230.0;     // its BiCGStab vectors and ILU(0) factor
constexpr double wall_model_bytes = 30.0;           // wall distance, nearest wall, y+ of a closure
constexpr double watched_field_bytes = 16.0;        // divergence watch: last good value and change of
                                                    // each watched field (app/divergence.hpp)
// Resident pages beyond the live heap (page rounding, transient output buffers): peak resident
// set slope over heap-profile total, 1.86 / 1.76 kB per cell for the cavity.
constexpr double resident_overhead = 1.06;
// On several ranks a cell costs more (off-diagonal matrix blocks, scatters, hypre's parallel
// coarsening): the slope of the cavity on 2 ranks (384^2 to 768^2 cells) is 1955 against 1860 B
// per cell on 1 rank.
constexpr double parallel_overhead = 1.05;
// Libraries and MPI buffers: the peak resident set extrapolated to zero cells (60-64 MiB measured).
constexpr double fixed_bytes = 64.0 * 1024 * 1024;
constexpr double node_bytes = 16.0;  // node coordinates, held whole by every rank

// Number after `key` in a "key value" file (meminfo in kB, memory.stat in B); -1 if absent.
double value_after(const fs::path& file, const std::string& key) {
  std::ifstream in(file);
  std::string name;
  double value = 0.0;
  while (in >> name >> value) {
    if (name == key) return value;
    in.ignore(std::numeric_limits<std::streamsize>::max(), '\n');
  }
  return -1.0;
}

// The first word of a file ("max" or a number); "" if unreadable.
std::string first_word(const fs::path& file) {
  std::ifstream in(file);
  std::string word;
  in >> word;
  return word;
}

struct CgroupMount {
  fs::path mount;  // mount point (absolute, without the test root)
  bool v2 = false;
};

// The memory cgroup hierarchies of /proc/self/mounts with this process's path in each.
std::vector<std::pair<CgroupMount, std::string>> memory_cgroups(const fs::path& root) {
  std::vector<CgroupMount> mounts;
  {
    std::ifstream in(root / "proc/self/mounts");
    std::string line;
    while (std::getline(in, line)) {
      std::istringstream words(line);
      std::string device, point, type, options;
      words >> device >> point >> type >> options;
      if (type == "cgroup2") mounts.push_back({point, true});
      if (type == "cgroup" && ("," + options + ",").find(",memory,") != std::string::npos)
        mounts.push_back({point, false});
    }
  }
  std::vector<std::pair<CgroupMount, std::string>> out;
  std::ifstream in(root / "proc/self/cgroup");
  std::string line;
  while (std::getline(in, line)) {
    const size_t first = line.find(':'), second = line.find(':', first + 1);
    if (first == std::string::npos || second == std::string::npos) continue;
    const std::string controllers = line.substr(first + 1, second - first - 1),
                      path = line.substr(second + 1);
    const bool v2 = line.substr(0, first) == "0" && controllers.empty();
    const bool v1_memory = ("," + controllers + ",").find(",memory,") != std::string::npos;
    for (const CgroupMount& m : mounts)
      if ((v2 && m.v2) || (v1_memory && !m.v2)) out.emplace_back(m, path);
  }
  return out;
}

}  // namespace

void check_cell_count(const CaseSpec& spec, long long cells_x, long long cells_y) {
  const double cells = static_cast<double>(cells_x) * static_cast<double>(cells_y);
  if (cells <= static_cast<double>(max_grid_cells)) return;
  const std::string text = significant(cells, 3);
  const std::string where = spec.source_file.empty() ? std::string("case") : spec.source_file;
  throw InputError(where + ":" + std::to_string(spec.grid.line) + ": key 'grid.cells': expected at most " +
                   std::to_string(max_grid_cells) +
                   " cells in all (PETSc's 32-bit indices address 5 matrix entries per cell), got " +
                   std::to_string(cells_x) + " x " + std::to_string(cells_y) + " = " + text + " cells");
}

MemoryEstimate estimate_memory(const CaseSpec& spec, long long cells_x, long long cells_y, int ranks,
                               MemoryUse use) {
  MemoryEstimate e;
  e.cells = static_cast<double>(cells_x) * static_cast<double>(cells_y);
  const int n_eq = transport_equations(spec.turbulence.model);
  const bool is_wall_model = spec.turbulence.model != "laminar";
  if (use == MemoryUse::grid_only) {
    e.bytes_per_cell = grid_bytes * resident_overhead;
  } else {
    e.bytes_per_cell = (grid_bytes + flow_bytes + (3 + n_eq) * matrix_bytes + (2 + n_eq) * gradient_bytes +
                        mean_flow_solver_bytes + n_eq * (equation_transport_bytes + equation_solver_bytes) +
                        (is_wall_model ? wall_model_bytes : 0.0) + (4 + n_eq) * watched_field_bytes) *
                       resident_overhead;
  }
  if (ranks > 1) e.bytes_per_cell *= parallel_overhead;
  // A rank's cells with its ghost layer: about 4 sqrt(n) more for a squarish block of n cells.
  const double local = std::ceil(e.cells / std::max(ranks, 1));
  const double ghosted = ranks > 1 ? local + 4.0 * std::sqrt(local) : local;
  // Nested start keeps the coarser grids' nodes (1/4 + 1/16 of the nodes) while the case runs.
  const double nodes = static_cast<double>(cells_x + 1) * static_cast<double>(cells_y + 1) *
                       (use == MemoryUse::run && spec.iterations.coarse_grids > 0 ? 1.3125 : 1.0);
  e.bytes_per_rank = fixed_bytes + e.bytes_per_cell * ghosted + node_bytes * nodes +
                     (spec.solid_regions.empty() ? 0.0 : e.cells);  // solid marker, whole grid
  return e;
}

std::vector<MemoryLimit> memory_limits(const fs::path& root) {
  std::vector<MemoryLimit> out;
  const double available_kb = value_after(root / "proc/meminfo", "MemAvailable:");
  if (available_kb >= 0.0) out.push_back({available_kb * 1024.0, "MemAvailable"});
  for (const auto& [cgroup, path] : memory_cgroups(root)) {
    const fs::path top = root / cgroup.mount.relative_path();
    fs::path dir = top / fs::path(path).relative_path();
    std::error_code error;
    if (!fs::is_directory(dir, error)) dir = top;  // a path of another namespace: the mount's root
    for (;;) {
      const std::string limit_text = first_word(dir / (cgroup.v2 ? "memory.max" : "memory.limit_in_bytes"));
      const std::string usage_text =
          first_word(dir / (cgroup.v2 ? "memory.current" : "memory.usage_in_bytes"));
      char* end = nullptr;
      const double limit = std::strtod(limit_text.c_str(), &end);
      // "max" (v2) or the page-rounded largest value (v1) mean no limit.
      if (!limit_text.empty() && *end == '\0' && limit < 1e18 && !usage_text.empty()) {
        double inactive =
            value_after(dir / "memory.stat", cgroup.v2 ? "inactive_file" : "total_inactive_file");
        if (inactive < 0.0) inactive = std::max(0.0, value_after(dir / "memory.stat", "inactive_file"));
        const double available = std::max(0.0, limit - std::strtod(usage_text.c_str(), nullptr) + inactive);
        const fs::path shown = fs::path("/") / fs::relative(dir, root, error);
        out.push_back({available, "cgroup limit " + format_bytes(limit) + " in " + shown.string()});
      }
      if (dir == top || !dir.has_parent_path() || dir.parent_path() == dir) break;
      dir = dir.parent_path();
    }
  }
  return out;
}

MemoryVerdict check_memory(MPI_Comm comm, const CaseSpec& spec, long long cells_x, long long cells_y,
                           MemoryUse use, const std::string& origin) {
  int size = 1, rank = 0;
  check_mpi(MPI_Comm_size(comm, &size));
  check_mpi(MPI_Comm_rank(comm, &rank));
  MemoryVerdict v;
  v.estimate = estimate_memory(spec, cells_x, cells_y, size, use);
  // What this rank still has to allocate: the estimate less what it holds already.
  const double resident = value_after("/proc/self/status", "VmRSS:") * 1024.0;
  double need = std::max(0.0, v.estimate.bytes_per_rank - std::max(resident, 0.0));
  MPI_Comm host = MPI_COMM_NULL;
  check_mpi(MPI_Comm_split_type(comm, MPI_COMM_TYPE_SHARED, rank, MPI_INFO_NULL, &host));
  int host_rank = 0;
  check_mpi(MPI_Comm_rank(host, &host_rank));
  check_mpi(MPI_Comm_size(host, &v.ranks_on_host));
  check_mpi(MPI_Allreduce(MPI_IN_PLACE, &need, 1, MPI_DOUBLE, MPI_SUM, host));
  v.needed_bytes = need;
  v.available_bytes = std::numeric_limits<double>::infinity();
  v.limit = "no limit found";
  if (host_rank == 0) {
    for (const MemoryLimit& limit : memory_limits()) {
      if (limit.available_bytes < v.available_bytes) {
        v.available_bytes = limit.available_bytes;
        v.limit = limit.description;
      }
    }
  }
  check_mpi(MPI_Bcast(&v.available_bytes, 1, MPI_DOUBLE, 0, host));
  broadcast_text(host, 0, v.limit);
  check_mpi(MPI_Comm_free(&host));
  // The host with the least room decides, and its figures go to every rank.
  struct {
    double margin;
    int rank;
  } tightest{v.available_bytes - v.needed_bytes, rank};
  check_mpi(MPI_Allreduce(MPI_IN_PLACE, &tightest, 1, MPI_DOUBLE_INT, MPI_MINLOC, comm));
  double figures[3] = {v.needed_bytes, v.available_bytes, double(v.ranks_on_host)};
  check_mpi(MPI_Bcast(figures, 3, MPI_DOUBLE, tightest.rank, comm));
  v.needed_bytes = figures[0];
  v.available_bytes = figures[1];
  v.ranks_on_host = static_cast<int>(figures[2]);
  char name[MPI_MAX_PROCESSOR_NAME];
  int length = 0;
  check_mpi(MPI_Get_processor_name(name, &length));
  v.host.assign(name, static_cast<size_t>(length));
  broadcast_text(comm, tightest.rank, v.host);
  broadcast_text(comm, tightest.rank, v.limit);
  if (v.needed_bytes > v.available_bytes) {
    const std::string cells = significant(v.estimate.cells, 3);
    throw InputError(
        origin + ": expected a grid whose " + (use == MemoryUse::run ? "run" : "grid") +
        " fits into memory, got " + cells + " cells needing about " + format_bytes(v.needed_bytes) +
        " more on host " + v.host + " (" + std::to_string(v.ranks_on_host) + " rank(s) of about " +
        format_bytes(v.estimate.bytes_per_rank) + ", " +
        std::to_string(static_cast<int>(std::lround(v.estimate.bytes_per_cell))) + " B per cell) with " +
        format_bytes(v.available_bytes) + " available (" + v.limit + "); use more hosts or a coarser grid");
  }
  return v;
}

std::string format_bytes(double bytes) {
  const char* units[] = {"B", "kiB", "MiB", "GiB", "TiB", "PiB"};
  int unit = 0;
  while (std::abs(bytes) >= 1024.0 && unit < 5) {
    bytes /= 1024.0;
    ++unit;
  }
  return significant(bytes, 3) + " " + units[unit];
}

}  // namespace wallrans
