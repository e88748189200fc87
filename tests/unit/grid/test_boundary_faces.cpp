// The flat list of boundary faces: unique global ids covering every boundary face exactly once on
// any rank count, the same face behind each id on 1 and on all ranks, closed cells with the
// interior faces, and the segment of each face.
#include <gtest/gtest.h>
#include <mpi.h>

#include <algorithm>
#include <functional>
#include <vector>

#include "core/error.hpp"
#include "grid/boundary.hpp"
#include "grid/boundary_faces.hpp"
#include "grid/grid.hpp"
#include "meshes/node_coordinates.hpp"

using namespace wallrans;

namespace {

constexpr int nx = 9, ny = 6;

NodeCoordinates skewed_nodes() {
  GridSpec spec;
  spec.generator = GridGenerator::skewed_box;
  spec.cells_x = nx;
  spec.cells_y = ny;
  spec.length = 1.8;
  spec.height = 1.2;
  spec.skew_amplitude = 0.06;
  return generate_nodes(spec);
}

NodeCoordinates channel_nodes() {
  GridSpec spec;
  spec.generator = GridGenerator::channel;
  spec.cells_x = nx;
  spec.cells_y = ny;
  spec.length = 2.0;
  spec.height = 1.0;
  return generate_nodes(spec);
}

// Collective: the global ids of the boundary faces owned by every rank, concatenated.
std::vector<int> all_owned_ids(const std::vector<BoundaryFace>& owned) {
  int size = 0;
  MPI_Comm_size(MPI_COMM_WORLD, &size);
  std::vector<int> ids;
  for (const BoundaryFace& f : owned) ids.push_back(f.id);
  const int count = static_cast<int>(ids.size());
  std::vector<int> counts(static_cast<size_t>(size)), offsets(static_cast<size_t>(size), 0);
  MPI_Allgather(&count, 1, MPI_INT, counts.data(), 1, MPI_INT, MPI_COMM_WORLD);
  for (int r = 1; r < size; ++r) offsets[r] = offsets[r - 1] + counts[r - 1];
  std::vector<int> all(static_cast<size_t>(offsets.back() + counts.back()));
  MPI_Allgatherv(ids.data(), count, MPI_INT, all.data(), counts.data(), offsets.data(), MPI_INT,
                 MPI_COMM_WORLD);
  return all;
}

void expect_ids_cover_the_boundary_once(const NodeCoordinates& nodes, bool periodic, int expected_faces) {
  const Grid grid(MPI_COMM_WORLD, nodes, periodic);
  const std::vector<BoundaryFace> domain = domain_boundary_faces(nodes, periodic);
  ASSERT_EQ(domain.size(), static_cast<size_t>(expected_faces));
  for (size_t id = 0; id < domain.size(); ++id) EXPECT_EQ(domain[id].id, static_cast<int>(id));

  const std::vector<BoundaryFace> owned = owned_boundary_faces(grid, domain);
  for (size_t k = 1; k < owned.size(); ++k) EXPECT_LT(owned[k - 1].id, owned[k].id) << "not in id order";
  std::vector<int> ids = all_owned_ids(owned);
  std::sort(ids.begin(), ids.end());
  ASSERT_EQ(ids.size(), static_cast<size_t>(expected_faces)) << "a face is missing or owned twice";
  for (int id = 0; id < expected_faces; ++id) EXPECT_EQ(ids[id], id);

  // Every boundary face of the block, from its definition: the owner cell lies on the block edge
  // and the face is the cell side on that edge, so no face is listed twice.
  std::vector<int> per_cell(static_cast<size_t>(nx * ny), 0);
  for (const BoundaryFace& f : domain) {
    const bool on_edge = f.i == 0 || f.i == nx - 1 || f.j == 0 || f.j == ny - 1;
    EXPECT_TRUE(on_edge) << f.id;
    ++per_cell[static_cast<size_t>(f.j * nx + f.i)];
  }
  for (int j = 0; j < ny; ++j) {
    for (int i = 0; i < nx; ++i) {
      const int expected = (periodic ? 0 : (i == 0) + (i == nx - 1)) + (j == 0) + (j == ny - 1);
      EXPECT_EQ(per_cell[static_cast<size_t>(j * nx + i)], expected) << i << ", " << j;
    }
  }
}

// Divergence theorem: the outward area vectors of a closed cell sum to zero. For every owned
// fluid cell, its interior faces to fluid neighbours come from the grid and its boundary faces
// from `faces`; a missing, doubled or inward face shows.
void expect_cells_closed(const Grid& grid, const std::vector<BoundaryFace>& faces,
                         const std::function<bool(int, int)>& fluid) {
  const auto by_cell = boundary_faces_by_cell(grid, faces);
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      if (!fluid(i, j)) continue;
      Vec2 sum{0.0, 0.0};
      if (grid.has_east(i) && fluid(i + 1, j)) sum = sum + grid.east_face(i, j).area;
      if (grid.has_west(i) && fluid(i - 1, j)) sum = sum - grid.east_face(i - 1, j).area;
      if (grid.has_north(j) && fluid(i, j + 1)) sum = sum + grid.north_face(i, j).area;
      if (grid.has_south(j) && fluid(i, j - 1)) sum = sum - grid.north_face(i, j - 1).area;
      for (int slot : by_cell[grid.owned(i, j)]) {
        if (slot < 0) continue;
        const BoundaryFace& f = faces[slot];
        sum = sum + f.area;
        // The outward normal points away from the owner's centre.
        EXPECT_GT(dot(f.centre - grid.centre(i, j), f.area), 0.0) << i << ", " << j;
        if (f.has_second) {
          EXPECT_GT(dot(grid.centre(i, j) - grid.centre(f.i2, f.j2), f.area), 0.0);
        }
      }
      EXPECT_NEAR(sum.x, 0.0, 1e-14) << i << ", " << j;
      EXPECT_NEAR(sum.y, 0.0, 1e-14) << i << ", " << j;
    }
  }
}

}  // namespace

