// Boundary conditions: one small object per boundary kind, created once per segment of the case,
// that answers everything the flow solver and the model equations ask about a boundary face.
// Adding a kind means adding one subclass here and one line in make_boundary_condition.
#pragma once

#include <memory>
#include <vector>

#include "core/case_spec.hpp"
#include "core/vec2.hpp"
#include "grid/boundary_faces.hpp"

namespace wallrans {

/// How the volume flux through a boundary face is predicted before the pressure correction.
enum class FluxPrediction {
  prescribed,  ///< from the face velocity, u_b . S (or a prescribed flux function)
  zero,        ///< no flow through the face
  rhie_chow,   ///< Rhie-Chow from the owner cell, with the boundary pressure
};

/// The face's part in the pressure correction and the pressure gradient.
enum class PressureRole {
  fixed,         ///< static pressure imposed: p_b = pressure(), p' = 0 at the face
  extrapolated,  ///< p_b extrapolated from the cells; no p' flux (zero-gradient p')
};

/// What the owner cell's momentum row needs to know about one of its boundary faces.
struct MomentumFaceInput {
  double flux;             ///< outward volume flux [m^2/s]
  Vec2 face_velocity;      ///< u_b [m/s]
  Vec2 cell_velocity;      ///< owner-cell velocity [m/s]
  Vec2 normal_derivative;  ///< d(u, v)/dn along the outward normal, second order (wall gradient) [1/s]
  double area;             ///< |S| [m]
  double normal_distance;  ///< owner centre to face centre along the normal [m]
  double nu;               ///< laminar kinematic viscosity [m^2/s]
  double nu_cell;          ///< effective viscosity (nu + nu_t) of the owner cell [m^2/s]
};

/// The owner cell's momentum row under assembly: diagonal a_P and the sources of u and v.
struct MomentumRow {
  double diag;
  double rhs_u, rhs_v;
  double diffusive;  ///< the diffusive part of diag (the relaxation treats it apart)
};

/// The values a model's transport equation imposes at boundaries.
struct ScalarBoundaryValues {
  double wall;        ///< at no-slip walls
  double freestream;  ///< carried in through inflows and openings
  /// True for the model's transported variable, which an inflow profile prescribes; false for
  /// other fields (e.g. the gradient of nu_t), which take `freestream` there.
  bool is_model_variable = true;
};

class BoundaryCondition {
 public:
  virtual ~BoundaryCondition() = default;
  /// True for a no-slip wall (wall shear stress, Cf, wall distance).
  virtual bool is_wall() const { return false; }
  /// True if the face values (velocity and model variables) are given in both flow directions;
  /// a manufactured boundary function may replace them there.
  virtual bool is_prescribed() const { return false; }
  /// Local. The face velocity u_b from the owner-cell velocity and the current outward flux.
  virtual Vec2 face_velocity(const BoundaryFace& face, Vec2 cell_velocity, double outward_flux) const = 0;
  virtual FluxPrediction flux_prediction() const = 0;
  /// Local. Adds the face's convection and diffusion terms to the owner cell's momentum row.
  virtual void add_momentum(const MomentumFaceInput& in, MomentumRow& row) const = 0;
  virtual PressureRole pressure_role() const { return PressureRole::extrapolated; }
  /// The imposed static (kinematic) pressure [m^2/s^2]; meaningful for PressureRole::fixed.
  virtual double pressure() const { return 0.0; }
  /// True if a model variable has a prescribed value at the face for this outward flux (else its
  /// normal gradient is zero).
  virtual bool scalar_is_prescribed(double outward_flux) const = 0;
  /// Local. The face value of a model variable: the prescribed value or, with zero gradient, the
  /// cell's.
  virtual double scalar_value(const BoundaryFace& face, double cell_value, double outward_flux,
                              const ScalarBoundaryValues& values) const = 0;
};

/// Local. The condition of one segment. `reference_pressure` is the pressure of fixed-pressure
/// kinds whose segment gives none. An inflow segment with a profile takes the velocity and the
/// model variable of each face from it, at the face centre's coordinate along the side (the
/// boundary map has checked that the profile covers every face of the segment).
std::unique_ptr<BoundaryCondition> make_boundary_condition(const BoundarySegmentSpec& segment,
                                                           double reference_pressure);

/// One condition per segment of the case, looked up by face.
class BoundaryConditions {
 public:
  BoundaryConditions(const std::vector<BoundarySegmentSpec>& segments, double reference_pressure);
  const BoundaryCondition& of(const BoundaryFace& face) const { return *by_segment_[face.segment]; }
  /// True if some segment fixes the pressure; otherwise the domain is closed or periodic and the
  /// pressure level is free.
  bool has_fixed_pressure() const;

 private:
  std::vector<std::unique_ptr<BoundaryCondition>> by_segment_;
};

}  // namespace wallrans
