// Reads the case layout documented in configs/README.md into CaseSpec, one section at a time,
// then writes it back with every default filled in. All defaults live in CaseSpec's member
// initialisers; this file only overrides them with what the case file says.
#include "io/case_loader.hpp"

#include <array>
#include <cerrno>
#include <filesystem>
#include <fstream>
#include <functional>
#include <limits>
#include <sstream>
#include <string>
#include <system_error>
#include <utility>
#include <vector>

#include "core/error.hpp"
#include "io/case_keys.hpp"
#include "io/profile_reader.hpp"
#include "io/yaml_reader.hpp"
#include "meshes/hill.hpp"
#include "meshes/step_grid.hpp"

namespace wallrans {

namespace {

using yaml_reader::number_text;
using yaml_reader::Section;
using yaml_reader::Value;

constexpr std::array all_generators{GridGenerator::channel, GridGenerator::cavity,
                                    GridGenerator::plate,   GridGenerator::skewed_box,
                                    GridGenerator::step,    GridGenerator::hill_channel};
constexpr std::array all_sides{Side::left, Side::right, Side::bottom, Side::top};
constexpr std::array all_kinds{BoundaryKind::wall, BoundaryKind::inflow, BoundaryKind::outflow,
                               BoundaryKind::slip, BoundaryKind::opening};
constexpr std::array all_couplings{Coupling::simple, Coupling::simplec};
constexpr std::array all_schemes{ConvectionScheme::upwind, ConvectionScheme::linear_upwind,
                                 ConvectionScheme::bounded_linear_upwind, ConvectionScheme::central};
// "none" is the absence of the periodic section, so it is not a value a case file can name.
constexpr std::array periodic_axes{PeriodicAxis::x};
// Models are added here as they are implemented.
constexpr std::array<const char*, 5> turbulence_models{"laminar", "mixing_length", "k_equation",
                                                       "spalart_allmaras", "baldwin_barth"};
constexpr std::array<const char*, 3> sa_variants{"negative", "standard", "noft2"};
constexpr std::array<const char*, 2> k_variants{"length_scale", "structure"};

const std::string any_number = "a number";
const std::string positive_number = "a number > 0";
const std::string velocity_pair = "2 numbers [u, v]";

bool is_positive(double x) { return x > 0.0; }
bool is_non_negative(double x) { return x >= 0.0; }

const char* name_of(const char* name) { return name; }
const char* name_of(Side side) { return to_string(side); }
const char* name_of(BoundaryKind kind) { return to_string(kind); }

const char* name_of(GridGenerator generator) { return to_string(generator); }

const char* name_of(PeriodicAxis axis) { return axis == PeriodicAxis::x ? "x" : "none"; }

const char* name_of(Coupling coupling) { return coupling == Coupling::simple ? "simple" : "simplec"; }

const char* name_of(ConvectionScheme scheme) {
  switch (scheme) {
    case ConvectionScheme::upwind:
      return "upwind";
    case ConvectionScheme::linear_upwind:
      return "linear_upwind";
    case ConvectionScheme::bounded_linear_upwind:
      return "bounded_linear_upwind";
    case ConvectionScheme::central:
      return "central";
  }
  return "?";
}

template <class Choice, std::size_t n>
std::string one_of(const std::array<Choice, n>& choices) {
  std::string text = "one of ";
  for (std::size_t k = 0; k < n; ++k) text += (k > 0 ? ", " : "") + std::string(name_of(choices[k]));
  return text;
}

template <class Choice, std::size_t n>
Choice read_enum(const Value& value, const std::array<Choice, n>& choices) {
  const std::string expected = one_of(choices);
  const std::string text = value.text(expected);
  for (Choice choice : choices) {
    if (text == name_of(choice)) return choice;
  }
  value.fail(expected);
}

double number_or(const Section& section, const char* key, double fallback, const std::string& expected,
                 const std::function<bool(double)>& ok = {}) {
  const auto value = section.find(key);
  return value ? value->number(expected, ok) : fallback;
}

int integer_or(const Section& section, const char* key, int fallback, const std::string& expected,
               const std::function<bool(int)>& ok) {
  const auto value = section.find(key);
  return value ? value->integer(expected, ok) : fallback;
}

std::string text_or(const Section& section, const char* key, const std::string& fallback, bool allow_empty) {
  const auto value = section.find(key);
  if (!value) return fallback;
  const std::string expected = allow_empty ? "a string" : "a non-empty string";
  std::string text = value->text(expected);
  if (!allow_empty && text.empty()) value->fail(expected);
  return text;
}

FlowSpec read_flow(const Value& value) {
  const Section section = value.section(keys_of("flow"));
  FlowSpec flow;
  flow.kinematic_viscosity =
      section.require("kinematic_viscosity", positive_number).number(positive_number, is_positive);
  flow.reference_velocity =
      number_or(section, "reference_velocity", flow.reference_velocity, positive_number, is_positive);
  flow.reference_velocity_given = section.has("reference_velocity");
  flow.reference_length =
      number_or(section, "reference_length", flow.reference_length, positive_number, is_positive);
  flow.reference_pressure = number_or(section, "reference_pressure", flow.reference_pressure, any_number);
  if (const auto force = section.find("body_force")) flow.body_force = force->vec2("2 numbers [f_x, f_y]");
  if (const auto velocity = section.find("initial_velocity")) {
    flow.initial_velocity = velocity->vec2(velocity_pair);
  }
  return flow;
}

// Keys that only one generator reads; giving them to another would be silently ignored.
void reject_foreign_keys(const Section& section, const GridSpec& grid, GridGenerator owner,
                         std::initializer_list<const char*> keys) {
  if (grid.generator == owner) return;
  for (const char* key : keys) {
    if (const auto value = section.find(key)) {
      value->fail(std::string("this key only with generator ") + name_of(owner),
                  std::string("generator ") + name_of(grid.generator));
    }
  }
}

void read_step_keys(const Section& section, GridSpec& grid) {
  const std::string nx = std::to_string(grid.cells_x), ny = std::to_string(grid.cells_y);
  grid.step_height = section.require("step_height", "a number in (0, height)")
                         .number("a number in (0, height) = (0, " + number_text(grid.height) + ")",
                                 [&](double h) { return h > 0.0 && h < grid.height; });
  grid.upstream_length =
      section.require("upstream_length", positive_number).number(positive_number, is_positive);
  grid.upstream_cells = section.require("upstream_cells", "an integer in [1, cells_x)")
                            .integer("an integer in [1, cells_x) = [1, " + nx + ")",
                                     [&](int n) { return n >= 1 && n < grid.cells_x; });
  grid.step_cells = section.require("step_cells", "an integer in [1, cells_y)")
                        .integer("an integer in [1, cells_y) = [1, " + ny + ")",
                                 [&](int n) { return n >= 1 && n < grid.cells_y; });
  if (const auto spacing = section.find("corner_spacing"))
    grid.corner_spacing = spacing->number(positive_number, is_positive);
  if (const auto top = section.find("top_cell_height")) {
    if (!grid.first_cell_height) top->fail("no top_cell_height without grid.first_cell_height");
    grid.top_cell_height = top->number(positive_number, is_positive);
  }
}

void read_plate_keys(const Section& section, GridSpec& grid) {
  const std::string n = std::to_string(grid.cells_x);
  grid.run_up = number_or(section, "run_up", grid.run_up, "a number >= 0", is_non_negative);
  grid.run_up_cells =
      integer_or(section, "run_up_cells", grid.run_up_cells, "an integer in [0, cells_x) = [0, " + n + ")",
                 [&](int cells) { return cells >= 0 && cells < grid.cells_x; });
  // The run-up needs cells and cells need a run-up (the generator builds both or neither).
  if (grid.run_up > 0.0 && grid.run_up_cells == 0) {
    const std::string expected = "an integer in [1, " + n + ") because grid.run_up > 0";
    if (const auto cells = section.find("run_up_cells")) cells->fail(expected);
    section.missing("run_up_cells", expected);
  }
  if (grid.run_up == 0.0 && grid.run_up_cells > 0) {
    section.find("run_up_cells")->fail("0 because grid.run_up is 0 (give grid.run_up > 0 for a run-up)");
  }
  if (const auto spacing = section.find("leading_edge_spacing")) {
    grid.leading_edge_spacing = spacing->number(positive_number, is_positive);
  }
}

// The hill channel's extents follow from the hill height (meshes/hill.hpp), so length and height
// would be ignored.
void read_hill_keys(const Section& section, GridSpec& grid) {
  for (const char* key : {"length", "height"}) {
    if (const auto value = section.find(key)) {
      value->fail("no grid." + std::string(key) +
                      " with generator hill_channel (9 x 3.035 hill heights; give grid.hill_height)",
                  "a value");
    }
  }
  grid.hill_height = number_or(section, "hill_height", grid.hill_height, positive_number, is_positive);
  grid.length = hill_period_in_h * grid.hill_height;
  grid.height = hill_channel_height_in_h * grid.hill_height;
}

// A file named relative to the case file's folder, made absolute so the resolved case in a run
// directory still finds it. `what` names the file's kind for the message.
std::string path_from_case(const Value& file, const std::string& what) {
  const std::string expected = "a non-empty path of " + what;
  const std::filesystem::path given = file.text(expected);
  if (given.empty()) file.fail(expected);
  if (given.is_absolute()) return given.lexically_normal().string();
  std::error_code ignored;
  const auto absolute =
      std::filesystem::absolute(std::filesystem::path(file.source()).parent_path() / given, ignored);
  return absolute.lexically_normal().string();
}

GridSpec read_grid(const Value& value) {
  const Section section = value.section(keys_of("grid"));
  GridSpec grid;
  grid.line = value.line();
  if (const auto file = section.find("file")) {
    // The file gives the nodes; a generator key next to it would be silently ignored.
    for (const char* key :
         {"generator", "cells", "length", "height", "first_cell_height", "run_up", "run_up_cells",
          "leading_edge_spacing", "skew_amplitude", "step_height", "upstream_length", "upstream_cells",
          "step_cells", "corner_spacing", "top_cell_height", "hill_height"}) {
      if (const auto other = section.find(key)) other->fail("no generator key next to grid.file", "a value");
    }
    grid.file = path_from_case(*file, "a grid file");
    return grid;
  }
  grid.generator =
      read_enum(section.require("generator", one_of(all_generators) + " (or grid.file)"), all_generators);
  const std::string cells_expected = "2 positive integers [cells_x, cells_y]";
  const auto cells = section.require("cells", cells_expected).integers(2, cells_expected, [](int cells) {
    return cells >= 1;
  });
  grid.cells_x = cells[0];
  grid.cells_y = cells[1];
  grid.length = number_or(section, "length", grid.length, positive_number, is_positive);
  grid.height = number_or(section, "height", grid.height, positive_number, is_positive);
  if (const auto height = section.find("first_cell_height")) {
    grid.first_cell_height = height->number(positive_number, is_positive);
  }
  reject_foreign_keys(section, grid, GridGenerator::plate,
                      {"run_up", "run_up_cells", "leading_edge_spacing"});
  reject_foreign_keys(section, grid, GridGenerator::skewed_box, {"skew_amplitude"});
  reject_foreign_keys(section, grid, GridGenerator::step,
                      {"step_height", "upstream_length", "upstream_cells", "step_cells", "corner_spacing",
                       "top_cell_height"});
  if (grid.generator == GridGenerator::plate) read_plate_keys(section, grid);
  if (grid.generator == GridGenerator::step) read_step_keys(section, grid);
  grid.skew_amplitude = number_or(section, "skew_amplitude", grid.skew_amplitude, "a number in [0, 0.2)",
                                  [](double a) { return a >= 0.0 && a < 0.2; });
  reject_foreign_keys(section, grid, GridGenerator::hill_channel, {"hill_height"});
  if (grid.generator == GridGenerator::hill_channel) read_hill_keys(section, grid);
  return grid;
}

PeriodicSpec read_periodic(const Value& value, const GridSpec& grid) {
  const Section section = value.section(keys_of("periodic"));
  PeriodicSpec periodic;
  const Value axis = section.require("axis", one_of(periodic_axes));
  periodic.axis = read_enum(axis, periodic_axes);
  // A grid file's cell count is checked when the file is read.
  if (grid.file.empty() && grid.cells_x < 2) {
    axis.fail("grid.cells_x >= 2 for a periodic x axis", "cells_x = " + std::to_string(grid.cells_x));
  }
  periodic.mean_pressure_gradient = number_or(section, "mean_pressure_gradient", 0.0, any_number);
  if (const auto bulk = section.find("bulk_velocity"))
    periodic.bulk_velocity = bulk->number(positive_number, is_positive);
  return periodic;
}

bool takes_velocity(BoundaryKind kind) {
  return kind == BoundaryKind::wall || kind == BoundaryKind::inflow || kind == BoundaryKind::opening;
}
bool takes_pressure(BoundaryKind kind) {
  return kind == BoundaryKind::outflow || kind == BoundaryKind::opening;
}

// Kind names that case files used before a rename, with the name to use now.
constexpr std::array<std::pair<const char*, const char*>, 1> renamed_kinds{{{"free", "opening"}}};

BoundaryKind read_kind(const Value& value) {
  const std::string expected = one_of(all_kinds);
  const std::string text = value.text(expected);
  for (const auto& [old_name, new_name] : renamed_kinds) {
    if (text == old_name) value.fail(expected, "'" + text + "' (renamed: use '" + new_name + "')");
  }
  return read_enum(value, all_kinds);
}

// Where a segment lies: a patch of the grid file, or a side with an optional coordinate or face
// range. Coordinates need not be monotone along a curved side, so file grids take faces or patches.
void read_segment_place(const Section& section, const GridSpec& grid, BoundarySegmentSpec& segment) {
  if (const auto patch = section.find("patch")) {
    if (grid.file.empty()) patch->fail("no patch without grid.file (only grid files have patches)");
    for (const char* key : {"side", "from", "to", "faces"}) {
      if (const auto other = section.find(key))
        other->fail("no " + std::string(key) + " next to patch (the patch gives the faces)", "a value");
    }
    segment.patch = patch->text("a patch name of the grid file");
    if (segment.patch.empty()) patch->fail("a patch name of the grid file");
    return;
  }
  segment.side = read_enum(section.require("side", one_of(all_sides) + " (or patch)"), all_sides);
  if (const auto faces = section.find("faces")) {
    const std::string expected = "2 integers [first, last] with 0 <= first <= last";
    const auto range = faces->integers(2, expected, [](int n) { return n >= 0; });
    if (range[0] > range[1]) faces->fail(expected);
    for (const char* key : {"from", "to"}) {
      if (const auto other = section.find(key))
        other->fail("no " + std::string(key) + " next to faces", "a value");
    }
    segment.faces = std::array<int, 2>{range[0], range[1]};
  }
  for (const char* key : {"from", "to"}) {
    const auto value = section.find(key);
    if (value && !grid.file.empty()) {
      value->fail("'faces' or 'patch' on a grid from a file (coordinates need not be monotone along a side)",
                  "'" + std::string(key) + "'");
    }
  }
  if (const auto from = section.find("from")) segment.from = from->number(any_number);
  if (const auto to = section.find("to")) {
    segment.to = to->number(any_number);
    if (segment.from && !(*segment.from < *segment.to)) {
      to->fail("a number greater than from = " + number_text(*segment.from));
    }
  }
}

BoundarySegmentSpec read_segment(const Value& entry, const FlowSpec& flow, const GridSpec& grid,
                                 const PeriodicSpec& periodic, int periodic_line) {
  const Section section = entry.section(keys_of("boundaries"));
  BoundarySegmentSpec segment;
  segment.line = entry.line();
  read_segment_place(section, grid, segment);
  segment.kind = read_kind(section.require("kind", one_of(all_kinds)));
  const std::string kind = name_of(segment.kind);
  if (const auto file = section.find("profile_file")) {
    // The table replaces the velocity; its coordinate runs along the side (read after the model).
    if (segment.kind != BoundaryKind::inflow)
      file->fail("no profile_file for kind '" + kind + "' (only inflow)");
    if (!segment.patch.empty())
      file->fail("profile_file with side (its coordinate runs along a side), not patch");
    if (const auto velocity = section.find("velocity"))
      velocity->fail("no velocity next to profile_file (the profile gives it)");
    InflowProfile profile;
    profile.file = path_from_case(*file, "a profile file (CSV)");
    profile.coordinate_column = segment.side == Side::left || segment.side == Side::right ? "y" : "x";
    if (const auto shift = section.find("profile_shift")) profile.shift = shift->number(any_number);
    segment.profile = std::move(profile);
  } else if (const auto shift = section.find("profile_shift")) {
    shift->fail("no profile_shift without profile_file");
  }
  if (const auto velocity = section.find("velocity")) {
    if (!takes_velocity(segment.kind)) {
      velocity->fail("no velocity for kind '" + kind + "' (only wall, inflow and opening take one)");
    }
    segment.velocity = velocity->vec2(velocity_pair);
  } else if (segment.kind == BoundaryKind::inflow && !segment.profile) {
    section.missing("velocity", velocity_pair + " or profile_file for kind 'inflow'");
  }
  if (const auto pressure = section.find("pressure")) {
    if (!takes_pressure(segment.kind)) {
      pressure->fail("no pressure for kind '" + kind + "' (only outflow and opening take one)");
    }
    segment.pressure = pressure->number(any_number);
  } else if (takes_pressure(segment.kind)) {
    segment.pressure = flow.reference_pressure;
  }
  const bool on_x_end = segment.patch.empty() && (segment.side == Side::left || segment.side == Side::right);
  if (periodic.axis == PeriodicAxis::x && on_x_end) {
    // Reported at the segment's own line, which is where the user has to act.
    const Value side = section.require("side", one_of(all_sides));
    Value(side.source(), side.node(), side.key(), segment.line)
        .fail("no segment on side '" + std::string(name_of(segment.side)) +
                  "' because periodic.axis is x (line " + std::to_string(periodic_line) + ")",
              "a " + kind + " segment");
  }
  return segment;
}

std::vector<BoundarySegmentSpec> read_boundaries(const Value& value, const FlowSpec& flow,
                                                 const GridSpec& grid, const PeriodicSpec& periodic,
                                                 int periodic_line) {
  const std::string expected = "a non-empty list of boundary segments";
  const auto entries = value.items(expected);
  if (entries.empty()) value.fail(expected);
  std::vector<BoundarySegmentSpec> segments;
  for (const Value& entry : entries)
    segments.push_back(read_segment(entry, flow, grid, periodic, periodic_line));
  return segments;
}

// One solid region: index ranges i, j (inclusive, within the grid) and coordinate ranges x, y of
// the cell centre, any combination but at least one.
SolidRegionSpec read_solid_region(const Value& entry, const GridSpec& grid) {
  const Section section = entry.section(keys_of("solid_regions"));
  SolidRegionSpec region;
  region.line = entry.line();
  if (!section.has("i") && !section.has("j") && !section.has("x") && !section.has("y")) {
    entry.fail("a mapping with at least one of i, j (index ranges) and x, y (coordinate ranges)");
  }
  auto index_range = [&](const char* key, int cells, const char* count) -> std::optional<std::array<int, 2>> {
    const auto value = section.find(key);
    if (!value) return std::nullopt;
    const std::string expected = "2 integers [first, last] with 0 <= first <= last < grid." +
                                 std::string(count) + " = " + std::to_string(cells);
    const auto range = value->integers(2, expected, [&](int k) { return k >= 0 && k < cells; });
    if (range[0] > range[1]) value->fail(expected);
    return std::array<int, 2>{range[0], range[1]};
  };
  auto coordinate_range = [&](const char* key) -> std::optional<std::array<double, 2>> {
    const auto value = section.find(key);
    if (!value) return std::nullopt;
    const std::string expected = "2 numbers [min, max] with min < max";
    const auto range = value->numbers(2, expected);
    if (!(range[0] < range[1])) value->fail(expected);
    return std::array<double, 2>{range[0], range[1]};
  };
  // On a grid from a file the cell counts are known only once it is read (SolidCells checks there).
  const int unknown = std::numeric_limits<int>::max();
  region.i = index_range("i", grid.file.empty() ? grid.cells_x : unknown, "cells_x");
  region.j = index_range("j", grid.file.empty() ? grid.cells_y : unknown, "cells_y");
  region.x = coordinate_range("x");
  region.y = coordinate_range("y");
  return region;
}

std::vector<SolidRegionSpec> read_solid_regions(const Value& value, const GridSpec& grid) {
  const std::string expected = "a non-empty list of solid regions";
  const auto entries = value.items(expected);
  if (entries.empty()) value.fail(expected);
  std::vector<SolidRegionSpec> regions;
  for (const Value& entry : entries) regions.push_back(read_solid_region(entry, grid));
  return regions;
}

TurbulenceSpec read_turbulence(const Value& value) {
  const Section section = value.section(keys_of("turbulence"));
  TurbulenceSpec turbulence;
  turbulence.line = value.line();
  if (const auto model = section.find("model")) {
    const std::string expected = one_of(turbulence_models);
    turbulence.model = model->text(expected);
    bool known = false;
    for (const char* name : turbulence_models) known = known || turbulence.model == name;
    if (!known) model->fail(expected);
  }
  const bool is_sa = turbulence.model == "spalart_allmaras", is_k = turbulence.model == "k_equation";
  if (const auto variant = section.find("variant")) {
    if (is_sa) {
      turbulence.variant = variant->text(one_of(sa_variants));
      bool known = false;
      for (const char* name : sa_variants) known = known || turbulence.variant == name;
      if (!known) variant->fail(one_of(sa_variants));
    } else if (is_k) {
      turbulence.variant = variant->text(one_of(k_variants));
      bool known = false;
      for (const char* name : k_variants) known = known || turbulence.variant == name;
      if (!known) variant->fail(one_of(k_variants));
    } else {
      variant->fail("no variant for model " + turbulence.model +
                    " (variants exist for spalart_allmaras and k_equation)");
    }
  }
  if (turbulence.variant.empty()) turbulence.variant = is_sa ? "negative" : is_k ? "length_scale" : "";
  turbulence.freestream_viscosity_ratio =
      number_or(section, "freestream_viscosity_ratio", turbulence.freestream_viscosity_ratio, positive_number,
                is_positive);
  turbulence.freestream_intensity =
      number_or(section, "freestream_intensity", turbulence.freestream_intensity, "a number in [0, 1]",
                [](double x) { return x >= 0.0 && x <= 1.0; });
  if (const auto outer = section.find("outer_length"))
    turbulence.outer_length = outer->number(positive_number, is_positive);
  if (turbulence.model == "mixing_length" && !turbulence.outer_length) {
    section.missing("outer_length", "a number > 0 (the mixing_length model caps l at 0.09 outer_length)");
  }
  turbulence.relax = number_or(section, "relax", turbulence.relax, "a number in (0, 1]",
                               [](double x) { return x > 0.0 && x <= 1.0; });
  turbulence.relax_diffusive_part =
      number_or(section, "relax_diffusive_part", turbulence.relax_diffusive_part, "a number in (0, 1]",
                [](double x) { return x > 0.0 && x <= 1.0; });
  if (const auto scheme = section.find("convection")) turbulence.convection = read_enum(*scheme, all_schemes);
  return turbulence;
}

IterationSpec read_iterations(const Value& value) {
  const Section section = value.section(keys_of("iterations"));
  IterationSpec iterations;
  if (const auto coupling = section.find("coupling")) {
    iterations.coupling = read_enum(*coupling, all_couplings);
  }
  iterations.max =
      integer_or(section, "max", iterations.max, "an integer >= 1", [](int n) { return n >= 1; });
  const auto open_unit = [](double x) { return x > 0.0 && x < 1.0; };
  iterations.residual_drop =
      number_or(section, "residual_drop", iterations.residual_drop, "a number in (0, 1)", open_unit);
  iterations.relax_velocity =
      number_or(section, "relax_velocity", iterations.relax_velocity, "a number in (0, 1)", open_unit);
  iterations.relax_pressure = number_or(section, "relax_pressure", iterations.relax_pressure,
                                        "a number in (0, 1]", [](double x) { return x > 0.0 && x <= 1.0; });
  // Plain SIMPLE relaxes all of a_P by default: its pressure relaxation (about 1 - alpha_u)
  // compensates the neglected neighbour coefficients only then.
  if (iterations.coupling == Coupling::simple) iterations.relax_diffusive_part = 1.0;
  iterations.relax_diffusive_part =
      number_or(section, "relax_diffusive_part", iterations.relax_diffusive_part, "a number in (0, 1]",
                [](double x) { return x > 0.0 && x <= 1.0; });
  iterations.pressure_setup_every =
      integer_or(section, "pressure_setup_every", iterations.pressure_setup_every, "an integer >= 1",
                 [](int n) { return n >= 1; });
  iterations.coarse_grids = integer_or(section, "coarse_grids", iterations.coarse_grids,
                                       "an integer in [0, 6]", [](int n) { return n >= 0 && n <= 6; });
  iterations.coarse_residual_drop =
      number_or(section, "coarse_residual_drop", iterations.coarse_residual_drop, "a number in (0, 1)",
                [](double x) { return x > 0.0 && x < 1.0; });
  iterations.coarse_max = integer_or(section, "coarse_max", iterations.coarse_max, "an integer >= 1",
                                     [](int n) { return n >= 1; });
  if (const auto scheme = section.find("convection")) iterations.convection = read_enum(*scheme, all_schemes);
  iterations.report_every = integer_or(section, "report_every", iterations.report_every, "an integer >= 0",
                                       [](int n) { return n >= 0; });
  iterations.petsc_options = text_or(section, "petsc_options", iterations.petsc_options, true);
  return iterations;
}

OutputSpec read_output(const Value& value) {
  const Section section = value.section(keys_of("output"));
  OutputSpec output;
  output.directory = text_or(section, "directory", output.directory, false);
  output.fields_every = integer_or(section, "fields_every", output.fields_every, "an integer >= 0",
                                   [](int n) { return n >= 0; });
  if (const auto wall_data = section.find("wall_data")) output.wall_data = wall_data->boolean();
  if (const auto stations = section.find("profiles_at_x")) {
    for (const Value& x : stations->items("a list of x stations [m]"))
      output.profiles_at_x.push_back(x.number(any_number));
  }
  return output;
}

CheckpointSpec read_checkpoint(const Value& value) {
  const Section section = value.section(keys_of("checkpoint"));
  CheckpointSpec checkpoint;
  checkpoint.every =
      integer_or(section, "every", checkpoint.every, "an integer >= 0", [](int n) { return n >= 0; });
  checkpoint.every_seconds =
      number_or(section, "every_seconds", checkpoint.every_seconds, "a number >= 0", is_non_negative);
  checkpoint.keep =
      integer_or(section, "keep", checkpoint.keep, "an integer >= 1", [](int n) { return n >= 1; });
  if (section.has("restart_from")) checkpoint.restart_from = text_or(section, "restart_from", "", false);
  if (const auto walltime = section.find("walltime"))
    checkpoint.walltime = walltime->number(positive_number, is_positive);
  return checkpoint;
}

// Emitter helpers: numbers go out as their shortest exact text so the round trip is lossless.
void put(YAML::Emitter& out, const char* key, double x) {
  out << YAML::Key << key << YAML::Value << number_text(x);
}
void put(YAML::Emitter& out, const char* key, int n) { out << YAML::Key << key << YAML::Value << n; }
void put(YAML::Emitter& out, const char* key, const char* name) {
  out << YAML::Key << key << YAML::Value << name;
}
void put_text(YAML::Emitter& out, const char* key, const std::string& text) {
  out << YAML::Key << key << YAML::Value << YAML::DoubleQuoted << text;
}
void put(YAML::Emitter& out, const char* key, Vec2 v) {
  out << YAML::Key << key << YAML::Value << YAML::Flow << YAML::BeginSeq << number_text(v.x)
      << number_text(v.y) << YAML::EndSeq;
}

void put_grid(YAML::Emitter& out, const GridSpec& grid) {
  out << YAML::Key << "grid" << YAML::Value << YAML::BeginMap;
  if (!grid.file.empty()) {
    put_text(out, "file", grid.file);
    out << YAML::EndMap;
    return;
  }
  put(out, "generator", name_of(grid.generator));
  out << YAML::Key << "cells" << YAML::Value << YAML::Flow << YAML::BeginSeq << grid.cells_x << grid.cells_y
      << YAML::EndSeq;
  if (grid.generator == GridGenerator::hill_channel) {
    put(out, "hill_height", grid.hill_height);
  } else {
    put(out, "length", grid.length);
    put(out, "height", grid.height);
  }
  if (grid.first_cell_height) put(out, "first_cell_height", *grid.first_cell_height);
  if (grid.generator == GridGenerator::plate) {
    put(out, "run_up", grid.run_up);
    put(out, "run_up_cells", grid.run_up_cells);
    if (grid.leading_edge_spacing) put(out, "leading_edge_spacing", *grid.leading_edge_spacing);
  }
  if (grid.generator == GridGenerator::skewed_box) put(out, "skew_amplitude", grid.skew_amplitude);
  if (grid.generator == GridGenerator::step) {
    put(out, "step_height", grid.step_height);
    put(out, "upstream_length", grid.upstream_length);
    put(out, "upstream_cells", grid.upstream_cells);
    put(out, "step_cells", grid.step_cells);
    if (grid.corner_spacing) put(out, "corner_spacing", *grid.corner_spacing);
    if (grid.top_cell_height) put(out, "top_cell_height", *grid.top_cell_height);
  }
  out << YAML::EndMap;
}

void put_solid_regions(YAML::Emitter& out, const std::vector<SolidRegionSpec>& regions) {
  std::vector<const SolidRegionSpec*> written;
  for (const auto& region : regions)
    if (!region.from_generator) written.push_back(&region);
  if (written.empty()) return;
  out << YAML::Key << "solid_regions" << YAML::Value << YAML::BeginSeq;
  for (const SolidRegionSpec* given : written) {
    const SolidRegionSpec& region = *given;
    out << YAML::Flow << YAML::BeginMap;
    for (const auto& [key, range] : {std::pair{"i", region.i}, std::pair{"j", region.j}}) {
      if (range)
        out << YAML::Key << key << YAML::Value << YAML::Flow << YAML::BeginSeq << (*range)[0] << (*range)[1]
            << YAML::EndSeq;
    }
    for (const auto& [key, range] : {std::pair{"x", region.x}, std::pair{"y", region.y}}) {
      if (range) put(out, key, Vec2{(*range)[0], (*range)[1]});
    }
    out << YAML::EndMap;
  }
  out << YAML::EndSeq;
}

void put_boundaries(YAML::Emitter& out, const std::vector<BoundarySegmentSpec>& segments) {
  out << YAML::Key << "boundaries" << YAML::Value << YAML::BeginSeq;
  for (const auto& segment : segments) {
    out << YAML::Flow << YAML::BeginMap;
    if (segment.patch.empty()) {
      put(out, "side", name_of(segment.side));
    } else {
      put_text(out, "patch", segment.patch);
    }
    put(out, "kind", name_of(segment.kind));
    if (segment.from) put(out, "from", *segment.from);
    if (segment.to) put(out, "to", *segment.to);
    if (segment.faces) {
      out << YAML::Key << "faces" << YAML::Value << YAML::Flow << YAML::BeginSeq << (*segment.faces)[0]
          << (*segment.faces)[1] << YAML::EndSeq;
    }
    if (segment.profile) {
      put_text(out, "profile_file", segment.profile->file);
      put(out, "profile_shift", segment.profile->shift);
    } else if (takes_velocity(segment.kind)) {
      put(out, "velocity", segment.velocity);
    }
    if (segment.pressure) put(out, "pressure", *segment.pressure);
    out << YAML::EndMap;
  }
  out << YAML::EndSeq;
}

// Reads the table of every inflow segment with a profile_file, now that the model (and so the
// column of its variable) is known. Messages name the case file and the segment's line.
void read_profile_tables(CaseSpec& spec) {
  const std::string variable = model_variable_column(spec.turbulence.model);
  for (size_t s = 0; s < spec.boundaries.size(); ++s) {
    BoundarySegmentSpec& segment = spec.boundaries[s];
    if (!segment.profile) continue;
    try {
      segment.profile = read_inflow_profile(segment.profile->file, segment.profile->coordinate_column,
                                            variable, spec.turbulence.model, segment.profile->shift);
    } catch (const InputError& e) {
      throw InputError(spec.source_file + ":" + std::to_string(segment.line) + ": key 'boundaries[" +
                       std::to_string(s) + "].profile_file': " + e.what());
    }
  }
}

}  // namespace

CaseSpec parse_case_text(const std::string& text, const std::string& source_name) {
  const Value document = yaml_reader::parse_document(text, source_name);
  const Section top = document.section(keys_of(""));
  CaseSpec spec;
  spec.source_file = source_name;
  spec.title = text_or(top, "title", spec.title, false);
  spec.flow = read_flow(top.require("flow", "a mapping (the flow section)"));
  spec.grid = read_grid(top.require("grid", "a mapping (the grid section)"));
  // Periodicity is read before the boundaries, which must leave the periodic sides free.
  const auto periodic = top.find("periodic");
  if (periodic) spec.periodic = read_periodic(*periodic, spec.grid);
  spec.boundaries = read_boundaries(top.require("boundaries", "a non-empty list of boundary segments"),
                                    spec.flow, spec.grid, spec.periodic, periodic ? periodic->line() : 0);
  if (const auto solid = top.find("solid_regions"))
    spec.solid_regions = read_solid_regions(*solid, spec.grid);
  // The step generator's solid corner comes after the case file's regions, which keep their
  // numbers in messages; it is not written back (the generator adds it again).
  if (spec.grid.file.empty() && spec.grid.generator == GridGenerator::step)
    spec.solid_regions.push_back(step_solid_region(spec.grid));
  if (const auto turbulence = top.find("turbulence")) spec.turbulence = read_turbulence(*turbulence);
  read_profile_tables(spec);
  if (const auto iterations = top.find("iterations")) spec.iterations = read_iterations(*iterations);
  if (const auto output = top.find("output")) spec.output = read_output(*output);
  if (const auto checkpoint = top.find("checkpoint")) spec.checkpoint = read_checkpoint(*checkpoint);
  return spec;
}

CaseSpec load_case_file(const std::string& path) {
  std::error_code status;
  if (std::filesystem::is_directory(path, status)) {
    throw InputError(path + ": expected a readable case file, got a directory");
  }
  errno = 0;
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    const std::string reason =
        errno != 0 ? std::generic_category().message(errno) : "a file that cannot be opened";
    throw InputError(path + ": expected a readable case file, got " + reason);
  }
  std::ostringstream text;
  text << in.rdbuf();
  if (in.bad()) throw InputError(path + ": expected a readable case file, got a read error");
  return parse_case_text(text.str(), path);
}

