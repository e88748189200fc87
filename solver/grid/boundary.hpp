// Assignment of every boundary face to one boundary segment of the case.
#pragma once

#include <string>
#include <vector>

#include "core/case_spec.hpp"
#include "grid/boundary_faces.hpp"
#include "meshes/node_coordinates.hpp"

namespace wallrans {

/// The domain's boundary faces (domain_boundary_faces order, the global ids) with the segment of
/// each face set.
class BoundaryMap {
 public:
  /// Local (same on every rank). Throws InputError naming the case file and line when a face is
  /// covered by no segment or by two segments, when a periodic side has segments, or when a
  /// segment covers no face.
  BoundaryMap(const CaseSpec& spec, const NodeCoordinates& nodes);

  /// Every boundary face of the domain, indexed by global id.
  const std::vector<BoundaryFace>& faces() const { return faces_; }
  const BoundarySegmentSpec& spec(const BoundaryFace& face) const { return segments_[face.segment]; }
  const std::vector<BoundarySegmentSpec>& segments() const { return segments_; }
  /// True if any face of the domain is a no-slip wall.
  bool has_wall() const;

 private:
  std::vector<BoundarySegmentSpec> segments_;
  std::vector<BoundaryFace> faces_;
};

}  // namespace wallrans
