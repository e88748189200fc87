// Case loader: a full case parses field by field, defaults are filled, the resolved YAML reads back
// to the same case, and each kind of bad input gives a one-line InputError at the right line and key.
#include <gtest/gtest.h>
#include <unistd.h>

#include <array>
#include <filesystem>
#include <fstream>
#include <ostream>
#include <string>

#include "core/error.hpp"
#include "input_error_of.hpp"
#include "io/case_loader.hpp"

using namespace wallrans;
using test_support::input_error_of;

namespace {

// Every key of the layout, with values that differ from the defaults. Line numbers matter.
const char* const full_plate_case = R"(title: plate_check
flow:
  kinematic_viscosity: 2.0e-5
  reference_velocity: 2.5
  reference_length: 0.5
  reference_pressure: 1.5
  body_force: [0.25, -9.81]
  initial_velocity: [2.5, 0.0]
grid:
  generator: plate
  cells: [96, 48]
  length: 2.0
  height: 0.5
  first_cell_height: 1.0e-5
  run_up: 0.3
  run_up_cells: 16
  leading_edge_spacing: 2.0e-3
boundaries:
  - {side: bottom, from: -0.3, to: 0.0, kind: slip}
  - {side: bottom, from: 0.0, kind: wall}
  - {side: left, kind: inflow, velocity: [2.5, 0.0]}
  - side: right
    kind: outflow
    pressure: 0.5
  - {side: top, kind: opening, velocity: [2.5, 0.1]}
turbulence: {model: laminar}
iterations:
  coupling: simple
  max: 500
  residual_drop: 1.0e-8
  relax_velocity: 0.7
  relax_pressure: 0.3
  convection: central
  report_every: 0
  petsc_options: "-pressure_ksp_type cg"
output:
  directory: out/plate_check
  fields_every: 100
  wall_data: false
)";

// Only the required keys, plus the periodic and skewed_box ones.
const char* const periodic_box_case = R"(flow: {kinematic_viscosity: 0.01}
grid: {generator: skewed_box, cells: [8, 4], skew_amplitude: 0.05}
periodic: {axis: x, mean_pressure_gradient: -1.0}
boundaries:
  - {side: bottom, kind: wall}
  - {side: top, kind: wall}
)";

// A hill channel held at a flow rate (meshes/hill.hpp, periodic.bulk_velocity).
const char* const hill_case = R"(flow: {kinematic_viscosity: 1.0e-4}
grid: {generator: hill_channel, cells: [16, 8], hill_height: 0.028, first_cell_height: 1.0e-4}
periodic: {axis: x, bulk_velocity: 0.5, mean_pressure_gradient: -0.01}
boundaries:
  - {side: bottom, kind: wall}
  - {side: top, kind: wall}
)";

void expect_same_vec(Vec2 a, Vec2 b) {
  EXPECT_EQ(a.x, b.x);
  EXPECT_EQ(a.y, b.y);
}

