// Assignment of every boundary face to one boundary segment of the case.
#pragma once

#include <string>
#include <vector>

#include "core/case_spec.hpp"
#include "meshes/node_coordinates.hpp"

namespace wallrans {

/// For each side, the segment index (into CaseSpec::boundaries) of every face along that side,
/// indexed by i (bottom/top) or j (left/right). Periodic sides hold -1.
class BoundaryMap {
 public:
  /// Local (same on every rank). Throws InputError naming the case file and line when a face is
  /// covered by no segment or by two segments, when a periodic side has segments, or when a
  /// segment covers no face.
  BoundaryMap(const CaseSpec& spec, const NodeCoordinates& nodes);

  int segment(Side side, int index) const { return faces_[static_cast<int>(side)][index]; }
  const BoundarySegmentSpec& spec(Side side, int index) const { return segments_[segment(side, index)]; }
  const std::vector<BoundarySegmentSpec>& segments() const { return segments_; }
  /// True if any face of the domain is a no-slip wall.
  bool has_wall() const;

 private:
  std::vector<BoundarySegmentSpec> segments_;
  std::vector<int> faces_[4];
};

}  // namespace wallrans
