#include "app/run_summary.hpp"

#include <cerrno>
#include <cmath>
#include <cstdio>
#include <sstream>
#include <system_error>

#include "core/atomic_file.hpp"
#include "core/error.hpp"

namespace wallrans {

namespace {

constexpr const char* caution =
    "RANS results are model-dependent: validate them for your case and defer to applicable codes "
    "and licensed engineering practice.";

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

std::string json_strings(const std::vector<std::string>& list) {
  std::string out = "[";
  for (const std::string& item : list) out += (out.size() > 1 ? ", " : "") + json_string(item);
  return out + "]";
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
  std::ostringstream json;
  json << "{\n  \"status\": " << json_string(to_string(s.status))
       << ",\n  \"exit_code\": " << (code < 0 ? std::string("null") : std::to_string(code))
       << ",\n  \"detail\": " << json_string(s.detail) << ",\n  \"title\": " << json_string(s.title)
       << ",\n  \"case_file\": " << json_string(s.case_file) << ",\n  \"case_id\": " << json_string(s.case_id)
       << ",\n  \"version\": " << json_string(WALLRANS_VERSION) << ",\n  \"host\": " << json_string(s.host)
       << ",\n  \"pid\": " << s.pid << ",\n  \"started\": " << json_string(s.started)
       << ",\n  \"ranks\": " << s.ranks << ",\n  \"cells\": [" << s.cells_x << ", " << s.cells_y
       << "],\n  \"model\": " << json_string(s.model) << ",\n  \"first_iteration\": " << s.first_iteration
       << ",\n  \"iterations\": " << s.iteration
       << ",\n  \"converged\": " << (s.status == RunStatus::converged ? "true" : "false")
       << ",\n  \"stopped_early\": " << (s.status == RunStatus::stopped ? "true" : "false")
       << ",\n  \"checkpoint\": " << json_string(s.checkpoint)
       << ",\n  \"coarse_grids\": " << s.coarse_grids_json << ",\n  \"work_in_fine_grid_iterations\": "
       << json_number(s.iteration - s.first_iteration + s.coarse_work)
       << ",\n  \"residuals\": {\"u\": " << json_number(s.residual_u)
       << ", \"v\": " << json_number(s.residual_v)
       << ", \"continuity\": " << json_number(s.residual_continuity)
       << "},\n  \"residual_drop\": " << json_number(s.residual_drop) << s.flow_report_json
       << ",\n  \"wall_time_s\": " << json_number(s.wall_time_s)
       << ",\n  \"warnings\": " << json_strings(s.warnings)
       << ",\n  \"diagnostic_file\": " << json_string(s.diagnostic_file)
       << ",\n  \"wall_resolution\": {\"max_first_cell_y_plus\": " << json_number(s.max_first_cell_y_plus)
       << ", \"at\": [" << json_number(s.max_y_plus_x) << ", " << json_number(s.max_y_plus_y) << "]}"
       << ",\n  \"caution\": " << json_string(caution) << "\n}\n";
  return json.str();
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