// Field-by-field equality; source_file and segment lines say where a case came from, not what it is.
void expect_same_case(const CaseSpec& a, const CaseSpec& b) {
  EXPECT_EQ(a.title, b.title);
  EXPECT_EQ(a.flow.kinematic_viscosity, b.flow.kinematic_viscosity);
  EXPECT_EQ(a.flow.reference_velocity, b.flow.reference_velocity);
  EXPECT_EQ(a.flow.reference_length, b.flow.reference_length);
  EXPECT_EQ(a.flow.reference_pressure, b.flow.reference_pressure);
  expect_same_vec(a.flow.body_force, b.flow.body_force);
  expect_same_vec(a.flow.initial_velocity, b.flow.initial_velocity);
  EXPECT_EQ(a.grid.file, b.grid.file);
  EXPECT_EQ(a.grid.generator, b.grid.generator);
  EXPECT_EQ(a.grid.cells_x, b.grid.cells_x);
  EXPECT_EQ(a.grid.cells_y, b.grid.cells_y);
  EXPECT_EQ(a.grid.length, b.grid.length);
  EXPECT_EQ(a.grid.height, b.grid.height);
  EXPECT_EQ(a.grid.first_cell_height, b.grid.first_cell_height);
  EXPECT_EQ(a.grid.run_up, b.grid.run_up);
  EXPECT_EQ(a.grid.run_up_cells, b.grid.run_up_cells);
  EXPECT_EQ(a.grid.leading_edge_spacing, b.grid.leading_edge_spacing);
  EXPECT_EQ(a.grid.skew_amplitude, b.grid.skew_amplitude);
  EXPECT_EQ(a.grid.hill_height, b.grid.hill_height);
  ASSERT_EQ(a.boundaries.size(), b.boundaries.size());
  for (size_t s = 0; s < a.boundaries.size(); ++s) {
    SCOPED_TRACE("segment " + std::to_string(s));
    EXPECT_EQ(a.boundaries[s].side, b.boundaries[s].side);
    EXPECT_EQ(a.boundaries[s].kind, b.boundaries[s].kind);
    EXPECT_EQ(a.boundaries[s].from, b.boundaries[s].from);
    EXPECT_EQ(a.boundaries[s].to, b.boundaries[s].to);
    EXPECT_EQ(a.boundaries[s].faces, b.boundaries[s].faces);
    EXPECT_EQ(a.boundaries[s].patch, b.boundaries[s].patch);
    expect_same_vec(a.boundaries[s].velocity, b.boundaries[s].velocity);
    EXPECT_EQ(a.boundaries[s].pressure, b.boundaries[s].pressure);
  }
  ASSERT_EQ(a.solid_regions.size(), b.solid_regions.size());
  for (size_t r = 0; r < a.solid_regions.size(); ++r) {
    SCOPED_TRACE("solid region " + std::to_string(r));
    EXPECT_EQ(a.solid_regions[r].i, b.solid_regions[r].i);
    EXPECT_EQ(a.solid_regions[r].j, b.solid_regions[r].j);
    EXPECT_EQ(a.solid_regions[r].x, b.solid_regions[r].x);
    EXPECT_EQ(a.solid_regions[r].y, b.solid_regions[r].y);
  }
  EXPECT_EQ(a.periodic.axis, b.periodic.axis);
  EXPECT_EQ(a.periodic.mean_pressure_gradient, b.periodic.mean_pressure_gradient);
  EXPECT_EQ(a.periodic.bulk_velocity, b.periodic.bulk_velocity);
  EXPECT_EQ(a.turbulence.model, b.turbulence.model);
  EXPECT_EQ(a.iterations.coupling, b.iterations.coupling);
  EXPECT_EQ(a.iterations.max, b.iterations.max);
  EXPECT_EQ(a.iterations.residual_drop, b.iterations.residual_drop);
  EXPECT_EQ(a.iterations.relax_velocity, b.iterations.relax_velocity);
  EXPECT_EQ(a.iterations.relax_pressure, b.iterations.relax_pressure);
  EXPECT_EQ(a.iterations.convection, b.iterations.convection);
  EXPECT_EQ(a.iterations.report_every, b.iterations.report_every);
  EXPECT_EQ(a.iterations.petsc_options, b.iterations.petsc_options);
  EXPECT_EQ(a.output.directory, b.output.directory);
  EXPECT_EQ(a.output.fields_every, b.output.fields_every);
  EXPECT_EQ(a.output.wall_data, b.output.wall_data);
}

void expect_round_trip(const CaseSpec& spec) {
  const std::string resolved = resolved_case_yaml(spec);
  SCOPED_TRACE(resolved);
  const CaseSpec again = parse_case_text(resolved, "resolved.yaml");
  expect_same_case(spec, again);
  // Writing the re-read case must give the same text, apart from the source named in the header.
  const std::string body = resolved.substr(resolved.find('\n'));
  const std::string resolved_again = resolved_case_yaml(again);
  EXPECT_EQ(resolved_again.substr(resolved_again.find('\n')), body);
}

}  // namespace

