// Separation and reattachment points along a wall: where the wall shear stress changes sign.
#pragma once

#include <vector>

namespace wallrans {

/// A point where the wall shear changes sign.
struct ShearSignChange {
  double s = 0.0;              ///< position along the wall, in the measure of the input positions
  double fraction = 0.0;       ///< where between samples `before` and the next signed one it lies (0..1)
  int before = 0;              ///< the last sample before the point
  bool is_separation = false;  ///< shear goes from positive to negative in the direction of increasing s
};

/// Local. The sign changes of `shear` sampled at increasing positions `s` (face centres along a
/// wall, or their arc length), found by linear interpolation between neighbouring samples: the zero
/// of the straight line through them, s_k + (s_{k+1} - s_k) tau_k / (tau_k - tau_{k+1}).
/// `shear` is the wall shear component along the direction of increasing s. Going along +s, a
/// change from positive to negative is a separation (the skin-friction lines on both sides run
/// into the point, so the flow leaves the wall) and one from negative to positive a reattachment.
/// Samples of exactly zero (or NaN) do not count as a sign: a run of them between opposite signs
/// gives one point at the middle of the run. With period > 0 the wall is periodic: the last signed
/// sample and the first one moved by one period are neighbours too, and a point found between them
/// is moved back by a period if it lies beyond the midpoint of the last and the moved first sample.
/// Returns the points in increasing s. Throws std::invalid_argument if the sizes differ.
std::vector<ShearSignChange> shear_sign_changes(const std::vector<double>& s, const std::vector<double>& shear,
                                                double period = 0.0);

}  // namespace wallrans
