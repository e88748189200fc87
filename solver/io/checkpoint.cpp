// Collective checkpoint writing and reading with parallel HDF5 (MPI-IO driver; each rank's part
// of a dataset and the transfers are in checkpoint_transfer.cpp). Rank 0 validates a file alone
// before any collective HDF5 call touches it, and every step ends with a failure agreement.
#include "io/checkpoint.hpp"

#include <fcntl.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <csignal>
#include <filesystem>
#include <optional>
#include <set>
#include <string>
#include <system_error>
#include <vector>

#include "core/error.hpp"
#include "core/utc_time.hpp"
#include "io/checkpoint_checksum.hpp"
#include "io/checkpoint_format.hpp"
#include "io/checkpoint_transfer.hpp"
#include "io/hdf5_attributes.hpp"
#include "io/hdf5_handles.hpp"
#include "io/rank_agreement.hpp"

namespace wallrans {

namespace {

namespace fs = std::filesystem;
namespace format = checkpoint_format;
using namespace checkpoint_transfer;

std::string field_path(const std::string& name) {
  return std::string("/") + format::fields_group + "/" + name;
}
std::string boundary_path(const std::string& name) {
  return std::string("/") + format::boundary_group + "/" + name;
}

// Local. Rejects a request that would give an ambiguous file or touch memory outside an array.
void check_request(const Grid& grid, const std::string& path, const std::vector<CellArray>& cells,
                   const BoundaryLayout& layout, const std::vector<BoundaryArray>& boundary, bool writing) {
  const std::string where = "checkpoint '" + path + "': ";
  auto check_name = [&where](const std::string& kind, const std::string& name, std::set<std::string>& seen) {
    if (!format::is_valid_name(name)) {
      throw Error(where + kind + " name '" + name +
                  "' must be non-empty and made of letters, digits, '_', '-' and '.'");
    }
    if (!seen.insert(name).second) throw Error(where + kind + " name '" + name + "' is used twice");
  };
  std::set<std::string> cell_names, boundary_names;
  for (const CellArray& cell : cells) {
    check_name("cell array", cell.name, cell_names);
    if (cell.field == nullptr || cell.field->data().size() != grid.n_ghosted()) {
      throw Error(where + "cell array '" + cell.name + "' is missing or does not belong to this grid");
    }
  }
  std::set<int> ids;
  for (const int id : layout.ids) {
    if (id < 0 || id >= layout.n_faces || !ids.insert(id).second) {
      throw Error(where + "boundary face id " + std::to_string(id) + " is repeated or outside [0, " +
                  std::to_string(layout.n_faces) + ")");
    }
  }
  for (const BoundaryArray& array : boundary) {
    check_name("boundary array", array.name, boundary_names);
    if (array.values == nullptr) throw Error(where + "boundary array '" + array.name + "' has no vector");
    if (writing && array.values->size() != layout.ids.size()) {
      throw Error(where + "boundary array '" + array.name + "' has " + std::to_string(array.values->size()) +
                  " values, expected " + std::to_string(layout.ids.size()) + " (one per boundary face id)");
    }
  }
}

// Collective. Every rank's boundary layout must count the faces of the same domain; all ranks
// reach the same verdict.
void check_face_count(MPI_Comm comm, const std::string& path, const BoundaryLayout& layout) {
  int range[2] = {-layout.n_faces, layout.n_faces};
  check_mpi(MPI_Allreduce(MPI_IN_PLACE, range, 2, MPI_INT, MPI_MAX, comm));
  if (-range[0] != range[1]) {
    throw Error("checkpoint '" + path + "': ranks disagree about the number of boundary faces (" +
                std::to_string(-range[0]) + " to " + std::to_string(range[1]) + ")");
  }
}

void check_scalars(const std::string& path, const CheckpointMetadata& metadata) {
  std::set<std::string> seen;
  for (const auto& scalar : metadata.scalars) {
    if (!format::is_valid_name(scalar.first) || !seen.insert(scalar.first).second) {
      throw Error("checkpoint '" + path + "': scalar name '" + scalar.first +
                  "' must be unique, non-empty and made of letters, digits, '_', '-' and '.'");
    }
  }
}

void make_parent_directory(const std::string& path) {
  const fs::path parent = fs::path(path).parent_path();
  if (parent.empty()) return;
  std::error_code error;
  fs::create_directories(parent, error);
  if (error || !fs::is_directory(parent)) {
    throw Error("checkpoint '" + path + "': cannot create directory '" + parent.string() +
                "': " + (error ? error.message() : std::string("a file of that name exists")));
  }
}

// Closes a POSIX file descriptor on scope exit.
class FileDescriptor {
 public:
  explicit FileDescriptor(int descriptor) : descriptor_(descriptor) {}
  FileDescriptor(const FileDescriptor&) = delete;
  FileDescriptor& operator=(const FileDescriptor&) = delete;
  ~FileDescriptor() {
    if (descriptor_ >= 0) (void)::close(descriptor_);
  }
  int get() const { return descriptor_; }

