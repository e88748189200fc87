#include "coupling/nested_start.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <map>
#include <memory>
#include <optional>

#include "core/error.hpp"
#include "grid/boundary.hpp"
#include "models/model_factory.hpp"

namespace wallrans {

NodeCoordinates coarsen(const NodeCoordinates& nodes, bool coarsen_x, bool coarsen_y) {
  const int sx = coarsen_x ? 2 : 1, sy = coarsen_y ? 2 : 1;
  NodeCoordinates out;
  out.cells_x = nodes.cells_x / sx;
  out.cells_y = nodes.cells_y / sy;
  out.nodes.reserve(static_cast<size_t>(out.cells_x + 1) * (out.cells_y + 1));
  for (int j = 0; j <= out.cells_y; ++j)
    for (int i = 0; i <= out.cells_x; ++i) out.nodes.push_back(nodes.at(sx * i, sy * j));
  return out;
}

namespace {

// A cell field of a whole grid on every rank, global (i, j) order: j * cells_x + i.
class GlobalField {
 public:
  GlobalField(const Grid& grid, const std::function<double(int, int)>& value) : nx_(grid.cells_x()) {
    std::vector<double> owned;
    owned.reserve(grid.n_owned() * 3);
    for (int j = grid.y_begin(); j < grid.y_end(); ++j)
      for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
        owned.push_back(static_cast<double>(j) * nx_ + i);
        owned.push_back(value(i, j));
      }
    int size = 1;
    check_mpi(MPI_Comm_size(grid.comm(), &size));
    const int count = static_cast<int>(owned.size());
    std::vector<int> counts(static_cast<size_t>(size)), offsets(static_cast<size_t>(size), 0);
    check_mpi(MPI_Allgather(&count, 1, MPI_INT, counts.data(), 1, MPI_INT, grid.comm()));
    for (int r = 1; r < size; ++r) offsets[r] = offsets[r - 1] + counts[r - 1];
    std::vector<double> all(static_cast<size_t>(offsets.back() + counts.back()));
    check_mpi(MPI_Allgatherv(owned.data(), count, MPI_DOUBLE, all.data(), counts.data(), offsets.data(),
                             MPI_DOUBLE, grid.comm()));
    values_.assign(static_cast<size_t>(grid.cells_x()) * grid.cells_y(), 0.0);
    for (size_t k = 0; k + 1 < all.size(); k += 2) values_[static_cast<size_t>(all[k])] = all[k + 1];
  }
  double operator()(int i, int j) const { return values_[static_cast<size_t>(j) * nx_ + i]; }

 private:
  int nx_;
  std::vector<double> values_;
};

struct Level {
  CaseSpec spec;
  std::unique_ptr<Grid> grid;
  std::unique_ptr<BoundaryMap> boundaries;
  std::unique_ptr<TurbulenceModel> model;
  std::unique_ptr<FlowSolver> solver;
};

// Interpolates the coarse solution onto the fine grid (fine cell (i, j) lies in coarse cell
// (i / sx, j / sy)). A field with a gradient is reconstructed linearly from the centre of its
// coarse cell, phi_c + grad phi_c . (x_f - x_c), then limited to the range of the coarse values
// around it (Barth & Jespersen 1989), so no new extrema appear inside the domain. Fields without
// a gradient (the gradients themselves) are copied from the coarse cell.
class Prolongation {
 public:
  Prolongation(const Grid& coarse, const Grid& fine)
      : coarse_(coarse),
        fine_(fine),
        sx_(fine.cells_x() / coarse.cells_x()),
        sy_(fine.cells_y() / coarse.cells_y()),
        cx_(coarse, [&](int i, int j) { return coarse.centre(i, j).x; }),
        cy_(coarse, [&](int i, int j) { return coarse.centre(i, j).y; }) {}

