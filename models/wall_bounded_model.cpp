#include "models/wall_bounded_model.hpp"

#include "core/error.hpp"

namespace wallrans {

void require_wall(const CaseSpec& spec, const BoundaryMap& boundaries) {
  if (!boundaries.has_wall()) {
    const std::string where = spec.source_file.empty() ? std::string("case") : spec.source_file;
    throw InputError(where + ":" + std::to_string(spec.turbulence.line) +
                     ": key 'turbulence.model': expected a "
                     "grid with at least one no-slip wall for model '" +
                     spec.turbulence.model + "', got none");
  }
}

WallBoundedModel::WallBoundedModel(const CaseSpec& spec, const Grid& grid, const BoundaryMap& boundaries)
    : spec_(spec),
      grid_(grid),
      boundaries_(boundaries),
      nu_(spec.flow.kinematic_viscosity),
      walls_(compute_wall_distance(grid, collect_wall_faces(boundaries))),
      yplus_(grid),
      nut_(grid) {
  require_wall(spec, boundaries);
}

void WallBoundedModel::update_yplus(const MeanFlowView& flow) {
  for (int j = grid_.y_begin(); j < grid_.y_end(); ++j) {
    for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) {
      const int wall = walls_.nearest[grid_.local(i, j)];
      const double u_tau = std::sqrt(flow.wall_shear[wall]);
      yplus_(i, j) = distance(i, j) * u_tau / nu_;
    }
  }
  yplus_.exchange();
}

std::vector<std::pair<std::string, const Field*>> WallBoundedModel::output_fields() const {
  return {{"wall_distance", &walls_.distance}, {"y_plus", &yplus_}};
}

}  // namespace wallrans
