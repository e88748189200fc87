// CGNS (mid-level library) reading and writing of one 2-D structured zone with its BC_t patches.
#include "cgns_grid.hpp"

#include <cgnslib.h>

#include <algorithm>
#include <array>
#include <filesystem>
#include <utility>
#include <vector>

#include "core/error.hpp"

namespace wallrans {

namespace {

namespace fs = std::filesystem;

// Our kind names and the CGNS BCType written for each; on reading, the first entry of a kind is
// the type written and the others are read as that kind too.
const std::array<std::pair<CGNS_ENUMT(BCType_t), const char*>, 15> bc_kinds{{
    {CGNS_ENUMV(BCWall), "wall"},
    {CGNS_ENUMV(BCInflow), "inflow"},
    {CGNS_ENUMV(BCOutflow), "outflow"},
    {CGNS_ENUMV(BCSymmetryPlane), "slip"},
    {CGNS_ENUMV(BCFarfield), "opening"},
    {CGNS_ENUMV(BCWallViscous), "wall"},
    {CGNS_ENUMV(BCWallViscousHeatFlux), "wall"},
    {CGNS_ENUMV(BCWallViscousIsothermal), "wall"},
    {CGNS_ENUMV(BCInflowSubsonic), "inflow"},
    {CGNS_ENUMV(BCInflowSupersonic), "inflow"},
    {CGNS_ENUMV(BCTunnelInflow), "inflow"},
    {CGNS_ENUMV(BCOutflowSubsonic), "outflow"},
    {CGNS_ENUMV(BCOutflowSupersonic), "outflow"},
    {CGNS_ENUMV(BCTunnelOutflow), "outflow"},
    {CGNS_ENUMV(BCWallInviscid), "slip"},
}};

std::string kind_of(CGNS_ENUMT(BCType_t) type) {
  for (const auto& [bc, kind] : bc_kinds) {
    if (bc == type) return kind;
  }
  return "";
}

CGNS_ENUMT(BCType_t) type_of(const std::string& kind) {
  for (const auto& [bc, name] : bc_kinds) {
    if (kind == name) return bc;
  }
  return CGNS_ENUMV(BCTypeUserDefined);
}

// Owner of an open CGNS file; closed on destruction (errors ignored there).
class CgnsFile {
 public:
  CgnsFile(const std::string& path, int mode) : is_open_(cg_open(path.c_str(), mode, &index_) == CG_OK) {}
  CgnsFile(const CgnsFile&) = delete;
  CgnsFile& operator=(const CgnsFile&) = delete;
  ~CgnsFile() {
    if (is_open_) (void)cg_close(index_);
  }
  bool is_open() const { return is_open_; }
  int index() const { return index_; }
  /// Closes now; false if the library reports a failure (the data may not be on disk).
  bool close() {
    is_open_ = false;
    return cg_close(index_) == CG_OK;
  }

