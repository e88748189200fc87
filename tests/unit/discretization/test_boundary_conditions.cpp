// Boundary-condition objects: what each kind answers about a face (face velocity, flux
// prediction, momentum terms, pressure role, model-variable values), checked against the
// definitions of the kinds in configs/README.md and a linear Couette profile at a wall.
#include <gtest/gtest.h>

#include <cmath>

#include "discretization/boundary_conditions.hpp"

using namespace wallrans;

namespace {

BoundarySegmentSpec segment(BoundaryKind kind, Vec2 velocity = {}, std::optional<double> pressure = {}) {
  BoundarySegmentSpec s;
  s.side = Side::bottom;
  s.kind = kind;
  s.velocity = velocity;
  s.pressure = pressure;
  return s;
}

// A bottom face of length 0.5 (outward normal -y) whose owner centre lies 0.1 above it.
BoundaryFace bottom_face() {
  BoundaryFace f;
  f.id = 0;
  f.segment = 0;
  f.area = {0.0, -0.5};
  f.centre = {0.25, 0.0};
  return f;
}

// Momentum input at the bottom face: owner at normal distance 0.1.
MomentumFaceInput input(double flux, Vec2 face_velocity, Vec2 cell_velocity, Vec2 normal_derivative) {
  return {flux, face_velocity, cell_velocity, normal_derivative, 0.5, 0.1, 1e-3, 4e-3};
}

constexpr ScalarBoundaryValues model_values{0.0, 7.0};  // wall value, free-stream value

}  // namespace

TEST(BoundaryConditions, WallTakesItsVelocityWhateverTheFlowAndHasZeroGradientPressure) {
  const auto wall = make_boundary_condition(segment(BoundaryKind::wall, {2.0, 0.0}), 0.0);
  const BoundaryFace f = bottom_face();
  for (const double flux : {-0.3, 0.0, 0.3}) {
    const Vec2 ub = wall->face_velocity(f, {5.0, -1.0}, flux);
    EXPECT_EQ(ub.x, 2.0);
    EXPECT_EQ(ub.y, 0.0);
    EXPECT_TRUE(wall->scalar_is_prescribed(flux));
    EXPECT_EQ(wall->scalar_value(f, 3.0, flux, model_values), 0.0);
  }
  EXPECT_TRUE(wall->is_wall());
  EXPECT_TRUE(wall->is_prescribed());
  EXPECT_EQ(wall->flux_prediction(), FluxPrediction::prescribed);
  EXPECT_EQ(wall->pressure_role(), PressureRole::extrapolated);
}

TEST(BoundaryConditions, WallMomentumGivesTheExactShearOfALinearProfileWithTheLaminarViscosity) {
  // Couette profile u = u_w + g s (s: distance from the wall): the second-order wall gradient
  // equals the two-point one, so the row's balance at u_P is the viscous force -nu A g, with the
  // laminar nu (nu_t = 0 at a wall) and not the cell's effective viscosity.
  const auto wall = make_boundary_condition(segment(BoundaryKind::wall, {2.0, 0.0}), 0.0);
  const double g = 30.0, s1 = 0.1, area = 0.5, nu = 1e-3;
  const Vec2 cell{2.0 + g * s1, 0.0};
  const MomentumFaceInput in = input(0.0, {2.0, 0.0}, cell, {-g, 0.0});
  MomentumRow row{1.0, 0.0, 0.0, 0.0};
  wall->add_momentum(in, row);
  EXPECT_DOUBLE_EQ(row.diag, 1.0 + nu * area / s1);
  EXPECT_DOUBLE_EQ(row.diffusive, nu * area / s1);  // the wall's coefficient is diffusion only
  EXPECT_NEAR(row.rhs_u - (row.diag - 1.0) * cell.x, -nu * area * g, 1e-15);
  EXPECT_NEAR(row.rhs_v, 0.0, 1e-15);
}

