// Wall faces from the boundary map, and the nearest-face search: segments bucketed in a uniform
// background grid, searched ring by ring outwards from the query point (spiral search).
#include "models/wall_distance.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <utility>

namespace wallrans {

namespace {

/// A wall face, possibly shifted by a period, with the id of the face in the caller's list.
struct Segment {
  Vec2 a, b;
  int id;
};

struct Nearest {
  double distance = std::numeric_limits<double>::infinity();
  int id = -1;
};

/// Uniform grid of square buckets over the bounding box of the segments; each segment is listed
/// in every bucket its bounding box overlaps (compressed row storage).
class BucketGrid {
 public:
  explicit BucketGrid(std::vector<Segment> segments);
  /// Nearest segment to p; equal to the all-pairs minimum, ties to the smallest id.
  Nearest nearest(Vec2 p) const;

 private:
  long long bucket_x(double x) const { return to_index((x - origin_.x) / size_); }
  long long bucket_y(double y) const { return to_index((y - origin_.y) / size_); }
  static long long to_index(double scaled) {
    // Far query points may lie many buckets outside; the clamp only keeps the cast defined.
    return static_cast<long long>(std::floor(std::clamp(scaled, -1e15, 1e15)));
  }
  void visit_bucket(Vec2 p, long long bx, long long by, double tolerance, Nearest& best) const;