TEST(CaseLoader, FullCaseSetsEveryField) {
  const CaseSpec spec = parse_case_text(full_plate_case, "plate_check.yaml");
  EXPECT_EQ(spec.source_file, "plate_check.yaml");
  EXPECT_EQ(spec.title, "plate_check");

  EXPECT_EQ(spec.flow.kinematic_viscosity, 2.0e-5);
  EXPECT_EQ(spec.flow.reference_velocity, 2.5);
  EXPECT_EQ(spec.flow.reference_length, 0.5);
  EXPECT_EQ(spec.flow.reference_pressure, 1.5);
  EXPECT_EQ(spec.flow.body_force.x, 0.25);
  EXPECT_EQ(spec.flow.body_force.y, -9.81);
  EXPECT_EQ(spec.flow.initial_velocity.x, 2.5);
  EXPECT_EQ(spec.flow.initial_velocity.y, 0.0);

  EXPECT_EQ(spec.grid.generator, GridGenerator::plate);
  EXPECT_EQ(spec.grid.cells_x, 96);
  EXPECT_EQ(spec.grid.cells_y, 48);
  EXPECT_EQ(spec.grid.length, 2.0);
  EXPECT_EQ(spec.grid.height, 0.5);
  EXPECT_EQ(spec.grid.first_cell_height, 1.0e-5);
  EXPECT_EQ(spec.grid.run_up, 0.3);
  EXPECT_EQ(spec.grid.run_up_cells, 16);
  EXPECT_EQ(spec.grid.leading_edge_spacing, 2.0e-3);
  EXPECT_EQ(spec.grid.skew_amplitude, 0.0);

  ASSERT_EQ(spec.boundaries.size(), 5u);
  const auto& slip = spec.boundaries[0];
  EXPECT_EQ(slip.side, Side::bottom);
  EXPECT_EQ(slip.kind, BoundaryKind::slip);
  EXPECT_EQ(slip.from, -0.3);
  EXPECT_EQ(slip.to, 0.0);
  EXPECT_FALSE(slip.pressure.has_value());
  EXPECT_EQ(slip.line, 19);
  const auto& wall = spec.boundaries[1];
  EXPECT_EQ(wall.side, Side::bottom);
  EXPECT_EQ(wall.kind, BoundaryKind::wall);
  EXPECT_EQ(wall.from, 0.0);
  EXPECT_FALSE(wall.to.has_value());
  EXPECT_EQ(wall.velocity.x, 0.0);
  EXPECT_EQ(wall.velocity.y, 0.0);
  EXPECT_EQ(wall.line, 20);
  const auto& inflow = spec.boundaries[2];
  EXPECT_EQ(inflow.side, Side::left);
  EXPECT_EQ(inflow.kind, BoundaryKind::inflow);
  EXPECT_FALSE(inflow.from.has_value());
  EXPECT_EQ(inflow.velocity.x, 2.5);
  EXPECT_EQ(inflow.velocity.y, 0.0);
  EXPECT_EQ(inflow.line, 21);
  const auto& outflow = spec.boundaries[3];  // block style: the line of the entry's first key
  EXPECT_EQ(outflow.side, Side::right);
  EXPECT_EQ(outflow.kind, BoundaryKind::outflow);
  EXPECT_EQ(outflow.pressure, 0.5);
  EXPECT_EQ(outflow.line, 22);
  const auto& opening = spec.boundaries[4];
  EXPECT_EQ(opening.side, Side::top);
  EXPECT_EQ(opening.kind, BoundaryKind::opening);
  EXPECT_EQ(opening.velocity.x, 2.5);
  EXPECT_EQ(opening.velocity.y, 0.1);
  EXPECT_EQ(opening.pressure, 1.5) << "an opening without pressure takes flow.reference_pressure";
  EXPECT_EQ(opening.line, 25);

  EXPECT_EQ(spec.periodic.axis, PeriodicAxis::none);
  EXPECT_EQ(spec.turbulence.model, "laminar");
  EXPECT_EQ(spec.iterations.coupling, Coupling::simple);
  EXPECT_EQ(spec.iterations.max, 500);
  EXPECT_EQ(spec.iterations.residual_drop, 1.0e-8);
  EXPECT_EQ(spec.iterations.relax_velocity, 0.7);
  EXPECT_EQ(spec.iterations.relax_pressure, 0.3);
  EXPECT_EQ(spec.iterations.convection, ConvectionScheme::central);
  EXPECT_EQ(spec.iterations.report_every, 0);
  EXPECT_EQ(spec.iterations.petsc_options, "-pressure_ksp_type cg");
  EXPECT_EQ(spec.output.directory, "out/plate_check");
  EXPECT_EQ(spec.output.fields_every, 100);
  EXPECT_FALSE(spec.output.wall_data);
}

TEST(CaseLoader, MinimalCaseTakesDocumentedDefaults) {
  const CaseSpec spec = parse_case_text(periodic_box_case, "box.yaml");
  EXPECT_EQ(spec.title, "case");
  EXPECT_EQ(spec.flow.kinematic_viscosity, 0.01);
  EXPECT_EQ(spec.flow.reference_velocity, 1.0);
  EXPECT_EQ(spec.flow.reference_length, 1.0);
  EXPECT_EQ(spec.flow.reference_pressure, 0.0);
  EXPECT_EQ(spec.grid.generator, GridGenerator::skewed_box);
  EXPECT_EQ(spec.grid.cells_x, 8);
  EXPECT_EQ(spec.grid.cells_y, 4);
  EXPECT_EQ(spec.grid.length, 1.0);
  EXPECT_EQ(spec.grid.height, 1.0);
  EXPECT_FALSE(spec.grid.first_cell_height.has_value());
  EXPECT_EQ(spec.grid.skew_amplitude, 0.05);
  EXPECT_EQ(spec.periodic.axis, PeriodicAxis::x);
  EXPECT_EQ(spec.periodic.mean_pressure_gradient, -1.0);
  ASSERT_EQ(spec.boundaries.size(), 2u);
  EXPECT_EQ(spec.boundaries[0].line, 5);
  EXPECT_FALSE(spec.boundaries[0].pressure.has_value()) << "walls take no pressure";
  EXPECT_EQ(spec.turbulence.model, "laminar");
  EXPECT_EQ(spec.iterations.coupling, Coupling::simplec);
  EXPECT_EQ(spec.iterations.max, 2000);
  EXPECT_EQ(spec.iterations.residual_drop, 1e-6);
  EXPECT_EQ(spec.iterations.relax_velocity, 0.8);
  EXPECT_EQ(spec.iterations.relax_pressure, 1.0);
  EXPECT_EQ(spec.iterations.convection, ConvectionScheme::bounded_linear_upwind);
  EXPECT_EQ(spec.iterations.report_every, 50);
  EXPECT_EQ(spec.iterations.petsc_options, "");
  EXPECT_EQ(spec.output.directory, "out");
  EXPECT_EQ(spec.output.fields_every, 0);
  EXPECT_TRUE(spec.output.wall_data);
}

