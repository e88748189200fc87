// The case file's keys: section, key, type, default and range, as the reference lists them.
#include "io/case_keys.hpp"

namespace wallrans {

const std::vector<CaseKey>& case_keys() {
  // clang-format off
  static const std::vector<CaseKey> keys = {
      {"", "title", "string", "`case`", "non-empty"},
      {"", "flow", "mapping", "required", "a section"},
      {"", "grid", "mapping", "required", "a section"},
      {"", "boundaries", "list of mappings", "required", "a section"},
      {"", "solid_regions", "list of mappings", "absent", "a section"},
      {"", "periodic", "mapping", "absent", "a section"},
      {"", "turbulence", "mapping", "absent", "a section"},
      {"", "iterations", "mapping", "absent", "a section"},
      {"", "output", "mapping", "absent", "a section"},
      {"", "checkpoint", "mapping", "absent", "a section"},
      {"flow", "kinematic_viscosity", "number", "required", "> 0"},
      {"flow", "reference_velocity", "number", "1", "> 0"},
      {"flow", "reference_length", "number", "1", "> 0"},
      {"flow", "reference_pressure", "number", "0", "any"},
      {"flow", "body_force", "[number, number]", "[0, 0]", "any"},
      {"flow", "initial_velocity", "[number, number]", "[0, 0]", "any"},
      {"grid", "file", "path", "absent", "a grid file"},
      {"grid", "generator", "name", "required without `file`", "`channel`, `cavity`, `plate`, `skewed_box`, `step`, `hill_channel`"},
      {"grid", "cells", "[integer, integer]", "required", "each >= 1"},
      {"grid", "length", "number", "1", "> 0"},
      {"grid", "height", "number", "1", "> 0"},
      {"grid", "first_cell_height", "number", "absent (uniform)", "> 0"},
      {"grid", "run_up", "number", "0", ">= 0"},
      {"grid", "run_up_cells", "integer", "0", "0 <= n < cells_x"},
      {"grid", "leading_edge_spacing", "number", "absent (length / plate cells)", "> 0"},
      {"grid", "skew_amplitude", "number", "0", "0 <= a < 0.2"},
      {"grid", "step_height", "number", "required for `step`", "0 < h < `height`"},
      {"grid", "upstream_length", "number", "required for `step`", "> 0"},
      {"grid", "upstream_cells", "integer", "required for `step`", "1 <= n < cells_x"},
      {"grid", "step_cells", "integer", "required for `step`", "1 <= n < cells_y"},
      {"grid", "corner_spacing", "number", "absent (uniform in each part)", "(0, part length / cells]"},
      {"grid", "top_cell_height", "number", "`first_cell_height`", "(0, inlet height / cells]"},
      {"grid", "hill_height", "number", "1", "> 0"},
      {"boundaries", "side", "name", "required without `patch`", "`left`, `right`, `bottom`, `top`"},
      {"boundaries", "patch", "string", "absent", "a patch of `grid.file`"},
      {"boundaries", "kind", "name", "required", "`wall`, `inflow`, `outflow`, `slip`, `opening`"},
      {"boundaries", "from", "number", "absent (start of side)", "any"},
      {"boundaries", "to", "number", "absent (end of side)", "> `from`"},
      {"boundaries", "faces", "[integer, integer]", "absent (the whole side)", "0 <= first <= last < faces on the side"},
      {"boundaries", "velocity", "[number, number]", "[0, 0] (`wall`, `opening`); required for `inflow`", "any"},
      {"boundaries", "pressure", "number", "`flow.reference_pressure`", "any"},
      {"boundaries", "profile_file", "path", "absent", "a CSV file"},
      {"boundaries", "profile_shift", "number", "0", "any"},
      {"solid_regions", "i", "[integer, integer]", "absent (every column)", "0 <= first <= last < `cells_x`"},
      {"solid_regions", "j", "[integer, integer]", "absent (every row)", "0 <= first <= last < `cells_y`"},
      {"solid_regions", "x", "[number, number]", "absent", "min < max"},
      {"solid_regions", "y", "[number, number]", "absent", "min < max"},
      {"periodic", "axis", "name", "required in the section", "`x`"},
      {"periodic", "mean_pressure_gradient", "number", "0", "any"},
      {"periodic", "bulk_velocity", "number", "absent (fixed gradient)", "> 0"},
      {"turbulence", "model", "name", "`laminar`", "`laminar`, `mixing_length`, `k_equation`, `spalart_allmaras`, `baldwin_barth`"},
      {"turbulence", "variant", "name", "`negative` (SA), `length_scale` (k)", "SA: `negative`, `standard`, `noft2`; k: `length_scale`, `structure`"},
      {"turbulence", "freestream_viscosity_ratio", "number", "3", "> 0"},
      {"turbulence", "freestream_intensity", "number", "0.01", "0 <= I <= 1"},
      {"turbulence", "outer_length", "number", "required for `mixing_length`", "> 0"},
      {"turbulence", "relax", "number", "0.8", "0 < a <= 1"},
      {"turbulence", "relax_diffusive_part", "number", "0.1", "0 < s <= 1"},
      {"turbulence", "convection", "name", "`bounded_linear_upwind`", "as `iterations.convection`"},
      {"iterations", "coupling", "name", "`simplec`", "`simple`, `simplec`"},
      {"iterations", "max", "integer", "2000", ">= 1"},
      {"iterations", "residual_drop", "number", "1e-6", "0 < r < 1"},
      {"iterations", "relax_velocity", "number", "0.8", "0 < a < 1"},
      {"iterations", "relax_pressure", "number", "1", "0 < a <= 1"},
      {"iterations", "relax_diffusive_part", "number", "0.1 (`simplec`), 1 (`simple`)", "0 < s <= 1"},
      {"iterations", "pressure_setup_every", "integer", "10", ">= 1"},
      {"iterations", "coarse_grids", "integer", "2", "0 to 6"},
      {"iterations", "coarse_residual_drop", "number", "1e-3", "(0, 1)"},
      {"iterations", "coarse_max", "integer", "300", ">= 1"},
      {"iterations", "convection", "name", "`bounded_linear_upwind`", "`upwind`, `linear_upwind`, `bounded_linear_upwind`, `central`"},
      {"iterations", "report_every", "integer", "50", ">= 0"},
      {"iterations", "petsc_options", "string", "`\"\"`", "any"},
      {"output", "directory", "string", "`out`", "non-empty"},
      {"output", "fields_every", "integer", "0", ">= 0"},
      {"output", "wall_data", "boolean", "`true`", "`true`, `false`"},
      {"output", "profiles_at_x", "list of numbers", "none", "any"},
      {"checkpoint", "every", "integer", "0", ">= 0"},
      {"checkpoint", "every_seconds", "number", "600", ">= 0"},
      {"checkpoint", "keep", "integer", "2", ">= 1"},
      {"checkpoint", "restart_from", "string", "none", "a checkpoint file"},
      {"checkpoint", "walltime", "number", "none", "> 0"},
  };
  // clang-format on
  return keys;
}

std::vector<std::string> keys_of(std::string_view section) {
  std::vector<std::string> names;
  for (const CaseKey& k : case_keys())
    if (k.section == section) names.emplace_back(k.key);
  return names;
}

std::string reference_row_start(const CaseKey& key) {
  return "| `" + std::string(key.key) + "` | " + std::string(key.type) + " | " + std::string(key.fallback) +
         " | " + std::string(key.range) + " |";
}

}  // namespace wallrans