TEST(BoundaryConditions, InflowConvectsItsVelocityAndDiffusesWithTheCellViscosity) {
  const auto inflow = make_boundary_condition(segment(BoundaryKind::inflow, {1.0, 0.5}), 0.0);
  const BoundaryFace f = bottom_face();
  const Vec2 ub = inflow->face_velocity(f, {9.0, 9.0}, -0.2);
  EXPECT_EQ(ub.x, 1.0);
  EXPECT_EQ(ub.y, 0.5);
  EXPECT_FALSE(inflow->is_wall());
  EXPECT_TRUE(inflow->is_prescribed());
  EXPECT_EQ(inflow->scalar_value(f, 3.0, -0.2, model_values), 7.0);
  EXPECT_EQ(inflow->scalar_value(f, 3.0, 0.2, model_values), 7.0);  // prescribed in and out
  // Entering flux -0.2: the face value is carried in; the diffusion coefficient is nu_cell A / s1.
  MomentumRow row{0.0, 0.0, 0.0, 0.0};
  inflow->add_momentum(input(-0.2, {1.0, 0.5}, {1.0, 0.5}, {0.0, 0.0}), row);
  EXPECT_DOUBLE_EQ(row.diag, 4e-3 * 0.5 / 0.1);
  EXPECT_DOUBLE_EQ(row.diffusive, row.diag);  // entering flow adds no convective diagonal
  EXPECT_DOUBLE_EQ(row.rhs_u, 0.2 * 1.0 + row.diag * 1.0);
  EXPECT_DOUBLE_EQ(row.rhs_v, 0.2 * 0.5 + row.diag * 0.5);
}

TEST(BoundaryConditions, OutflowIsZeroGradientWithFixedPressure) {
  const auto outflow = make_boundary_condition(segment(BoundaryKind::outflow, {}, 2.5), 1.0);
  const BoundaryFace f = bottom_face();
  for (const double flux : {-0.3, 0.3}) {
    const Vec2 ub = outflow->face_velocity(f, {0.4, -0.6}, flux);
    EXPECT_EQ(ub.x, 0.4);
    EXPECT_EQ(ub.y, -0.6);
    EXPECT_FALSE(outflow->scalar_is_prescribed(flux));
    EXPECT_EQ(outflow->scalar_value(f, 3.0, flux, model_values), 3.0);
  }
  EXPECT_EQ(outflow->pressure_role(), PressureRole::fixed);
  EXPECT_EQ(outflow->pressure(), 2.5);
  EXPECT_EQ(outflow->flux_prediction(), FluxPrediction::rhie_chow);
  EXPECT_FALSE(outflow->is_prescribed());
  const auto default_pressure = make_boundary_condition(segment(BoundaryKind::outflow), 1.0);
  EXPECT_EQ(default_pressure->pressure(), 1.0) << "no pressure given: the reference pressure";

  // Leaving flow is upwind (implicit, on the diagonal); entering flow brings the cell velocity.
  MomentumRow out{0.0, 0.0, 0.0, 0.0};
  outflow->add_momentum(input(0.3, {0.4, -0.6}, {0.4, -0.6}, {}), out);
  EXPECT_EQ(out.diag, 0.3);
  EXPECT_EQ(out.rhs_u, 0.0);
  MomentumRow in{0.0, 0.0, 0.0, 0.0};
  outflow->add_momentum(input(-0.3, {0.4, -0.6}, {0.4, -0.6}, {}), in);
  EXPECT_EQ(in.diag, 0.0);
  EXPECT_DOUBLE_EQ(in.rhs_u, 0.3 * 0.4);
  EXPECT_DOUBLE_EQ(in.rhs_v, -0.3 * 0.6);
}

TEST(BoundaryConditions, OpeningTakesItsVelocityOnlyWhereFlowEnters) {
  const auto opening = make_boundary_condition(segment(BoundaryKind::opening, {10.0, 0.0}), 0.0);
  const BoundaryFace f = bottom_face();
  const Vec2 cell{8.0, 1.0};
  const Vec2 entering = opening->face_velocity(f, cell, -0.1);
  EXPECT_EQ(entering.x, 10.0);
  EXPECT_EQ(entering.y, 0.0);
  const Vec2 leaving = opening->face_velocity(f, cell, 0.1);
  EXPECT_EQ(leaving.x, 8.0);
  EXPECT_EQ(leaving.y, 1.0);
  EXPECT_TRUE(opening->scalar_is_prescribed(-0.1));
  EXPECT_FALSE(opening->scalar_is_prescribed(0.1));
  EXPECT_EQ(opening->scalar_value(f, 3.0, -0.1, model_values), 7.0);
  EXPECT_EQ(opening->scalar_value(f, 3.0, 0.1, model_values), 3.0);
  EXPECT_EQ(opening->pressure_role(), PressureRole::fixed);
  EXPECT_EQ(opening->pressure(), 0.0);
  EXPECT_EQ(opening->flux_prediction(), FluxPrediction::rhie_chow);
  EXPECT_FALSE(opening->is_prescribed()) << "a manufactured function must not replace its velocity";

  MomentumRow in{0.0, 0.0, 0.0, 0.0};
  opening->add_momentum(input(-0.1, entering, cell, {}), in);
  EXPECT_EQ(in.diag, 0.0);
  EXPECT_DOUBLE_EQ(in.rhs_u, 0.1 * 10.0);
  EXPECT_EQ(in.rhs_v, 0.0);
  MomentumRow out{0.0, 0.0, 0.0, 0.0};
  opening->add_momentum(input(0.1, leaving, cell, {}), out);
  EXPECT_EQ(out.diag, 0.1);
  EXPECT_EQ(out.rhs_u, 0.0);
}

