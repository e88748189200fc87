// Drives one case: validate everything first (so bad input writes nothing), claim the run
// directory, iterate with a live residual line, and write history, fields, wall data and a
// summary that says how the run ended.
#include "app/run_case.hpp"

#include <unistd.h>

#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <memory>

#include "app/case_identity.hpp"
#include "app/case_setup.hpp"
#include "app/checkpointing.hpp"
#include "app/divergence.hpp"
#include "app/flow_report.hpp"
#include "app/petsc_option_checks.hpp"
#include "app/progress.hpp"
#include "app/resource_guard.hpp"
#include "app/run_directory.hpp"
#include "app/run_outputs.hpp"
#include "app/run_summary.hpp"
#include "app/stop_signals.hpp"
#include "app/wall_resolution.hpp"
#include "app/well_posedness.hpp"
#include "core/atomic_file.hpp"
#include "core/error.hpp"
#include "core/utc_time.hpp"
#include "coupling/flow_solver.hpp"
#include "coupling/nested_start.hpp"
#include "grid/boundary.hpp"
#include "grid/grid_quality.hpp"
#include "grid/solid_cells.hpp"
#include "io/case_loader.hpp"
#include "io/checkpoint.hpp"
#include "io/csv_writer.hpp"
#include "io/gather.hpp"
#include "io/grid_file.hpp"
#include "io/grid_file_case.hpp"
#include "io/profile_writer.hpp"
#include "io/rank_agreement.hpp"
#include "io/vtk_writer.hpp"
#include "models/model_factory.hpp"