TEST(CaseLoader, ResolvedYamlReadsBackToTheSameCase) {
  expect_round_trip(parse_case_text(full_plate_case, "plate_check.yaml"));
  expect_round_trip(parse_case_text(periodic_box_case, "box.yaml"));
  expect_round_trip(parse_case_text(hill_case, "hill.yaml"));
}

TEST(CaseLoader, HillChannelTakesItsExtentsFromTheHillHeightAndAFlowRate) {
  const CaseSpec spec = parse_case_text(hill_case, "hill.yaml");
  EXPECT_EQ(spec.grid.generator, GridGenerator::hill_channel);
  EXPECT_EQ(spec.grid.hill_height, 0.028);
  EXPECT_DOUBLE_EQ(spec.grid.length, 9.0 * 0.028);
  EXPECT_DOUBLE_EQ(spec.grid.height, 3.035 * 0.028);
  ASSERT_TRUE(spec.periodic.bulk_velocity.has_value());
  EXPECT_EQ(*spec.periodic.bulk_velocity, 0.5);
  EXPECT_EQ(spec.periodic.mean_pressure_gradient, -0.01);  // the starting value
  // Without bulk_velocity the gradient is fixed, as before.
  EXPECT_FALSE(parse_case_text(periodic_box_case, "box.yaml").periodic.bulk_velocity.has_value());
}

TEST(CaseLoader, ResolvedYamlKeepsAwkwardStringsAndNumbersExact) {
  CaseSpec spec = parse_case_text(full_plate_case, "plate_check.yaml");
  spec.title = "a: \"quoted\" # not a comment";
  spec.output.directory = "out dir/true";
  spec.iterations.petsc_options = "";
  spec.flow.kinematic_viscosity = 1.0 / 3.0;
  spec.flow.reference_pressure = -1.0e-300;
  spec.grid.first_cell_height = 0.1 + 0.2;  // 0.30000000000000004 must not come back as 0.3
  spec.boundaries[3].pressure = 123456789.125;
  expect_round_trip(spec);
  const std::string resolved = resolved_case_yaml(spec);
  EXPECT_NE(resolved.find("# Resolved wallrans case"), std::string::npos);
  EXPECT_NE(resolved.find("wall_data: false"), std::string::npos);
}

TEST(CaseLoader, SolidRegionsKeepTheirRangesAndLinesAndReadBack) {
  const std::string text = std::string(periodic_box_case) +
                           "solid_regions:\n"
                           "  - {j: [0, 1]}\n"
                           "  - i: [2, 5]\n"
                           "    y: [0.25, 0.5]\n"
                           "  - {x: [-1.0e-3, 0.75], y: [0.0, 1.0]}\n";
  const CaseSpec spec = parse_case_text(text, "solid.yaml");
  ASSERT_EQ(spec.solid_regions.size(), 3u);
  const SolidRegionSpec& rows = spec.solid_regions[0];
  EXPECT_FALSE(rows.i);
  EXPECT_EQ(rows.j, (std::array{0, 1}));
  EXPECT_FALSE(rows.x || rows.y);
  EXPECT_EQ(rows.line, 8);
  EXPECT_EQ(spec.solid_regions[1].i, (std::array{2, 5}));
  EXPECT_EQ(spec.solid_regions[1].y, (std::array{0.25, 0.5}));
  EXPECT_EQ(spec.solid_regions[1].line, 9);
  EXPECT_EQ(spec.solid_regions[2].x, (std::array{-1.0e-3, 0.75}));
  EXPECT_EQ(spec.solid_regions[2].line, 11);
  expect_round_trip(spec);
  EXPECT_TRUE(parse_case_text(periodic_box_case, "box.yaml").solid_regions.empty());
}

TEST(CaseLoader, LoadsFileAndNamesItInMessages) {
  const auto path =
      std::filesystem::temp_directory_path() / ("wallrans_case_" + std::to_string(getpid()) + ".yaml");
  { std::ofstream(path) << periodic_box_case; }
  const CaseSpec spec = load_case_file(path.string());
  EXPECT_EQ(spec.source_file, path.string());
  ASSERT_EQ(spec.boundaries.size(), 2u);
  EXPECT_EQ(spec.boundaries[1].line, 6);
  {
    std::ofstream(path) << "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\n"
                           "boundaries: [{side: top, kind: wal}]\n";
  }
  const std::string message = input_error_of([&] { load_case_file(path.string()); });
  EXPECT_EQ(message.rfind(path.string() + ":3: key 'boundaries[0].kind': expected one of wall,", 0), 0u)
      << message;
  std::filesystem::remove(path);
}

