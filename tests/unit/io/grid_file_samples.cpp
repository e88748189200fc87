// The sample grid and the bad grid files: each bad file starts from a good one written by the
// layout code and is then damaged with plain HDF5 calls.
#include "grid_file_samples.hpp"

#include <cmath>
#include <fstream>
#include <limits>
#include <stdexcept>

#include "io/grid_file_format.hpp"
#include "io/hdf5_attributes.hpp"
#include "io/hdf5_handles.hpp"

namespace wallrans::test_support {

namespace {

void check(bool ok, const char* what) {
  if (!ok) throw std::runtime_error(std::string("grid_file_samples: ") + what + " failed");
}

// Opens a written file for changes.
Hdf5File open_rw(const std::string& path) {
  Hdf5File file(H5Fopen(path.c_str(), H5F_ACC_RDWR, H5P_DEFAULT));
  check(bool(file), "H5Fopen");
  return file;
}

// Replaces dataset `name` by one of `dims` values of `type` (all equal to 1).
void replace_dataset(const std::string& path, const char* name, const std::vector<hsize_t>& dims,
                     hid_t type) {
  const Hdf5File file = open_rw(path);
  check(H5Ldelete(file.get(), name, H5P_DEFAULT) >= 0, "H5Ldelete");
  const Hdf5Space space(H5Screate_simple(static_cast<int>(dims.size()), dims.data(), nullptr));
  const Hdf5Dataset dataset(
      H5Dcreate2(file.get(), name, type, space.get(), H5P_DEFAULT, H5P_DEFAULT, H5P_DEFAULT));
  check(bool(dataset), "H5Dcreate2");
  size_t n = 1;
  for (const hsize_t d : dims) n *= d;
  const std::vector<int> ones(n, 1);
  check(H5Dwrite(dataset.get(), H5T_NATIVE_INT, H5S_ALL, H5S_ALL, H5P_DEFAULT, ones.data()) >= 0, "H5Dwrite");
}

void replace_root_attribute(const std::string& path, const char* name, const std::string* text, int number) {
  const Hdf5File file = open_rw(path);
  check(H5Adelete(file.get(), name) >= 0, "H5Adelete");
  if (text) {
    write_string_attribute(file.get(), name, *text);
  } else {
    write_int_attribute(file.get(), name, number);
  }
}

// A good file of `content`, then `damage` applied to it.
std::function<void(const std::string&)> good_then(GridFileContent content,
                                                  std::function<void(const std::string&)> damage = {}) {
  return [content, damage](const std::string& path) {
    grid_file_format::write_file(path, content);
    if (damage) damage(path);
  };
}

}  // namespace

GridFileContent sample_grid() {
  GridFileContent content;
  NodeCoordinates& nodes = content.nodes;
  nodes.cells_x = 6;
  nodes.cells_y = 4;
  nodes.nodes.resize(7 * 5);
  for (int j = 0; j <= 4; ++j) {
    for (int i = 0; i <= 6; ++i) {
      const double x = 0.5 * i, eta = 0.25 * j;
      // A bump on the bottom wall that fades out towards the top: curved j lines.
      const double bottom = 0.2 * std::sin(3.14159265358979 * i / 6.0);
      nodes.at(i, j) = {x + 0.03 * eta * i, bottom * (1.0 - eta) + 1.3 * eta * eta + 0.7 * eta * (1 - eta)};
    }
  }
  content.patches = {{"inlet", Side::left, 0, 3, "inflow"},
                     {"outlet", Side::right, 0, 3, "outflow"},
                     {"floor_a", Side::bottom, 0, 2, "wall"},
                     {"floor_b", Side::bottom, 3, 5, ""},
                     {"lid", Side::top, 0, 5, "slip"}};
  return content;
}

std::vector<BadGridFile> bad_grid_files() {
  const GridFileContent good = sample_grid();
  std::vector<BadGridFile> cases;
  cases.push_back({"missing_file", [](const std::string&) {}, {"wallrans grid file", "no such file"}});
  cases.push_back({"not_hdf5",
                   [](const std::string& path) { std::ofstream(path) << "x y\n0 0\n1 0\n"; },
                   {"wallrans grid file", "not HDF5"}});
  cases.push_back({"no_format_attribute",
                   good_then(good,
                             [](const std::string& path) {
                               const Hdf5File file = open_rw(path);
                               check(H5Adelete(file.get(), "format") >= 0, "H5Adelete");
                             }),
                   {"without attribute 'format'"}});
  const std::string other_marker = "wallrans-checkpoint";
  cases.push_back({"wrong_marker",
                   good_then(good,
                             [other_marker](const std::string& path) {
                               replace_root_attribute(path, "format", &other_marker, 0);
                             }),
                   {"'wallrans-checkpoint'"}});
  cases.push_back(
      {"wrong_version",
       good_then(good,
                 [](const std::string& path) { replace_root_attribute(path, "format_version", nullptr, 7); }),
       {"attribute 'format_version'", "expected 1, got 7"}});
  cases.push_back({"missing_y",
                   good_then(good,
                             [](const std::string& path) {
                               const Hdf5File file = open_rw(path);
                               check(H5Ldelete(file.get(), "/grid/y", H5P_DEFAULT) >= 0, "H5Ldelete");
                             }),
                   {"'/grid/y'", "no such dataset"}});
  cases.push_back({"mismatched_dimensions",
                   good_then(good,
                             [](const std::string& path) {
                               replace_dataset(path, "/grid/y", {5, 6}, H5T_IEEE_F64LE);
                             }),
                   {"'/grid/y'", "dimensions of '/grid/x' (5 x 7)", "got 5 x 6"}});
  cases.push_back(
      {"one_dimensional",
       good_then(good,
                 [](const std::string& path) { replace_dataset(path, "/grid/x", {35}, H5T_IEEE_F64LE); }),
       {"'/grid/x'", "1 dimension(s)"}});
  cases.push_back({"single_node_row",
                   good_then(good,
                             [](const std::string& path) {
                               replace_dataset(path, "/grid/x", {1, 7}, H5T_IEEE_F64LE);
                               replace_dataset(path, "/grid/y", {1, 7}, H5T_IEEE_F64LE);
                             }),
                   {"at least 2 x 2 nodes", "got 1 x 7"}});
  cases.push_back({"integer_coordinates",
                   good_then(good,
                             [](const std::string& path) {
                               replace_dataset(path, "/grid/x", {5, 7}, H5T_STD_I32LE);
                             }),
                   {"'/grid/x'", "an integer"}});
  {
    GridFileContent nan = good;
    nan.nodes.at(3, 2).x = std::numeric_limits<double>::quiet_NaN();
    // The writer refuses non-finite coordinates, so the value is put in afterwards.
    cases.push_back({"non_finite_coordinate",
                     good_then(good,
                               [nan](const std::string& path) {
                                 const Hdf5File file = open_rw(path);
                                 const Hdf5Dataset x(H5Dopen2(file.get(), "/grid/x", H5P_DEFAULT));
                                 std::vector<double> values;
                                 for (const Vec2& p : nan.nodes.nodes) values.push_back(p.x);
                                 check(H5Dwrite(x.get(), H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT,
                                                values.data()) >= 0,
                                       "H5Dwrite");
                               }),
                     {"node (3, 2)", "finite coordinates"}});
  }
  const std::string front = "front";
  cases.push_back({"bad_patch_side",
                   good_then(good,
                             [front](const std::string& path) {
                               const Hdf5File file = open_rw(path);
                               const Hdf5Group lid(H5Gopen2(file.get(), "/patches/lid", H5P_DEFAULT));
                               check(H5Adelete(lid.get(), "side") >= 0, "H5Adelete");
                               write_string_attribute(lid.get(), "side", front);
                             }),
                   {"patch 'lid'", "attribute 'side'", "'front'"}});
  cases.push_back({"patch_beyond_side",
                   good_then(good,
                             [](const std::string& path) {
                               const Hdf5File file = open_rw(path);
                               const Hdf5Group inlet(H5Gopen2(file.get(), "/patches/inlet", H5P_DEFAULT));
                               check(H5Adelete(inlet.get(), "last_face") >= 0, "H5Adelete");
                               write_int_attribute(inlet.get(), "last_face", 4);
                             }),
                   {"patch 'inlet'", "last_face <= 3", "got [0, 4]"}});
  {
    GridFileContent collapsed = good;
    collapsed.nodes.at(3, 1) = collapsed.nodes.at(4, 1);
    collapsed.nodes.at(3, 2) = collapsed.nodes.at(4, 2);  // cell (3, 1) has four corners on one line
    cases.push_back({"zero_area_cell", good_then(collapsed), {"cell (3, 1)", "non-zero area", "got area 0"}});
  }
  {
    GridFileContent folded = good;
    std::swap(folded.nodes.at(2, 2), folded.nodes.at(2, 3));  // cell (2, 2) turns over
    cases.push_back({"folded_cell", good_then(folded), {"cell (2, 2)", "folded"}});
  }
  return cases;
}

}  // namespace wallrans::test_support
