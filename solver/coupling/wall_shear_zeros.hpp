// Separation and reattachment points along a wall: where the wall shear stress changes sign.
#pragma once

#include <vector>

namespace wallrans {

struct WallShearZero {
  double position;       ///< where the interpolated wall shear stress is zero [m]
  bool is_reattachment;  ///< the shear turns from negative to positive with increasing position
};

/// Local. The sign changes of the wall shear stress `shear` sampled at face centres `position`
/// (increasing) along one wall, with the shear's sign taken along the direction of increasing
/// position: between two samples of opposite sign, the zero of the straight line through them;
/// across a run of samples that are exactly zero, the middle of the run. With the flow along
/// increasing position, a zero where the shear turns negative is a separation, one where it turns
/// positive a reattachment. Samples of zero at either end are not crossings.
std::vector<WallShearZero> wall_shear_zeros(const std::vector<double>& position,
                                            const std::vector<double>& shear);

}  // namespace wallrans
