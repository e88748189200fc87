// A run's checkpoints: the solver's and the model's restart state written to and read from
// parallel HDF5 files checkpoint_<iteration>.h5 (+ .xmf) in the run directory.
#pragma once

#include <string>
#include <vector>

#include "core/case_spec.hpp"
#include "coupling/flow_solver.hpp"
#include "models/turbulence_model.hpp"

namespace wallrans {

class RunCheckpoints {
 public:
  /// `case_text` is the resolved case (its hash goes into the metadata).
  RunCheckpoints(const CaseSpec& spec, const Grid& grid, FlowSolver& solver, TurbulenceModel& model,
                 const std::string& case_text);

  /// Collective. Validates `path` against this case (file type, grid size and fingerprint, model
  /// and variant, every dataset) and reads the state into solver and model. Throws InputError
  /// naming the file and what was expected; nothing has been written at that point. Returns the
  /// iteration of the checkpoint; prints a note (rank 0) if the case file changed since.
  int restart_from(const std::string& path);

  /// Collective. Writes <directory>/checkpoint_<iteration>.h5 and its .xmf, then keeps only the
  /// newest `keep`. `abort_after_datasets` >= 0 is the test-only kill switch of write_checkpoint.
  std::string write(const std::string& directory, int abort_after_datasets = -1);

 private:
  struct Arrays;
  Arrays arrays();
  const CaseSpec& spec_;
  const Grid& grid_;
  FlowSolver& solver_;
  TurbulenceModel& model_;
  std::string case_hash_;
};

}  // namespace wallrans
