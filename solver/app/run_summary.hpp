// summary.json: how a run ended, for people and scripts, and the answers the case was run for.
// It is written when the run claims its directory (status "running") and rewritten at every
// ending, so it never describes an earlier run.
#pragma once

#include <filesystem>
#include <limits>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "app/run_answers.hpp"

namespace wallrans {

/// How a run ended (or that it has not yet) and the exit code that goes with it.
enum class RunStatus { running, converged, capped, diverged, stopped, failed };

/// "running", "converged", "capped" (iteration cap), "diverged", "stopped", "failed".
const char* to_string(RunStatus status);

/// The process exit code of an ending: 0 converged, 3 capped, 4 diverged, 5 stopped, 1 failed
/// (running has none: -1).
int exit_code(RunStatus status);

/// One coarse grid of the nested start.
struct CoarseGridSummary {
  int cells_x = 0, cells_y = 0, iterations = 0;
  bool converged = false;
};

struct RunSummary {
  RunStatus status = RunStatus::running;
  std::string title, case_file, case_id, model;
  std::string model_variant;  ///< turbulence.variant ("" for none)
  std::string grid_source;    ///< "generator <name>" or "file <path>"
  std::string host, started;  ///< rank 0's host and the claim time (UTC)
  long pid = 0;               ///< rank 0's process id
  int ranks = 1, cells_x = 0, cells_y = 0;
  int first_iteration = 0;  ///< iteration restarted from (0: from the start)
  std::string restarted_from;  ///< the checkpoint restarted from ("" for a start from iteration 0)
  int iteration = 0;        ///< last iteration done
  double residual_u = std::numeric_limits<double>::quiet_NaN();
  double residual_v = std::numeric_limits<double>::quiet_NaN();
  double residual_continuity = std::numeric_limits<double>::quiet_NaN();
  /// The model equations' final normalised residuals, by the model's names (e.g. "nu_tilde").
  std::vector<std::pair<std::string, double>> model_residuals;
  double residual_drop = 0.0;
  double wall_time_s = 0.0;
  std::string checkpoint;  ///< newest checkpoint written by this run (file name), empty if none
  /// Nested start: the coarse grids, and their work in iterations of the case's grid
  /// (iterations x cells share).
  std::vector<CoarseGridSummary> coarse_grids;
  double coarse_work = 0.0;
  double reference_velocity = 1.0;        ///< U_ref of Cf and Cp [m/s]
  bool reference_velocity_given = false;  ///< false: the default (flow.reference_velocity not set)
  std::optional<RunAnswers> answers;      ///< set once the outputs are written
  std::string detail;                     ///< why it stopped, diverged or failed
  std::vector<std::string> warnings;  ///< e.g. PETSc options nobody used, first-cell y+ above 1
  /// Mass balance and periodic driving: JSON members (app/flow_report.hpp), empty until the outputs.
  std::string flow_report_json;
  std::string diagnostic_file;  ///< diverged: the file with the fields of the last good iteration
  /// Closures that integrate to the wall: the largest first-cell y+ and its wall-face centre.
  double max_first_cell_y_plus = std::numeric_limits<double>::quiet_NaN();
  double max_y_plus_x = std::numeric_limits<double>::quiet_NaN();
  double max_y_plus_y = std::numeric_limits<double>::quiet_NaN();
};

/// Local. The JSON text of `summary` (non-finite numbers become null).
std::string summary_json(const RunSummary& summary);

/// Local (rank 0). Replaces <directory>/summary.json atomically; if that fails (a full disk has no
/// room for the temporary copy) it overwrites the file in place. Throws Error if both fail.
void write_summary(const std::filesystem::path& directory, const RunSummary& summary);

}  // namespace wallrans
