// Divergence diagnostics: the last good fields, the cell where the running-away field went wrong,
// and a hint from the case's own settings.
#include "app/divergence.hpp"

#include <cmath>
#include <cstdio>

#include "app/text_format.hpp"
#include "core/error.hpp"
#include "io/vtk_writer.hpp"

namespace wallrans {

namespace {

std::string number(double value) { return significant(value, 4); }

// What to change, from the case's settings, most likely first (Patankar 1980, sec. 6.7: SIMPLE
// needs pressure under-relaxation, typically 0.3; central convection is unbounded at cell Peclet
// numbers above 2).
std::string advice(const CaseSpec& spec, bool is_model_equation) {
  const IterationSpec& it = spec.iterations;
  if (is_model_equation) {
    return "lower turbulence.relax (now " + number(spec.turbulence.relax) + ", e.g. " +
           number(0.5 * spec.turbulence.relax) + ") or start from a converged laminar or coarser solution";
  }
  std::string hints;
  if (it.coupling == Coupling::simple && it.relax_pressure > 0.5)
    hints += "lower iterations.relax_pressure (now " + number(it.relax_pressure) +
             "; SIMPLE typically needs 0.3); ";
  if (it.convection == ConvectionScheme::central)
    hints += "use iterations.convection: bounded_linear_upwind (now central, unbounded on coarse cells); ";
  return hints + "lower iterations.relax_velocity (now " + number(it.relax_velocity) + ", e.g. " +
         number(0.5 * it.relax_velocity + 0.25) + "), or check the grid near that cell";
}

}  // namespace

DivergenceWatch::Location DivergenceWatch::locate(const Watched& w, Mode mode, bool has_good) const {
  const Grid& grid = solver_.grid();
  Location found;
  struct {
    double score;
    int rank;
  } best{-1.0, grid.rank()};
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      const double now = (*w.now)(i, j);
      if (std::isfinite(now) == (mode == Mode::non_finite)) continue;
      found.count += 1.0;
      // Non-finite: ranked by the change of the last good iteration (+1, so every one counts).
      const double score = mode == Mode::non_finite ? 1.0 + (has_good ? w.change(i, j) : 0.0)
                           : mode == Mode::change   ? std::abs(now - (has_good ? w.good(i, j) : 0.0))
                                                    : std::abs(now);
      if (score > best.score) best.score = score, found.i = i, found.j = j;
    }
  }
  check_mpi(MPI_Allreduce(MPI_IN_PLACE, &best, 1, MPI_DOUBLE_INT, MPI_MAXLOC, grid.comm()));
  found.count = grid.global_sum(found.count);
  found.score = best.score;
  found.rank = best.rank;
  return found;
}

bool is_diverged(const IterationStatus& status) {
  const auto& r = status.normalised;
  bool bad = !std::isfinite(r.u + r.v + r.continuity) || r.u > runaway_residual || r.v > runaway_residual ||
             r.continuity > runaway_residual;
  for (const double m : status.model_normalised) bad = bad || !std::isfinite(m);
  return bad;
}

DivergenceWatch::DivergenceWatch(const FlowSolver& solver, const TurbulenceModel& model)
    : solver_(solver), model_(model) {
  const Grid& grid = solver.grid();
  auto watch = [&](const std::string& name, const Field& field) {
    fields_.push_back({name, &field, Field(grid), Field(grid)});
  };
  watch("velocity_x", solver.velocity().x);
  watch("velocity_y", solver.velocity().y);
  watch("pressure", solver.pressure());
  watch("eddy_viscosity", solver.eddy_viscosity());
  for (const auto& residual : model.residuals())
    for (const auto& [name, field] : model.output_fields())
      if (name == residual.name) watch(name, *field);
}

void DivergenceWatch::keep(int iteration) {
  for (Watched& w : fields_) {
    const auto& now = w.now->data();
    auto& good = w.good.data();
    auto& change = w.change.data();
    for (size_t k = 0; k < now.size(); ++k) {
      change[k] = std::abs(now[k] - good[k]);
      good[k] = now[k];
    }
  }
  good_iteration_ = iteration;
}