namespace wallrans {

namespace {

namespace fs = std::filesystem;
using Clock = std::chrono::steady_clock;

// Test-only kill switch: WALLRANS_TEST_KILL_IN_CHECKPOINT="<iteration>:<datasets>" kills every
// rank after that many datasets of the checkpoint of that iteration (see write_checkpoint).
int kill_switch(int iteration) {
  const char* text = std::getenv("WALLRANS_TEST_KILL_IN_CHECKPOINT");
  if (!text) return -1;
  int at = -1, datasets = -1;
  if (std::sscanf(text, "%d:%d", &at, &datasets) != 2) return -1;
  return at == iteration ? datasets : -1;
}

// Everything `run` settles before it builds the solver; `check` stops there.
struct Setup : CaseSetup {
  std::string case_id;
  RunDirectoryRequest directory;
  DirectoryContent content = DirectoryContent::empty;
  std::optional<std::string> restart;
};

// Collective. build_case(), then judges the run directory and the restart checkpoint.
Setup prepare(MPI_Comm comm, const RunOptions& options) {
  Setup s;
  static_cast<CaseSetup&>(s) = build_case(comm, options.case_file, MemoryUse::run);
  CaseSpec& spec = s.spec;
  if (options.output_directory) spec.output.directory = *options.output_directory;
  if (options.max_iterations) spec.iterations.max = *options.max_iterations;
  s.case_id = case_identity(spec);
  s.directory.path = spec.output.directory;
  s.directory.origin =
      options.output_directory ? "command line: --output-dir" : spec.source_file + ": key 'output.directory'";
  s.directory.case_id = s.case_id;
  s.directory.title = spec.title;
  s.directory.case_file = spec.source_file;
  s.directory.replace_results = options.replace_results;
  if (!options.resume) s.directory.restart = options.restart ? options.restart : spec.checkpoint.restart_from;
  // A checkpoint that does not fit the case is the more specific message, so it comes first.
  s.restart = s.directory.restart;
  if (s.restart) check_restart_file(comm, *s.restart, spec, *s.grid);
  s.content = inspect_run_directory(comm, s.directory);
  if (options.resume && s.content == DirectoryContent::same_case) {
    s.restart = newest_checkpoint_of_case(comm, spec.output.directory, s.case_id);
    if (s.restart) check_restart_file(comm, *s.restart, spec, *s.grid);
  }
  return s;
}

// Collective. What the run prints when its grid comes from a file: the file, any repair note and
// the quality report ("" for a generated grid).
std::string file_grid_report(const Setup& s) {
  if (s.spec.grid.file.empty()) return "";
  const GridQuality quality = measure_quality(*s.grid, *s.boundaries);
  std::string text = "wallrans: grid " + s.spec.grid.file + ": " + std::to_string(s.grid->cells_x()) + " x " +
                     std::to_string(s.grid->cells_y()) + " cells\n";
  if (!s.grid_note.empty()) text += "wallrans: note: " + s.grid_note + "\n";
  return text + quality_report(quality, *s.boundaries);
}

// The lines of `text` without their line breaks.
std::vector<std::string> lines_of(const std::string& text) {
  std::vector<std::string> lines;
  for (size_t start = 0; start < text.size();) {
    const size_t end = std::min(text.find('\n', start), text.size());
    lines.push_back(text.substr(start, end - start));
    start = end + 1;
  }
  return lines;
}

std::string format_number(double value) {
  char text[32];
  std::snprintf(text, sizeof text, "%.6g", value);
  return text;
}

int rank_of(MPI_Comm comm) {
  int rank = 0;
  check_mpi(MPI_Comm_rank(comm, &rank));
  return rank;
}

// The history file: on a restart the rows up to the restart iteration are kept.
std::unique_ptr<CsvWriter> open_history(const fs::path& dir, const TurbulenceModel& model,
                                        int first_iteration) {
  std::vector<std::vector<double>> earlier;
  if (first_iteration > 0 && fs::exists(dir / "residuals.csv")) {
    try {
      for (const auto& row : read_csv((dir / "residuals.csv").string()).rows)
        if (!row.empty() && row[0] <= first_iteration) earlier.push_back(row);
    } catch (const InputError&) {
      earlier.clear();  // an unreadable old history is replaced, not fatal
    }
  }
  std::vector<CsvColumn> columns{
      {"iteration", CsvType::integer}, {"u_residual"}, {"v_residual"}, {"continuity_residual"}};
  for (const auto& r : model.residuals()) columns.push_back({r.name + "_residual"});
  for (const char* c : {"u_residual_abs", "v_residual_abs", "continuity_residual_abs"})
    columns.push_back({c});
  for (const auto& r : model.residuals()) columns.push_back({r.name + "_residual_abs"});
  for (const char* c : {"momentum_linear_its", "pressure_linear_its"})
    columns.push_back({c, CsvType::integer});
  if (!model.residuals().empty()) columns.push_back({"turbulence_linear_its", CsvType::integer});
  columns.push_back({"elapsed_s"});
  auto history = std::make_unique<CsvWriter>((dir / "residuals.csv").string(), columns);
  for (const auto& row : earlier)
    if (row.size() == columns.size()) history->row(row);
  return history;
}

// One run after its directory is claimed: iterate, then write the outputs and the summary.
class Run {
 public:
  Run(MPI_Comm comm, const RunOptions& options, const CaseSpec& spec, const BoundaryMap& boundaries,
      const TurbulenceModel& model, FlowSolver& solver, RunCheckpoints& checkpoints,
      const RunDirectory& directory, RunSummary& summary, Clock::time_point start, ProgressOutput* progress)
      : comm_(comm),
        options_(options),
        spec_(spec),
        boundaries_(boundaries),
        model_(model),
        solver_(solver),
        checkpoints_(checkpoints),
        dir_(directory.path()),
        summary_(summary),
        start_(start),
        rank_(rank_of(comm)),
        progress_(progress),
        estimate_(spec.iterations.residual_drop),
        watch_(solver, model) {}

  int execute(int first_iteration, const StopSignals& signals);