 private:
  int index_ = -1;
  bool is_open_ = false;
};

// Throws Error if a CGNS call failed; the message names the call and the library's text.
void check_cgns(int code, const char* call) {
  if (code != CG_OK) throw Error(std::string("CGNS error in ") + call + ": " + cg_get_error());
}

// Local. The vertex range (1-based, i fastest) of a BC and the patch it describes, or an
// InputError naming the BC.
GridPatch patch_from_range(const std::string& label, const cgsize_t range[4], cgsize_t ni, cgsize_t nj) {
  const cgsize_t i0 = std::min(range[0], range[2]), i1 = std::max(range[0], range[2]);
  const cgsize_t j0 = std::min(range[1], range[3]), j1 = std::max(range[1], range[3]);
  GridPatch patch;
  const bool inside = i0 >= 1 && i1 <= ni && j0 >= 1 && j1 <= nj;
  if (inside && j0 == j1 && i1 > i0 && (j0 == 1 || j0 == nj)) {
    patch.side = j0 == 1 ? Side::bottom : Side::top;
    patch.first_face = static_cast<int>(i0) - 1;
    patch.last_face = static_cast<int>(i1) - 2;
  } else if (inside && i0 == i1 && j1 > j0 && (i0 == 1 || i0 == ni)) {
    patch.side = i0 == 1 ? Side::left : Side::right;
    patch.first_face = static_cast<int>(j0) - 1;
    patch.last_face = static_cast<int>(j1) - 2;
  } else {
    throw InputError(label + ": expected a vertex range along one side of the " + std::to_string(ni) + " x " +
                     std::to_string(nj) + " zone, got (" + std::to_string(range[0]) + ", " +
                     std::to_string(range[1]) + ") to (" + std::to_string(range[2]) + ", " +
                     std::to_string(range[3]) + ")");
  }
  return patch;
}

std::vector<GridPatch> read_patches(int file, const std::string& zone_label, cgsize_t ni, cgsize_t nj) {
  int n_bcs = 0;
  check_cgns(cg_nbocos(file, 1, 1, &n_bcs), "cg_nbocos");
  std::vector<GridPatch> patches;
  for (int bc = 1; bc <= n_bcs; ++bc) {
    char name[64] = {};
    CGNS_ENUMT(BCType_t) type;
    CGNS_ENUMT(PointSetType_t) point_set;
    cgsize_t n_points = 0, normal_list_size = 0;
    int normal_index[3] = {};
    CGNS_ENUMT(DataType_t) normal_type;
    int n_datasets = 0;
    check_cgns(cg_boco_info(file, 1, 1, bc, name, &type, &point_set, &n_points, normal_index,
                            &normal_list_size, &normal_type, &n_datasets),
               "cg_boco_info");
    const std::string label = zone_label + ": BC '" + name + "'";
    if (point_set != CGNS_ENUMV(PointRange) || n_points != 2) {
      throw InputError(label + ": expected a PointRange of 2 points, got " + cg_PointSetTypeName(point_set) +
                       " of " + std::to_string(n_points) + " points");
    }
    CGNS_ENUMT(GridLocation_t) location;
    check_cgns(cg_boco_gridlocation_read(file, 1, 1, bc, &location), "cg_boco_gridlocation_read");
    if (location != CGNS_ENUMV(Vertex)) {
      throw InputError(label + ": expected GridLocation Vertex, got " + cg_GridLocationName(location));
    }
    cgsize_t range[4] = {};
    // Normals, if any, are not needed: the side and range fix the faces.
    std::vector<double> normals(static_cast<size_t>(std::max<cgsize_t>(normal_list_size, 0)) * 2 + 1);
    check_cgns(cg_boco_read(file, 1, 1, bc, range, normals.data()), "cg_boco_read");
    GridPatch patch = patch_from_range(label, range, ni, nj);
    patch.name = name;
    patch.kind = kind_of(type);
    check_patch(patch, static_cast<int>(ni) - 1, static_cast<int>(nj) - 1, label);
    patches.push_back(patch);
  }
  return patches;
}

std::vector<double> read_coordinate(int file, const char* name, cgsize_t ni, cgsize_t nj) {
  const cgsize_t first[2] = {1, 1}, last[2] = {ni, nj};
  std::vector<double> values(static_cast<size_t>(ni) * static_cast<size_t>(nj));
  check_cgns(cg_coord_read(file, 1, 1, name, CGNS_ENUMV(RealDouble), first, last, values.data()),
             "cg_coord_read");
  return values;
}

}  // namespace

GridFileContent read_cgns_grid(const std::string& path) {
  const std::string expected = path + ": expected a readable CGNS file, got ";
  std::error_code error;
  const fs::file_status status = fs::status(path, error);
  if (status.type() == fs::file_type::not_found) throw InputError(expected + "no such file");
  if (!fs::is_regular_file(status)) throw InputError(expected + "something that is not a regular file");
  const CgnsFile file(path, CG_MODE_READ);
  if (!file.is_open())
    throw InputError(expected + "a file the CGNS library cannot open (" + cg_get_error() + ")");
  const int fn = file.index();

  int n_bases = 0;
  check_cgns(cg_nbases(fn, &n_bases), "cg_nbases");
  if (n_bases != 1) throw InputError(path + ": expected one CGNS base, got " + std::to_string(n_bases));
  char base_name[64] = {};
  int cell_dim = 0, physical_dim = 0;
  check_cgns(cg_base_read(fn, 1, base_name, &cell_dim, &physical_dim), "cg_base_read");
  const std::string base_label = path + ": base '" + base_name + "'";
  if (cell_dim != 2) {
    throw InputError(base_label + ": expected a 2-D structured zone (cell dimension 2), got cell dimension " +
                     std::to_string(cell_dim));
  }
  int n_zones = 0;
  check_cgns(cg_nzones(fn, 1, &n_zones), "cg_nzones");
  if (n_zones != 1) throw InputError(base_label + ": expected a single zone, got " + std::to_string(n_zones));
  CGNS_ENUMT(ZoneType_t) zone_type;
  check_cgns(cg_zone_type(fn, 1, 1, &zone_type), "cg_zone_type");
  char zone_name[64] = {};
  cgsize_t size[9] = {};
  check_cgns(cg_zone_read(fn, 1, 1, zone_name, size), "cg_zone_read");
  const std::string zone_label = path + ": zone '" + zone_name + "'";
  if (zone_type != CGNS_ENUMV(Structured)) {
    throw InputError(zone_label + ": expected a 2-D structured zone, got an " + cg_ZoneTypeName(zone_type) +
                     " zone");
  }
  const cgsize_t ni = size[0], nj = size[1];
  if (ni < 2 || nj < 2) {
    throw InputError(zone_label + ": expected at least 2 x 2 vertices, got " + std::to_string(ni) + " x " +
                     std::to_string(nj));
  }

  int n_coordinates = 0;
  check_cgns(cg_ncoords(fn, 1, 1, &n_coordinates), "cg_ncoords");
  std::vector<std::string> names;
  for (int c = 1; c <= n_coordinates; ++c) {
    CGNS_ENUMT(DataType_t) type;
    char name[64] = {};
    check_cgns(cg_coord_info(fn, 1, 1, c, &type, name), "cg_coord_info");
    names.emplace_back(name);
  }
  auto has = [&names](const char* name) {
    return std::find(names.begin(), names.end(), name) != names.end();
  };
  if (!has("CoordinateX") || !has("CoordinateY")) {
    std::string found;
    for (const auto& name : names) found += (found.empty() ? "" : ", ") + name;
    throw InputError(zone_label + ": expected coordinates CoordinateX and CoordinateY, got " +
                     (found.empty() ? std::string("none") : found));
  }
  if (has("CoordinateZ")) {
    const auto z = read_coordinate(fn, "CoordinateZ", ni, nj);
    const auto [low, high] = std::minmax_element(z.begin(), z.end());
    if (*low != *high) {
      throw InputError(zone_label + ": expected a plane grid (CoordinateZ constant), got z from " +
                       std::to_string(*low) + " to " + std::to_string(*high));
    }
  }
  GridFileContent content;
  content.nodes.cells_x = static_cast<int>(ni) - 1;
  content.nodes.cells_y = static_cast<int>(nj) - 1;
  // CGNS stores structured arrays with i varying fastest, as our node order does.
  const auto x = read_coordinate(fn, "CoordinateX", ni, nj);
  const auto y = read_coordinate(fn, "CoordinateY", ni, nj);
  content.nodes.nodes.resize(x.size());
  for (size_t k = 0; k < x.size(); ++k) content.nodes.nodes[k] = {x[k], y[k]};
  content.patches = read_patches(fn, zone_label, ni, nj);
  check_content(content, path);
  return content;
}

void write_cgns_grid(const std::string& path, const GridFileContent& content) {
  check_content(content, path);
  const NodeCoordinates& nodes = content.nodes;
  const cgsize_t ni = nodes.cells_x + 1, nj = nodes.cells_y + 1;
  const std::string temporary = path + ".tmp";
  std::error_code ignored;
  try {
    CgnsFile file(temporary, CG_MODE_WRITE);
    if (!file.is_open()) {
      throw InputError(path + ": expected a location where the CGNS file can be written, got " +
                       cg_get_error());
    }
    const int fn = file.index();
    int base = 0, zone = 0, coordinate = 0;
    check_cgns(cg_base_write(fn, "wallrans", 2, 2, &base), "cg_base_write");
    // Coordinates are dimensional, in SI units (metres), as everywhere in wallrans.
    check_cgns(cg_goto(fn, base, "end"), "cg_goto");
    check_cgns(cg_dataclass_write(CGNS_ENUMV(Dimensional)), "cg_dataclass_write");
    check_cgns(cg_units_write(CGNS_ENUMV(Kilogram), CGNS_ENUMV(Meter), CGNS_ENUMV(Second), CGNS_ENUMV(Kelvin),
                              CGNS_ENUMV(Radian)),
               "cg_units_write");
    const cgsize_t size[6] = {ni, nj, ni - 1, nj - 1, 0, 0};
    check_cgns(cg_zone_write(fn, base, "block", size, CGNS_ENUMV(Structured), &zone), "cg_zone_write");
    std::vector<double> x, y;
    for (const Vec2& p : nodes.nodes) {
      x.push_back(p.x);
      y.push_back(p.y);
    }
    for (const auto& [name, values] : {std::pair{"CoordinateX", &x}, std::pair{"CoordinateY", &y}}) {
      check_cgns(cg_coord_write(fn, base, zone, CGNS_ENUMV(RealDouble), name, values->data(), &coordinate),
                 "cg_coord_write");
      // A length: exponent 1 of the length unit, 0 of mass, time, temperature and angle.
      const double exponents[5] = {0.0, 1.0, 0.0, 0.0, 0.0};
      check_cgns(cg_goto(fn, base, "Zone_t", zone, "GridCoordinates_t", 1, "DataArray_t", coordinate, "end"),
                 "cg_goto");
      check_cgns(cg_exponents_write(CGNS_ENUMV(RealDouble), exponents), "cg_exponents_write");
    }
    for (const GridPatch& patch : content.patches) {
      const cgsize_t first = patch.first_face + 1, last = patch.last_face + 2;
      cgsize_t range[4] = {};
      switch (patch.side) {
        case Side::bottom:
        case Side::top:
          range[0] = first, range[2] = last;
          range[1] = range[3] = patch.side == Side::bottom ? 1 : nj;
          break;
        case Side::left:
        case Side::right:
          range[1] = first, range[3] = last;
          range[0] = range[2] = patch.side == Side::left ? 1 : ni;
          break;
      }
      int bc = 0;
      check_cgns(cg_boco_write(fn, base, zone, patch.name.c_str(), type_of(patch.kind),
                               CGNS_ENUMV(PointRange), 2, range, &bc),
                 "cg_boco_write");
    }
    if (!file.close()) throw Error("CGNS error in cg_close: " + std::string(cg_get_error()));
    fs::rename(temporary, path, ignored);
    if (ignored) {
      throw InputError(path +
                       ": expected a location where the CGNS file can be written, got rename failure (" +
                       ignored.message() + ")");
    }
  } catch (...) {
    fs::remove(temporary, ignored);
    throw;
  }
}

}  // namespace wallrans
