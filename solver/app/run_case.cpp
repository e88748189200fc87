// Drives one case: load and validate everything first (so bad input writes nothing), then
// iterate with a live residual line, and write history, fields, wall data and a summary.
#include "app/run_case.hpp"

#include <chrono>
#include <cmath>
#include <csignal>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <memory>
#include <sstream>

#include "app/checkpointing.hpp"
#include "app/flow_report.hpp"
#include "core/atomic_file.hpp"
#include "core/error.hpp"
#include "coupling/flow_solver.hpp"
#include "coupling/nested_start.hpp"
#include "grid/boundary.hpp"
#include "grid/grid_quality.hpp"
#include "io/case_loader.hpp"
#include "io/csv_writer.hpp"
#include "io/gather.hpp"
#include "io/grid_file.hpp"
#include "io/grid_file_case.hpp"
#include "io/vtk_writer.hpp"
#include "models/model_factory.hpp"

namespace wallrans {

namespace {

// Set by SIGTERM/SIGINT (what cluster schedulers send). A signal handler can only touch a
// lock-free flag of static storage, so this is the program's one piece of global state.
volatile std::sig_atomic_t stop_requested = 0;

extern "C" void request_stop(int) { stop_requested = 1; }

// Test-only kill switch: WALLRANS_TEST_KILL_IN_CHECKPOINT="<iteration>:<datasets>" kills every
// rank after that many datasets of the checkpoint of that iteration (see write_checkpoint).
int kill_switch(int iteration) {
  const char* text = std::getenv("WALLRANS_TEST_KILL_IN_CHECKPOINT");
  if (!text) return -1;
  int at = -1, datasets = -1;
  if (std::sscanf(text, "%d:%d", &at, &datasets) != 2) return -1;
  return at == iteration ? datasets : -1;
}

constexpr const char* caution =
    "RANS results are model-dependent: validate them for your case and defer to applicable codes "
    "and licensed engineering practice.";

struct Setup {
  CaseSpec spec;
  std::unique_ptr<Grid> grid;
  std::unique_ptr<BoundaryMap> boundaries;
  std::string grid_note;  ///< what loading a grid file repaired ("" if nothing)
};

// Wraps messages from the grid generators and the boundary map with the case file name.
Setup build(MPI_Comm comm, const std::string& case_file) {
  Setup s;
  s.spec = load_case_file(case_file);
  try {
    if (s.spec.grid.file.empty()) {
      NodeCoordinates nodes = generate_nodes(s.spec.grid);
      s.grid = std::make_unique<Grid>(comm, std::move(nodes), s.spec.periodic.axis == PeriodicAxis::x);
      s.boundaries = std::make_unique<BoundaryMap>(s.spec, s.grid->nodes());
    } else {
      // Segments on a file grid are resolved against its patches (and its orientation).
      CaseGrid loaded = load_case_grid(comm, s.spec);
      s.grid_note = loaded.note;
      s.grid = std::make_unique<Grid>(comm, std::move(loaded.nodes), s.spec.periodic.axis == PeriodicAxis::x);
      CaseSpec resolved = s.spec;
      resolved.boundaries = loaded.segments;
      s.boundaries = std::make_unique<BoundaryMap>(resolved, s.grid->nodes());
    }
  } catch (const InputError& e) {
    // Messages of the boundary map already name the file and segment line; the generators and
    // the grid metrics name the grid key, and get the grid section's line here.
    const std::string text = e.what();
    if (text.rfind(case_file, 0) == 0) throw;
    throw InputError(case_file + ":" + std::to_string(s.spec.grid.line) + ": " + text);
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

std::string json_number(double x) {
  if (!std::isfinite(x)) return "null";
  char buffer[40];
  std::snprintf(buffer, sizeof buffer, "%.10g", x);
  return buffer;
}

std::string json_string(const std::string& s) {
  std::string out = "\"";
  for (char c : s) {
    if (c == '"' || c == '\\') out += '\\';
    if (static_cast<unsigned char>(c) < 0x20) continue;
    out += c;
  }
  return out + "\"";
}

// Profiles along the grid column containing each station x, measured from the bottom wall:
// y (normal distance to the bottom wall face of the column), y+, U+ = u_t/u_tau, nu_t/nu.
void write_profiles(const CaseSpec& spec, const FlowSolver& solver, const std::filesystem::path& dir,
                    MPI_Comm comm) {
  const Grid& grid = solver.grid();
  int rank = 0;
  MPI_Comm_rank(comm, &rank);
  const double nu = spec.flow.kinematic_viscosity;
  for (size_t station = 0; station < spec.output.profiles_at_x.size(); ++station) {
    const double x = spec.output.profiles_at_x[station];
    int column = -1;
    for (int i = 0; i < grid.cells_x(); ++i)
      if (grid.node(i, 0).x <= x && x < grid.node(i + 1, 0).x) column = i;
    if (column < 0) {
      if (rank == 0)
        std::printf("wallrans: warning: profile station x = %g is outside the grid; skipped\n", x);
      continue;
    }
    // The bottom face of the column and its shear stress (owned by one rank, summed over all).
    const Vec2 a = grid.node(column, 0), b = grid.node(column + 1, 0);
    const Vec2 face_centre = 0.5 * (a + b);
    const Vec2 normal = (1.0 / norm(b - a)) * Vec2{-(b - a).y, (b - a).x};  // into the domain
    double tau = 0.0;
    for (const auto& w : solver.wall_samples())
      if (!w.on_solid && w.side == Side::bottom && w.index == column) tau = w.shear_stress;
    double tau_all = 0.0;
    MPI_Allreduce(&tau, &tau_all, 1, MPI_DOUBLE, MPI_SUM, comm);
    const double u_tau = std::sqrt(std::abs(tau_all));
    const Vec2 tangent{normal.y, -normal.x};
    std::vector<std::vector<double>> rows;
    if (column >= grid.x_begin() && column < grid.x_end()) {
      for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
        const Vec2 c = grid.centre(column, j);
        const double y = dot(c - face_centre, normal);
        const double ut = dot(solver.velocity()(column, j), tangent);
        const double nut = solver.eddy_viscosity()(column, j);
        rows.push_back(
            {c.x, c.y, y, u_tau > 0 ? y * u_tau / nu : 0.0, ut, u_tau > 0 ? ut / u_tau : 0.0, nut / nu});
      }
    }
    const auto all = gather_rows(comm, rows, 7);
    if (rank == 0) {
      CsvWriter out((dir / ("profile_" + std::to_string(station) + ".csv")).string(),
                    {"x", "y", "wall_distance", "y_plus", "u_tangential", "u_plus", "nut_over_nu"});
      for (const auto& row : all) out.row(row);
    }
  }
}

}  // namespace

int check_case(MPI_Comm comm, const std::string& case_file) {
  Setup s = build(comm, case_file);
  (void)make_turbulence_model(s.spec, *s.grid, *s.boundaries);
  const GridQuality q = measure_quality(*s.grid, *s.boundaries);
  int rank = 0, size = 1;
  MPI_Comm_rank(comm, &rank);
  MPI_Comm_size(comm, &size);
  if (rank == 0) {
    std::printf("%s: case '%s' is valid\n", case_file.c_str(), s.spec.title.c_str());
    if (!s.grid_note.empty()) std::printf("  note: %s\n", s.grid_note.c_str());
    std::printf("  grid: %d x %d cells%s%s, %d rank(s)\n%s", s.grid->cells_x(), s.grid->cells_y(),
                s.spec.grid.file.empty() ? "" : " from ", s.spec.grid.file.c_str(), size,
                quality_report(q, *s.boundaries).c_str());
    std::printf(
        "  flow: nu = %.4g m^2/s, Re = U_ref L_ref / nu = %.4g; model %s; %zu boundary segment(s)\n",
        s.spec.flow.kinematic_viscosity,
        s.spec.flow.reference_velocity * s.spec.flow.reference_length / s.spec.flow.kinematic_viscosity,
        s.spec.turbulence.model.c_str(), s.spec.boundaries.size());
  }
  return 0;
}

int write_case_grid(MPI_Comm comm, const std::string& case_file, const std::string& grid_file) {
  const Setup s = build(comm, case_file);
  const GridFileContent content{s.grid->nodes(), case_patches(*s.boundaries)};
  write_grid_file(comm, grid_file, content);
  int rank = 0;
  MPI_Comm_rank(comm, &rank);
  if (rank == 0) {
    std::printf("wallrans: wrote the grid of '%s' (%d x %d cells, %zu patches) to %s\n", case_file.c_str(),
                s.grid->cells_x(), s.grid->cells_y(), content.patches.size(), grid_file.c_str());
  }
  return 0;
}

int run_case(MPI_Comm comm, const RunOptions& options) {
  const auto start = std::chrono::steady_clock::now();
  Setup s = build(comm, options.case_file);
  CaseSpec& spec = s.spec;
  if (options.output_directory) spec.output.directory = *options.output_directory;
  if (options.max_iterations) spec.iterations.max = *options.max_iterations;
  const Grid& grid = *s.grid;
  const std::string grid_report = file_grid_report(s);
  auto model = make_turbulence_model(spec, grid, *s.boundaries);
  FlowSolver solver(spec, grid, *s.boundaries, *model);
  const std::string case_text = resolved_case_yaml(spec);
  RunCheckpoints checkpoints(spec, grid, solver, *model, case_text);
  // Restart before anything is written: a bad checkpoint stops the run with the run directory
  // untouched.
  const std::optional<std::string> restart = options.restart ? options.restart : spec.checkpoint.restart_from;
  int first_iteration = 0;
  if (restart) first_iteration = checkpoints.restart_from(*restart);
  const std::optional<double> walltime = options.walltime ? options.walltime : spec.checkpoint.walltime;

  int rank = 0, size = 1;
  MPI_Comm_rank(comm, &rank);
  MPI_Comm_size(comm, &size);
  const std::filesystem::path dir = spec.output.directory;
  int dir_ok = 1;
  std::string dir_error;
  if (rank == 0) {
    std::error_code ec;
    std::filesystem::create_directories(dir, ec);
    if (ec) {
      dir_ok = 0;
      dir_error = ec.message();
    }
  }
  MPI_Bcast(&dir_ok, 1, MPI_INT, 0, comm);
  if (!dir_ok) {
    const std::string origin = options.output_directory ? "command line: --output-dir"
                                                        : spec.source_file + ": key 'output.directory'";
    throw InputError(origin + ": expected a directory that can be created, got '" + dir.string() + "' (" +
                     dir_error + ")");
  }

  std::unique_ptr<CsvWriter> history;
  if (rank == 0) {
    write_file_atomically(dir / "case.resolved.yaml", case_text, "run directory");
    // On a restart, keep the history rows up to the restart iteration.
    std::vector<std::vector<double>> earlier;
    if (first_iteration > 0 && std::filesystem::exists(dir / "residuals.csv")) {
      try {
        for (const auto& row : read_csv((dir / "residuals.csv").string()).rows)
          if (!row.empty() && row[0] <= first_iteration) earlier.push_back(row);
      } catch (const InputError&) {
        earlier.clear();  // an unreadable old history is replaced, not fatal
      }
    }
    std::vector<std::string> columns{"iteration", "u_residual", "v_residual", "continuity_residual"};
    for (const auto& r : model->residuals()) columns.push_back(r.name + "_residual");
    for (const char* c : {"u_residual_abs", "v_residual_abs", "continuity_residual_abs"})
      columns.push_back(c);
    for (const auto& r : model->residuals()) columns.push_back(r.name + "_residual_abs");
    for (const char* c : {"momentum_linear_its", "pressure_linear_its", "elapsed_s"}) columns.push_back(c);
    history = std::make_unique<CsvWriter>((dir / "residuals.csv").string(), columns);
    for (const auto& row : earlier)
      if (row.size() == columns.size()) history->row(row);
    if (first_iteration > 0)
      std::printf("wallrans: restarted from %s at iteration %d\n", restart->c_str(), first_iteration);
    std::fputs(grid_report.c_str(), stdout);
    std::printf("wallrans: case '%s', %d x %d cells on %d rank(s), model %s\n", spec.title.c_str(),
                grid.cells_x(), grid.cells_y(), size, model->name().c_str());
    std::printf("%8s %12s %12s %12s", "iter", "res_u", "res_v", "res_mass");
    for (const auto& m : model->residuals()) std::printf(" %12s", ("res_" + m.name).c_str());
    std::printf(" %8s\n", "time_s");
  }
  auto fields = [&](const std::string& basename) {
    std::vector<NamedScalar> scalars{{"pressure", &solver.pressure()},
                                     {"eddy_viscosity", &solver.eddy_viscosity()},
                                     {"solid", &solver.solid()}};
    for (const auto& [name, field] : model->output_fields()) scalars.push_back({name, field});
    write_vtk_fields(grid, scalars, {{"velocity", &solver.velocity()}}, dir.string(), basename);
  };

  // A fresh run may start from the solution on coarser grids (iterations.coarse_grids).
  std::vector<CoarseGridRun> coarse_runs;
  if (first_iteration == 0 && spec.iterations.coarse_grids > 0) {
    coarse_runs = start_from_coarser_grids(spec, grid, solver, *model, [&](const CoarseGridRun& run) {
      if (rank == 0 && !options.quiet)
        std::printf("wallrans: coarse grid %d x %d: %s after %d iterations (%.1f s)\n", run.cells_x, run.cells_y,
                    run.converged  ? "converged"
                    : run.diverged ? "diverged; the case's grid starts from the uniform field"
                                   : "iteration budget spent; its state is used",
                    run.iterations,
                    run.seconds);
    });
  }

  stop_requested = 0;
  std::signal(SIGTERM, request_stop);
  std::signal(SIGINT, request_stop);
  IterationStatus status;
  status.iteration = first_iteration;
  bool converged = false, diverged = false, stopped = false;
  double elapsed = 0.0, slowest_iteration = 0.0, checkpoint_seconds = 0.0;
  auto timed_checkpoint = [&]() {
    const auto t0 = std::chrono::steady_clock::now();
    checkpoints.write(dir.string(), kill_switch(status.iteration));
    checkpoint_seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  };
  while (status.iteration < spec.iterations.max) {
    const double before = elapsed;
    status = solver.iterate();
    elapsed = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    slowest_iteration = std::max(slowest_iteration, elapsed - before);
    converged = solver.converged(status);
    const auto& r = status.normalised;
    diverged = !std::isfinite(r.u + r.v + r.continuity) || r.u > 1e8 || r.v > 1e8;
    if (rank == 0) {
      std::vector<double> row{double(status.iteration), r.u, r.v, r.continuity};
      for (double m : status.model_normalised) row.push_back(m);
      for (double a : {status.absolute.u, status.absolute.v, status.absolute.continuity}) row.push_back(a);
      for (const auto& m : status.model_absolute) row.push_back(m.value);
      for (double a : {double(status.momentum_iterations), double(status.pressure_iterations), elapsed})
        row.push_back(a);
      history->row(row);
      const int every = spec.iterations.report_every;
      if (!options.quiet && every > 0 &&
          (status.iteration % every == 0 || status.iteration == 1 || converged || diverged)) {
        std::printf("%8d %12.4e %12.4e %12.4e", status.iteration, r.u, r.v, r.continuity);
        for (double m : status.model_normalised) std::printf(" %12.4e", m);
        std::printf(" %8.1f%s\n", elapsed,
                    status.linear_solves_converged ? "" : "  (a linear solve broke down)");
        std::fflush(stdout);
      }
    }
    if (converged || diverged) break;
    if (spec.output.fields_every > 0 && status.iteration % spec.output.fields_every == 0) {
      fields("fields_" + std::to_string(status.iteration));
    }
    if (spec.checkpoint.every > 0 && status.iteration % spec.checkpoint.every == 0) timed_checkpoint();
    // Stop early on a signal, or when one more iteration plus a checkpoint (with margin) would
    // overrun the wall-clock budget; all ranks decide together.
    int stop = stop_requested ? 1 : 0;
    if (walltime && elapsed + 2.0 * slowest_iteration + 2.0 * checkpoint_seconds + 1.0 > *walltime) stop = 1;
    int stop_all = 0;
    MPI_Allreduce(&stop, &stop_all, 1, MPI_INT, MPI_MAX, comm);
    if (stop_all) {
      stopped = true;
      if (!(spec.checkpoint.every > 0 && status.iteration % spec.checkpoint.every == 0)) timed_checkpoint();
      if (rank == 0) {
        std::printf("wallrans: stopped at iteration %d (%s); checkpoint written\n", status.iteration,
                    stop_requested ? "signal" : "wall-clock budget");
      }
      break;
    }
  }
  std::signal(SIGTERM, SIG_DFL);
  std::signal(SIGINT, SIG_DFL);
  if (diverged) {
    if (rank == 0)
      std::printf("wallrans: diverged at iteration %d; fields not written (residuals.csv kept)\n",
                  status.iteration);
    return 4;
  }
  // A checkpoint at the end of every run that did not diverge, so it can be continued.
  if (!stopped && !(spec.checkpoint.every > 0 && status.iteration % spec.checkpoint.every == 0))
    timed_checkpoint();
  fields("fields");
  if (spec.output.wall_data) {
    std::vector<std::vector<double>> rows;
    for (const auto& w : solver.wall_samples()) {
      const double yplus =
          w.first_cell_distance * std::sqrt(std::abs(w.shear_stress)) / spec.flow.kinematic_viscosity;
      rows.push_back({w.centre.x, w.centre.y, w.cf, w.cp, w.shear_stress, w.first_cell_distance, yplus});
    }
    const auto all = gather_rows(comm, rows, 7);
    if (rank == 0) {
      CsvWriter wall((dir / "wall.csv").string(),
                     {"x", "y", "cf", "cp", "wall_shear_stress", "first_cell_distance", "first_cell_y_plus"});
      for (const auto& row : all) wall.row(row);
    }
  }
  write_profiles(spec, solver, dir, comm);
  const bool periodic = spec.periodic.axis == PeriodicAxis::x;
  const MassBalance balance = solver.mass_balance();
  const PeriodicDriving driving = solver.periodic_driving();
  if (rank == 0) {
    std::ostringstream json;
    json << "{\n  \"title\": " << json_string(spec.title)
         << ",\n  \"case_file\": " << json_string(spec.source_file)
         << ",\n  \"version\": " << json_string(WALLRANS_VERSION) << ",\n  \"ranks\": " << size
         << ",\n  \"cells\": [" << grid.cells_x() << ", " << grid.cells_y()
         << "],\n  \"model\": " << json_string(model->name()) << ",\n  \"iterations\": " << status.iteration
         << ",\n  \"converged\": " << (converged ? "true" : "false")
         << ",\n  \"stopped_early\": " << (stopped ? "true" : "false")
         << ",\n  \"coarse_grids\": [";
    // Work in fine-grid iterations: this run's iterations, plus each coarse grid's iterations
    // weighted by its share of the cells, plus the reference iteration on this grid.
    double work = status.iteration - first_iteration + (coarse_runs.empty() ? 0 : 1);
    for (size_t k = 0; k < coarse_runs.size(); ++k) {
      const CoarseGridRun& c = coarse_runs[k];
      json << (k ? ", " : "") << "{\"cells\": [" << c.cells_x << ", " << c.cells_y
           << "], \"iterations\": " << c.iterations << ", \"converged\": " << (c.converged ? "true" : "false")
           << ", \"seconds\": " << json_number(c.seconds) << "}";
      work += double(c.iterations + c.reference_iterations) * c.cells_x * c.cells_y / (double(grid.cells_x()) * grid.cells_y());
    }
    json << "],\n  \"work_in_fine_grid_iterations\": " << json_number(work)
         << ",\n  \"residuals\": {\"u\": " << json_number(status.normalised.u)
         << ", \"v\": " << json_number(status.normalised.v)
         << ", \"continuity\": " << json_number(status.normalised.continuity)
         << "},\n  \"residual_drop\": " << json_number(spec.iterations.residual_drop)
         << flow_report_json(balance, driving, periodic) << ",\n  \"wall_time_s\": " << json_number(elapsed)
         << ",\n  \"caution\": " << json_string(caution) << "\n}\n";
    write_file_atomically(dir / "summary.json", json.str(), "run directory");
    std::fputs(flow_report_text(balance, driving, periodic).c_str(), stdout);
    std::printf("wallrans: %s after %d iterations (%.1f s); results in %s\n",
                converged ? "converged"
                : stopped ? "stopped early (restart from the last checkpoint)"
                          : "NOT converged (iteration cap reached)",
                status.iteration, elapsed, dir.string().c_str());
    std::printf("note: %s\n", caution);
  }
  if (stopped) return exit_stopped_with_checkpoint;
  return converged ? 0 : 3;
}

}  // namespace wallrans
