// Marks the cells of the solid regions and checks that the fluid left is one connected region.
#include "grid/solid_cells.hpp"

#include <algorithm>
#include <array>
#include <cstdio>
#include <optional>
#include <string>

#include "core/error.hpp"

namespace wallrans {

namespace {

std::string number(double x) {
  char text[32];
  std::snprintf(text, sizeof text, "%.6g", x);
  return text;
}

bool in_range(const std::optional<std::array<int, 2>>& range, int value) {
  return !range || ((*range)[0] <= value && value <= (*range)[1]);
}

bool in_range(const std::optional<std::array<double, 2>>& range, double value) {
  return !range || ((*range)[0] <= value && value <= (*range)[1]);
}

}  // namespace

std::string case_location(const CaseSpec& spec, int line) {
  const std::string file = spec.source_file.empty() ? std::string("case") : spec.source_file;
  return line > 0 ? file + ":" + std::to_string(line) : file;
}

SolidCells::SolidCells(const CaseSpec& spec, const NodeCoordinates& nodes)
    : cells_x_(nodes.cells_x), cells_y_(nodes.cells_y) {
  if (spec.solid_regions.empty()) return;
  const int nx = cells_x_, ny = cells_y_;
  region_.assign(static_cast<size_t>(nx) * ny, -1);
  Vec2 low = nodes.at(0, 0), high = low;
  for (const Vec2& p : nodes.nodes) {
    low = {std::min(low.x, p.x), std::min(low.y, p.y)};
    high = {std::max(high.x, p.x), std::max(high.y, p.y)};
  }
  for (size_t r = 0; r < spec.solid_regions.size(); ++r) {
    const SolidRegionSpec& solid = spec.solid_regions[r];
    // Index ranges were checked against the case's cell counts, except on grids from files.
    auto check_range = [&](const std::optional<std::array<int, 2>>& range, int cells, const char* key) {
      if (range && (*range)[1] >= cells)
        throw InputError(case_location(spec, solid.line) + ": key 'solid_regions[" + std::to_string(r) + "]." +
                         key + "': expected 2 integers [first, last] with 0 <= first <= last < " +
                         std::to_string(cells) + " (cells of the grid file), got [" + std::to_string((*range)[0]) +
                         ", " + std::to_string((*range)[1]) + "]");
    };
    check_range(solid.i, nx, "i");
    check_range(solid.j, ny, "j");
    int taken = 0;
    for (int j = 0; j < ny; ++j) {
      for (int i = 0; i < nx; ++i) {
        const Vec2 centre =
            0.25 * (nodes.at(i, j) + nodes.at(i + 1, j) + nodes.at(i + 1, j + 1) + nodes.at(i, j + 1));
        if (!in_range(solid.i, i) || !in_range(solid.j, j) || !in_range(solid.x, centre.x) ||
            !in_range(solid.y, centre.y))
          continue;
        ++taken;
        int& owner = region_[static_cast<size_t>(j) * nx + i];
        if (owner < 0) {
          owner = static_cast<int>(r);
          ++n_solid_;
        }
      }
    }
    if (taken == 0) {
      throw InputError(case_location(spec, solid.line) + ": key 'solid_regions[" + std::to_string(r) +
                       "]': expected a region holding at least one cell centre (the grid spans x " +
                       number(low.x) + " to " + number(high.x) + ", y " + number(low.y) + " to " +
                       number(high.y) + "), got none");
    }
  }
  const int first_line = spec.solid_regions.front().line;
  if (n_solid_ == nx * ny) {
    throw InputError(case_location(spec, first_line) +
                     ": key 'solid_regions': expected at least one fluid cell, got all " +
                     std::to_string(nx * ny) + " cells solid");
  }
  // The fluid must be one region connected through faces: a detached pocket has no pressure level
  // (its block of the pressure-correction matrix is singular) and no flow.
  const bool periodic = spec.periodic.axis == PeriodicAxis::x;
  std::vector<unsigned char> reached(region_.size(), 0);
  std::vector<int> stack;
  int seed = 0;
  while (region_[static_cast<size_t>(seed)] >= 0) ++seed;
  stack.push_back(seed);
  reached[static_cast<size_t>(seed)] = 1;
  int n_reached = 1;
  while (!stack.empty()) {
    const int cell = stack.back();
    stack.pop_back();
    const int i = cell % nx, j = cell / nx;
    auto visit = [&](int ni, int nj) {
      if (periodic) ni = (ni + nx) % nx;
      if (ni < 0 || ni >= nx || nj < 0 || nj >= ny) return;
      const size_t n = static_cast<size_t>(nj) * nx + ni;
      if (reached[n] || region_[n] >= 0) return;
      reached[n] = 1;
      ++n_reached;
      stack.push_back(static_cast<int>(n));
    };
    visit(i + 1, j);
    visit(i - 1, j);
    visit(i, j + 1);
    visit(i, j - 1);
  }
  if (n_reached + n_solid_ < nx * ny) {
    size_t cut = 0;
    while (reached[cut] || region_[cut] >= 0) ++cut;
    throw InputError(case_location(spec, first_line) +
                     ": key 'solid_regions': expected the fluid cells to form one region connected "
                     "through faces, got fluid cell (" +
                     std::to_string(cut % static_cast<size_t>(nx)) + ", " +
                     std::to_string(cut / static_cast<size_t>(nx)) + ") cut off from cell (" +
                     std::to_string(seed % nx) + ", " + std::to_string(seed / nx) + ")");
  }
}

std::vector<unsigned char> SolidCells::ghosted_mask(const Grid& grid) const {
  if (!any()) return {};
  std::vector<unsigned char> mask(grid.n_ghosted(), 0);
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j) {
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i) {
      const int wrapped = (i + cells_x_) % cells_x_;  // periodic ghosts at -1 and cells_x
      mask[grid.local(i, j)] = is_solid(wrapped, j) ? 1 : 0;
    }
  }
  return mask;
}

}  // namespace wallrans
