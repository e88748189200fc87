// The flat list of boundary faces: every face of the domain boundary once (block sides and faces
// next to solid cells), with a global id that does not depend on the rank count, its owner cell,
// outward geometry and boundary segment.
#pragma once

#include <array>
#include <vector>

#include "core/case_spec.hpp"
#include "grid/grid.hpp"
#include "grid/solid_cells.hpp"
#include "meshes/node_coordinates.hpp"

namespace wallrans {

/// One boundary face. `area` points out of the domain (out of the fluid, into a solid cell).
struct BoundaryFace {
  int id = -1;       ///< global id: the position in domain_boundary_faces()
  int segment = -1;  ///< index into CaseSpec::boundaries (set by BoundaryMap; -1 before)
  int i = 0, j = 0;  ///< the owner cell
  /// The next cell inwards along the grid line (valid if has_second: it exists and is fluid). On
  /// a periodic grid it may be a periodic ghost index (-1 or cells_x).
  int i2 = 0, j2 = 0;
  bool has_second = false;
  Vec2 area;    ///< outward area vector
  Vec2 centre;  ///< face centre
  Vec2 a, b;    ///< end nodes, in increasing grid index
  /// Block side and position along it (i for bottom/top, j for left/right). Used only to match
  /// the case file's segments and to label wall output. For a face next to a solid cell: the side
  /// of the owner cell it lies on (bottom: the solid cell is below) and the owner's i or j.
  Side side = Side::left;
  int index = 0;
  bool on_solid = false;  ///< between the (fluid) owner cell and a solid cell
};

/// Local (same on every rank). Every boundary face of the fluid domain in global-id order: first
/// the block sides left, right, bottom, top, each by increasing index, without the faces of solid
/// cells (the sides of a periodic direction have none); then the faces between a fluid and a
/// solid cell, by fluid cell (j-major, i fastest) and for each cell in the order left, right,
/// bottom, top. This is the one place that decides which faces bound the domain and how they are
/// numbered; ids are the same on any rank count.
std::vector<BoundaryFace> domain_boundary_faces(const NodeCoordinates& nodes, bool periodic_x,
                                                const SolidCells& solid = SolidCells());

/// Local. The faces of `domain` (a domain_boundary_faces() list) whose owner cell this rank owns,
/// in global-id order. Values per boundary face are arrays in this order.
std::vector<BoundaryFace> owned_boundary_faces(const Grid& grid, const std::vector<BoundaryFace>& domain);

/// Local. For each owned cell (owned order), the positions in `faces` of its boundary faces
/// (at most four: block sides and solid neighbours; unused slots are -1).
std::vector<std::array<int, 4>> boundary_faces_by_cell(const Grid& grid,
                                                       const std::vector<BoundaryFace>& faces);

}  // namespace wallrans