TEST(CaseLoader, GridFileIsFoundBesideTheCaseFileAndSegmentsTakePatchesOrFaces) {
  const std::string text =
      "flow: {kinematic_viscosity: 0.01}\n"
      "grid: {file: grids/hill.h5}\n"
      "boundaries:\n"
      "  - {patch: lower wall, kind: wall}\n"
      "  - {side: top, faces: [0, 5], kind: slip}\n"
      "  - {side: top, faces: [6, 9], kind: opening}\n";
  const CaseSpec spec = parse_case_text(text, "/cases/hill/case.yaml");
  EXPECT_EQ(spec.grid.file, "/cases/hill/grids/hill.h5");
  ASSERT_EQ(spec.boundaries.size(), 3u);
  EXPECT_EQ(spec.boundaries[0].patch, "lower wall");
  EXPECT_FALSE(spec.boundaries[0].faces.has_value());
  EXPECT_EQ(spec.boundaries[1].side, Side::top);
  EXPECT_EQ(spec.boundaries[1].faces, (std::array<int, 2>{0, 5}));
  EXPECT_EQ(spec.boundaries[2].faces, (std::array<int, 2>{6, 9}));
  expect_round_trip(spec);
  // An absolute path is kept as it is.
  const CaseSpec absolute = parse_case_text(
      "flow: {kinematic_viscosity: 0.01}\ngrid: {file: /data/g.h5}\nboundaries: [{side: top, kind: wall}]\n",
      "/cases/c.yaml");
  EXPECT_EQ(absolute.grid.file, "/data/g.h5");
}

TEST(CaseLoader, TheOldKindNameFreeIsAnErrorThatNamesOpening) {
  const std::string text =
      "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\nboundaries:\n"
      "  - {side: left, kind: wall}\n  - {side: top, kind: free, velocity: [1, 0]}\n";
  EXPECT_EQ(input_error_of([&] { parse_case_text(text, "old.yaml"); }),
            "old.yaml:5: key 'boundaries[1].kind': expected one of wall, inflow, outflow, slip, opening, got "
            "'free' (renamed: use 'opening')");
}

TEST(CaseLoader, UnreadableFileIsAnInputError) {
  const std::string missing = "no_such_directory/missing_case.yaml";
  const std::string message = input_error_of([&] { load_case_file(missing); });
  EXPECT_EQ(message.rfind(missing + ": expected a readable case file, got ", 0), 0u) << message;
  const std::string directory = std::filesystem::temp_directory_path().string();
  const std::string directory_message = input_error_of([&] { load_case_file(directory); });
  EXPECT_EQ(directory_message, directory + ": expected a readable case file, got a directory");
}

// Bad inputs: each names the source, the 1-based line and the dotted key, and says "expected".

struct BadCase {
  const char* name;
  const char* text;
  int line;          // expected 1-based line in the message (0: no line)
  const char* key;   // expected dotted key ("" for syntax errors)
  const char* also;  // a further part of the message, e.g. the allowed values
};

// Lets GoogleTest name a failing case instead of dumping its bytes.
void PrintTo(const BadCase& bad, std::ostream* out) { *out << bad.name; }

class BadInput : public ::testing::TestWithParam<BadCase> {};

TEST_P(BadInput, IsOneLineInputErrorAtTheRightLineAndKey) {
  const BadCase& bad = GetParam();
  const std::string message = input_error_of([&] { parse_case_text(bad.text, "bad.yaml"); });
  SCOPED_TRACE(message);
  const std::string where = bad.line > 0 ? "bad.yaml:" + std::to_string(bad.line) + ": " : "bad.yaml: ";
  EXPECT_EQ(message.rfind(where, 0), 0u);
  if (*bad.key != '\0') {
    EXPECT_NE(message.find(where + "key '" + bad.key + "': expected "), std::string::npos);
  }
  EXPECT_NE(message.find("expected "), std::string::npos);
  EXPECT_NE(message.find(", got "), std::string::npos);
  EXPECT_NE(message.find(bad.also), std::string::npos);
  EXPECT_EQ(message.find('\n'), std::string::npos);
}