 private:
  int descriptor_;
};

// Local (rank 0). Forces the closed temporary file to disk, renames it over `path` (atomic on
// POSIX file systems) and syncs the directory so the rename itself survives a crash.
void publish(const std::string& temporary, const std::string& path) {
  const FileDescriptor file(::open(temporary.c_str(), O_RDONLY | O_CLOEXEC));
  if (file.get() < 0 || ::fsync(file.get()) != 0) {
    throw Error("checkpoint: cannot sync '" + temporary + "': " + std::generic_category().message(errno));
  }
  std::error_code error;
  fs::rename(temporary, path, error);
  if (error)
    throw Error("checkpoint: cannot rename '" + temporary + "' to '" + path + "': " + error.message());
  const fs::path parent = fs::path(path).parent_path();
  const FileDescriptor directory(
      ::open(parent.empty() ? "." : parent.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC));
  if (directory.get() >= 0) (void)::fsync(directory.get());  // best effort: not every file system allows it
}

// Local. Throws the InputError of a dataset `label` whose data do not match the stored checksum
// (required from format version 3 on) or hold a non-finite value (`bad_at` names where; "" none).
void judge_dataset(const std::string& label, const std::optional<uint32_t>& stored, uint32_t computed,
                   int version, const std::string& bad_at) {
  namespace checksum = checkpoint_checksum;
  if (!stored && version >= 3)
    throw InputError(label + ": expected attribute 'crc32' (format version 3), got none");
  if (stored && *stored != computed) {
    throw InputError(label + ": expected the data its checksum was written for (crc32 " +
                     checksum::hex(*stored) + "), got data with crc32 " + checksum::hex(computed) +
                     ": the file was changed or damaged after it was written");
  }
  if (!bad_at.empty())
    throw InputError(label + ": expected finite values, got a non-finite value at " + bad_at);
}

// Collective. judge_dataset for this rank's `block` of a dataset read back; the same InputError on
// every rank.
void verify_dataset(MPI_Comm comm, const std::string& path, const std::string& dataset_path,
                    const Block& block, const std::vector<double>& values,
                    const std::optional<uint32_t>& stored, int version, const char* element) {
  const uint32_t computed = checkpoint_checksum::dataset_crc32(comm, block, values);
  const long long bad = checkpoint_checksum::first_non_finite(comm, block, values);
  judge_dataset(path + ": dataset '" + dataset_path + "'", stored, computed, version,
                bad < 0 ? "" : checkpoint_checksum::index_text(block, bad, element));
}

}  // namespace

CheckpointMetadata write_checkpoint(const Grid& grid, const std::string& path,
                                    const CheckpointMetadata& metadata, const std::vector<CellArray>& cells,
                                    const BoundaryLayout& layout, const std::vector<BoundaryArray>& boundary,
                                    int abort_after_datasets) {
  const QuietHdf5Errors quiet;
  const MPI_Comm comm = grid.comm();
  check_face_count(comm, path, layout);
  agree(comm, attempt([&] {
          check_request(grid, path, cells, layout, boundary, true);
          check_scalars(path, metadata);
        }));
  // Parallel HDF5 needs identical attribute values on every rank, so rank 0's metadata is used.
  const CheckpointMetadata stored = format::unpack(run_on_root(comm, [&] {
    CheckpointMetadata completed = metadata;
    completed.cells_x = grid.cells_x();
    completed.cells_y = grid.cells_y();
    completed.grid_fingerprint = grid_fingerprint(grid.nodes());
    completed.written_at = utc_now();
    make_parent_directory(path);
    return format::pack(completed);
  }));

  const std::string temporary = path + ".tmp";
  Hdf5File file;
  Hdf5Group fields, faces, nodes;
  Hdf5PropertyList transfer;
  agree(comm, attempt([&] {
          file =
              Hdf5File(H5Fcreate(temporary.c_str(), H5F_ACC_TRUNC, H5P_DEFAULT, parallel_access(comm).get()));
          if (!file) throw Error("checkpoint: cannot create '" + temporary + "' (" + hdf5_error_text() + ")");
          format::write_metadata(file.get(), stored);
          auto make_group = [&file](const char* name) {
            return Hdf5Group(check_hdf5(H5Gcreate2(file.get(), name, H5P_DEFAULT, H5P_DEFAULT, H5P_DEFAULT),
                                        "H5Gcreate2"));
          };
          fields = make_group(format::fields_group);
          faces = make_group(format::boundary_group);
          nodes = make_group(format::grid_group);
          transfer = collective_transfer();
        }));

  int n_written = 0;
  auto maybe_abort = [&] {
    if (abort_after_datasets >= 0 && n_written >= abort_after_datasets) std::raise(SIGKILL);
  };
  auto write = [&](hid_t group, const std::string& name, const Block& block,
                   const std::vector<double>& values) {
    const uint32_t crc = checkpoint_checksum::dataset_crc32(comm, block, values);
    agree(comm, attempt([&] { write_dataset(group, name, block, values, transfer.get(), crc); }));
    ++n_written;
    maybe_abort();
  };
  maybe_abort();
  for (const CellArray& cell : cells) {
    write(fields.get(), cell.name, cell_block(grid), owned_values(grid, *cell.field));
  }
  const FaceOrder order = face_order(layout);
  for (const BoundaryArray& array : boundary) {
    std::vector<double> sorted;
    sorted.reserve(order.positions.size());
    for (const size_t k : order.positions) sorted.push_back((*array.values)[k]);
    write(faces.get(), array.name, face_block(layout, order), sorted);
  }
  const Block block = node_block(grid);
  const std::vector<double> x = node_values(grid, block, true), y = node_values(grid, block, false);
  write(nodes.get(), "x", block, x);
  write(nodes.get(), "y", block, y);
  // The same nodes interleaved, (cells_y + 1) x (cells_x + 1) x 2: the geometry of the XDMF
  // description (the XDMF-3 reader of a common viewer crashes on the two-array X_Y form).
  Block pairs = block;
  pairs.global.push_back(2);
  pairs.start.push_back(0);
  pairs.count.push_back(2);
  std::vector<double> xy(2 * x.size());
  for (size_t k = 0; k < x.size(); ++k) {
    xy[2 * k] = x[k];
    xy[2 * k + 1] = y[k];
  }
  write(nodes.get(), "xy", pairs, xy);

  agree(comm, attempt([&] {
          fields.reset();
          faces.reset();
          nodes.reset();
          file.close_checked("H5Fclose");
        }));
  run_on_root(comm, [&] {
    publish(temporary, path);
    return std::string();
  });
  return stored;
}

CheckpointMetadata read_checkpoint_metadata(MPI_Comm comm, const std::string& path) {
  const QuietHdf5Errors quiet;
  return format::unpack(run_on_root(comm, [&] {
    return read_input_file(format::expected_checkpoint(path), [&] {
      const Hdf5File file = format::open_for_validation(path);
      return format::pack(format::read_metadata(file.get(), path));
    });
  }));
}

void read_checkpoint(const Grid& grid, const std::string& path, const std::vector<CellArray>& cells,
                     const BoundaryLayout& layout, const std::vector<BoundaryArray>& boundary) {
  const QuietHdf5Errors quiet;
  const MPI_Comm comm = grid.comm();
  check_face_count(comm, path, layout);
  agree(comm, attempt([&] { check_request(grid, path, cells, layout, boundary, false); }));
  std::vector<std::vector<double>> cell_values(cells.size()), face_values(boundary.size());
  const FaceOrder order = face_order(layout);
  // A damaged file can pass rank 0's checks and fail in a collective read; every failure below is
  // agreed by all ranks, so all turn it into the same InputError.
  read_input_file(format::expected_checkpoint(path), [&] {
    // Rank 0 alone finds bad files, so no rank enters a collective HDF5 call with one.
    const std::string version_text = run_on_root(comm, [&] {
      int version = 0;
      const Hdf5File file = format::open_for_validation(path, &version);
      const auto nx = static_cast<unsigned long long>(grid.cells_x());
      const auto ny = static_cast<unsigned long long>(grid.cells_y());
      for (const CellArray& cell : cells) {
        format::check_dataset(file.get(), path, field_path(cell.name), {ny, nx}, "cells_y x cells_x");
      }
      const auto n_faces = static_cast<unsigned long long>(layout.n_faces);
      for (const BoundaryArray& array : boundary) {
        format::check_dataset(file.get(), path, boundary_path(array.name), {n_faces}, "boundary faces");
      }
      return std::to_string(version);
    });
    const int version = std::stoi(version_text);

    Hdf5File file;
    Hdf5PropertyList transfer;
    agree(comm, attempt([&] {
            file = Hdf5File(H5Fopen(path.c_str(), H5F_ACC_RDONLY, parallel_access(comm).get()));
            if (!file)
              throw Error("checkpoint: cannot open '" + path + "' in parallel (" + hdf5_error_text() + ")");
            transfer = collective_transfer();
          }));
    // Each dataset is read, then its checksum (format version 3) and its values are checked.
    auto read = [&](const std::string& dataset_path, const Block& block, const char* element) {
      std::vector<double> values;
      std::optional<uint32_t> stored;
      agree(comm, attempt([&] {
              values = read_dataset(file.get(), dataset_path, block, transfer.get());
              const Hdf5Dataset dataset(
                  check_hdf5(H5Dopen2(file.get(), dataset_path.c_str(), H5P_DEFAULT), "H5Dopen2"));
              stored =
                  checkpoint_checksum::read_crc32(dataset.get(), path + ": dataset '" + dataset_path + "'");
            }));
      verify_dataset(comm, path, dataset_path, block, values, stored, version, element);
      return values;
    };
    for (size_t k = 0; k < cells.size(); ++k)
      cell_values[k] = read(field_path(cells[k].name), cell_block(grid), "cell");
    for (size_t k = 0; k < boundary.size(); ++k)
      face_values[k] = read(boundary_path(boundary[k].name), face_block(layout, order), "face");
    agree(comm, attempt([&] { file.close_checked("H5Fclose"); }));
  });

  // Every array was read: only now are the caller's arrays changed.
  for (size_t k = 0; k < cells.size(); ++k) {
    Field& field = *cells[k].field;
    size_t n = 0;
    for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
      for (int i = grid.x_begin(); i < grid.x_end(); ++i) field(i, j) = cell_values[k][n++];
    }
    field.exchange();
  }
  for (size_t k = 0; k < boundary.size(); ++k) {
    std::vector<double>& values = *boundary[k].values;
    values.resize(layout.ids.size());
    for (size_t n = 0; n < order.positions.size(); ++n) values[order.positions[n]] = face_values[k][n];
  }
}

}  // namespace wallrans

