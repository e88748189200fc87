// A case's grid from a grid file, and the patches that describe a case's boundary segments.
#include "io/grid_file_case.hpp"

#include <algorithm>
#include <cmath>
#include <set>
#include <sstream>

#include "core/error.hpp"
#include "io/grid_file.hpp"
#include "meshes/cell_orientation.hpp"

namespace wallrans {

namespace {

std::string where(const CaseSpec& spec, int line) {
  const std::string file = spec.source_file.empty() ? std::string("case") : spec.source_file;
  return line > 0 ? file + ":" + std::to_string(line) : file;
}

std::string point_text(Vec2 p) {
  std::ostringstream text;
  text << "(" << p.x << ", " << p.y << ")";
  return text.str();
}

// Local. Where a run of faces lies once j is reversed: bottom and top swap; along left and right
// the face index k becomes cells_y - 1 - k.
void reverse_j(Side& side, int& first, int& last, int cells_y) {
  if (side == Side::bottom || side == Side::top) {
    side = side == Side::bottom ? Side::top : Side::bottom;
    return;
  }
  const int old_first = first;
  first = cells_y - 1 - last;
  last = cells_y - 1 - old_first;
}

// Local. A periodic x direction joins node (0, j) to node (cells_x, j) by one translation for all
// j. Tolerance: 1e-6 of the grid's extent, above the rounding of coordinates stored in single
// precision (2^-24 ~ 6e-8 relative), so a translated copy written by any tool passes, while a
// real mismatch (a side that is not a translated copy) is far larger.
void check_periodic(const NodeCoordinates& nodes, const std::string& path) {
  if (nodes.cells_x < 2) {
    throw InputError(path + ": expected at least 2 cells along i for periodic.axis x, got " +
                     std::to_string(nodes.cells_x));
  }
  double lo_x = nodes.nodes[0].x, hi_x = lo_x, lo_y = nodes.nodes[0].y, hi_y = lo_y;
  for (const Vec2& p : nodes.nodes) {
    lo_x = std::min(lo_x, p.x);
    hi_x = std::max(hi_x, p.x);
    lo_y = std::min(lo_y, p.y);
    hi_y = std::max(hi_y, p.y);
  }
  const double tolerance = 1e-6 * std::max(hi_x - lo_x, hi_y - lo_y);
  const Vec2 period = nodes.at(nodes.cells_x, 0) - nodes.at(0, 0);
  for (int j = 0; j <= nodes.cells_y; ++j) {
    const Vec2 shift = nodes.at(nodes.cells_x, j) - nodes.at(0, j);
    if (norm(shift - period) > tolerance) {
      throw InputError(path + ": expected the right side to be the left side moved by one translation " +
                       point_text(period) + " for periodic.axis x, got " + point_text(shift) +
                       " at node row j = " + std::to_string(j));
    }
  }
}

BoundarySegmentSpec resolve_patch(const CaseSpec& spec, size_t k, const std::vector<GridPatch>& patches) {
  BoundarySegmentSpec segment = spec.boundaries[k];
  const std::string key = ": key 'boundaries[" + std::to_string(k) + "].patch': ";
  const auto found = std::find_if(patches.begin(), patches.end(),
                                  [&segment](const GridPatch& p) { return p.name == segment.patch; });
  if (found == patches.end()) {
    std::string names;
    for (const GridPatch& p : patches) names += (names.empty() ? "" : ", ") + p.name;
    throw InputError(where(spec, segment.line) + key + "expected a patch of " + spec.grid.file + " (" +
                     (names.empty() ? std::string("it has none") : names) + "), got '" + segment.patch + "'");
  }
  const bool on_x_end = found->side == Side::left || found->side == Side::right;
  if (spec.periodic.axis == PeriodicAxis::x && on_x_end) {
    throw InputError(where(spec, segment.line) + key +
                     "expected a patch on side bottom or top (periodic.axis x joins left and right), got '" +
                     segment.patch + "' on side " + side_name(found->side));
  }
  segment.side = found->side;
  segment.faces = std::array<int, 2>{found->first_face, found->last_face};
  return segment;
}

}  // namespace

CaseGrid load_case_grid(MPI_Comm comm, const CaseSpec& spec) {
  const std::string& path = spec.grid.file;
  GridFileContent content = read_grid_file(comm, path);
  const int cells_y = content.nodes.cells_y;
  CaseGrid out;
  const bool reverse = cell_handedness(content.nodes, path) == Handedness::left;
  if (reverse) {
    content.nodes = reversed_j(content.nodes);
    for (GridPatch& patch : content.patches)
      reverse_j(patch.side, patch.first_face, patch.last_face, cells_y);
    out.note = path +
               ": left-handed grid (clockwise cells); j reversed on load, so its bottom and top sides swap "
               "(patches and side segments follow)";
  }
  if (spec.periodic.axis == PeriodicAxis::x) check_periodic(content.nodes, path);
  for (size_t k = 0; k < spec.boundaries.size(); ++k) {
    if (!spec.boundaries[k].patch.empty()) {
      out.segments.push_back(resolve_patch(spec, k, content.patches));
      continue;
    }
    BoundarySegmentSpec segment = spec.boundaries[k];
    if (reverse && segment.faces) {
      reverse_j(segment.side, (*segment.faces)[0], (*segment.faces)[1], cells_y);
    } else if (reverse) {
      int all_first = 0, all_last = cells_y - 1;
      reverse_j(segment.side, all_first, all_last, cells_y);
    }
    out.segments.push_back(segment);
  }
  out.nodes = std::move(content.nodes);
  return out;
}

std::vector<GridPatch> case_patches(const BoundaryMap& boundaries) {
  std::vector<GridPatch> patches;
  std::set<std::string> used;
  const auto& faces = boundaries.faces();
  for (size_t first = 0; first < faces.size();) {
    size_t last = first;
    while (last + 1 < faces.size() && faces[last + 1].side == faces[first].side &&
           faces[last + 1].segment == faces[first].segment &&
           faces[last + 1].index == faces[last].index + 1) {
      ++last;
    }
    const BoundarySegmentSpec& segment = boundaries.spec(faces[first]);
    const std::string base = segment.patch.empty()
                                 ? std::string(side_name(faces[first].side)) + "_" + to_string(segment.kind)
                                 : segment.patch;
    std::string name = base;
    for (int n = 2; used.count(name) > 0; ++n) name = base + "_" + std::to_string(n);
    used.insert(name);
    patches.push_back(
        {name, faces[first].side, faces[first].index, faces[last].index, to_string(segment.kind)});
    first = last + 1;
  }
  return patches;
}

}  // namespace wallrans
