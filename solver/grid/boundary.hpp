// Assignment of every boundary face to one boundary segment of the case, and the solid cells whose
// faces join the boundary as no-slip walls.
#pragma once

#include <string>
#include <vector>

#include "core/case_spec.hpp"
#include "grid/boundary_faces.hpp"
#include "grid/solid_cells.hpp"
#include "meshes/node_coordinates.hpp"

namespace wallrans {

/// The domain's boundary faces (domain_boundary_faces order, the global ids) with the segment of
/// each face set, and the solid cells of the case.
class BoundaryMap {
 public:
  /// Local (same on every rank). Throws InputError naming the case file and line when a face of a
  /// fluid cell is covered by no segment or by two segments, when a periodic side has segments,
  /// when a segment covers no face, for bad solid regions (see SolidCells), or when a solid cell
  /// lies at an inflow, outflow or opening face (the flow would enter or leave through a solid).
  BoundaryMap(const CaseSpec& spec, const NodeCoordinates& nodes);

  /// Every boundary face of the domain, indexed by global id.
  const std::vector<BoundaryFace>& faces() const { return faces_; }
  const BoundarySegmentSpec& spec(const BoundaryFace& face) const { return segments_[face.segment]; }
  /// The case's segments, followed (when there are solid cells) by one no-slip wall at rest for
  /// the faces next to solid cells.
  const std::vector<BoundarySegmentSpec>& segments() const { return segments_; }
  /// True if any face of the domain is a no-slip wall.
  bool has_wall() const;
  const SolidCells& solid() const { return solid_; }

 private:
  std::vector<BoundarySegmentSpec> segments_;
  SolidCells solid_;
  std::vector<BoundaryFace> faces_;
};

}  // namespace wallrans