  void operator()(const Field& from, const Field* grad_x, const Field* grad_y, Field& to) const {
    const GlobalField value(coarse_, [&](int i, int j) { return from(i, j); });
    std::optional<GlobalField> gx, gy;
    if (grad_x && grad_y) {
      gx.emplace(coarse_, [&](int i, int j) { return (*grad_x)(i, j); });
      gy.emplace(coarse_, [&](int i, int j) { return (*grad_y)(i, j); });
    }
    const int nx = coarse_.cells_x(), ny = coarse_.cells_y();
    for (int j = fine_.y_begin(); j < fine_.y_end(); ++j) {
      for (int i = fine_.x_begin(); i < fine_.x_end(); ++i) {
        const int ic = i / sx_, jc = j / sy_;
        double v = value(ic, jc);
        if (gx) {
          const Vec2 r = fine_.centre(i, j) - Vec2{cx_(ic, jc), cy_(ic, jc)};
          // Cells next to the domain edge are not limited: their gradient includes the boundary
          // values (the wall value, say), so the reconstruction towards the edge is consistent.
          double lo = -HUGE_VAL, hi = HUGE_VAL;
          const bool edge = (!coarse_.periodic_x() && (ic == 0 || ic == nx - 1)) || jc == 0 || jc == ny - 1;
          if (!edge) {
            lo = hi = v;
            for (int dj = -1; dj <= 1; ++dj) {
              for (int di = -1; di <= 1; ++di) {
                const int in = coarse_.periodic_x() ? (ic + di + nx) % nx : ic + di;
                lo = std::min(lo, value(in, jc + dj));
                hi = std::max(hi, value(in, jc + dj));
              }
            }
          }
          v = std::clamp(v + (*gx)(ic, jc) * r.x + (*gy)(ic, jc) * r.y, lo, hi);
        }
        to(i, j) = v;
      }
    }
    to.exchange();
  }

 private:
  const Grid& coarse_;
  const Grid& fine_;
  int sx_, sy_;
  GlobalField cx_, cy_;
};

// Writes the solution of `from` into the fresh solver and model of the finer grid.
void prolong(const Grid& coarse_grid, FlowSolver& coarse, TurbulenceModel& coarse_model, const Grid& fine_grid,
             FlowSolver& fine, TurbulenceModel& fine_model) {
  const Prolongation interpolate(coarse_grid, fine_grid);
  SolverRestartState to = fine.restart_state();
  auto cell = [](SolverRestartState& s, const std::string& name) -> Field& {
    for (auto& [n, f] : s.cells)
      if (n == name) return *f;
    throw std::logic_error("nested start: no solver field " + name);
  };
  interpolate(coarse.velocity().x, &coarse.grad_u().x, &coarse.grad_u().y, cell(to, "velocity_x"));
  interpolate(coarse.velocity().y, &coarse.grad_v().x, &coarse.grad_v().y, cell(to, "velocity_y"));
  // The pressure is not carried over: it starts from zero, as on a cold start, and the pressure
  // correction rebuilds it within a few iterations. Measured on the 352 x 192 plate (two coarse
  // grids): interpolated pressure 586 iterations on the fine grid, zero pressure 219 (cold start
  // 263); the interpolated field leaves a slowly decaying error in the v equation.
  fine.initialised_from_fields();
  // A flow-rate-driven periodic case continues from the gradient of the coarser grid.
  fine.set_mean_pressure_gradient(coarse.mean_pressure_gradient());

  // Model fields: "<name>_gradient_x/y" is the gradient of "<name>" where both exist.
  std::map<std::string, Field*> model_from;
  for (auto& [name, field] : coarse_model.restart_state()) model_from[name] = field;
  for (auto& [name, field] : fine_model.restart_state()) {
    const auto source = model_from.find(name);
    if (source == model_from.end()) throw std::logic_error("nested start: no model field " + name);
    const auto gx = model_from.find(name + "_gradient_x"), gy = model_from.find(name + "_gradient_y");
    const bool has_gradient = gx != model_from.end() && gy != model_from.end();
    interpolate(*source->second, has_gradient ? gx->second : nullptr, has_gradient ? gy->second : nullptr,
                *field);
  }
}

// The residual references of a grid (FlowSolver::iterate: the largest residuals of its first
// iterations) are measured by one iteration from the uniform start before the interpolated state
// replaces it, so that a nested start stops at the very standard of a start from the uniform
// field (measured references from the interpolated state would be smaller and the standard
// stricter; carrying a coarser grid's references over would mix grids).
void first_iteration_for_references(FlowSolver& solver) { (void)solver.iterate(); }

}  // namespace

void interpolate_to_finer(const Grid& coarse, const Grid& fine, const Field& from, const Field* grad_x,
                          const Field* grad_y, Field& to) {
  Prolongation(coarse, fine)(from, grad_x, grad_y, to);
}

