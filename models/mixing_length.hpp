// Algebraic mixing-length model (Prandtl) with van Driest (1956) damping and an outer cap
// l <= 0.09 delta (Escudier); models/README.md sec. 4. No transport equation.
#pragma once

#include "models/wall_bounded_model.hpp"

namespace wallrans {

class MixingLength final : public WallBoundedModel {
 public:
  MixingLength(const CaseSpec& spec, const Grid& grid, const BoundaryMap& boundaries)
      : WallBoundedModel(spec, grid, boundaries) {}
  std::string name() const override { return "mixing_length"; }
  void update(const MeanFlowView& flow) override;
  std::vector<std::pair<std::string, Field*>> restart_state() override { return {{"eddy_viscosity", &nut_}}; }

  static constexpr double kappa = 0.41, a_plus = 26.0, outer_fraction = 0.09;
};

}  // namespace wallrans