 private:
  double elapsed() const { return std::chrono::duration<double>(Clock::now() - start_).count(); }
  void checkpoint();
  void record(const IterationStatus& status, bool converged, bool diverged);
  void write_outputs();
  void finish(RunStatus status, const std::string& detail);
  void warn(const std::string& text);
  void check_wall_resolution();

  MPI_Comm comm_;
  const RunOptions& options_;
  const CaseSpec& spec_;
  const BoundaryMap& boundaries_;
  const TurbulenceModel& model_;
  FlowSolver& solver_;
  RunCheckpoints& checkpoints_;
  fs::path dir_;
  RunSummary& summary_;
  Clock::time_point start_;
  int rank_;
  ProgressOutput* progress_;  // rank 0 only
  ConvergenceEstimate estimate_;
  int last_iteration_ = 0;   // the cap
  std::string stop_reason_;  // why a stopped run stopped
  std::unique_ptr<CsvWriter> history_;
  IterationStatus status_;
  int checkpoint_iteration_ = -1;
  double checkpoint_time_ = 0.0, checkpoint_seconds_ = 0.0;
  DivergenceWatch watch_;
};

// A warning goes to the terminal (also with --quiet) and progress.log (rank 0) and into the summary.
void Run::warn(const std::string& text) {
  summary_.warnings.push_back(text);
  if (rank_ == 0 && progress_) progress_->final("wallrans: warning: " + text);
}

// Closures that integrate to the wall need the first cell centre at y+ <= 1.
void Run::check_wall_resolution() {
  if (!needs_wall_resolution(spec_.turbulence.model)) return;
  const auto worst = worst_wall_resolution(comm_, solver_, spec_.flow.kinematic_viscosity);
  if (!worst) return;
  summary_.max_first_cell_y_plus = worst->y_plus;
  summary_.max_y_plus_x = worst->at.x;
  summary_.max_y_plus_y = worst->at.y;
  if (worst->y_plus > wall_y_plus_limit) warn(wall_resolution_warning(*worst, spec_.turbulence.model));
}

void Run::checkpoint() {
  const double before = elapsed();
  const std::string path = checkpoints_.write(dir_.string(), kill_switch(status_.iteration));
  checkpoint_time_ = elapsed();
  checkpoint_seconds_ = checkpoint_time_ - before;
  checkpoint_iteration_ = status_.iteration;
  summary_.checkpoint = fs::path(path).filename().string();
}

void Run::record(const IterationStatus& status, bool converged, bool diverged) {
  if (rank_ != 0) return;
  const auto& r = status.normalised;
  std::vector<double> row{double(status.iteration), r.u, r.v, r.continuity};
  for (double m : status.model_normalised) row.push_back(m);
  for (double a : {status.absolute.u, status.absolute.v, status.absolute.continuity}) row.push_back(a);
  for (const auto& m : status.model_absolute) row.push_back(m.value);
  row.push_back(double(status.momentum_iterations));
  row.push_back(double(status.pressure_iterations));
  if (!model_.residuals().empty()) row.push_back(double(model_.linear_iterations()));
  row.push_back(elapsed());
  history_->row(row);
  std::vector<double> residuals{r.u, r.v, r.continuity};
  residuals.insert(residuals.end(), status.model_normalised.begin(), status.model_normalised.end());
  estimate_.add(status.iteration, residuals, elapsed());
  const int every = spec_.iterations.report_every;
  const bool solves_ok = status.linear_solves_converged && model_.linear_solves_converged();
  const std::string text =
      progress_row(status.iteration, residuals, elapsed(), estimate_, last_iteration_ - status.iteration,
                   solves_ok ? "" : "(a linear solve broke down)");
  if (every > 0 && (status.iteration % every == 0 || status.iteration == 1 || converged || diverged))
    progress_->line(text);
  else
    progress_->status(text);
}

int Run::execute(int first_iteration, const StopSignals& signals) {
  const int last = first_iteration + spec_.iterations.max;  // the cap counts this run's iterations
  last_iteration_ = last;
  if (rank_ == 0) {
    history_ = open_history(dir_, model_, first_iteration);
    std::vector<std::string> names{"u", "v", "mass"};
    for (const auto& m : model_.residuals()) names.push_back(m.name);
    if (spec_.iterations.report_every > 0) progress_->line(progress_header(names));
  }
  status_.iteration = first_iteration;
  watch_.keep(first_iteration);  // the start (restart or initial fields) is the first good state
  checkpoint_time_ = elapsed();
  const std::optional<double> walltime = options_.walltime ? options_.walltime : spec_.checkpoint.walltime;
  const double cadence = spec_.checkpoint.every_seconds;
  bool converged = false, diverged = false;
  std::string stop_reason;
  double slowest_iteration = 0.0;
  while (status_.iteration < last) {
    const double before = elapsed();
    status_ = solver_.iterate();
    summary_.iteration = status_.iteration;
    slowest_iteration = std::max(slowest_iteration, elapsed() - before);
    converged = solver_.converged(status_);
    diverged = is_diverged(status_);
    record(status_, converged, diverged);
    if (!diverged) watch_.keep(status_.iteration);
    // Every solver has read its options in its first set-up.
    if (status_.iteration == first_iteration + 1) {
      const std::vector<std::string> unused = solver_.unused_options();
      if (!unused.empty()) warn(unused_options_warning(unused));
    }
    if (converged || diverged) break;
    if (spec_.output.fields_every > 0 && status_.iteration % spec_.output.fields_every == 0) {
      write_fields(solver_, model_, dir_, "fields_" + std::to_string(status_.iteration));
      if (rank_ == 0) write_field_series(dir_, -1);
    }
    if (spec_.checkpoint.every > 0 && status_.iteration % spec_.checkpoint.every == 0) checkpoint();
    // All ranks decide together: stop (2 a signal on some rank, 1 when one more iteration plus a
    // checkpoint, with margin, would overrun the wall-clock budget) and a checkpoint due by time.
    const double now = elapsed();
    int decide[2] = {signals.requested() ? 2 : 0, cadence > 0 && now - checkpoint_time_ >= cadence ? 1 : 0};
    if (decide[0] == 0 && walltime &&
        now + 2.0 * slowest_iteration + 2.0 * checkpoint_seconds_ + 1.0 > *walltime)
      decide[0] = 1;
    check_mpi(MPI_Allreduce(MPI_IN_PLACE, decide, 2, MPI_INT, MPI_MAX, comm_));
    if (decide[0] > 0) {
      stop_reason = decide[0] == 1 ? "wall-clock budget" : signals.requested() ? signals.name() : "signal";
      break;
    }
    if (decide[1] && checkpoint_iteration_ != status_.iteration) checkpoint();
  }
  summary_.residual_u = status_.normalised.u;
  summary_.residual_v = status_.normalised.v;
  summary_.residual_continuity = status_.normalised.continuity;
  summary_.model_residuals.clear();
  for (size_t k = 0; k < status_.model_normalised.size() && k < model_.residuals().size(); ++k)
    summary_.model_residuals.emplace_back(model_.residuals()[k].name, status_.model_normalised[k]);
  if (diverged) {
    // The last checkpoint stays; no fields, so nothing on disk looks like a result. The fields of
    // the last good iteration go to a file of their own.
    std::string file;
    const std::string detail = watch_.diagnose(status_, spec_, dir_, file);
    summary_.diagnostic_file = file;
    finish(RunStatus::diverged, detail + "; fields not written");
    return exit_code(RunStatus::diverged);
  }
  // A checkpoint at the end of every run that did not diverge, so it can be continued.
  if (checkpoint_iteration_ != status_.iteration) checkpoint();
  write_outputs();
  check_wall_resolution();
  const RunStatus status = converged              ? RunStatus::converged
                           : !stop_reason.empty() ? RunStatus::stopped
                                                  : RunStatus::capped;
  stop_reason_ = stop_reason;
  finish(status, stop_reason.empty() ? "" : "stopped by " + stop_reason);
  return exit_code(status);
}

void Run::write_outputs() {
  RunOutputs outputs = write_run_outputs(spec_, boundaries_, solver_, model_, dir_, status_.iteration, comm_);
  // Mass balance and periodic driving (collective), into the summary and onto the terminal.
  const bool periodic = spec_.periodic.axis == PeriodicAxis::x;
  const MassBalance balance = solver_.mass_balance();
  const PeriodicDriving driving = solver_.periodic_driving();
  summary_.flow_report_json = flow_report_json(balance, driving, periodic);
  if (rank_ != 0) return;
  progress_->line(flow_report_text(balance, driving, periodic));
  for (const std::string& warning : outputs.warnings) progress_->line(warning);
  summary_.answers = std::move(outputs.answers);
}

void Run::finish(RunStatus status, const std::string& detail) {
  summary_.status = status;
  summary_.detail = detail;
  summary_.wall_time_s = elapsed();
  std::optional<Failure> failure;
  if (rank_ == 0) failure = attempt([&] { write_summary(dir_, summary_); });
  agree(comm_, failure);
  if (rank_ != 0) return;
  if (status == RunStatus::diverged) {
    progress_->final("wallrans: diverged: " + detail + " (residuals.csv and earlier checkpoints kept)");
    return;
  }
  if (summary_.answers)
    for (const std::string& line : answers_table(*summary_.answers)) progress_->line(line);
  progress_->line(
      "note: RANS results are model-dependent: validate them for your case and defer to applicable codes and "
      "licensed engineering practice.");
  // The final line, the only one under --quiet.
  char time[32];
  std::snprintf(time, sizeof time, " (%.1f s); results in ", summary_.wall_time_s);
  const std::string n = std::to_string(status_.iteration);
  const std::string what =
      status == RunStatus::converged ? "converged after " + n + " iterations"
      : status == RunStatus::stopped
          ? "stopped at iteration " + n + " (" + stop_reason_ + "); checkpoint written, restart from it"
          : "NOT converged (iteration cap reached) after " + n + " iterations";
  const std::string restart = summary_.restarted_from.empty()
                                  ? ""
                                  : "; restarted from " + summary_.restarted_from + " at iteration " +
                                        std::to_string(summary_.first_iteration);
  progress_->final("wallrans: " + what + restart + time + dir_.string());
}

}  // namespace

int check_case(MPI_Comm comm, const RunOptions& options) {
  Setup s = prepare(comm, options);
  check_turbulence_model(s.spec, *s.boundaries);  // the model's checks, without allocating it
  if (s.restart) verify_checkpoint_data(comm, *s.restart);
  const GridQuality q = measure_quality(*s.grid, *s.boundaries);
  int size = 1;
  MPI_Comm_size(comm, &size);
  if (rank_of(comm) == 0) {
    std::printf("%s: case '%s' is valid\n", options.case_file.c_str(), s.spec.title.c_str());
    if (!s.grid_note.empty()) std::printf("  note: %s\n", s.grid_note.c_str());
    std::printf("  grid: %d x %d cells%s%s, %d rank(s)\n%s", s.grid->cells_x(), s.grid->cells_y(),
                s.spec.grid.file.empty() ? "" : " from ", s.spec.grid.file.c_str(), size,
                quality_report(q, *s.boundaries).c_str());
    std::printf(
        "  flow: nu = %.4g m^2/s, Re = U_ref L_ref / nu = %.4g; model %s; %zu boundary segment(s)\n",
        s.spec.flow.kinematic_viscosity,
        s.spec.flow.reference_velocity * s.spec.flow.reference_length / s.spec.flow.kinematic_viscosity,
        s.spec.turbulence.model.c_str(), s.spec.boundaries.size());
    const char* content = s.content == DirectoryContent::empty ? "new or empty"
                          : s.content == DirectoryContent::same_case
                              ? "holds this case's results"
                              : "holds other results (--replace-results)";
    std::printf("  run directory: %s (%s); %s\n", s.directory.path.c_str(), content,
                s.restart ? ("restarts from " + *s.restart).c_str() : "starts from iteration 0");
    const MemoryVerdict& m = s.memory;
    std::printf(
        "  memory (estimate): about %s per rank (%.0f B per cell); host %s: %d rank(s) need %s more, %s "
        "available (%s)\n",
        format_bytes(m.estimate.bytes_per_rank).c_str(), m.estimate.bytes_per_cell, m.host.c_str(),
        m.ranks_on_host, format_bytes(m.needed_bytes).c_str(), format_bytes(m.available_bytes).c_str(),
        m.limit.c_str());
    std::fputs(first_cell_estimate(s.spec, *s.boundaries, s.grid->nodes()).c_str(), stdout);
    if (!s.unused_options.empty())
      std::printf("  warning: %s\n", unused_options_warning(s.unused_options).c_str());
  }
  return 0;
}

int write_case_grid(MPI_Comm comm, const std::string& case_file, const std::string& grid_file) {
  const CaseSetup s = build_case(comm, case_file, MemoryUse::grid_only);
  const GridFileContent content{s.grid->nodes(), case_patches(*s.boundaries)};
  write_grid_file(comm, grid_file, content);
  // The same grid for a viewer, beside the grid file: <stem>.pvts with the solid cells marked
  // (cell_volume and cell_index come with every VTK file we write).
  Field solid(*s.grid);
  const std::vector<unsigned char> mask = s.boundaries->solid().ghosted_mask(*s.grid);
  for (size_t c = 0; c < mask.size(); ++c) solid[c] = mask[c] != 0 ? 1.0 : 0.0;
  const fs::path grid_path(grid_file);
  const std::string view = write_vtk_fields(*s.grid, {{"solid", &solid}}, {},
                                            grid_path.parent_path().string(), grid_path.stem().string());
  if (rank_of(comm) == 0) {
    std::printf("wallrans: wrote the grid of '%s' (%d x %d cells, %zu patches) to %s and %s\n",
                case_file.c_str(), s.grid->cells_x(), s.grid->cells_y(), content.patches.size(),
                grid_file.c_str(), view.c_str());
  }
  return 0;
}

int run_case(MPI_Comm comm, const RunOptions& options) {
  const StopSignals signals;
  const auto start = Clock::now();
  Setup s = prepare(comm, options);
  const CaseSpec& spec = s.spec;
  const Grid& grid = *s.grid;
  const std::string grid_report = file_grid_report(s);
  auto model = make_turbulence_model(spec, grid, *s.boundaries);
  FlowSolver solver(spec, grid, *s.boundaries, *model);
  RunCheckpoints checkpoints(spec, grid, solver, *model, s.case_id);
  // Restart before anything is written: a bad checkpoint stops the run with the run directory
  // untouched.
  const int first_iteration = s.restart ? checkpoints.restart_from(*s.restart) : 0;
  const int rank = rank_of(comm);
  RunDirectory directory(comm, s.directory, s.restart ? first_iteration : -1,
                         [&](const std::string& file) { return is_checkpoint_of_case(file, s.case_id); });

  RunSummary summary;
  summary.title = spec.title;
  summary.case_file = spec.source_file;
  summary.case_id = s.case_id;
  summary.model = model->name();
  summary.host = host_name();
  summary.pid = static_cast<long>(getpid());
  summary.started = utc_now();
  check_mpi(MPI_Comm_size(comm, &summary.ranks));
  summary.cells_x = grid.cells_x();
  summary.cells_y = grid.cells_y();
  summary.first_iteration = summary.iteration = first_iteration;
  if (first_iteration > 0) summary.restarted_from = *s.restart;
  summary.residual_drop = spec.iterations.residual_drop;
  summary.model_variant = spec.turbulence.variant;
  summary.grid_source = spec.grid.file.empty() ? std::string("generator ") + to_string(spec.grid.generator)
                                               : "file " + spec.grid.file;
  summary.reference_velocity = spec.flow.reference_velocity;
  summary.reference_velocity_given = spec.flow.reference_velocity_given;
  std::unique_ptr<ProgressOutput> progress;  // rank 0
  std::optional<Failure> failure;
  if (rank == 0) {
    failure = attempt([&] {
      write_file_atomically(directory.path() / "case.resolved.yaml", resolved_case_yaml(spec),
                            "run directory");
      write_summary(directory.path(), summary);
      progress = std::make_unique<ProgressOutput>(directory.path(), first_iteration > 0, options.quiet,
                                                  stdout_is_terminal());
      if (options.resume && !s.restart)
        progress->line("wallrans: note: no checkpoint of this case in " + directory.path().string() +
                       "; starting from iteration 0");
      if (first_iteration > 0)
        progress->line("wallrans: restarted from " + *s.restart + " at iteration " +
                       std::to_string(first_iteration));
      for (const std::string& line : lines_of(grid_report)) progress->line(line);
      progress->line(
          "wallrans: case '" + spec.title + "', " + std::to_string(grid.cells_x()) + " x " +
          std::to_string(grid.cells_y()) + " cells on " + std::to_string(summary.ranks) + " rank(s), model " +
          model->name() + "; Cf and Cp with U_ref = " + format_number(spec.flow.reference_velocity) + " m/s" +
          (spec.flow.reference_velocity_given ? "" : " (default: flow.reference_velocity not set)"));
    });
  }
  agree(comm, failure);
  // A fresh run may start from the solution on coarser grids (iterations.coarse_grids).
  if (first_iteration == 0 && spec.iterations.coarse_grids > 0) {
    const auto runs = start_from_coarser_grids(spec, grid, solver, *model, [&](const CoarseGridRun& run) {
      if (rank != 0) return;
      char seconds[32];
      std::snprintf(seconds, sizeof seconds, " iterations (%.1f s)", run.seconds);
      progress->line("wallrans: coarse grid " + std::to_string(run.cells_x) + " x " +
                     std::to_string(run.cells_y) + ": " +
                     (run.converged  ? "converged"
                      : run.diverged ? "diverged; the case's grid starts from the uniform field"
                                     : "iteration budget spent; its state is used") +
                     " after " + std::to_string(run.iterations) + seconds);
    });
    // Work in iterations of the case's grid: each coarse grid's iterations weighted by its share
    // of the cells, plus the iteration on the case's grid that measured the residual references.
    summary.coarse_work = runs.empty() ? 0.0 : 1.0;
    for (const CoarseGridRun& c : runs) {
      summary.coarse_grids.push_back({c.cells_x, c.cells_y, c.iterations, c.converged});
      summary.coarse_work += double(c.iterations + c.reference_iterations) * c.cells_x * c.cells_y /
                             (double(grid.cells_x()) * grid.cells_y());
    }
  }
  Run run(comm, options, spec, *s.boundaries, *model, solver, checkpoints, directory, summary, start,
          progress.get());
  try {
    return run.execute(first_iteration, signals);
  } catch (const std::exception& e) {
    // Every ending leaves a summary: best effort on rank 0 (a rank that fails alone aborts the
    // run before rank 0 can write one; the summary then still says "running").
    if (rank == 0) {
      directory.remove_temporaries();
      summary.status = RunStatus::failed;
      summary.detail = e.what();
      summary.wall_time_s = std::chrono::duration<double>(Clock::now() - start).count();
      try {
        write_summary(directory.path(), summary);
      } catch (const std::exception&) {
        // the disk may be full or gone; the error that matters is being reported
      }
    }
    throw;
  }
}

}  // namespace wallrans
