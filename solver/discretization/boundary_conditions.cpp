// The boundary kinds: no-slip wall, inflow, outflow, slip and the fixed-pressure opening.
#include "discretization/boundary_conditions.hpp"

#include <algorithm>
#include <optional>

namespace wallrans {

namespace {

// Velocity given in both flow directions (wall, inflow). The face value is convected in and out:
// an upwind cell value would be first order where flow leaves through such a face. Diffusion uses
// the second-order wall gradient as a deferred correction to the two-point term.
class PrescribedVelocity : public BoundaryCondition {
 public:
  explicit PrescribedVelocity(Vec2 velocity) : velocity_(velocity) {}
  bool is_prescribed() const override { return true; }
  Vec2 face_velocity(const BoundaryFace&, Vec2, double) const override { return velocity_; }
  FluxPrediction flux_prediction() const override { return FluxPrediction::prescribed; }
  bool scalar_is_prescribed(double) const override { return true; }

 protected:
  // nu_face: the viscosity at the face (laminar at a wall, where nu_t = 0).
  static void add_prescribed_velocity(const MomentumFaceInput& in, double nu_face, MomentumRow& row) {
    const Vec2 ub = in.face_velocity;
    row.rhs_u -= in.flux * ub.x;
    row.rhs_v -= in.flux * ub.y;
    const double s1 = in.normal_distance;
    const double c = nu_face * in.area / s1;
    row.diag += c;
    row.diffusive += c;
    row.rhs_u += c * ub.x + nu_face * in.area * (in.normal_derivative.x - (ub.x - in.cell_velocity.x) / s1);
    row.rhs_v += c * ub.y + nu_face * in.area * (in.normal_derivative.y - (ub.y - in.cell_velocity.y) / s1);
  }

 private:
  Vec2 velocity_;
};

class Wall final : public PrescribedVelocity {
 public:
  using PrescribedVelocity::PrescribedVelocity;
  bool is_wall() const override { return true; }
  void add_momentum(const MomentumFaceInput& in, MomentumRow& row) const override {
    add_prescribed_velocity(in, in.nu, row);
  }
  double scalar_value(const BoundaryFace&, double, double,
                      const ScalarBoundaryValues& values) const override {
    return values.wall;
  }
};

// A uniform inflow, or one whose velocity and model variable come from a profile along the side.
class Inflow final : public PrescribedVelocity {
 public:
  Inflow(Vec2 velocity, const std::optional<InflowProfile>& profile)
      : PrescribedVelocity(velocity), profile_(profile) {}
  Vec2 face_velocity(const BoundaryFace& face, Vec2 cell_velocity, double outward_flux) const override {
    if (!profile_) return PrescribedVelocity::face_velocity(face, cell_velocity, outward_flux);
    return profile_->at(along_side(face)).velocity;
  }
  void add_momentum(const MomentumFaceInput& in, MomentumRow& row) const override {
    add_prescribed_velocity(in, in.nu_cell, row);
  }
  double scalar_value(const BoundaryFace& face, double, double,
                      const ScalarBoundaryValues& values) const override {
    if (!profile_ || !values.is_model_variable) return values.freestream;
    return profile_->at(along_side(face)).model_variable;
  }

 private:
  static double along_side(const BoundaryFace& face) {
    return face.side == Side::left || face.side == Side::right ? face.centre.y : face.centre.x;
  }
  std::optional<InflowProfile> profile_;
};

// Fixed static pressure; the flux comes from Rhie-Chow with the boundary pressure. Leaving flow
// carries the cell value (upwind), entering flow carries `entering` (zero velocity gradient for an
// outflow, the given velocity for an opening); there is no viscous flux.
class FixedPressure : public BoundaryCondition {
 public:
  explicit FixedPressure(double pressure) : pressure_(pressure) {}
  FluxPrediction flux_prediction() const override { return FluxPrediction::rhie_chow; }
  PressureRole pressure_role() const override { return PressureRole::fixed; }
  double pressure() const override { return pressure_; }
  void add_momentum(const MomentumFaceInput& in, MomentumRow& row) const override {
    row.diag += std::max(in.flux, 0.0);
    if (in.flux < 0.0) {
      const Vec2 carried = entering_velocity(in.cell_velocity);
      row.rhs_u -= in.flux * carried.x;
      row.rhs_v -= in.flux * carried.y;
    }
  }

