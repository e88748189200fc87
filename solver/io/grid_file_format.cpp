// The grid-file layout with the serial driver: structure checks, whole-file reading and writing
// (the file is assembled in memory and published under its name in one step).
#include "io/grid_file_format.hpp"

#include <climits>

#include "core/atomic_file.hpp"
#include "core/error.hpp"
#include "io/hdf5_attributes.hpp"
#include "io/text_excerpt.hpp"

namespace wallrans::grid_file_format {

namespace layout = grid_file_layout;

namespace {

constexpr const char* format_attribute = "format";
constexpr const char* version_attribute = "format_version";

std::string dims_text(const std::vector<hsize_t>& dims) {
  std::string text;
  for (size_t k = 0; k < dims.size(); ++k) text += (k ? " x " : "") + std::to_string(dims[k]);
  return text;
}

// Local. Dimensions of the coordinate dataset `name` after checking that it is a 2-D dataset of
// floating-point values; InputError names the file and the dataset otherwise.
std::vector<hsize_t> coordinate_dims(hid_t file, const std::string& path, const std::string& name) {
  const std::string expected = path + ": dataset '" + name +
                               "': expected node coordinates (a 2-D floating-point dataset, nodes_y x "
                               "nodes_x), got ";
  if (!has_object(file, name)) throw InputError(expected + "no such dataset");
  const Hdf5Dataset dataset(H5Dopen2(file, name.c_str(), H5P_DEFAULT));
  if (!dataset) throw InputError(expected + "an object that is not a dataset");
  const Hdf5Type type(check_hdf5(H5Dget_type(dataset.get()), "H5Dget_type"));
  const H5T_class_t type_class = H5Tget_class(type.get());
  if (type_class != H5T_FLOAT)
    throw InputError(expected + "values of another type (" + type_class_text(type_class) + ")");
  const Hdf5Space space(check_hdf5(H5Dget_space(dataset.get()), "H5Dget_space"));
  if (H5Sget_simple_extent_type(space.get()) != H5S_SIMPLE) throw InputError(expected + "a single value");
  const int n_dims =
      static_cast<int>(check_hdf5(H5Sget_simple_extent_ndims(space.get()), "H5Sget_simple_extent_ndims"));
  std::vector<hsize_t> dims(static_cast<size_t>(n_dims));
  check_hdf5(H5Sget_simple_extent_dims(space.get(), dims.data(), nullptr), "H5Sget_simple_extent_dims");
  if (n_dims != 2)
    throw InputError(expected + std::to_string(n_dims) + " dimension(s) (" + dims_text(dims) + ")");
  return dims;
}

herr_t collect_link(hid_t /*group*/, const char* name, const H5L_info_t* /*info*/, void* client_data) {
  static_cast<std::vector<std::string>*>(client_data)->push_back(name);
  return 0;
}

// Local. Member names of `group` in creation order if tracked, in name order otherwise.
std::vector<std::string> member_names(hid_t group) {
  std::vector<std::string> names;
  hsize_t position = 0;
  if (H5Literate(group, H5_INDEX_CRT_ORDER, H5_ITER_INC, &position, collect_link, &names) >= 0) return names;
  names.clear();
  position = 0;
  check_hdf5(H5Literate(group, H5_INDEX_NAME, H5_ITER_INC, &position, collect_link, &names), "H5Literate");
  return names;
}

std::vector<GridPatch> read_patches(hid_t file, const std::string& path, int cells_x, int cells_y) {
  const std::string group_path = std::string("/") + layout::patches_group;
  if (!has_object(file, group_path)) return {};  // no patches: segments are given by side
  const Hdf5Group group(H5Gopen2(file, group_path.c_str(), H5P_DEFAULT));
  if (!group) {
    throw InputError(path + ": '" + group_path +
                     "': expected a group of patches, got another kind of object");
  }
  std::vector<GridPatch> patches;
  for (const std::string& name : member_names(group.get())) {
    const std::string label = path + ": patch '" + excerpt(name) + "'";
    const Hdf5Group member(H5Gopen2(group.get(), name.c_str(), H5P_DEFAULT));
    if (!member)
      throw InputError(
          label +
          ": expected a group with attributes side, first_face, last_face, got another kind of object");
    GridPatch patch;
    patch.name = name;
    const std::string side = read_string_attribute(member.get(), "side", label + ": attribute 'side'");
    const auto parsed = side_from_name(side);
    if (!parsed) {
      throw InputError(label + ": attribute 'side': expected one of left, right, bottom, top, got '" +
                       excerpt(side) + "'");
    }
    patch.side = *parsed;
    patch.first_face = read_int_attribute(member.get(), "first_face", label + ": attribute 'first_face'");
    patch.last_face = read_int_attribute(member.get(), "last_face", label + ": attribute 'last_face'");
    if (has_attribute(member.get(), "kind")) {
      patch.kind = read_string_attribute(member.get(), "kind", label + ": attribute 'kind'");
    }
    check_patch(patch, cells_x, cells_y, label);
    patches.push_back(patch);
  }
  return patches;
}

std::vector<double> read_whole(hid_t file, const char* name, size_t n_values) {
  const Hdf5Dataset dataset(check_hdf5(H5Dopen2(file, name, H5P_DEFAULT), "H5Dopen2"));
  std::vector<double> values(n_values);
  check_hdf5(H5Dread(dataset.get(), H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT, values.data()),
             "H5Dread");
  return values;
}

void write_whole(hid_t group, const char* name, const NodeCoordinates& nodes, bool want_x) {
  const hsize_t dims[2] = {static_cast<hsize_t>(nodes.cells_y) + 1, static_cast<hsize_t>(nodes.cells_x) + 1};
  const Hdf5Space space(check_hdf5(H5Screate_simple(2, dims, nullptr), "H5Screate_simple"));
  const Hdf5Dataset dataset(
      check_hdf5(H5Dcreate2(group, name, H5T_IEEE_F64LE, space.get(), H5P_DEFAULT, H5P_DEFAULT, H5P_DEFAULT),
                 "H5Dcreate2"));
  std::vector<double> values;
  values.reserve(nodes.nodes.size());
  for (const Vec2& p : nodes.nodes) values.push_back(want_x ? p.x : p.y);
  check_hdf5(H5Dwrite(dataset.get(), H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT, values.data()),
             "H5Dwrite");
}

Hdf5Group make_group(hid_t parent, const std::string& name, hid_t creation = H5P_DEFAULT) {
  return Hdf5Group(
      check_hdf5(H5Gcreate2(parent, name.c_str(), H5P_DEFAULT, creation, H5P_DEFAULT), "H5Gcreate2"));
}

// Local. The bytes of an HDF5 file holding `content`, built with the in-memory (core) driver.
std::string file_image(const GridFileContent& content) {
  const Hdf5PropertyList access(check_hdf5(H5Pcreate(H5P_FILE_ACCESS), "H5Pcreate"));
  check_hdf5(H5Pset_fapl_core(access.get(), 1 << 20, false), "H5Pset_fapl_core");
  Hdf5File file(
      check_hdf5(H5Fcreate("wallrans-grid-image", H5F_ACC_TRUNC, H5P_DEFAULT, access.get()), "H5Fcreate"));
  write_string_attribute(file.get(), format_attribute, layout::marker);
  write_int_attribute(file.get(), version_attribute, layout::version);
  {
    const Hdf5Group grid = make_group(file.get(), layout::grid_group);
    write_whole(grid.get(), "x", content.nodes, true);
    write_whole(grid.get(), "y", content.nodes, false);
  }
  // Link creation order is tracked so the patches read back in the order they were written.
  const Hdf5PropertyList creation(check_hdf5(H5Pcreate(H5P_GROUP_CREATE), "H5Pcreate"));
  check_hdf5(H5Pset_link_creation_order(creation.get(), H5P_CRT_ORDER_TRACKED | H5P_CRT_ORDER_INDEXED),
             "H5Pset_link_creation_order");
  {
    const Hdf5Group patches = make_group(file.get(), layout::patches_group, creation.get());
    for (const GridPatch& patch : content.patches) {
      const Hdf5Group member = make_group(patches.get(), patch.name);
      write_string_attribute(member.get(), "side", side_name(patch.side));
      write_int_attribute(member.get(), "first_face", patch.first_face);
      write_int_attribute(member.get(), "last_face", patch.last_face);
      if (!patch.kind.empty()) write_string_attribute(member.get(), "kind", patch.kind);
    }
  }
  check_hdf5(H5Fflush(file.get(), H5F_SCOPE_GLOBAL), "H5Fflush");
  const ssize_t size = H5Fget_file_image(file.get(), nullptr, 0);
  check_hdf5(size, "H5Fget_file_image");
  std::string bytes(static_cast<size_t>(size), '\0');
  check_hdf5(H5Fget_file_image(file.get(), bytes.data(), bytes.size()), "H5Fget_file_image");
  file.close_checked("H5Fclose");
  return bytes;
}

}  // namespace

std::string expected_grid_file(const std::string& path) {
  return path + ": expected a wallrans grid file (HDF5 with attribute 'format' = '" + layout::marker +
         "'), got ";
}

Hdf5File open_for_reading(const std::string& path) {
  const std::string expected = expected_grid_file(path);
  Hdf5File file = open_hdf5_read_only(path, expected);
  if (!has_attribute(file.get(), format_attribute)) {
    throw InputError(expected + "an HDF5 file without attribute 'format'");
  }
  const std::string format =
      read_string_attribute(file.get(), format_attribute, path + ": attribute 'format'");
  if (format != layout::marker) throw InputError(expected + "attribute 'format' = '" + excerpt(format) + "'");
  const int version =
      read_int_attribute(file.get(), version_attribute, path + ": attribute 'format_version'");
  if (version != layout::version) {
    throw InputError(path + ": attribute 'format_version': expected " + std::to_string(layout::version) +
                     ", got " + std::to_string(version));
  }
  return file;
}

Header read_header(hid_t file, const std::string& path) {
  const std::vector<hsize_t> x_dims = coordinate_dims(file, path, layout::x_dataset);
  const std::vector<hsize_t> y_dims = coordinate_dims(file, path, layout::y_dataset);
  if (y_dims != x_dims) {
    throw InputError(path + ": dataset '" + layout::y_dataset + "': expected the dimensions of '" +
                     layout::x_dataset + "' (" + dims_text(x_dims) + "), got " + dims_text(y_dims));
  }
  if (x_dims[0] < 2 || x_dims[1] < 2) {
    throw InputError(path + ": dataset '" + layout::x_dataset +
                     "': expected at least 2 x 2 nodes (one cell each way), got " + dims_text(x_dims));
  }
  // Node counts travel as MPI int counts.
  if (x_dims[0] > INT_MAX / x_dims[1]) {
    throw InputError(path + ": dataset '" + layout::x_dataset + "': expected fewer than 2^31 nodes, got " +
                     dims_text(x_dims));
  }
  Header header;
  header.cells_x = static_cast<int>(x_dims[1]) - 1;
  header.cells_y = static_cast<int>(x_dims[0]) - 1;
  header.patches = read_patches(file, path, header.cells_x, header.cells_y);
  return header;
}

GridFileContent read_file(const std::string& path) {
  const QuietHdf5Errors quiet;
  return read_input_file(expected_grid_file(path), [&] {
    const Hdf5File file = open_for_reading(path);
    const Header header = read_header(file.get(), path);
    GridFileContent content;
    NodeCoordinates& nodes = content.nodes;
    nodes.cells_x = header.cells_x;
    nodes.cells_y = header.cells_y;
    const size_t n = static_cast<size_t>(header.cells_x + 1) * (header.cells_y + 1);
    const std::vector<double> x = read_whole(file.get(), layout::x_dataset, n);
    const std::vector<double> y = read_whole(file.get(), layout::y_dataset, n);
    nodes.nodes.resize(n);
    for (size_t k = 0; k < n; ++k) nodes.nodes[k] = {x[k], y[k]};
    content.patches = header.patches;
    check_content(content, path);
    return content;
  });
}

void write_file(const std::string& path, const GridFileContent& content) {
  const QuietHdf5Errors quiet;
  const NodeCoordinates& nodes = content.nodes;
  if (nodes.cells_x < 1 || nodes.cells_y < 1 ||
      nodes.nodes.size() != static_cast<size_t>(nodes.cells_x + 1) * (nodes.cells_y + 1)) {
    throw Error(path + ": grid to write has " + std::to_string(nodes.nodes.size()) + " nodes for " +
                std::to_string(nodes.cells_x) + " x " + std::to_string(nodes.cells_y) + " cells");
  }
  check_content(content, path);
  const std::string bytes = file_image(content);
  try {
    write_file_atomically(path, bytes, "grid file");
  } catch (const Error& e) {
    throw InputError(path + ": expected a location where the grid file can be written, got " + e.what());
  }
}

}  // namespace wallrans::grid_file_format
