// The flat list of boundary faces: unique global ids covering every boundary face exactly once on
// any rank count, the same face behind each id on 1 and on all ranks, closed cells with the
// interior faces, and the segment of each face.
#include <gtest/gtest.h>
#include <mpi.h>

#include <algorithm>
#include <vector>

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
  // Divergence theorem: the outward area vectors of a closed cell sum to zero. The interior faces
  // come from the grid, the boundary faces from the list; a missing, doubled or inward face shows.
  const NodeCoordinates nodes = skewed_nodes();
  const Grid grid(MPI_COMM_WORLD, nodes, false);
  const std::vector<BoundaryFace> faces = owned_boundary_faces(grid, domain_boundary_faces(nodes, false));
  const auto by_cell = boundary_faces_by_cell(grid, faces);
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      Vec2 sum{0.0, 0.0};
      if (grid.has_east(i)) sum = sum + grid.east_face(i, j).area;
      if (grid.has_west(i)) sum = sum - grid.east_face(i - 1, j).area;
      if (grid.has_north(j)) sum = sum + grid.north_face(i, j).area;
      if (grid.has_south(j)) sum = sum - grid.north_face(i, j - 1).area;
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
