// The part of each checkpoint dataset a rank transfers (a block of cells or nodes, or its
// boundary faces by id) and the collective HDF5 transfers themselves.
#include "io/checkpoint_transfer.hpp"

#include <algorithm>

#include "io/checkpoint_checksum.hpp"

namespace wallrans::checkpoint_transfer {

namespace {

hsize_t to_hsize(int value) { return static_cast<hsize_t>(value); }

// Local. Selects the sorted face ids `ids` in the 1-D `file_space` as a union of runs of
// consecutive ids (nothing if there are none) and returns the matching contiguous memory space.
Hdf5Space select_faces(hid_t file_space, const std::vector<hsize_t>& ids) {
  if (ids.empty()) {
    check_hdf5(H5Sselect_none(file_space), "H5Sselect_none");
    const hsize_t one = 1;
    Hdf5Space memory(check_hdf5(H5Screate_simple(1, &one, nullptr), "H5Screate_simple"));
    check_hdf5(H5Sselect_none(memory.get()), "H5Sselect_none");
    return memory;
  }
  H5S_seloper_t operation = H5S_SELECT_SET;
  for (size_t first = 0; first < ids.size();) {
    size_t last = first;
    while (last + 1 < ids.size() && ids[last + 1] == ids[last] + 1) ++last;
    const hsize_t start = ids[first], count = last - first + 1;
    check_hdf5(H5Sselect_hyperslab(file_space, operation, &start, nullptr, &count, nullptr),
               "H5Sselect_hyperslab");
    operation = H5S_SELECT_OR;
    first = last + 1;
  }
  const hsize_t size = ids.size();
  return Hdf5Space(check_hdf5(H5Screate_simple(1, &size, nullptr), "H5Screate_simple"));
}

}  // namespace

Block cell_block(const Grid& grid) {
  return {{to_hsize(grid.cells_y()), to_hsize(grid.cells_x())},
          {to_hsize(grid.y_begin()), to_hsize(grid.x_begin())},
          {to_hsize(grid.y_end() - grid.y_begin()), to_hsize(grid.x_end() - grid.x_begin())},
          false,
          {}};
}

Block node_block(const Grid& grid) {
  const int extra_x = grid.x_end() == grid.cells_x() ? 1 : 0,
            extra_y = grid.y_end() == grid.cells_y() ? 1 : 0;
  return {
      {to_hsize(grid.cells_y() + 1), to_hsize(grid.cells_x() + 1)},
      {to_hsize(grid.y_begin()), to_hsize(grid.x_begin())},
      {to_hsize(grid.y_end() - grid.y_begin() + extra_y), to_hsize(grid.x_end() - grid.x_begin() + extra_x)},
      false,
      {}};
}

FaceOrder face_order(const BoundaryLayout& layout) {
  std::vector<size_t> positions(layout.ids.size());
  for (size_t k = 0; k < positions.size(); ++k) positions[k] = k;
  std::sort(positions.begin(), positions.end(),
            [&layout](size_t a, size_t b) { return layout.ids[a] < layout.ids[b]; });
  FaceOrder order;
  order.positions = positions;
  for (const size_t k : positions) order.ids.push_back(static_cast<hsize_t>(layout.ids[k]));
  return order;
}

Block face_block(const BoundaryLayout& layout, const FaceOrder& order) {
  return {{to_hsize(layout.n_faces)}, {}, {}, true, order.ids};
}

Hdf5Space select_block(hid_t file_space, const Block& block) {
  if (block.by_id) return select_faces(file_space, block.ids);
  const int rank = static_cast<int>(block.global.size());
  if (block.size() == 0) {
    check_hdf5(H5Sselect_none(file_space), "H5Sselect_none");
    const std::vector<hsize_t> one(block.global.size(), 1);
    Hdf5Space memory(check_hdf5(H5Screate_simple(rank, one.data(), nullptr), "H5Screate_simple"));
    check_hdf5(H5Sselect_none(memory.get()), "H5Sselect_none");
    return memory;
  }
  check_hdf5(H5Sselect_hyperslab(file_space, H5S_SELECT_SET, block.start.data(), nullptr, block.count.data(),
                                 nullptr),
             "H5Sselect_hyperslab");
  return Hdf5Space(check_hdf5(H5Screate_simple(rank, block.count.data(), nullptr), "H5Screate_simple"));
}

Hdf5PropertyList collective_transfer() {
  Hdf5PropertyList transfer(check_hdf5(H5Pcreate(H5P_DATASET_XFER), "H5Pcreate"));
  check_hdf5(H5Pset_dxpl_mpio(transfer.get(), H5FD_MPIO_COLLECTIVE), "H5Pset_dxpl_mpio");
  return transfer;
}

Hdf5PropertyList parallel_access(MPI_Comm comm) {
  Hdf5PropertyList access(check_hdf5(H5Pcreate(H5P_FILE_ACCESS), "H5Pcreate"));
  check_hdf5(H5Pset_fapl_mpio(access.get(), comm, MPI_INFO_NULL), "H5Pset_fapl_mpio");
  return access;
}

void write_dataset(hid_t group, const std::string& name, const Block& block,
                   const std::vector<double>& values, hid_t transfer, uint32_t crc) {
  const Hdf5Space file_space(
      check_hdf5(H5Screate_simple(static_cast<int>(block.global.size()), block.global.data(), nullptr),
                 "H5Screate_simple"));
  const Hdf5PropertyList creation(check_hdf5(H5Pcreate(H5P_DATASET_CREATE), "H5Pcreate"));
  check_hdf5(H5Pset_fill_time(creation.get(), H5D_FILL_TIME_NEVER), "H5Pset_fill_time");
  const Hdf5Dataset dataset(check_hdf5(H5Dcreate2(group, name.c_str(), H5T_IEEE_F64LE, file_space.get(),
                                                  H5P_DEFAULT, creation.get(), H5P_DEFAULT),
                                       "H5Dcreate2"));
  const Hdf5Space memory = select_block(file_space.get(), block);
  const double unused = 0.0;
  check_hdf5(H5Dwrite(dataset.get(), H5T_NATIVE_DOUBLE, memory.get(), file_space.get(), transfer,
                      values.empty() ? &unused : values.data()),
             "H5Dwrite");
  checkpoint_checksum::write_crc32(dataset.get(), crc);
}

std::vector<double> read_dataset(hid_t file, const std::string& dataset_path, const Block& block,
                                 hid_t transfer) {
  const Hdf5Dataset dataset(check_hdf5(H5Dopen2(file, dataset_path.c_str(), H5P_DEFAULT), "H5Dopen2"));
  const Hdf5Space file_space(check_hdf5(H5Dget_space(dataset.get()), "H5Dget_space"));
  const Hdf5Space memory = select_block(file_space.get(), block);
  std::vector<double> values(block.size());
  double unused = 0.0;
  check_hdf5(H5Dread(dataset.get(), H5T_NATIVE_DOUBLE, memory.get(), file_space.get(), transfer,
                     values.empty() ? &unused : values.data()),
             "H5Dread");
  return values;
}

std::vector<double> owned_values(const Grid& grid, const Field& field) {
  std::vector<double> values;
  values.reserve(grid.n_owned());
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) values.push_back(field(i, j));
  }
  return values;
}

std::vector<double> node_values(const Grid& grid, const Block& block, bool want_x) {
  std::vector<double> values;
  values.reserve(block.size());
  const int j0 = static_cast<int>(block.start[0]), i0 = static_cast<int>(block.start[1]);
  for (int j = j0; j < j0 + static_cast<int>(block.count[0]); ++j) {
    for (int i = i0; i < i0 + static_cast<int>(block.count[1]); ++i) {
      const Vec2 node = grid.nodes().at(i, j);
      values.push_back(want_x ? node.x : node.y);
    }
  }
  return values;
}

}  // namespace wallrans::checkpoint_transfer
