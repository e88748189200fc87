// The typed, validated description of one case. Filled by io/case_loader (from YAML) or by
// tests; the solver core only reads it. All quantities are SI, density is 1 (kinematic form).
#pragma once

#include <array>
#include <optional>
#include <string>
#include <vector>

#include "core/inflow_profile.hpp"
#include "core/vec2.hpp"

namespace wallrans {

enum class Side { left, right, bottom, top };

enum class BoundaryKind {
  wall,     ///< no-slip; `velocity` is the wall velocity (tangential motion allowed)
  inflow,   ///< prescribed velocity vector
  outflow,  ///< zero-gradient velocity, fixed static pressure
  slip,     ///< symmetry / slip wall: zero normal velocity, zero shear
  opening,  ///< fixed static pressure; where flow enters, it takes `velocity`
};

struct FlowSpec {
  double kinematic_viscosity = 0.0;  ///< nu [m^2/s], required, > 0
  double reference_velocity = 1.0;   ///< U_ref for Cf, Cp, initial field [m/s], > 0
  bool reference_velocity_given = false;  ///< the case file sets reference_velocity (reports say so)
  double reference_length = 1.0;     ///< L_ref for Reynolds number and reports [m], > 0
  double reference_pressure = 0.0;   ///< p_ref for Cp and default outflow pressure [m^2/s^2]
  Vec2 body_force{0.0, 0.0};         ///< uniform body force per unit mass [m/s^2]
  Vec2 initial_velocity{0.0, 0.0};   ///< initial interior velocity [m/s]
};

enum class GridGenerator { channel, cavity, plate, skewed_box, step, hill_channel };

struct GridSpec {
  /// Grid file in our HDF5 layout (docs/grid-file.md), an absolute path; "" = a generated grid.
  /// With a file, the generator keys are unused and the cells come from the file.
  std::string file;
  GridGenerator generator = GridGenerator::cavity;
  int cells_x = 0;  ///< required, >= 1 (periodic directions >= 2)
  int cells_y = 0;
  double length = 1.0;  ///< extent in x [m] (plate: length of the no-slip plate)
  double height = 1.0;  ///< extent in y [m]
  /// First cell height at the wall(s) [m]; absent = uniform spacing. Channel and cavity cluster
  /// at both walls of y (cavity also x), plate at the bottom wall.
  std::optional<double> first_cell_height;
  double run_up = 0.0;                         ///< plate: slip run-up length ahead of x = 0 [m]
  int run_up_cells = 0;                        ///< plate: cells in the run-up (included in cells_x)
  std::optional<double> leading_edge_spacing;  ///< plate: x spacing at the leading edge [m]
  double skew_amplitude = 0.0;                 ///< skewed_box: node displacement / box size
  /// step: a backward-facing step at x = 0 of height step_height in a channel of `height` (the
  /// outlet); the inlet channel spans y in [step_height, height], x in [-upstream_length, 0].
  double step_height = 0.0;
  double upstream_length = 0.0;
  int upstream_cells = 0;                 ///< step: cells in x upstream of x = 0 (within cells_x)
  int step_cells = 0;                     ///< step: cells in y below y = step_height (within cells_y)
  std::optional<double> corner_spacing;   ///< step: x spacing on both sides of x = 0 [m]
  std::optional<double> top_cell_height;  ///< step: first cell height at the top (default first_cell_height)
  /// hill_channel: hill height h [m]; the channel is 9 h long (crest to crest) and 3.035 h high.
  double hill_height = 1.0;
  int line = 0;                                ///< case-file line of the grid section (messages)
};

struct BoundarySegmentSpec {
  Side side = Side::left;
  std::optional<double> from;  ///< start coordinate along the side (x for bottom/top, y for left/right)
  std::optional<double> to;    ///< end coordinate along the side
  BoundaryKind kind = BoundaryKind::wall;
  Vec2 velocity{0.0, 0.0};         ///< wall velocity, inflow velocity or velocity entering an opening [m/s]
  std::optional<double> pressure;  ///< outflow/opening static pressure; default flow.reference_pressure
  int line = 0;                    ///< source line in the case file, for messages (0 = unknown)
  /// First and last face along the side (0-based, inclusive; by increasing i on bottom/top, j on
  /// left/right); absent = as from/to say.
  std::optional<std::array<int, 2>> faces;
  std::string patch;  ///< grid-file patch the segment covers instead of a side ("" = by side)
  /// inflow only: velocity and model variable from a table instead of `velocity`.
  std::optional<InflowProfile> profile;
};

/// A block of cells taken out of the flow (blanked). A cell is in the region when its indices lie
/// in every given index range and its centre (the mean of its four corner nodes) in every given
/// coordinate range; an absent range does not restrict. Every face between a fluid cell and a
/// solid cell is a no-slip wall at rest.
struct SolidRegionSpec {
  std::optional<std::array<int, 2>> i, j;     ///< cell index ranges [first, last], inclusive, from 0
  std::optional<std::array<double, 2>> x, y;  ///< coordinate ranges [min, max] of the cell centre [m]
  int line = 0;                               ///< source line in the case file, for messages
  bool from_generator = false;  ///< added by the grid generator (the step's corner), not the case file
};

enum class PeriodicAxis { none, x };

struct PeriodicSpec {
  PeriodicAxis axis = PeriodicAxis::none;
  /// dp/dx imposed as a body force -dp/dx [m/s^2]; with bulk_velocity, its starting value.
  double mean_pressure_gradient = 0.0;
  /// Target bulk velocity [m/s]: flow rate through the section at x = 0 (the periodic side) over
  /// its height. Present: the mean pressure gradient is adjusted every outer iteration to hold it.
  std::optional<double> bulk_velocity;
};

enum class Coupling { simple, simplec };
enum class ConvectionScheme { upwind, linear_upwind, bounded_linear_upwind, central };

struct IterationSpec {
  Coupling coupling = Coupling::simplec;
  int max = 2000;               ///< maximum outer iterations, >= 1
  double residual_drop = 1e-6;  ///< stop when every normalised residual is below this
  double relax_velocity = 0.8;  ///< in (0, 1)
  double relax_pressure = 1.0;  ///< in (0, 1]; SIMPLE typically 0.3
  /// Share of the diffusive part of a_P that the velocity relaxation acts on, in (0, 1]: 1 is
  /// classic under-relaxation; smaller values keep wall-normal diffusion implicit, so the outer
  /// iteration count does not grow with wall-normal refinement.
  double relax_diffusive_part = 0.1;
  int pressure_setup_every = 10;  ///< rebuild the pressure preconditioner every N outer iterations, >= 1
  /// Nested start: solve first on this many grids made by dropping every other grid line (in
  /// each direction that has an even cell count), coarsest first, each to coarse_residual_drop,
  /// and start each finer grid from the interpolated solution. 0: start on the case's grid.
  int coarse_grids = 2;
  double coarse_residual_drop = 1e-3;
  int coarse_max = 300;  ///< iteration budget of each coarse grid, >= 1
  ConvectionScheme convection = ConvectionScheme::bounded_linear_upwind;
  int report_every = 50;      ///< terminal residual line every N iterations (0 = never)
  std::string petsc_options;  ///< extra PETSc options, e.g. "-pressure_ksp_rtol 0.01"
};

/// Turbulence closure (equations in models/README.md).
struct TurbulenceSpec {
  /// laminar | mixing_length | k_equation | spalart_allmaras | baldwin_barth
  std::string model = "laminar";
  /// spalart_allmaras: negative (default) | standard | noft2; k_equation: length_scale (default) | structure
  std::string variant;
  double freestream_viscosity_ratio = 3.0;  ///< SA, BB: transported variable / nu at inflow and free stream
  double freestream_intensity = 0.01;       ///< k_equation: k = 1.5 (I U_ref)^2 at inflow and free stream
  std::optional<double> outer_length;       ///< mixing_length: delta in l <= 0.09 delta [m] (required there)
  double relax = 0.8;                       ///< under-relaxation of the model equation, in (0, 1]
  double relax_diffusive_part = 0.1;        ///< share of the diffusive coefficients relaxed, in (0, 1]
  ConvectionScheme convection = ConvectionScheme::bounded_linear_upwind;
  int line = 0;  ///< case-file line of the turbulence section (messages)
};

struct OutputSpec {
  std::string directory = "out";
  int fields_every = 0;               ///< VTK files every N iterations (0 = only at the end)
  bool wall_data = true;              ///< write wall.csv (x, y, Cf, Cp, y+) at the end
  std::vector<double> profiles_at_x;  ///< x stations [m] of profile_x<x>.csv (io/profile_writer.hpp)
};

/// Checkpoints (parallel HDF5) and stopping within a wall-clock budget.
struct CheckpointSpec {
  int every = 0;  ///< write a checkpoint every N iterations (0: not by iteration count)
  /// Also write one when this much wall-clock time [s] has passed since the last one (0: off), so
  /// a hard kill loses at most about this much work.
  double every_seconds = 600.0;
  int keep = 2;  ///< newest checkpoints of this case kept in the run directory, >= 1
  std::optional<std::string> restart_from;  ///< checkpoint file to continue from
  std::optional<double> walltime;           ///< wall-clock budget [s]: checkpoint and stop before it ends
};

struct CaseSpec {
  std::string source_file;  ///< path of the case file ("" when built in code)
  std::string title = "case";
  FlowSpec flow;
  GridSpec grid;
  std::vector<BoundarySegmentSpec> boundaries;
  std::vector<SolidRegionSpec> solid_regions;  ///< blanked cells; empty: every cell is fluid
  PeriodicSpec periodic;
  TurbulenceSpec turbulence;
  IterationSpec iterations;
  OutputSpec output;
  CheckpointSpec checkpoint;
};

const char* to_string(Side side);
const char* to_string(BoundaryKind kind);
const char* to_string(GridGenerator generator);

}  // namespace wallrans