 protected:
  virtual Vec2 entering_velocity(Vec2 cell_velocity) const = 0;

 private:
  double pressure_;
};

class Outflow final : public FixedPressure {
 public:
  using FixedPressure::FixedPressure;
  Vec2 face_velocity(const BoundaryFace&, Vec2 cell_velocity, double) const override { return cell_velocity; }
  bool scalar_is_prescribed(double) const override { return false; }
  double scalar_value(const BoundaryFace&, double cell_value, double,
                      const ScalarBoundaryValues&) const override {
    return cell_value;
  }

 protected:
  Vec2 entering_velocity(Vec2 cell_velocity) const override { return cell_velocity; }
};

// Fixed pressure that takes `velocity` (and the free-stream model values) where flow enters.
class Opening final : public FixedPressure {
 public:
  Opening(double pressure, Vec2 velocity) : FixedPressure(pressure), velocity_(velocity) {}
  Vec2 face_velocity(const BoundaryFace&, Vec2 cell_velocity, double outward_flux) const override {
    return outward_flux < 0.0 ? velocity_ : cell_velocity;
  }
  bool scalar_is_prescribed(double outward_flux) const override { return outward_flux < 0.0; }
  double scalar_value(const BoundaryFace&, double cell_value, double outward_flux,
                      const ScalarBoundaryValues& values) const override {
    return outward_flux < 0.0 ? values.freestream : cell_value;
  }

 protected:
  Vec2 entering_velocity(Vec2) const override { return velocity_; }

 private:
  Vec2 velocity_;
};

// Symmetry or slip wall: zero normal velocity and zero shear. Only the normal velocity component
// feels the boundary, through a two-point term towards the slip-projected face velocity (lagged,
// so that u and v share one matrix).
class Slip final : public BoundaryCondition {
 public:
  Vec2 face_velocity(const BoundaryFace& face, Vec2 cell_velocity, double) const override {
    const Vec2 n = (1.0 / norm(face.area)) * face.area;
    return cell_velocity - dot(cell_velocity, n) * n;
  }
  FluxPrediction flux_prediction() const override { return FluxPrediction::zero; }
  void add_momentum(const MomentumFaceInput& in, MomentumRow& row) const override {
    const double c = in.nu_cell * in.area / in.normal_distance;
    row.diag += c;
    row.diffusive += c;
    row.rhs_u += c * in.face_velocity.x;
    row.rhs_v += c * in.face_velocity.y;
  }
  bool scalar_is_prescribed(double) const override { return false; }
  double scalar_value(const BoundaryFace&, double cell_value, double,
                      const ScalarBoundaryValues&) const override {
    return cell_value;
  }
};

}  // namespace

std::unique_ptr<BoundaryCondition> make_boundary_condition(const BoundarySegmentSpec& segment,
                                                           double reference_pressure) {
  const double pressure = segment.pressure.value_or(reference_pressure);
  switch (segment.kind) {
    case BoundaryKind::wall:
      return std::make_unique<Wall>(segment.velocity);
    case BoundaryKind::inflow:
      return std::make_unique<Inflow>(segment.velocity, segment.profile);
    case BoundaryKind::outflow:
      return std::make_unique<Outflow>(pressure);
    case BoundaryKind::slip:
      return std::make_unique<Slip>();
    case BoundaryKind::opening:
      return std::make_unique<Opening>(pressure, segment.velocity);
  }
  return nullptr;
}

BoundaryConditions::BoundaryConditions(const std::vector<BoundarySegmentSpec>& segments,
                                       double reference_pressure) {
  for (const BoundarySegmentSpec& segment : segments)
    by_segment_.push_back(make_boundary_condition(segment, reference_pressure));
}

bool BoundaryConditions::has_fixed_pressure() const {
  for (const auto& condition : by_segment_) {
    if (condition->pressure_role() == PressureRole::fixed) return true;
  }
  return false;
}

}  // namespace wallrans
