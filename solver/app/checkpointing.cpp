#include "app/checkpointing.hpp"

#include <sys/statvfs.h>

#include <cstdio>
#include <filesystem>

#include "core/error.hpp"
#include "io/checkpoint.hpp"
#include "io/rank_agreement.hpp"

namespace wallrans {

namespace fs = std::filesystem;

struct RunCheckpoints::Arrays {
  std::vector<CellArray> cells;
  BoundaryLayout layout;
  std::vector<BoundaryArray> boundary;
  std::vector<std::pair<std::string, double*>> scalars;
  int* iteration;
};

RunCheckpoints::RunCheckpoints(const CaseSpec& spec, const Grid& grid, FlowSolver& solver,
                               TurbulenceModel& model, std::string case_id)
    : spec_(spec), grid_(grid), solver_(solver), model_(model), case_id_(std::move(case_id)) {}

RunCheckpoints::Arrays RunCheckpoints::arrays() {
  Arrays a;
  SolverRestartState state = solver_.restart_state();
  for (const auto& [name, field] : state.cells) a.cells.push_back({name, field});
  for (const auto& [name, field] : model_.restart_state()) a.cells.push_back({"model_" + name, field});
  a.layout = {state.boundary_ids, state.n_boundary_faces};
  for (const auto& [name, values] : state.boundary) a.boundary.push_back({name, values});
  a.scalars = state.scalars;
  a.iteration = state.iteration;
  return a;
}

std::string RunCheckpoints::write(const std::string& directory, int abort_after_datasets) {
  Arrays a = arrays();
  CheckpointMetadata meta;
  meta.iteration = *a.iteration;
  meta.model = spec_.turbulence.model;
  meta.variant = spec_.turbulence.variant;
  meta.case_hash = case_id_;
  meta.program_version = WALLRANS_VERSION;
  for (const auto& [name, value] : a.scalars) meta.scalars.push_back({name, *value});
  const std::string base = "checkpoint_" + std::to_string(meta.iteration);
  const std::string path = (fs::path(directory) / (base + ".h5")).string();
  CheckpointMetadata written;
  try {
    written = write_checkpoint(grid_, path, meta, a.cells, a.layout, a.boundary, abort_after_datasets);
  } catch (const InputError&) {
    throw;
  } catch (const Error& e) {
    // Every rank gets the same error; name the file and how much room its file system has left
    // (parallel HDF5 does not pass the system's reason on).
    struct statvfs space {};
    const std::string room =
        statvfs(directory.c_str(), &space) == 0
            ? std::to_string(static_cast<unsigned long long>(space.f_bavail) * space.f_frsize) +
                  " bytes free on its file system"
            : "free space unknown";
    throw Error(path + ": checkpoint not written (" + room + "): " + e.what());
  }
  std::optional<Failure> failure;
  if (grid_.rank() == 0) {
    failure = attempt([&] {
      std::vector<std::string> names;
      for (const auto& c : a.cells) names.push_back(c.name);
      write_checkpoint_xdmf((fs::path(directory) / (base + ".xmf")).string(), base + ".h5", written, names);
      prune_checkpoints(directory, "checkpoint", spec_.checkpoint.keep,
                        [&](const std::string& file) { return is_checkpoint_of_case(file, case_id_); });
    });
  }
  agree(grid_.comm(), failure);
  return path;
}

void check_restart_file(MPI_Comm comm, const std::string& path, const CaseSpec& spec, const Grid& grid) {
  const CheckpointMetadata meta = read_checkpoint_metadata(comm, path);
  auto mismatch = [&](const std::string& what, const std::string& expected, const std::string& got) {
    throw InputError(path + ": " + what + ": expected " + expected + " (the case), got " + got);
  };
  if (meta.cells_x != grid.cells_x() || meta.cells_y != grid.cells_y()) {
    mismatch("grid size", std::to_string(grid.cells_x()) + " x " + std::to_string(grid.cells_y()),
             std::to_string(meta.cells_x) + " x " + std::to_string(meta.cells_y));
  }
  const std::string fingerprint = grid_fingerprint(grid.nodes());
  if (meta.grid_fingerprint != fingerprint) mismatch("grid fingerprint", fingerprint, meta.grid_fingerprint);
  if (meta.model != spec.turbulence.model || meta.variant != spec.turbulence.variant) {
    mismatch("turbulence model", spec.turbulence.model + "/" + spec.turbulence.variant,
             meta.model + "/" + meta.variant);
  }
}

int RunCheckpoints::restart_from(const std::string& path) {
  check_restart_file(grid_.comm(), path, spec_, grid_);
  const CheckpointMetadata meta = read_checkpoint_metadata(grid_.comm(), path);
  Arrays a = arrays();
  for (const auto& [name, value] : a.scalars) {
    bool found = false;
    for (const auto& [stored, stored_value] : meta.scalars) {
      if (stored == name) {
        *value = stored_value;
        found = true;
      }
    }
    if (!found)
      throw InputError(path + ": scalar '" + name +
                       "': expected it to be stored (the case), got no such scalar");
  }
  read_checkpoint(grid_, path, a.cells, a.layout, a.boundary);
  *a.iteration = meta.iteration;
  solver_.restarted();
  if (grid_.rank() == 0 && meta.case_hash != case_id_) {
    std::printf(
        "wallrans: note: %s was written for another case (flow, grid, boundaries or model settings "
        "changed since); continuing from it\n",
        path.c_str());
  }
  return meta.iteration;
}

bool is_checkpoint_of_case(const std::string& path, const std::string& case_id) {
  try {
    return read_checkpoint_metadata(MPI_COMM_SELF, path).case_hash == case_id;
  } catch (const std::exception&) {
    return false;
  }
}

std::optional<std::string> newest_checkpoint_of_case(MPI_Comm comm, const std::string& directory,
                                                     const std::string& case_id) {
  const std::string newest = run_on_root(comm, [&] {
    std::string best;
    int best_iteration = -1;
    std::error_code error;
    for (fs::directory_iterator entry(directory, error), end; !error && entry != end;
         entry.increment(error)) {
      const std::string name = entry->path().filename().string();
      int iteration = -1;
      char tail = 0;
      if (std::sscanf(name.c_str(), "checkpoint_%d.h%c", &iteration, &tail) != 2 || tail != '5' ||
          name != "checkpoint_" + std::to_string(iteration) + ".h5" || iteration <= best_iteration)
        continue;
      if (!is_checkpoint_of_case(entry->path().string(), case_id)) continue;
      best = entry->path().string();
      best_iteration = iteration;
    }
    return best;
  });
  if (newest.empty()) return std::nullopt;
  return newest;
}

}  // namespace wallrans
