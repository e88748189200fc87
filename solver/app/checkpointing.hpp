// A run's checkpoints: the solver's and the model's restart state written to and read from
// parallel HDF5 files checkpoint_<iteration>.h5 (+ .xmf) in the run directory, each marked with
// the case it belongs to (app/case_identity.hpp).
#pragma once

#include <mpi.h>

#include <optional>
#include <string>
#include <vector>

#include "core/case_spec.hpp"
#include "coupling/flow_solver.hpp"
#include "models/turbulence_model.hpp"

namespace wallrans {

class RunCheckpoints {
 public:
  /// `case_id` is the case's identity (case_identity()); it goes into each checkpoint's metadata
  /// as its case hash.
  RunCheckpoints(const CaseSpec& spec, const Grid& grid, FlowSolver& solver, TurbulenceModel& model,
                 std::string case_id);

  /// Collective. Validates `path` against this case (check_restart_file, then the scalars and
  /// every dataset) and reads the state into solver and model. Throws InputError naming the file
  /// and what was expected; nothing has been written at that point. Returns the iteration of the
  /// checkpoint; prints a note (rank 0) if it was written for another case (settings changed).
  int restart_from(const std::string& path);

  /// Collective. Writes <directory>/checkpoint_<iteration>.h5 and its .xmf, then keeps only the
  /// newest `keep` checkpoints of this case (other files are never touched). Returns the path.
  /// `abort_after_datasets` >= 0 is the test-only kill switch of write_checkpoint.
  std::string write(const std::string& directory, int abort_after_datasets = -1);

 private:
  struct Arrays;
  Arrays arrays();
  const CaseSpec& spec_;
  const Grid& grid_;
  FlowSolver& solver_;
  TurbulenceModel& model_;
  std::string case_id_;
};

/// Collective. Checks that `path` is a readable checkpoint that fits this case: file type, grid
/// size and fingerprint, turbulence model and variant. Throws the same InputError on every rank,
/// naming the file and what was expected. Needs no solver, so `check` runs it too.
void check_restart_file(MPI_Comm comm, const std::string& path, const CaseSpec& spec, const Grid& grid);

/// Local. Whether `path` is a checkpoint whose metadata names the case `case_id` (false for
/// unreadable files).
bool is_checkpoint_of_case(const std::string& path, const std::string& case_id);

/// Collective. The newest checkpoint (by iteration) of the case `case_id` in `directory`, if any;
/// the same answer on every rank.
std::optional<std::string> newest_checkpoint_of_case(MPI_Comm comm, const std::string& directory,
                                                     const std::string& case_id);

}  // namespace wallrans
