// Classifies boundary faces by the coordinate of their centre along the side.
#include "grid/boundary.hpp"

#include "core/error.hpp"

namespace wallrans {

namespace {

std::string where(const CaseSpec& spec, int line) {
  std::string file = spec.source_file.empty() ? std::string("case") : spec.source_file;
  return line > 0 ? file + ":" + std::to_string(line) : file;
}

}  // namespace

const char* to_string(Side side) {
  switch (side) {
    case Side::left:
      return "left";
    case Side::right:
      return "right";
    case Side::bottom:
      return "bottom";
    case Side::top:
      return "top";
  }
  return "?";
}

const char* to_string(BoundaryKind kind) {
  switch (kind) {
    case BoundaryKind::wall:
      return "wall";
    case BoundaryKind::inflow:
      return "inflow";
    case BoundaryKind::outflow:
      return "outflow";
    case BoundaryKind::slip:
      return "slip";
    case BoundaryKind::free:
      return "free";
  }
  return "?";
}

BoundaryMap::BoundaryMap(const CaseSpec& spec, const NodeCoordinates& nodes) : segments_(spec.boundaries) {
  const int nx = nodes.cells_x, ny = nodes.cells_y;
  const bool periodic_x = spec.periodic.axis == PeriodicAxis::x;
  auto key = [](size_t s) { return "key 'boundaries[" + std::to_string(s) + "]': "; };
  for (Side side : {Side::left, Side::right, Side::bottom, Side::top}) {
    const bool along_x = side == Side::bottom || side == Side::top;
    const int n = along_x ? nx : ny;
    auto& faces = faces_[static_cast<int>(side)];
    faces.assign(static_cast<size_t>(n), -1);
    const bool periodic_side = periodic_x && !along_x;
    // Coordinate of each face centre along the side (x for bottom/top, y for left/right).
    std::vector<double> mid(static_cast<size_t>(n));
    for (int k = 0; k < n; ++k) {
      const Vec2 a =
          along_x ? nodes.at(k, side == Side::bottom ? 0 : ny) : nodes.at(side == Side::left ? 0 : nx, k);
      const Vec2 b = along_x ? nodes.at(k + 1, side == Side::bottom ? 0 : ny)
                             : nodes.at(side == Side::left ? 0 : nx, k + 1);
      mid[k] = along_x ? 0.5 * (a.x + b.x) : 0.5 * (a.y + b.y);
    }
    int first_line = 0;
    for (size_t s = 0; s < segments_.size(); ++s) {
      const auto& seg = segments_[s];
      if (seg.side != side) continue;
      if (first_line == 0) first_line = seg.line;
      if (periodic_side) {
        throw InputError(where(spec, seg.line) + ": " + key(s) + "expected no segment on side '" +
                         to_string(side) + "' (periodic.axis: x makes it periodic), got kind '" +
                         to_string(seg.kind) + "'");
      }
      int covered = 0;
      for (int k = 0; k < n; ++k) {
        if (seg.from && mid[k] < *seg.from) continue;
        if (seg.to && mid[k] > *seg.to) continue;
        if (faces[k] >= 0) {
          throw InputError(where(spec, seg.line) + ": " + key(s) +
                           "expected faces not covered by another segment, got "
                           "an overlap with boundaries[" +
                           std::to_string(faces[k]) + "] (line " + std::to_string(segments_[faces[k]].line) +
                           ") on side '" + to_string(side) + "' at " + (along_x ? "x = " : "y = ") +
                           std::to_string(mid[k]));
        }
        faces[k] = static_cast<int>(s);
        ++covered;
      }
      if (covered == 0) {
        throw InputError(where(spec, seg.line) + ": " + key(s) +
                         "expected 'from'/'to' enclosing at least one face "
                         "centre of side '" +
                         to_string(side) + "' (" + std::to_string(mid.front()) + " to " +
                         std::to_string(mid.back()) + "), got none");
      }
    }
    if (!periodic_side) {
      for (int k = 0; k < n; ++k) {
        if (faces[k] < 0) {
          throw InputError(where(spec, first_line) + ": key 'boundaries': expected segments covering side '" +
                           to_string(side) + "' completely, got no segment for the face at " +
                           (along_x ? "x = " : "y = ") + std::to_string(mid[k]));
        }
      }
    }
  }
}

bool BoundaryMap::has_wall() const {
  for (const auto& faces : faces_) {
    for (int s : faces) {
      if (s >= 0 && segments_[s].kind == BoundaryKind::wall) return true;
    }
  }
  return false;
}

}  // namespace wallrans
