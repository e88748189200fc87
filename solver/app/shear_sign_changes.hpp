// Separation and reattachment points along a wall: where the wall shear changes sign.
#pragma once

#include <vector>

namespace wallrans {

/// A point where the wall shear changes sign.
struct ShearSignChange {
  double s;            ///< position along the wall, in the measure of the input positions
  double fraction;     ///< where between samples `before` and `before + 1` it lies (0..1)
  int before;          ///< the last sample before the point
  bool is_separation;  ///< shear goes from positive to negative in the direction of increasing s
};

/// Local. The sign changes of `shear` sampled at increasing positions `s` (e.g. arc length along
/// a wall through the face centres), found by linear interpolation between neighbouring samples.
/// `shear` is the wall shear component along the direction of increasing s. Going along +s, a
/// change from positive to negative is a separation (the skin-friction lines on both sides run
/// into the point, so the flow leaves the wall) and one from negative to positive a
/// reattachment. Samples of exactly zero do not count as a sign: a run of them between opposite
/// signs gives one point at the middle of the run. Returns the points in increasing s. Throws
/// std::invalid_argument if the sizes differ.
std::vector<ShearSignChange> shear_sign_changes(const std::vector<double>& s,
                                                const std::vector<double>& shear);

}  // namespace wallrans