INSTANTIATE_TEST_SUITE_P(
    CaseLoader, BadInput,
    ::testing::Values(
        BadCase{"malformed_yaml",
                "flow:\n  kinematic_viscosity: 0.01\n reference_velocity: 1.0\ngrid: {generator: cavity}\n",
                3, "", "expected valid YAML, got a syntax error"},
        BadCase{"unclosed_list",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8}\n", 2, "",
                "syntax error"},
        BadCase{"two_documents", "flow: {kinematic_viscosity: 0.01}\n---\ngrid: {generator: cavity}\n", 3, "",
                "a single YAML document, got 2 documents"},
        BadCase{"empty_document", "# nothing but a comment\n", 0, "", "got an empty document"},
        BadCase{"unknown_top_level_key",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\n"
                "boundaries: [{side: top, kind: wall}]\niteration: {max: 10}\n",
                4, "iteration", "a top-level key (title, flow, grid"},
        BadCase{
            "unknown_nested_key",
            "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8], cell_count: 4}\n", 2,
            "grid.cell_count", "got an unknown key"},
        BadCase{"unknown_key_in_block_segment",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\nboundaries:\n"
                "  - side: top\n    kind: wall\n    speed: [1, 0]\n",
                6, "boundaries[0].speed",
                "a key of 'boundaries[0]' (side, patch, kind, from, to, faces, velocity, pressure, "
                "profile_file, profile_shift)"},
        BadCase{"repeated_key", "flow:\n  kinematic_viscosity: 0.01\n  kinematic_viscosity: 0.02\n", 3,
                "flow.kinematic_viscosity", "first at line 2"},
        BadCase{"string_viscosity", "flow: {kinematic_viscosity: small}\n", 1, "flow.kinematic_viscosity",
                "expected a number > 0, got small"},
        BadCase{"quoted_number_viscosity", "title: t\nflow: {kinematic_viscosity: \"0.01\"}\n", 2,
                "flow.kinematic_viscosity", "got \"0.01\""},
        BadCase{"negative_viscosity", "flow:\n  kinematic_viscosity: -0.01\n", 2, "flow.kinematic_viscosity",
                "got -0.01"},
        BadCase{"missing_viscosity",
                "title: t\nflow:\n  reference_velocity: 2.0\ngrid: {generator: cavity, cells: [8, 8]}\n", 2,
                "flow.kinematic_viscosity", "the key is missing"},
        BadCase{"flow_not_a_mapping", "flow: 0.01\n", 1, "flow",
                "expected a mapping with keys kinematic_viscosity"},
        BadCase{"zero_cells",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [0, 96]}\n", 2,
                "grid.cells", "expected 2 positive integers [cells_x, cells_y], got [0, 96]"},
        BadCase{"non_integer_cells",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 2.5]}\n", 2,
                "grid.cells", "got [8, 2.5]"},
        BadCase{"three_cells",
                "flow: {kinematic_viscosity: 0.01}\ngrid:\n  generator: cavity\n  cells: [8, 8, 8]\n", 4,
                "grid.cells", "got [8, 8, 8]"},
        BadCase{"unknown_generator",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: box, cells: [8, 8]}\n", 2,
                "grid.generator", "one of channel, cavity, plate, skewed_box, step, hill_channel, got box"},
        BadCase{"hill_key_on_channel",
                "flow: {kinematic_viscosity: 0.01}\ngrid:\n  generator: channel\n  cells: [8, 8]\n"
                "  hill_height: 2.0\n",
                5, "grid.hill_height", "only with generator hill_channel, got generator channel"},
        BadCase{"length_on_hill_channel",
                "flow: {kinematic_viscosity: 0.01}\ngrid:\n  generator: hill_channel\n  cells: [8, 8]\n"
                "  length: 9.0\n",
                5, "grid.length", "no grid.length with generator hill_channel"},
        BadCase{"negative_hill_height",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: hill_channel, cells: [8, 8], "
                "hill_height: -1}\n",
                2, "grid.hill_height", "a number > 0, got -1"},
        BadCase{"zero_bulk_velocity",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: channel, cells: [8, 8]}\n"
                "periodic: {axis: x, bulk_velocity: 0}\n",
                3, "periodic.bulk_velocity", "a number > 0, got 0"},
        BadCase{
            "plate_key_on_cavity",
            "flow: {kinematic_viscosity: 0.01}\ngrid:\n  generator: cavity\n  cells: [8, 8]\n  run_up: 0.3\n",
            5, "grid.run_up", "only with generator plate, got generator cavity"},
        BadCase{
            "run_up_without_cells",
            "flow: {kinematic_viscosity: 0.01}\ngrid:\n  generator: plate\n  cells: [8, 8]\n  run_up: 0.3\n",
            2, "grid.run_up_cells", "because grid.run_up > 0"},
        BadCase{"skew_amplitude_too_large",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: skewed_box, cells: [8, 8], "
                "skew_amplitude: 0.2}\n",
                2, "grid.skew_amplitude", "in [0, 0.2)"},
        BadCase{"missing_boundaries",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\n", 1,
                "boundaries", "the key is missing"},
        BadCase{
            "empty_boundaries",
            "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\nboundaries: []\n",
            3, "boundaries", "a non-empty list of boundary segments, got []"},
        BadCase{"unknown_boundary_kind",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\nboundaries:\n"
                "  - {side: top, kind: wall}\n  - {side: left, kind: wal}\n",
                5, "boundaries[1].kind", "one of wall, inflow, outflow, slip, opening, got wal"},
        BadCase{"renamed_boundary_kind",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\nboundaries:\n"
                "  - {side: left, kind: wall}\n  - {side: top, kind: free, velocity: [1, 0]}\n",
                5, "boundaries[1].kind", "got 'free' (renamed: use 'opening')"},
        BadCase{"unknown_side",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\nboundaries:\n"
                "  - {side: up, kind: wall}\n",
                4, "boundaries[0].side", "one of left, right, bottom, top, got up"},
        BadCase{"from_not_below_to",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\nboundaries:\n"
                "  - {side: bottom, from: 2.0, to: 1.0, kind: wall}\n",
                4, "boundaries[0].to", "a number greater than from = 2, got 1.0"},
        BadCase{"velocity_on_outflow",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\nboundaries:\n"
                "  - {side: top, kind: wall}\n  - side: right\n    kind: outflow\n    velocity: [1, 0]\n",
                7, "boundaries[1].velocity", "no velocity for kind 'outflow'"},
        BadCase{"inflow_without_velocity",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\nboundaries:\n"
                "  - {side: left, kind: inflow}\n",
                4, "boundaries[0].velocity", "for kind 'inflow', got nothing"},
        BadCase{"pressure_on_wall",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\nboundaries:\n"
                "  - {side: top, kind: wall, pressure: 0.0}\n",
                4, "boundaries[0].pressure", "no pressure for kind 'wall'"},
        BadCase{"periodic_side_has_segment",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: channel, cells: [8, 8]}\nboundaries:\n"
                "  - {side: bottom, kind: wall}\n  - {side: left, kind: inflow, velocity: [1, 0]}\n"
                "periodic: {axis: x}\n",
                5, "boundaries[1].side", "because periodic.axis is x (line 6)"},
        BadCase{"periodic_axis_y",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: channel, cells: [8, 8]}\nperiodic: "
                "{axis: y}\n",
                3, "periodic.axis", "one of x, got y"},
        BadCase{"unknown_turbulence_model",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\n"
                "boundaries: [{side: top, kind: wall}]\nturbulence: {model: two_layer_magic}\n",
                4, "turbulence.model", "one of laminar, mixing_length"},
        BadCase{"mixing_length_without_outer_length",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\n"
                "boundaries: [{side: top, kind: wall}]\nturbulence: {model: mixing_length}\n",
                4, "turbulence.outer_length", "0.09 outer_length"},
        BadCase{
            "unknown_sa_variant",
            "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\n"
            "boundaries: [{side: top, kind: wall}]\nturbulence: {model: spalart_allmaras, variant: lowre}\n",
            4, "turbulence.variant", "one of negative, standard, noft2"},
        BadCase{"unknown_coupling",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\n"
                "boundaries: [{side: top, kind: wall}]\niterations:\n  max: 10\n  coupling: coupled\n",
                6, "iterations.coupling", "one of simple, simplec, got coupled"},
        BadCase{"relax_velocity_too_large",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\n"
                "boundaries: [{side: top, kind: wall}]\niterations: {relax_velocity: 1.5}\n",
                4, "iterations.relax_velocity", "a number in (0, 1), got 1.5"},
        BadCase{"zero_max_iterations",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\n"
                "boundaries: [{side: top, kind: wall}]\niterations: {max: 0}\n",
                4, "iterations.max", "an integer >= 1, got 0"},
        BadCase{"boolean_yes",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\n"
                "boundaries: [{side: top, kind: wall}]\noutput: {wall_data: yes}\n",
                4, "output.wall_data", "true or false, got yes"},
        BadCase{"empty_title", "title: \"\"\n", 1, "title", "a non-empty string"},
        BadCase{"solid_index_beyond_the_grid",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 6]}\n"
                "boundaries: [{side: top, kind: wall}]\nsolid_regions:\n  - {i: [0, 1]}\n  - {i: [2, 3], j: "
                "[4, 6]}\n",
                6, "solid_regions[1].j", "0 <= first <= last < grid.cells_y = 6, got [4, 6]"},
        BadCase{"solid_index_range_reversed",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 6]}\n"
                "boundaries: [{side: top, kind: wall}]\nsolid_regions:\n  - i: [5, 2]\n",
                5, "solid_regions[0].i", "got [5, 2]"},
        BadCase{"solid_coordinate_range_empty",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 6]}\n"
                "boundaries: [{side: top, kind: wall}]\nsolid_regions:\n  - {x: [0.5, 0.5]}\n",
                5, "solid_regions[0].x", "2 numbers [min, max] with min < max, got [0.5, 0.5]"},
        BadCase{"solid_region_without_range",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 6]}\n"
                "boundaries: [{side: top, kind: wall}]\nsolid_regions:\n  - {}\n",
                5, "solid_regions[0]", "at least one of i, j (index ranges) and x, y"},
        BadCase{"solid_region_unknown_key",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 6]}\n"
                "boundaries: [{side: top, kind: wall}]\nsolid_regions:\n  - {i: [0, 1], k: [0, 1]}\n",
                5, "solid_regions[0].k", "(i, j, x, y)"},
        BadCase{"solid_regions_empty_list",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 6]}\n"
                "boundaries: [{side: top, kind: wall}]\nsolid_regions: []\n",
                4, "solid_regions", "a non-empty list of solid regions, got []"},
        BadCase{"generator_key_next_to_file",
                "flow: {kinematic_viscosity: 0.01}\ngrid:\n  file: hill.h5\n  cells: [8, 8]\n", 4,
                "grid.cells", "no generator key next to grid.file"},
        BadCase{"patch_without_grid_file",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\nboundaries:\n"
                "  - {patch: lid, kind: wall}\n",
                4, "boundaries[0].patch", "no patch without grid.file"},
        BadCase{"side_next_to_patch",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {file: hill.h5}\nboundaries:\n"
                "  - {patch: lid, side: top, kind: wall}\n",
                4, "boundaries[0].side", "no side next to patch"},
        BadCase{"coordinates_on_a_file_grid",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {file: hill.h5}\nboundaries:\n"
                "  - {side: bottom, from: 0.5, kind: wall}\n",
                4, "boundaries[0].from", "'faces' or 'patch' on a grid from a file"},
        BadCase{"faces_reversed",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {file: hill.h5}\nboundaries:\n"
                "  - {side: bottom, faces: [5, 2], kind: wall}\n",
                4, "boundaries[0].faces", "0 <= first <= last, got [5, 2]"},
        BadCase{"step_key_on_channel",
                "flow: {kinematic_viscosity: 0.01}\ngrid:\n  generator: channel\n  cells: [8, 8]\n"
                "  step_height: 0.2\n",
                5, "grid.step_height", "only with generator step, got generator channel"},
        BadCase{
            "step_without_step_height",
            "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: step, cells: [8, 8], upstream_length: 1, "
            "upstream_cells: 2, step_cells: 2}\n",
            2, "grid.step_height", "the key is missing"},
        BadCase{"step_height_not_below_height",
                "flow: {kinematic_viscosity: 0.01}\ngrid:\n  generator: step\n  cells: [8, 8]\n  height: 2\n"
                "  step_height: 2\n  upstream_length: 1\n  upstream_cells: 2\n  step_cells: 2\n",
                6, "grid.step_height", "a number in (0, height) = (0, 2), got 2"},
        BadCase{"step_upstream_cells_all",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: step, cells: [8, 8], step_height: 0.2, "
                "upstream_length: 1, upstream_cells: 8, step_cells: 2}\n",
                2, "grid.upstream_cells", "an integer in [1, cells_x) = [1, 8), got 8"},
        BadCase{"step_top_cell_without_first_cell",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: step, cells: [8, 8], step_height: 0.2, "
                "upstream_length: 1, upstream_cells: 2, step_cells: 2, top_cell_height: 0.01}\n",
                2, "grid.top_cell_height", "no top_cell_height without grid.first_cell_height"},
        BadCase{"profile_file_on_a_wall",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\nboundaries:\n"
                "  - {side: bottom, kind: wall, profile_file: inlet.csv}\n",
                4, "boundaries[0].profile_file", "no profile_file for kind 'wall' (only inflow)"},
        BadCase{"profile_file_next_to_velocity",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\nboundaries:\n"
                "  - {side: left, kind: inflow, velocity: [1, 0], profile_file: inlet.csv}\n",
                4, "boundaries[0].velocity", "no velocity next to profile_file"},
        BadCase{"profile_shift_alone",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\nboundaries:\n"
                "  - {side: left, kind: inflow, velocity: [1, 0], profile_shift: 0.5}\n",
                4, "boundaries[0].profile_shift", "no profile_shift without profile_file"},
        BadCase{"inflow_without_velocity_or_profile",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\nboundaries:\n"
                "  - {side: left, kind: inflow}\n",
                4, "boundaries[0].velocity", "or profile_file for kind 'inflow'"},
        BadCase{"faces_next_to_from",
                "flow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [8, 8]}\nboundaries:\n"
                "  - {side: bottom, faces: [0, 3], to: 0.5, kind: wall}\n",
                4, "boundaries[0].to", "no to next to faces"}),
    [](const ::testing::TestParamInfo<BadCase>& info) { return std::string(info.param.name); });