TEST(BoundaryConditions, SlipRemovesTheNormalComponentAndCarriesNoFlux) {
  const auto slip = make_boundary_condition(segment(BoundaryKind::slip), 0.0);
  BoundaryFace f = bottom_face();
  f.area = {0.3, 0.4};  // an oblique face, normal (0.6, 0.8)
  const Vec2 cell{2.0, -1.0};
  const Vec2 ub = slip->face_velocity(f, cell, 0.0);
  EXPECT_NEAR(dot(ub, {0.6, 0.8}), 0.0, 1e-15);
  EXPECT_NEAR(dot(ub, {-0.8, 0.6}), dot(cell, {-0.8, 0.6}), 1e-15);  // tangential part kept
  EXPECT_EQ(slip->flux_prediction(), FluxPrediction::zero);
  EXPECT_EQ(slip->pressure_role(), PressureRole::extrapolated);
  EXPECT_FALSE(slip->is_wall());
  EXPECT_FALSE(slip->scalar_is_prescribed(0.0));
  EXPECT_EQ(slip->scalar_value(f, 3.0, 0.0, model_values), 3.0);
  // Only the normal component feels the face: the row pulls u_P towards the slip velocity.
  MomentumRow row{0.0, 0.0, 0.0, 0.0};
  slip->add_momentum(input(0.0, ub, cell, {}), row);
  const double c = 4e-3 * 0.5 / 0.1;
  EXPECT_DOUBLE_EQ(row.diag, c);
  EXPECT_DOUBLE_EQ(row.rhs_u, c * ub.x);
  EXPECT_DOUBLE_EQ(row.rhs_v, c * ub.y);
}

TEST(BoundaryConditions, OnePerSegmentAndFixedPressureOnlyWithOutflowOrOpening) {
  const std::vector<BoundarySegmentSpec> closed = {segment(BoundaryKind::wall, {1.0, 0.0}),
                                                   segment(BoundaryKind::slip)};
  const BoundaryConditions walls(closed, 0.0);
  EXPECT_FALSE(walls.has_fixed_pressure());
  BoundaryFace f = bottom_face();
  f.segment = 0;
  EXPECT_TRUE(walls.of(f).is_wall());
  f.segment = 1;
  EXPECT_EQ(walls.of(f).flux_prediction(), FluxPrediction::zero);

  EXPECT_TRUE(BoundaryConditions({segment(BoundaryKind::wall), segment(BoundaryKind::outflow)}, 0.0)
                  .has_fixed_pressure());
  EXPECT_TRUE(BoundaryConditions({segment(BoundaryKind::opening)}, 0.0).has_fixed_pressure());
}

TEST(BoundaryConditions, ProfileInflowInterpolatesVelocityAndModelVariableAlongItsSide) {
  // A left-side inflow from a three-row table: u = 2 y, v = -y, model variable 10 + y (linear, so
  // the interpolation must reproduce it exactly between the rows).
  BoundarySegmentSpec spec = segment(BoundaryKind::inflow);
  spec.side = Side::left;
  InflowProfile profile;
  profile.coordinate = {0.0, 0.5, 2.0};
  for (double y : profile.coordinate) {
    profile.u.push_back(2.0 * y);
    profile.v.push_back(-y);
    profile.model_variable.push_back(10.0 + y);
  }
  spec.profile = profile;
  const auto inflow = make_boundary_condition(spec, 0.0);
  BoundaryFace f;
  f.side = Side::left;
  f.area = {-0.2, 0.0};
  for (const double y : {0.0, 0.3, 0.5, 1.7, 2.0}) {
    f.centre = {-4.0, y};  // the coordinate along a left side is y, whatever x is
    const Vec2 ub = inflow->face_velocity(f, {9.0, 9.0}, -0.1);
    EXPECT_NEAR(ub.x, 2.0 * y, 1e-15) << y;
    EXPECT_NEAR(ub.y, -y, 1e-15) << y;
    EXPECT_NEAR(inflow->scalar_value(f, 3.0, -0.1, model_values), 10.0 + y, 1e-14) << y;
    // Other fields than the model variable (e.g. grad nu_t) keep the free-stream value.
    EXPECT_EQ(inflow->scalar_value(f, 3.0, -0.1, {0.0, 7.0, false}), 7.0);
  }
  EXPECT_TRUE(inflow->is_prescribed());
  EXPECT_EQ(inflow->flux_prediction(), FluxPrediction::prescribed);
}