std::string resolved_case_yaml(const CaseSpec& spec) {
  YAML::Emitter out;
  out.SetIndent(2);
  out << YAML::BeginMap;
  put_text(out, "title", spec.title);

  const FlowSpec& flow = spec.flow;
  out << YAML::Key << "flow" << YAML::Value << YAML::BeginMap;
  put(out, "kinematic_viscosity", flow.kinematic_viscosity);
  put(out, "reference_velocity", flow.reference_velocity);
  put(out, "reference_length", flow.reference_length);
  put(out, "reference_pressure", flow.reference_pressure);
  put(out, "body_force", flow.body_force);
  put(out, "initial_velocity", flow.initial_velocity);
  out << YAML::EndMap;

  put_grid(out, spec.grid);
  put_boundaries(out, spec.boundaries);
  put_solid_regions(out, spec.solid_regions);

  if (spec.periodic.axis != PeriodicAxis::none) {
    out << YAML::Key << "periodic" << YAML::Value << YAML::BeginMap;
    put(out, "axis", name_of(spec.periodic.axis));
    put(out, "mean_pressure_gradient", spec.periodic.mean_pressure_gradient);
    if (spec.periodic.bulk_velocity) put(out, "bulk_velocity", *spec.periodic.bulk_velocity);
    out << YAML::EndMap;
  }

  out << YAML::Key << "turbulence" << YAML::Value << YAML::BeginMap;
  put_text(out, "model", spec.turbulence.model);
  if (!spec.turbulence.variant.empty()) put_text(out, "variant", spec.turbulence.variant);
  put(out, "freestream_viscosity_ratio", spec.turbulence.freestream_viscosity_ratio);
  put(out, "freestream_intensity", spec.turbulence.freestream_intensity);
  if (spec.turbulence.outer_length) put(out, "outer_length", *spec.turbulence.outer_length);
  put(out, "relax", spec.turbulence.relax);
  put(out, "relax_diffusive_part", spec.turbulence.relax_diffusive_part);
  put(out, "convection", name_of(spec.turbulence.convection));
  out << YAML::EndMap;

  const IterationSpec& iterations = spec.iterations;
  out << YAML::Key << "iterations" << YAML::Value << YAML::BeginMap;
  put(out, "coupling", name_of(iterations.coupling));
  put(out, "max", iterations.max);
  put(out, "residual_drop", iterations.residual_drop);
  put(out, "relax_velocity", iterations.relax_velocity);
  put(out, "relax_pressure", iterations.relax_pressure);
  put(out, "relax_diffusive_part", iterations.relax_diffusive_part);
  put(out, "pressure_setup_every", iterations.pressure_setup_every);
  put(out, "coarse_grids", iterations.coarse_grids);
  put(out, "coarse_residual_drop", iterations.coarse_residual_drop);
  put(out, "coarse_max", iterations.coarse_max);
  put(out, "convection", name_of(iterations.convection));
  put(out, "report_every", iterations.report_every);
  put_text(out, "petsc_options", iterations.petsc_options);
  out << YAML::EndMap;

  out << YAML::Key << "checkpoint" << YAML::Value << YAML::BeginMap;
  put(out, "every", spec.checkpoint.every);
  put(out, "every_seconds", spec.checkpoint.every_seconds);
  put(out, "keep", spec.checkpoint.keep);
  if (spec.checkpoint.restart_from) put_text(out, "restart_from", *spec.checkpoint.restart_from);
  if (spec.checkpoint.walltime) put(out, "walltime", *spec.checkpoint.walltime);
  out << YAML::EndMap;

  out << YAML::Key << "output" << YAML::Value << YAML::BeginMap;
  put_text(out, "directory", spec.output.directory);
  put(out, "fields_every", spec.output.fields_every);
  put(out, "wall_data", spec.output.wall_data ? "true" : "false");
  if (!spec.output.profiles_at_x.empty()) {
    out << YAML::Key << "profiles_at_x" << YAML::Value << YAML::Flow << YAML::BeginSeq;
    for (double x : spec.output.profiles_at_x) out << number_text(x);
    out << YAML::EndSeq;
  }
  out << YAML::EndMap;
  out << YAML::EndMap;

  std::string header = "# Resolved wallrans case (every default filled in)";
  if (!spec.source_file.empty()) header += ", read from " + spec.source_file;
  for (char& c : header) {
    if (c == '\n' || c == '\r') c = ' ';
  }
  return header + "\n" + out.c_str() + "\n";
}

}  // namespace wallrans