TEST(BoundaryFaces, UniqueGlobalIdsCoverEveryFaceOnceOnAnyRankCount) {
  expect_ids_cover_the_boundary_once(skewed_nodes(), false, 2 * (nx + ny));
}

TEST(BoundaryFaces, PeriodicSidesHaveNoFaces) {
  expect_ids_cover_the_boundary_once(channel_nodes(), true, 2 * nx);
}

TEST(BoundaryFaces, EachIdIsTheSameFaceOnOneRankAndOnAllRanks) {
  const NodeCoordinates nodes = skewed_nodes();
  const Grid world(MPI_COMM_WORLD, nodes, false);
  const Grid alone(MPI_COMM_SELF, nodes, false);
  const std::vector<BoundaryFace> domain = domain_boundary_faces(nodes, false);
  const std::vector<BoundaryFace> whole = owned_boundary_faces(alone, domain);
  ASSERT_EQ(whole.size(), domain.size());
  for (const BoundaryFace& f : owned_boundary_faces(world, domain)) {
    const BoundaryFace& g = whole[static_cast<size_t>(f.id)];
    EXPECT_EQ(f.i, g.i);
    EXPECT_EQ(f.j, g.j);
    EXPECT_EQ(f.centre.x, g.centre.x);
    EXPECT_EQ(f.centre.y, g.centre.y);
  }
}

TEST(BoundaryFaces, OutwardAreasCloseEveryOwnedCellWithItsInteriorFaces) {
  const NodeCoordinates nodes = skewed_nodes();
  const Grid grid(MPI_COMM_WORLD, nodes, false);
  const std::vector<BoundaryFace> faces = owned_boundary_faces(grid, domain_boundary_faces(nodes, false));
  expect_cells_closed(grid, faces, [](int, int) { return true; });
}

TEST(BoundaryFaces, EachFaceGetsTheSegmentThatCoversItsCentre) {
  CaseSpec spec;
  spec.grid.cells_x = nx;
  spec.grid.cells_y = ny;
  auto segment = [](Side side, BoundaryKind kind, std::optional<double> from, std::optional<double> to) {
    BoundarySegmentSpec s;
    s.side = side;
    s.kind = kind;
    s.from = from;
    s.to = to;
    return s;
  };
  spec.boundaries = {
      segment(Side::left, BoundaryKind::inflow, {}, {}), segment(Side::right, BoundaryKind::outflow, {}, {}),
      segment(Side::bottom, BoundaryKind::slip, {}, 0.6), segment(Side::bottom, BoundaryKind::wall, 0.6, {}),
      segment(Side::top, BoundaryKind::slip, {}, {})};
  const BoundaryMap map(spec, skewed_nodes());
  ASSERT_EQ(map.faces().size(), static_cast<size_t>(2 * (nx + ny)));
  for (const BoundaryFace& f : map.faces()) {
    const bool on_x_end = f.i == 0 || f.i == nx - 1;
    int expected = -1;
    if (f.id < ny)
      expected = 0;  // left, j = 0..ny-1
    else if (f.id < 2 * ny)
      expected = 1;
    else if (f.id < 2 * ny + nx)
      expected = f.centre.x < 0.6 ? 2 : 3;
    else
      expected = 4;
    EXPECT_EQ(f.segment, expected) << f.id;
    EXPECT_EQ(&map.spec(f), &map.segments()[static_cast<size_t>(expected)]);
    if (expected <= 1) {
      EXPECT_TRUE(on_x_end) << f.id;
    }
  }
  EXPECT_TRUE(map.has_wall());
}

namespace {

// The skewed box with a bump on the bottom side (cells i 3..5, j 0..2) and an island (cell column
// i = 7, j 3..4) of solid cells; every side a wall unless `left` says otherwise.
CaseSpec solid_case(BoundaryKind left = BoundaryKind::wall) {
  CaseSpec spec;
  spec.source_file = "bump.yaml";
  spec.grid.cells_x = nx;
  spec.grid.cells_y = ny;
  for (Side side : {Side::left, Side::right, Side::bottom, Side::top}) {
    BoundarySegmentSpec segment;
    segment.side = side;
    segment.kind = side == Side::left ? left : BoundaryKind::wall;
    segment.line = 10 + static_cast<int>(spec.boundaries.size());
    spec.boundaries.push_back(segment);
  }
  SolidRegionSpec bump, island;
  bump.i = std::array{3, 5};
  bump.j = std::array{0, 2};
  bump.line = 20;
  island.i = std::array{7, 7};
  island.j = std::array{3, 4};
  island.line = 21;
  spec.solid_regions = {bump, island};
  return spec;
}

}  // namespace

