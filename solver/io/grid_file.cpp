// Grid files with parallel HDF5: rank 0 checks the structure alone, then every rank reads a band
// of node rows collectively (MPI-IO driver) and the bands are gathered on every rank.
#include "io/grid_file.hpp"

#include <sstream>
#include <vector>

#include "core/error.hpp"
#include "io/checkpoint_transfer.hpp"
#include "io/grid_file_format.hpp"
#include "io/rank_agreement.hpp"

namespace wallrans {

namespace {

namespace format = grid_file_format;
using checkpoint_transfer::Block;

// Collective. The values of every rank's band (rows [first_row[r], first_row[r + 1]) of a
// dataset with `row_length` values per row), in row order, on every rank.
std::vector<double> gather_bands(MPI_Comm comm, const std::vector<double>& band,
                                 const std::vector<int>& first_row, int row_length) {
  const int size = static_cast<int>(first_row.size()) - 1;
  std::vector<int> counts(static_cast<size_t>(size)), offsets(static_cast<size_t>(size));
  for (int r = 0; r < size; ++r) {
    counts[r] = (first_row[r + 1] - first_row[r]) * row_length;
    offsets[r] = first_row[r] * row_length;
  }
  std::vector<double> all(static_cast<size_t>(first_row.back()) * row_length);
  check_mpi(MPI_Allgatherv(band.data(), static_cast<int>(band.size()), MPI_DOUBLE, all.data(), counts.data(),
                           offsets.data(), MPI_DOUBLE, comm));
  return all;
}

// Collective. read_grid_file before damaged-file errors become input errors.
GridFileContent read_collectively(MPI_Comm comm, const std::string& path) {
  const std::string header_text = run_on_root(comm, [&] {
    const Hdf5File file = format::open_for_reading(path);
    const format::Header header = format::read_header(file.get(), path);
    return std::to_string(header.cells_x) + " " + std::to_string(header.cells_y) + "\n" +
           pack_patches(header.patches);
  });
  GridFileContent content;
  NodeCoordinates& nodes = content.nodes;
  const size_t end_of_sizes = header_text.find('\n');
  std::istringstream(header_text.substr(0, end_of_sizes)) >> nodes.cells_x >> nodes.cells_y;
  content.patches = unpack_patches(header_text.substr(end_of_sizes + 1));

  int rank = 0, size = 1;
  check_mpi(MPI_Comm_rank(comm, &rank));
  check_mpi(MPI_Comm_size(comm, &size));
  const int rows = nodes.cells_y + 1, row_length = nodes.cells_x + 1;
  std::vector<int> first_row(static_cast<size_t>(size) + 1);
  for (int r = 0; r <= size; ++r) first_row[r] = static_cast<int>(static_cast<long long>(rows) * r / size);
  const Block band{
      {static_cast<hsize_t>(rows), static_cast<hsize_t>(row_length)},
      {static_cast<hsize_t>(first_row[rank]), 0},
      {static_cast<hsize_t>(first_row[rank + 1] - first_row[rank]), static_cast<hsize_t>(row_length)},
      false,
      {}};
  Hdf5File file;
  Hdf5PropertyList transfer;
  std::vector<double> x_band, y_band;
  agree(comm, attempt([&] {
          file = Hdf5File(
              H5Fopen(path.c_str(), H5F_ACC_RDONLY, checkpoint_transfer::parallel_access(comm).get()));
          if (!file)
            throw Error("grid file: cannot open '" + path + "' in parallel (" + hdf5_error_text() + ")");
          transfer = checkpoint_transfer::collective_transfer();
        }));
  agree(comm, attempt([&] {
          x_band = checkpoint_transfer::read_dataset(file.get(), grid_file_layout::x_dataset, band,
                                                     transfer.get());
        }));
  agree(comm, attempt([&] {
          y_band = checkpoint_transfer::read_dataset(file.get(), grid_file_layout::y_dataset, band,
                                                     transfer.get());
        }));
  agree(comm, attempt([&] { file.close_checked("H5Fclose"); }));

  const std::vector<double> x = gather_bands(comm, x_band, first_row, row_length);
  const std::vector<double> y = gather_bands(comm, y_band, first_row, row_length);
  nodes.nodes.resize(x.size());
  for (size_t k = 0; k < x.size(); ++k) nodes.nodes[k] = {x[k], y[k]};
  // Every rank holds the same nodes, so every rank reaches the same verdict.
  check_content(content, path);
  return content;
}

}  // namespace

GridFileContent read_grid_file(MPI_Comm comm, const std::string& path) {
  const QuietHdf5Errors quiet;
  // Every failure inside is agreed by all ranks (or found by all alike), so all convert it alike.
  return read_input_file(format::expected_grid_file(path), [&] { return read_collectively(comm, path); });
}

void write_grid_file(MPI_Comm comm, const std::string& path, const GridFileContent& content) {
  run_on_root(comm, [&] {
    format::write_file(path, content);
    return std::string();
  });
}

}  // namespace wallrans
