// What a diverging run says and leaves: the equation whose residual ran away, the cell where its
// field went wrong, a hint on what to change, and the fields of the last good iteration in a file
// of their own (the run's checkpoints stay as they were).
#pragma once

#include <filesystem>
#include <string>
#include <vector>

#include "core/case_spec.hpp"
#include "coupling/flow_solver.hpp"

namespace wallrans {

/// Local. The residual limit of a run: a normalised momentum or continuity residual above it (or
/// any residual that is not finite) is divergence.
inline constexpr double runaway_residual = 1e8;

/// Local. Whether `status` shows divergence: a non-finite residual, or a momentum or continuity
/// residual above runaway_residual.
bool is_diverged(const IterationStatus& status);

class DivergenceWatch {
 public:
  /// Local. Watches the velocity, pressure, eddy viscosity and the model's variables of `solver`
  /// and `model` (which must outlive the watch).
  DivergenceWatch(const FlowSolver& solver, const TurbulenceModel& model);

  /// Local. Keeps the current fields as the last good state of `iteration` (and, per cell, how
  /// much each field changed since the previous good state).
  void keep(int iteration);

  /// Collective. For a diverged `status`: names the equation, the cell (i, j) with its centre and
  /// value where its field went wrong (a non-finite value, or the largest change of the last
  /// iteration), the iteration and what to change in `spec`; writes the fields of the last good
  /// iteration to <directory>/diverged_fields.pvts (and its pieces). Returns the one-line detail;
  /// `file` gets the written file's name ("" if there was no good iteration yet).
  std::string diagnose(const IterationStatus& status, const CaseSpec& spec,
                       const std::filesystem::path& directory, std::string& file) const;

 private:
  struct Watched {
    std::string name;  ///< field name (output and messages)
    const Field* now;
    Field good, change;
  };
  /// What locate() ranks cells by: non-finite values, the change of the last iteration, or the
  /// magnitude.
  enum class Mode { non_finite, change, magnitude };
  struct Location {
    double score = -1.0;  ///< the best cell's score (> 0 if one was found)
    double count = 0.0;   ///< cells of this mode (non-finite ones) over all ranks
    int i = 0, j = 0, rank = 0;
  };
  /// Collective. The owned cell of `w` with the highest score of `mode`, over all ranks.
  Location locate(const Watched& w, Mode mode, bool has_good) const;

  const FlowSolver& solver_;
  const TurbulenceModel& model_;
  std::vector<Watched> fields_;  // velocity_x, velocity_y, pressure, eddy_viscosity, model fields
  int good_iteration_ = -1;
};

}  // namespace wallrans
