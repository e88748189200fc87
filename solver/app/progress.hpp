// Live progress of a run: seconds per iteration and an estimate of the time to the convergence
// target from the recent slope of the log residuals; the text goes to the terminal (with a
// one-line display that updates in place when stdout is a terminal) and to progress.log.
#pragma once

#include <cstdio>
#include <filesystem>
#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace wallrans {

/// The file in the run directory that receives every line the run prints (also under --quiet).
inline constexpr const char* progress_log_name = "progress.log";

/// Estimates how long a run still needs: each residual's log10 is fitted by a straight line over
/// the recent iterations (least squares), and the line is extended to the target. Local.
class ConvergenceEstimate {
 public:
  /// `target`: the residual every equation must fall below; `window`: iterations in the fit (>= 2).
  explicit ConvergenceEstimate(double target, int window = 50);

  /// Records the normalised residuals of `iteration`, `elapsed_s` seconds after the run started.
  void add(int iteration, const std::vector<double>& residuals, double elapsed_s);

  /// Mean wall-clock seconds per iteration over the window; nullopt before two iterations.
  std::optional<double> seconds_per_iteration() const;
  /// Iterations until every residual is below the target at the recent rates: the largest over
  /// the residuals still above it (0 if none is). nullopt when one of those does not decrease,
  /// or before 5 iterations are in the window.
  std::optional<double> iterations_to_target() const;
  /// iterations_to_target() times seconds_per_iteration().
  std::optional<double> seconds_to_target() const;

 private:
  struct Sample {
    int iteration;
    double elapsed_s;
    std::vector<double> log_residuals;  // log10; -inf for a zero residual
  };
  double log_target_;
  size_t window_;
  std::vector<Sample> samples_;  // the last window_ samples, oldest first
};

/// Where the text of a run goes. Rank 0 holds one (the other ranks none). Local.
class ProgressOutput {
 public:
  /// Opens <directory>/progress.log (appending when `append`, e.g. after a restart). `quiet`: the
  /// terminal gets only final(); `live`: a one-line display is kept up to date (stdout must be a
  /// terminal; see stdout_is_terminal). Throws Error if the log cannot be opened.
  ProgressOutput(const std::filesystem::path& directory, bool append, bool quiet, bool live);
  ProgressOutput(const ProgressOutput&) = delete;
  ProgressOutput& operator=(const ProgressOutput&) = delete;
  ~ProgressOutput();

  /// A finished line (no trailing newline): to the log and, unless quiet, to stdout.
  void line(const std::string& text);
  /// The run's final line: to the log and always to stdout.
  void final(const std::string& text);
  /// The live display: replaces the current in-place line on the terminal (at most 5 times a
  /// second); nothing without `live`.
  void status(const std::string& text);

 private:
  void clear_status();
  struct CloseFile {
    void operator()(std::FILE* file) const noexcept { std::fclose(file); }
  };
  std::unique_ptr<std::FILE, CloseFile> log_;
  bool quiet_, live_;
  bool status_shown_ = false;
  double last_status_ = -1.0;
};

/// Local. Whether stdout is a terminal (isatty), so a live display makes sense; under Open MPI's
/// launcher (which gives each rank a pseudo-terminal) whether the launcher's stdout is one.
bool stdout_is_terminal();

/// Local. A report row: iteration, the normalised residuals, elapsed seconds, seconds per
/// iteration and the estimated seconds to the target ("-" when unknown, ">cap" when the estimate
/// passes the iteration cap `iterations_left` away). `note` is appended.
std::string progress_row(int iteration, const std::vector<double>& residuals, double elapsed_s,
                         const ConvergenceEstimate& estimate, int iterations_left, const std::string& note);

/// Local. The header of progress_row() for the residual names given (e.g. "u", "v", "mass").
std::string progress_header(const std::vector<std::string>& residual_names);

}  // namespace wallrans