TEST(BoundaryFaces, SolidCellsAddWallFacesAfterTheSidesAndDropTheirOwnSideFaces) {
  const CaseSpec spec = solid_case();
  const NodeCoordinates nodes = skewed_nodes();
  const BoundaryMap map(spec, nodes);
  const SolidCells& solid = map.solid();
  // Sides: left 6, right 6, bottom 9 - 3 (under the bump), top 9. Next to solid cells: the bump's
  // west, east and top faces (3 + 3 + 3) and the island's (2 + 2 + 1 + 1).
  const int n_sides = 27, n_solid = 15;
  ASSERT_EQ(map.faces().size(), static_cast<size_t>(n_sides + n_solid));
  ASSERT_EQ(map.segments().size(), spec.boundaries.size() + 1);
  const BoundarySegmentSpec& solid_wall = map.segments().back();
  EXPECT_EQ(solid_wall.kind, BoundaryKind::wall);
  EXPECT_EQ(solid_wall.line, 20);
  for (const BoundaryFace& f : map.faces()) {
    EXPECT_EQ(f.id, &f - map.faces().data());
    EXPECT_FALSE(solid.is_solid(f.i, f.j)) << "face " << f.id << " of a solid cell";
    EXPECT_EQ(f.on_solid, f.id >= n_sides) << f.id;
    if (f.on_solid) {
      EXPECT_EQ(&map.spec(f), &solid_wall) << f.id;
    }
    if (f.has_second) {
      EXPECT_FALSE(solid.is_solid(f.i2, f.j2)) << f.id;
    }
    // The owner's neighbour across the face is solid (or absent, for side faces).
    const int di = f.side == Side::left ? -1 : f.side == Side::right ? 1 : 0;
    const int dj = f.side == Side::bottom ? -1 : f.side == Side::top ? 1 : 0;
    const int ni = f.i + di, nj = f.j + dj;
    const bool outside = ni < 0 || ni >= nx || nj < 0 || nj >= ny;
    EXPECT_EQ(outside, !f.on_solid) << f.id;
    if (!outside) {
      EXPECT_TRUE(solid.is_solid(ni, nj)) << f.id;
    }
  }
  // Cell (7, 5) sits on the island: its top (side) face has a solid second cell, its bottom face
  // (on the island) none above j = 5; neither has a second cell.
  for (const BoundaryFace& f : map.faces()) {
    if (f.i == 7 && f.j == 5) {
      EXPECT_FALSE(f.has_second) << f.id;
    }
  }
  EXPECT_TRUE(map.has_wall());
}

TEST(BoundaryFaces, FacesNextToSolidCellsCloseEveryFluidCellOnAnyRankCount) {
  const NodeCoordinates nodes = skewed_nodes();
  const BoundaryMap map(solid_case(), nodes);
  const Grid grid(MPI_COMM_WORLD, nodes, false);
  const std::vector<BoundaryFace> faces = owned_boundary_faces(grid, map.faces());
  std::vector<int> ids = all_owned_ids(faces);
  std::sort(ids.begin(), ids.end());
  ASSERT_EQ(ids.size(), map.faces().size()) << "a face is missing or owned twice";
  for (size_t id = 0; id < ids.size(); ++id) EXPECT_EQ(ids[id], static_cast<int>(id));
  expect_cells_closed(grid, faces, [&](int i, int j) { return !map.solid().is_solid(i, j); });
}

TEST(BoundaryFaces, SideFacesOfSolidCellsNeedNoSegmentButMustNotLetFlowIn) {
  CaseSpec spec = solid_case();
  // The bottom segments leave the faces under the bump (x about 0.6 to 1.2) uncovered.
  spec.boundaries[2].to = 0.55;
  BoundarySegmentSpec right_part = spec.boundaries[2];
  right_part.from = 1.25;
  right_part.to.reset();
  spec.boundaries.push_back(right_part);
  EXPECT_NO_THROW(BoundaryMap(spec, skewed_nodes()));

  // A solid cell at an inflow face.
  spec = solid_case(BoundaryKind::inflow);
  spec.solid_regions[0].i = std::array{0, 5};
  try {
    BoundaryMap map(spec, skewed_nodes());
    ADD_FAILURE() << "a solid cell at an inflow face was accepted";
  } catch (const InputError& e) {
    const std::string message = e.what();
    EXPECT_EQ(message.rfind("bump.yaml:20: key 'solid_regions[0]': expected no solid cell at a face of an "
                            "inflow segment, got cell (0, 0) at the face of boundaries[0] (line 10)",
                            0),
              0u)
        << message;
  }
}