std::string DivergenceWatch::diagnose(const IterationStatus& status, const CaseSpec& spec,
                                      const std::filesystem::path& directory, std::string& file) const {
  const Grid& grid = solver_.grid();
  const auto& r = status.normalised;
  auto runaway = [](double value, bool bounded) {
    return !std::isfinite(value) || (bounded && value > runaway_residual);
  };
  // The equation: the first residual that ran away, and the field it solves for.
  std::string equation = "u-momentum", field_name = "velocity_x";
  bool is_model = false;
  if (runaway(r.u, true)) {
  } else if (runaway(r.v, true)) {
    equation = "v-momentum", field_name = "velocity_y";
  } else if (runaway(r.continuity, true)) {
    equation = "continuity (pressure correction)", field_name = "pressure";
  } else {
    const auto residuals = model_.residuals();
    for (size_t k = 0; k < status.model_normalised.size() && k < residuals.size(); ++k) {
      if (runaway(status.model_normalised[k], false)) {
        equation = "model equation of " + residuals[k].name, field_name = residuals[k].name, is_model = true;
        break;
      }
    }
  }
  const Watched* watched = &fields_.front();
  for (const Watched& w : fields_)
    if (w.name == field_name) watched = &w;
  if (is_model && watched->name != field_name) watched = &fields_[3];  // the eddy viscosity

  // Where it went wrong: non-finite values first (the equation's field, then any other), then the
  // largest change of the last iteration (likewise), then the equation field's largest magnitude.
  const bool has_good = good_iteration_ >= 0;
  std::vector<const Watched*> candidates{watched};
  for (const Watched& w : fields_)
    if (&w != watched) candidates.push_back(&w);
  Mode mode = Mode::non_finite;
  Location best;
  for (const Mode m : {Mode::non_finite, Mode::change}) {
    for (const Watched* w : candidates) {
      best = locate(*w, m, has_good);
      if (best.score > 0.0) {
        watched = w, mode = m;
        break;
      }
    }
    if (best.score > 0.0) break;
  }
  if (!(best.score > 0.0)) best = locate(*watched, mode = Mode::magnitude, has_good);
  const int best_i = best.i, best_j = best.j;
  double where[5] = {double(best_i), double(best_j), 0.0, 0.0, 0.0};
  if (grid.rank() == best.rank) {
    const Vec2 centre = grid.centre(best_i, best_j);
    where[2] = centre.x, where[3] = centre.y, where[4] = (*watched->now)(best_i, best_j);
  }
  check_mpi(MPI_Bcast(where, 5, MPI_DOUBLE, best.rank, grid.comm()));

  file.clear();
  if (has_good) {
    // The last good fields, as the run's fields would be written.
    VectorField velocity(grid);
    velocity.x = fields_[0].good;
    velocity.y = fields_[1].good;
    std::vector<NamedScalar> scalars;
    for (size_t k = 2; k < fields_.size(); ++k) scalars.push_back({fields_[k].name, &fields_[k].good});
    scalars.push_back({"solid", &solver_.solid()});
    write_vtk_fields(grid, scalars, {{"velocity", &velocity}}, directory.string(), "diverged_fields");
    file = "diverged_fields.pvts";
  }
  std::string text =
      equation + " diverged at iteration " + std::to_string(status.iteration) + ": " + watched->name + " = " +
      number(where[4]) + " at cell (" + std::to_string(static_cast<int>(where[0])) + ", " +
      std::to_string(static_cast<int>(where[1])) + "), x = " + number(where[2]) + ", y = " + number(where[3]);
  text += mode == Mode::non_finite ? " (non-finite in " + number(best.count) +
                                         " cell(s); this one changed most in the last good iteration)"
          : mode == Mode::magnitude ? " (its largest magnitude; the last iteration changed nothing)"
                                    : " (the largest change of the last iteration)";
  text += has_good ? "; fields of iteration " + std::to_string(good_iteration_) + " in " + file
                   : "; no iteration of this run was good, so no fields were written";
  return text + "; try: " + advice(spec, is_model);
}

}  // namespace wallrans
