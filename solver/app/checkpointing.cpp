#include "app/checkpointing.hpp"

#include <cstdio>
#include <filesystem>

#include "core/error.hpp"
#include "io/checkpoint.hpp"

namespace wallrans {

struct RunCheckpoints::Arrays {
  std::vector<CellArray> cells;
  BoundaryLayout layout;
  std::vector<BoundaryArray> boundary;
  std::vector<std::pair<std::string, double*>> scalars;
  int* iteration;
};

RunCheckpoints::RunCheckpoints(const CaseSpec& spec, const Grid& grid, FlowSolver& solver,
                               TurbulenceModel& model, const std::string& case_text)
    : spec_(spec), grid_(grid), solver_(solver), model_(model), case_hash_(text_hash(case_text)) {}

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
  meta.case_hash = case_hash_;
  meta.program_version = WALLRANS_VERSION;
  for (const auto& [name, value] : a.scalars) meta.scalars.push_back({name, *value});
  const std::string base = "checkpoint_" + std::to_string(meta.iteration);
  const std::string path = (std::filesystem::path(directory) / (base + ".h5")).string();
  const CheckpointMetadata written =
      write_checkpoint(grid_, path, meta, a.cells, a.layout, a.boundary, abort_after_datasets);
  if (grid_.rank() == 0) {
    std::vector<std::string> names;
    for (const auto& c : a.cells) names.push_back(c.name);
    write_checkpoint_xdmf((std::filesystem::path(directory) / (base + ".xmf")).string(), base + ".h5",
                          written, names);
    prune_checkpoints(directory, "checkpoint", spec_.checkpoint.keep);
  }
  check_mpi(MPI_Barrier(grid_.comm()));
  return path;
}

int RunCheckpoints::restart_from(const std::string& path) {
  const CheckpointMetadata meta = read_checkpoint_metadata(grid_.comm(), path);
  auto mismatch = [&](const std::string& what, const std::string& expected, const std::string& got) {
    throw InputError(path + ": " + what + ": expected " + expected + " (the case), got " + got);
  };
  if (meta.cells_x != grid_.cells_x() || meta.cells_y != grid_.cells_y()) {
    mismatch("grid size", std::to_string(grid_.cells_x()) + " x " + std::to_string(grid_.cells_y()),
             std::to_string(meta.cells_x) + " x " + std::to_string(meta.cells_y));
  }
  const std::string fingerprint = grid_fingerprint(grid_.nodes());
  if (meta.grid_fingerprint != fingerprint) mismatch("grid fingerprint", fingerprint, meta.grid_fingerprint);
  if (meta.model != spec_.turbulence.model || meta.variant != spec_.turbulence.variant) {
    mismatch("turbulence model", spec_.turbulence.model + "/" + spec_.turbulence.variant,
             meta.model + "/" + meta.variant);
  }
  Arrays a = arrays();
  for (const auto& [name, value] : a.scalars) {
    bool found = false;
    for (const auto& [stored, stored_value] : meta.scalars) {
      if (stored == name) {
        *value = stored_value;
        found = true;
      }
    }
    if (!found) mismatch("scalar '" + name + "'", "it to be stored", "no such scalar");
  }
  read_checkpoint(grid_, path, a.cells, a.layout, a.boundary);
  *a.iteration = meta.iteration;
  solver_.restarted();
  if (grid_.rank() == 0 && meta.case_hash != case_hash_) {
    std::printf(
        "wallrans: note: %s was written by a different case file (settings changed since); continuing\n",
        path.c_str());
  }
  return meta.iteration;
}

}  // namespace wallrans