namespace wallrans {

void verify_checkpoint_data(MPI_Comm comm, const std::string& path) {
  const QuietHdf5Errors quiet;
  run_on_root(comm, [&] {
    int version = 0;
    const Hdf5File file = format::open_for_validation(path, &version);
    for (const char* group_name : {format::fields_group, format::boundary_group, format::grid_group}) {
      const std::string group_path = std::string("/") + group_name;
      if (!has_object(file.get(), group_path)) continue;
      const Hdf5Group group(check_hdf5(H5Gopen2(file.get(), group_name, H5P_DEFAULT), "H5Gopen2"));
      H5G_info_t info;
      check_hdf5(H5Gget_info(group.get(), &info), "H5Gget_info");
      for (hsize_t k = 0; k < info.nlinks; ++k) {
        const ssize_t length = check_hdf5(
            H5Lget_name_by_idx(group.get(), ".", H5_INDEX_NAME, H5_ITER_INC, k, nullptr, 0, H5P_DEFAULT),
            "H5Lget_name_by_idx");
        std::string name(static_cast<size_t>(length), '\0');
        check_hdf5(H5Lget_name_by_idx(group.get(), ".", H5_INDEX_NAME, H5_ITER_INC, k, name.data(),
                                      static_cast<size_t>(length) + 1, H5P_DEFAULT),
                   "H5Lget_name_by_idx");
        const std::string dataset_path = group_path + "/" + name;
        const Hdf5Dataset dataset(H5Dopen2(file.get(), dataset_path.c_str(), H5P_DEFAULT));
        if (!dataset) continue;
        const Hdf5Space space(check_hdf5(H5Dget_space(dataset.get()), "H5Dget_space"));
        const int n_dims = static_cast<int>(
            check_hdf5(H5Sget_simple_extent_ndims(space.get()), "H5Sget_simple_extent_ndims"));
        if (n_dims < 1 || n_dims > 2) continue;
        Block block;
        block.global.assign(static_cast<size_t>(n_dims), 0);
        check_hdf5(H5Sget_simple_extent_dims(space.get(), block.global.data(), nullptr),
                   "H5Sget_simple_extent_dims");
        block.count = block.global;
        std::vector<double> values(block.size());
        double unused = 0.0;
        check_hdf5(H5Dread(dataset.get(), H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT,
                           values.empty() ? &unused : values.data()),
                   "H5Dread");
        const std::string label = path + ": dataset '" + dataset_path + "'";
        std::string bad_at;
        const auto bad =
            std::find_if(values.begin(), values.end(), [](double v) { return !std::isfinite(v); });
        if (bad != values.end()) {
          const auto index = static_cast<hsize_t>(bad - values.begin());
          const std::string element = group_name == format::grid_group ? "node"
                                      : n_dims == 1                    ? "face id"
                                                                       : "cell";
          bad_at = n_dims == 1 ? element + " " + std::to_string(index)
                               : element + " (" + std::to_string(index % block.global[1]) + ", " +
                                     std::to_string(index / block.global[1]) + ")";
        }
        judge_dataset(label, checkpoint_checksum::read_crc32(dataset.get(), label),
                      checkpoint_checksum::crc32_of(values.data(), values.size()), version, bad_at);
      }
    }
    return std::string();
  });
}

}  // namespace wallrans
