// Model selection: a model that needs the wall distance is rejected on a grid without a no-slip
// wall, with the one-line case-file message; laminar needs no wall.
#include <gtest/gtest.h>

#include "core/error.hpp"
#include "grid/boundary.hpp"
#include "models/model_factory.hpp"

using namespace wallrans;

namespace {

CaseSpec box_without_wall(const std::string& model) {
  CaseSpec spec;
  spec.source_file = "nowall.yaml";
  spec.flow.kinematic_viscosity = 1e-3;
  spec.grid.generator = GridGenerator::cavity;
  spec.grid.cells_x = 6;
  spec.grid.cells_y = 6;
  spec.boundaries = {{Side::left, {}, {}, BoundaryKind::inflow, {1.0, 0.0}, {}, 5, {}, {}, {}},
                     {Side::right, {}, {}, BoundaryKind::outflow, {}, {}, 6, {}, {}, {}},
                     {Side::bottom, {}, {}, BoundaryKind::slip, {}, {}, 7, {}, {}, {}},
                     {Side::top, {}, {}, BoundaryKind::slip, {}, {}, 8, {}, {}, {}}};
  spec.turbulence.model = model;
  spec.turbulence.variant = model == "k_equation"         ? "length_scale"
                            : model == "spalart_allmaras" ? "negative"
                                                          : "";
  spec.turbulence.outer_length = 1.0;
  spec.turbulence.line = 9;
  return spec;
}

}  // namespace

TEST(ModelFactory, WallModelsNeedAWall) {
  for (const char* model : {"spalart_allmaras", "baldwin_barth", "k_equation", "mixing_length"}) {
    const CaseSpec spec = box_without_wall(model);
    Grid grid(MPI_COMM_WORLD, generate_nodes(spec.grid), false);
    BoundaryMap boundaries(spec, grid.nodes());
    try {
      (void)make_turbulence_model(spec, grid, boundaries);
      ADD_FAILURE() << model << ": expected InputError";
    } catch (const InputError& e) {
      const std::string text = e.what();
      EXPECT_EQ(
          text.find("nowall.yaml:9: key 'turbulence.model': expected a grid with at least one no-slip wall"),
          0u)
          << text;
      EXPECT_EQ(text.find('\n'), std::string::npos);
    }
  }
}

TEST(ModelFactory, LaminarNeedsNoWallAndUnknownNamesAreRejected) {
  CaseSpec spec = box_without_wall("laminar");
  Grid grid(MPI_COMM_WORLD, generate_nodes(spec.grid), false);
  BoundaryMap boundaries(spec, grid.nodes());
  EXPECT_EQ(make_turbulence_model(spec, grid, boundaries)->name(), "laminar");
  spec.turbulence.model = "two_layer_magic";
  EXPECT_THROW((void)make_turbulence_model(spec, grid, boundaries), InputError);
}
