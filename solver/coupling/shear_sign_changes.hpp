// Separation and reattachment points along a wall: where the wall shear stress changes sign.
#pragma once

#include <vector>

namespace wallrans {

/// A point of a wall where the wall shear stress changes sign.
struct ShearSignChange {
  double x = 0.0;              ///< position [m], linear between the two face centres
  bool is_separation = false;  ///< true: positive to non-positive along +x; false: reattachment
};

/// Local. The sign changes of the shear stress `tau` along a wall given by its face centres `x`
/// (increasing), tau > 0 meaning flow along +x at the wall (WallSample::shear_stress on a floor).
/// Between neighbouring faces k, k+1 of opposite sign (tau > 0 against tau <= 0) the zero is
/// x_k + (x_{k+1} - x_k) tau_k / (tau_k - tau_{k+1}). With period > 0 the wall is periodic: the last
/// face and the first face moved by one period are neighbours too, and a zero found between them
/// is moved back by a period if it lies beyond the midpoint of the two (the periodic side of a
/// block whose faces span one period). Sorted by x. The sizes must agree.
std::vector<ShearSignChange> shear_sign_changes(const std::vector<double>& x, const std::vector<double>& tau,
                                                double period = 0.0);

}  // namespace wallrans