  std::vector<Segment> segments_;
  Vec2 origin_;
  double size_ = 1.0;
  long long n_x_ = 1, n_y_ = 1;
  std::vector<size_t> offsets_;  ///< bucket (bx, by) = by * n_x_ + bx lists ids_[offsets_[b]..offsets_[b+1])
  std::vector<int> ids_;         ///< positions in segments_
};

BucketGrid::BucketGrid(std::vector<Segment> segments) : segments_(std::move(segments)) {
  Vec2 low{std::numeric_limits<double>::infinity(), std::numeric_limits<double>::infinity()};
  Vec2 high = -1.0 * low;
  for (const auto& seg : segments_) {
    low = {std::min({low.x, seg.a.x, seg.b.x}), std::min({low.y, seg.a.y, seg.b.y})};
    high = {std::max({high.x, seg.a.x, seg.b.x}), std::max({high.y, seg.a.y, seg.b.y})};
  }
  const double width = high.x - low.x, height = high.y - low.y;
  const double n_segments = static_cast<double>(segments_.size());
  // About one bucket per segment: square buckets of area width*height/n, but no more than n
  // buckets along the longer extent (walls on a single line have zero area).
  size_ = std::max(std::sqrt(width * height / n_segments), std::max(width, height) / n_segments);
  if (!(size_ > 0.0)) size_ = 1.0;  // all segments degenerate to one point
  n_x_ = static_cast<long long>(width / size_) + 1;
  n_y_ = static_cast<long long>(height / size_) + 1;
  origin_ = {low.x - 0.5 * (n_x_ * size_ - width), low.y - 0.5 * (n_y_ * size_ - height)};

  auto bucket_range = [&](const Segment& seg, long long& x0, long long& x1, long long& y0, long long& y1) {
    x0 = std::clamp(bucket_x(std::min(seg.a.x, seg.b.x)), 0LL, n_x_ - 1);
    x1 = std::clamp(bucket_x(std::max(seg.a.x, seg.b.x)), 0LL, n_x_ - 1);
    y0 = std::clamp(bucket_y(std::min(seg.a.y, seg.b.y)), 0LL, n_y_ - 1);
    y1 = std::clamp(bucket_y(std::max(seg.a.y, seg.b.y)), 0LL, n_y_ - 1);
  };
  offsets_.assign(static_cast<size_t>(n_x_ * n_y_) + 1, 0);
  long long x0 = 0, x1 = 0, y0 = 0, y1 = 0;
  for (const auto& seg : segments_) {
    bucket_range(seg, x0, x1, y0, y1);
    for (long long by = y0; by <= y1; ++by)
      for (long long bx = x0; bx <= x1; ++bx) ++offsets_[static_cast<size_t>(by * n_x_ + bx) + 1];
  }
  for (size_t bucket = 1; bucket < offsets_.size(); ++bucket) offsets_[bucket] += offsets_[bucket - 1];
  ids_.resize(offsets_.back());
  std::vector<size_t> fill(offsets_.begin(), offsets_.end() - 1);
  for (size_t position = 0; position < segments_.size(); ++position) {
    bucket_range(segments_[position], x0, x1, y0, y1);
    for (long long by = y0; by <= y1; ++by)
      for (long long bx = x0; bx <= x1; ++bx)
        ids_[fill[static_cast<size_t>(by * n_x_ + bx)]++] = static_cast<int>(position);
  }
}

void BucketGrid::visit_bucket(Vec2 p, long long bx, long long by, double tolerance, Nearest& best) const {
  // Distance from p to the bucket's square bounds every segment point that lies in the bucket.
  const double x_low = origin_.x + bx * size_, y_low = origin_.y + by * size_;
  const double dx = std::max({x_low - p.x, 0.0, p.x - (x_low + size_)});
  const double dy = std::max({y_low - p.y, 0.0, p.y - (y_low + size_)});
  if (std::sqrt(dx * dx + dy * dy) > best.distance + tolerance) return;
  const size_t bucket = static_cast<size_t>(by * n_x_ + bx);
  for (size_t entry = offsets_[bucket]; entry < offsets_[bucket + 1]; ++entry) {
    const Segment& seg = segments_[ids_[entry]];
    const double distance = point_segment_distance(p, seg.a, seg.b);
    if (distance < best.distance || (distance == best.distance && seg.id < best.id))
      best = {distance, seg.id};
  }
}

Nearest BucketGrid::nearest(Vec2 p) const {
  const long long cx = bucket_x(p.x), cy = bucket_y(p.y);  // the bucket containing p
  // Rounding in the bucket bounds is far below this margin; within it nothing is pruned, so a
  // tie or a near-tie is always compared exactly.
  const double tolerance =
      1e-12 * (std::abs(p.x - origin_.x) + std::abs(p.y - origin_.y) + (n_x_ + n_y_) * size_);
  // Rings closer than the bucket grid itself are empty: start at the first ring that meets it.
  long long ring = std::max({0LL, -cx, cx - (n_x_ - 1), -cy, cy - (n_y_ - 1)});
  Nearest best;
  for (;; ++ring) {
    // The ring: buckets at Chebyshev index distance `ring` from (cx, cy), clipped to the grid.
    const long long x_lo = std::max(cx - ring, 0LL), x_hi = std::min(cx + ring, n_x_ - 1);
    const long long y_lo = std::max(cy - ring + 1, 0LL), y_hi = std::min(cy + ring - 1, n_y_ - 1);
    const long long step = std::max(2 * ring, 1LL);  // rows cy - ring and cy + ring; ring 0 is one bucket
    for (long long by = cy - ring; by <= cy + ring; by += step) {
      if (by < 0 || by >= n_y_) continue;
      for (long long bx = x_lo; bx <= x_hi; ++bx) visit_bucket(p, bx, by, tolerance, best);
    }
    for (long long bx = cx - ring; ring > 0 && bx <= cx + ring; bx += step) {  // columns without the corners
      if (bx < 0 || bx >= n_x_) continue;
      for (long long by = y_lo; by <= y_hi; ++by) visit_bucket(p, bx, by, tolerance, best);
    }
    const bool searched_all =
        cx - ring <= 0 && cx + ring >= n_x_ - 1 && cy - ring <= 0 && cy + ring >= n_y_ - 1;
    if (searched_all) break;
    // Every unsearched segment lies outside the square of rings 0..ring, hence at least as far from
    // p as the square's boundary.
    const double bound =
        std::min({p.x - (origin_.x + (cx - ring) * size_), origin_.x + (cx + ring + 1) * size_ - p.x,
                  p.y - (origin_.y + (cy - ring) * size_), origin_.y + (cy + ring + 1) * size_ - p.y});
    if (best.distance + tolerance < bound) break;
  }
  return best;
}

}  // namespace

std::vector<WallFace> collect_wall_faces(const BoundaryMap& boundaries) {
  std::vector<WallFace> walls;
  for (const BoundaryFace& f : boundaries.faces()) {
    if (boundaries.spec(f).kind == BoundaryKind::wall) walls.push_back({f.a, f.b, f.side, f.index});
  }
  return walls;
}

WallDistance compute_wall_distance(const Grid& grid, const std::vector<WallFace>& walls) {
  WallDistance out{Field(grid, std::numeric_limits<double>::infinity()),
                   std::vector<int>(grid.n_ghosted(), -1)};
  if (walls.empty()) return out;
  std::vector<Segment> segments;
  const NodeCoordinates& nodes = grid.nodes();
  const Vec2 period = nodes.at(nodes.cells_x, 0) - nodes.at(0, 0);
  for (int shift : grid.periodic_x() ? std::vector<int>{0, -1, 1} : std::vector<int>{0}) {
    for (size_t id = 0; id < walls.size(); ++id) {
      const Vec2 offset = static_cast<double>(shift) * period;
      segments.push_back({walls[id].a + offset, walls[id].b + offset, static_cast<int>(id)});
    }
  }
  const BucketGrid buckets(std::move(segments));
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j) {
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i) {
      const Nearest found = buckets.nearest(grid.centre(i, j));
      out.distance(i, j) = found.distance;
      out.nearest[grid.local(i, j)] = found.id;
    }
  }
  return out;
}

}  // namespace wallrans
