#include "app/run_summary.hpp"

#include <cstdio>
#include <nlohmann/json.hpp>

#include "core/atomic_file.hpp"
#include "core/error.hpp"

namespace wallrans {

namespace {

using Json = nlohmann::ordered_json;

constexpr const char* caution =
    "RANS results are model-dependent: validate them for your case and defer to applicable codes "
    "and licensed engineering practice.";

Json pair(Vec2 v) { return Json::array({v.x, v.y}); }

Json wall_json(const WallAnswers& w) {
  Json points = Json::array();
  for (const ShearPoint& p : w.shear_points) {
    points.push_back({{"kind", p.is_separation ? "separation" : "reattachment"},
                      {"at", pair(p.at)},
                      {"s", p.s},
                      {"side", p.side}});
  }
  return Json{{"segment", w.segment},
              {"name", w.name},
              {"side", w.side},
              {"line", w.line},
              {"faces", w.n_faces},
              {"length", w.length},
              {"friction_force", pair(w.friction_force)},
              {"pressure_force", pair(w.pressure_force)},
              {"force", pair(w.friction_force + w.pressure_force)},
              {"cf_mean", w.cf_mean},
              {"cf_min", w.cf_min},
              {"cf_min_at", pair(w.cf_min_at)},
              {"cf_max", w.cf_max},
              {"cf_max_at", pair(w.cf_max_at)},
              {"first_cell_y_plus_max", w.y_plus_max},
              {"first_cell_y_plus_max_at", pair(w.y_plus_max_at)},
              {"separation_and_reattachment", points}};
}

Json periodic_json(const PeriodicAnswers& p) {
  return Json{{"bulk_velocity", p.bulk_velocity},
              {"u_tau", p.u_tau},
              {"u_tau_from_wall_shear", p.u_tau_wall_shear},
              {"re_tau", p.re_tau},
              {"re_bulk", p.re_bulk},
              {"cf_bulk", p.cf_bulk},
              {"half_height", p.half_height},
              {"mean_pressure_gradient", p.mean_pressure_gradient},
              {"driving_force_per_unit_mass", p.driving_force}};
}

}  // namespace

const char* to_string(RunStatus status) {
  switch (status) {
    case RunStatus::running:
      return "running";
    case RunStatus::converged:
      return "converged";
    case RunStatus::capped:
      return "capped";
    case RunStatus::diverged:
      return "diverged";
    case RunStatus::stopped:
      return "stopped";
    case RunStatus::failed:
      return "failed";
  }
  return "?";
}

int exit_code(RunStatus status) {
  switch (status) {
    case RunStatus::running:
      return -1;
    case RunStatus::converged:
      return 0;
    case RunStatus::capped:
      return 3;
    case RunStatus::diverged:
      return 4;
    case RunStatus::stopped:
      return 5;
    case RunStatus::failed:
      return 1;
  }
  return 1;
}

std::string summary_json(const RunSummary& s) {
  const int code = exit_code(s.status);
  Json coarse = Json::array();
  for (const CoarseGridSummary& c : s.coarse_grids) {
    coarse.push_back({{"cells", Json::array({c.cells_x, c.cells_y})},
                      {"iterations", c.iterations},
                      {"converged", c.converged}});
  }
  Json residuals{{"u", s.residual_u}, {"v", s.residual_v}, {"continuity", s.residual_continuity}};
  for (const auto& [name, value] : s.model_residuals) residuals[name] = value;
  Json json{{"status", to_string(s.status)},
            {"exit_code", code < 0 ? Json(nullptr) : Json(code)},
            {"detail", s.detail},
            {"title", s.title},
            {"case_file", s.case_file},
            {"case_id", s.case_id},
            {"version", WALLRANS_VERSION},
            {"host", s.host},
            {"pid", s.pid},
            {"started", s.started},
            {"ranks", s.ranks},
            {"cells", Json::array({s.cells_x, s.cells_y})},
            {"model", s.model},
            {"first_iteration", s.first_iteration},
            {"restarted_from", s.restarted_from.empty() ? Json(nullptr) : Json(s.restarted_from)},
            {"iterations", s.iteration},
            {"converged", s.status == RunStatus::converged},
            {"stopped_early", s.status == RunStatus::stopped},
            {"checkpoint", s.checkpoint},
            {"coarse_grids", coarse},
            {"work_in_fine_grid_iterations", s.iteration - s.first_iteration + s.coarse_work},
            {"residuals", residuals},
            {"residual_drop", s.residual_drop},
            {"wall_time_s", s.wall_time_s},
            {"grid", {{"source", s.grid_source}, {"cells", Json::array({s.cells_x, s.cells_y})}}},
            {"turbulence_model", {{"name", s.model}, {"variant", s.model_variant}}},
            {"reference_velocity",
             {{"value", s.reference_velocity},
              {"from", s.reference_velocity_given ? "flow.reference_velocity"
                                                  : "default (flow.reference_velocity not set)"}}}};
  // The answers exist once the outputs are written (not while running, nor after divergence).
  Json walls = nullptr, periodic = nullptr;
  if (s.answers) {
    walls = Json::array();
    for (const WallAnswers& w : s.answers->walls) walls.push_back(wall_json(w));
    if (s.answers->periodic) periodic = periodic_json(*s.answers->periodic);
  }
  json["warnings"] = s.warnings;
  json["diagnostic_file"] = s.diagnostic_file;
  json["wall_resolution"] = {{"max_first_cell_y_plus", s.max_first_cell_y_plus},
                             {"at", Json::array({s.max_y_plus_x, s.max_y_plus_y})}};
  // Mass balance and periodic driving: members written by app/flow_report.hpp.
  if (!s.flow_report_json.empty()) {
    std::string object = s.flow_report_json;  // ",\n  \"mass_balance\": {...}..." -> "{...}"
    object.front() = '{';
    object.push_back('}');
    const Json report = Json::parse(object);
    for (const auto& [key, value] : report.items()) json[key] = value;
  }
  json["walls"] = walls;
  json["periodic"] = periodic;
  json["caution"] = caution;
  // Non-finite numbers (a residual before the first iteration) are written as null.
  return json.dump(2, ' ', false, Json::error_handler_t::replace) + "\n";
}

void write_summary(const std::filesystem::path& directory, const RunSummary& summary) {
  const std::filesystem::path path = directory / "summary.json";
  const std::string text = summary_json(summary);
  try {
    write_file_atomically(path, text, "run summary");
  } catch (const Error&) {
    // In place: truncating frees the old file's blocks, which the new text (of about the same
    // length) can reuse on a full disk.
    std::FILE* file = std::fopen(path.c_str(), "w");
    const bool written = file != nullptr && std::fwrite(text.data(), 1, text.size(), file) == text.size() &&
                         std::fflush(file) == 0;
    if (file != nullptr) std::fclose(file);
    if (!written) throw;
  }
}

}  // namespace wallrans