std::vector<CoarseGridRun> start_from_coarser_grids(const CaseSpec& spec, const Grid& grid, FlowSolver& solver,
                                                    TurbulenceModel& model,
                                                    const std::function<void(const CoarseGridRun&)>& note) {
  // The hierarchy, finest first: halve a direction while its cell count is even and the halved
  // count keeps at least 8 cells (common practice for the coarsest grid of a sequence).
  // Solid regions and boundary segments given by cell or face indices (grids from files) refer
  // to the case's grid; such cases start on it.
  bool by_index = !spec.grid.file.empty();
  for (const SolidRegionSpec& region : spec.solid_regions) by_index = by_index || region.i || region.j;
  if (by_index) return {};
  std::vector<NodeCoordinates> hierarchy;
  NodeCoordinates current = grid.nodes();
  for (int level = 0; level < spec.iterations.coarse_grids; ++level) {
    const bool in_x = current.cells_x % 2 == 0 && current.cells_x / 2 >= 8;
    const bool in_y = current.cells_y % 2 == 0 && current.cells_y / 2 >= 8;
    if (!in_x && !in_y) break;
    current = coarsen(current, in_x, in_y);
    hierarchy.push_back(current);
  }
  // Build the levels; a level whose boundary segments no longer enclose a face (a segment end
  // between two dropped lines) ends the hierarchy there.
  std::vector<std::unique_ptr<Level>> levels;
  for (const NodeCoordinates& nodes : hierarchy) {
    auto level = std::make_unique<Level>();
    level->spec = spec;
    level->spec.grid.cells_x = nodes.cells_x;
    level->spec.grid.cells_y = nodes.cells_y;
    level->spec.iterations.residual_drop = spec.iterations.coarse_residual_drop;
    try {
      level->grid = std::make_unique<Grid>(grid.comm(), nodes, grid.periodic_x());
      level->boundaries = std::make_unique<BoundaryMap>(level->spec, level->grid->nodes());
    } catch (const InputError&) {
      break;
    }
    levels.push_back(std::move(level));
  }
  std::vector<CoarseGridRun> runs;
  for (auto it = levels.rbegin(); it != levels.rend(); ++it) {
    Level& level = **it;
    const auto start = std::chrono::steady_clock::now();
    int reference_iterations = 0;
    level.model = make_turbulence_model(level.spec, *level.grid, *level.boundaries);
    level.solver = std::make_unique<FlowSolver>(level.spec, *level.grid, *level.boundaries, *level.model);
    if (it != levels.rbegin()) {
      const Level& coarser = **std::prev(it);
      first_iteration_for_references(*level.solver);
      reference_iterations = 1;
      prolong(*coarser.grid, *coarser.solver, *coarser.model, *level.grid, *level.solver, *level.model);
    }
    CoarseGridRun run{level.grid->cells_x(), level.grid->cells_y()};
    run.reference_iterations = reference_iterations;
    // A coarse grid only has to carry the start-up transient: it gets a budget of iterations
    // (coarse grids of a stiff case may end in a limit cycle above the drop), and its state is
    // used once the budget is spent as long as it is finite.
    const int budget = spec.iterations.coarse_max;  // not iterations.max: a run split by restarts starts alike
    while (run.iterations < budget) {
      const IterationStatus status = level.solver->iterate();
      run.iterations = status.iteration;
      const auto& r = status.normalised;
      if (!std::isfinite(r.u + r.v + r.continuity) || r.u > 1e8 || r.v > 1e8) {
        run.diverged = true;
        break;
      }
      if ((run.converged = level.solver->converged(status))) break;
    }
    // The previous (coarser) level is no longer needed.
    if (it != levels.rbegin()) {
      Level& coarser = **std::prev(it);
      coarser.solver.reset();
      coarser.model.reset();
    }
    run.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    runs.push_back(run);
    note(run);
    if (run.diverged) return runs;  // the case's grid starts from the uniform field
  }
  if (!levels.empty()) {
    first_iteration_for_references(solver);
    prolong(*levels.front()->grid, *levels.front()->solver, *levels.front()->model, grid, solver, model);
  }
  return runs;
}

}  // namespace wallrans
