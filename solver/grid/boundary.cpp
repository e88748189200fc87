// Classifies boundary faces by the coordinate of their centre along the side, or by their index.
#include "grid/boundary.hpp"

#include <string>

#include "core/error.hpp"

namespace wallrans {

namespace {

bool is_flow_through(BoundaryKind kind) {
  return kind == BoundaryKind::inflow || kind == BoundaryKind::outflow || kind == BoundaryKind::opening;
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

const char* to_string(GridGenerator generator) {
  switch (generator) {
    case GridGenerator::channel:
      return "channel";
    case GridGenerator::cavity:
      return "cavity";
    case GridGenerator::plate:
      return "plate";
    case GridGenerator::skewed_box:
      return "skewed_box";
    case GridGenerator::step:
      return "step";
    case GridGenerator::hill_channel:
      return "hill_channel";
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
    case BoundaryKind::opening:
      return "opening";
  }
  return "?";
}

BoundaryMap::BoundaryMap(const CaseSpec& spec, const NodeCoordinates& nodes)
    : segments_(spec.boundaries), solid_(spec, nodes) {
  const bool periodic_x = spec.periodic.axis == PeriodicAxis::x;
  // Segments are matched against every face of the block sides, those of solid cells included;
  // a face of a solid cell needs no segment, and must not let flow in or out.
  std::vector<BoundaryFace> side_faces = domain_boundary_faces(nodes, periodic_x);
  auto key = [](size_t s) { return "key 'boundaries[" + std::to_string(s) + "]': "; };
  for (Side side : {Side::left, Side::right, Side::bottom, Side::top}) {
    const bool along_x = side == Side::bottom || side == Side::top;
    // The faces of this side (none on a periodic side) and the coordinate of each face centre
    // along it (x for bottom/top, y for left/right).
    std::vector<BoundaryFace*> on_side;
    for (BoundaryFace& f : side_faces) {
      if (f.side == side) on_side.push_back(&f);
    }
    const size_t n = on_side.size();
    std::vector<double> mid(n);
    for (size_t k = 0; k < n; ++k) {
      const Vec2 a = on_side[k]->a, b = on_side[k]->b;
      mid[k] = along_x ? 0.5 * (a.x + b.x) : 0.5 * (a.y + b.y);
    }
    int first_line = 0;
    for (size_t s = 0; s < segments_.size(); ++s) {
      const auto& seg = segments_[s];
      if (seg.side != side) continue;
      if (first_line == 0) first_line = seg.line;
      if (n == 0) {
        throw InputError(case_location(spec, seg.line) + ": " + key(s) + "expected no segment on side '" +
                         to_string(side) + "' (periodic.axis: x makes it periodic), got kind '" +
                         to_string(seg.kind) + "'");
      }
      if (seg.faces && (*seg.faces)[1] >= static_cast<int>(n)) {
        throw InputError(case_location(spec, seg.line) + ": " + key(s) + "expected faces within [0, " +
                         std::to_string(n - 1) + "] on side '" + to_string(side) + "', got [" +
                         std::to_string((*seg.faces)[0]) + ", " + std::to_string((*seg.faces)[1]) + "]");
      }
      int covered = 0;
      for (size_t k = 0; k < n; ++k) {
        if (seg.from && mid[k] < *seg.from) continue;
        if (seg.to && mid[k] > *seg.to) continue;
        if (seg.faces && (on_side[k]->index < (*seg.faces)[0] || on_side[k]->index > (*seg.faces)[1]))
          continue;
        const int taken = on_side[k]->segment;
        if (taken >= 0) {
          throw InputError(case_location(spec, seg.line) + ": " + key(s) +
                           "expected faces not covered by another segment, got "
                           "an overlap with boundaries[" +
                           std::to_string(taken) + "] (line " + std::to_string(segments_[taken].line) +
                           ") on side '" + to_string(side) + "' at " + (along_x ? "x = " : "y = ") +
                           std::to_string(mid[k]));
        }
        on_side[k]->segment = static_cast<int>(s);
        ++covered;
        if (seg.profile && !seg.profile->covers(mid[k])) {
          throw InputError(
              case_location(spec, seg.line) + ": key 'boundaries[" + std::to_string(s) +
              "].profile_file': expected a profile covering every face of the segment on side '" +
              to_string(side) + "', got rows from " + std::to_string(seg.profile->front()) + " to " +
              std::to_string(seg.profile->back()) + " in " + seg.profile->file + " and a face at " +
              (along_x ? "x = " : "y = ") + std::to_string(mid[k]));
        }
      }
      if (covered == 0) {
        throw InputError(case_location(spec, seg.line) + ": " + key(s) +
                         "expected 'from'/'to' enclosing at least one face "
                         "centre of side '" +
                         to_string(side) + "' (" + std::to_string(mid.front()) + " to " +
                         std::to_string(mid.back()) + "), got none");
      }
    }
    for (size_t k = 0; k < n; ++k) {
      const BoundaryFace& f = *on_side[k];
      const int region = solid_.region(f.i, f.j);
      if (f.segment < 0 && region < 0) {
        throw InputError(case_location(spec, first_line) +
                         ": key 'boundaries': expected segments covering side '" + to_string(side) +
                         "' completely, got no segment for the face at " + (along_x ? "x = " : "y = ") +
                         std::to_string(mid[k]));
      }
      if (region >= 0 && f.segment >= 0 && is_flow_through(segments_[f.segment].kind)) {
        const BoundarySegmentSpec& seg = segments_[f.segment];
        if (spec.solid_regions[region].from_generator) {
          throw InputError(
              case_location(spec, seg.line) + ": key 'boundaries[" + std::to_string(f.segment) +
              "]': expected no face of the step (the generator's solid corner below y = " +
              std::to_string(spec.grid.step_height) + " and left of x = 0) in an " + to_string(seg.kind) +
              " segment, got the face at " + (along_x ? "x = " : "y = ") + std::to_string(mid[k]) +
              " (give the segment from: " + std::to_string(along_x ? 0.0 : spec.grid.step_height) + ")");
        }
        throw InputError(case_location(spec, spec.solid_regions[region].line) + ": key 'solid_regions[" +
                         std::to_string(region) + "]': expected no solid cell at a face of an " +
                         to_string(seg.kind) + " segment, got cell (" + std::to_string(f.i) + ", " +
                         std::to_string(f.j) + ") at the face of boundaries[" + std::to_string(f.segment) +
                         "] (line " + std::to_string(seg.line) + ") at " + (along_x ? "x = " : "y = ") +
                         std::to_string(mid[k]));
      }
    }
  }
  // The faces of the fluid: side faces keep their segment, faces next to solid cells get a wall.
  std::vector<std::vector<int>> segment_of(4);  // by side, then index along it
  for (const BoundaryFace& f : side_faces) {
    auto& along = segment_of[static_cast<size_t>(f.side)];
    if (along.size() <= static_cast<size_t>(f.index)) along.resize(static_cast<size_t>(f.index) + 1, -1);
    along[static_cast<size_t>(f.index)] = f.segment;
  }
  faces_ = domain_boundary_faces(nodes, periodic_x, solid_);
  const int solid_wall = static_cast<int>(segments_.size());
  bool has_solid_faces = false;
  for (BoundaryFace& f : faces_) {
    has_solid_faces = has_solid_faces || f.on_solid;
    f.segment =
        f.on_solid ? solid_wall : segment_of[static_cast<size_t>(f.side)][static_cast<size_t>(f.index)];
  }
  if (has_solid_faces) {
    BoundarySegmentSpec wall;
    wall.kind = BoundaryKind::wall;
    wall.line = spec.solid_regions.front().line;
    segments_.push_back(wall);
  }
}

bool BoundaryMap::has_wall() const {
  for (const BoundaryFace& f : faces_) {
    if (spec(f).kind == BoundaryKind::wall) return true;
  }
  return false;
}

}  // namespace wallrans
