// VTK XML output of cell fields. Each piece is serialised by VTK's structured-grid writer (raw
// binary appended data); the small parallel index and the series file are written here
// directly, following VTK's documented XML file format, because they need only names and extents.
#include "io/vtk_writer.hpp"

#include <petscdmda.h>
#include <unistd.h>
#include <vtkCellData.h>
#include <vtkDoubleArray.h>
#include <vtkIntArray.h>
#include <vtkNew.h>
#include <vtkPointData.h>
#include <vtkPoints.h>
#include <vtkStructuredGrid.h>
#include <vtkXMLStructuredGridWriter.h>

#include <array>
#include <bit>
#include <cerrno>
#include <cstdio>
#include <filesystem>
#include <memory>
#include <set>
#include <sstream>
#include <system_error>

#include "core/atomic_file.hpp"
#include "core/error.hpp"
#include "linear/petsc_handles.hpp"

namespace wallrans {

namespace {

namespace fs = std::filesystem;

constexpr const char* volume_name = "cell_volume";
constexpr const char* index_name = "cell_index";

// Collective. Turns a failure on some ranks into an exception on every rank, so that no rank is
// left waiting in the next collective call. `local_error` is empty on ranks that succeeded.
void agree(MPI_Comm comm, const std::string& local_error, const std::string& step) {
  int rank = 0;
  check_mpi(MPI_Comm_rank(comm, &rank));
  const int mine = local_error.empty() ? -1 : rank;
  int failed = -1;
  check_mpi(MPI_Allreduce(&mine, &failed, 1, MPI_INT, MPI_MAX, comm));
  if (!local_error.empty()) throw Error(local_error);
  if (failed >= 0) throw Error("vtk output: rank " + std::to_string(failed) + " failed " + step);
}

// Local. Runs `step` and returns its error message, or "" if it succeeded (input for `agree`).
template <typename Step>
std::string attempt(Step&& step) {
  try {
    step();
    return {};
  } catch (const std::exception& e) {
    return e.what();
  }
}

// Names end up inside XML attributes of the index file, which we write without an escaping layer.
bool is_plain_name(const std::string& name) {
  if (name.empty()) return false;
  for (const char c : name) {
    if (static_cast<unsigned char>(c) < 0x20 || c == '<' || c == '>' || c == '&' || c == '"' || c == '\'')
      return false;
  }
  return true;
}

// Local. Rejects requests that would give an ambiguous or unreadable file, or read outside a field.
void check_request(const Grid& grid, const std::vector<NamedScalar>& scalars,
                   const std::vector<NamedVector>& vectors, const std::string& basename) {
  if (!is_plain_name(basename) || basename.find('/') != std::string::npos) {
    throw Error("vtk output: basename '" + basename +
                "' must be non-empty, without '/', control or XML markup characters");
  }
  std::set<std::string> seen{volume_name, index_name};
  auto check = [&](const std::string& name, const std::vector<const Field*>& parts) {
    if (!is_plain_name(name)) {
      throw Error("vtk output: array name '" + name +
                  "' must be non-empty, without control or XML markup characters");
    }
    if (!seen.insert(name).second) {
      throw Error("vtk output: array name '" + name + "' is used twice or is a reserved grid quantity");
    }
    for (const Field* part : parts) {
      if (part == nullptr || part->data().size() != grid.n_ghosted()) {
        throw Error("vtk output: array '" + name + "' is missing or does not belong to this grid");
      }
    }
  };
  for (const auto& scalar : scalars) check(scalar.name, {scalar.field});
  for (const auto& vector : vectors) {
    check(vector.name, vector.field ? std::vector<const Field*>{&vector.field->x, &vector.field->y}
                                    : std::vector<const Field*>{nullptr});
  }
}

// Local. Creates `directory` (and parents) unless it already is a directory.
void make_directory(const fs::path& directory) {
  std::error_code error;
  fs::create_directories(directory, error);
  if (error || !fs::is_directory(directory)) {
    throw Error("vtk output: cannot create directory '" + directory.string() +
                "': " + (error ? error.message() : std::string("a file of that name exists")));
  }
}

// Cell values with a full layer of neighbour cells, the diagonal ones included (the grid's own
// ghosts follow a star stencil and leave those out), for averaging to the nodes. A second DMDA
// with the grid's layout and a box stencil does the exchange.
class BoxGhosts {
 public:
  // Collective.
  explicit BoxGhosts(const Grid& grid) : grid_(grid) {
    PetscInt ranks_x = 0, ranks_y = 0;
    check_petsc(DMDAGetInfo(grid.dm(), nullptr, nullptr, nullptr, nullptr, &ranks_x, &ranks_y, nullptr,
                            nullptr, nullptr, nullptr, nullptr, nullptr, nullptr));
    const PetscInt *cells_x = nullptr, *cells_y = nullptr;
    check_petsc(DMDAGetOwnershipRanges(grid.dm(), &cells_x, &cells_y, nullptr));
    check_petsc(DMDACreate2d(grid.comm(), grid.periodic_x() ? DM_BOUNDARY_PERIODIC : DM_BOUNDARY_NONE,
                             DM_BOUNDARY_NONE, DMDA_STENCIL_BOX, grid.cells_x(), grid.cells_y(), ranks_x,
                             ranks_y, 1, 1, cells_x, cells_y, dm_.out()));
    check_petsc(DMSetUp(dm_.get()));
    check_petsc(DMCreateGlobalVector(dm_.get(), global_.out()));
    check_petsc(DMCreateLocalVector(dm_.get(), local_.out()));
  }

  // Collective. `field` over the owned cells and every neighbour cell, indexed like Grid::local.
  std::vector<double> values(const Field& field) {
    PetscScalar** owned = nullptr;
    check_petsc(DMDAVecGetArray(dm_.get(), global_.get(), &owned));
    for (int j = grid_.y_begin(); j < grid_.y_end(); ++j)
      for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) owned[j][i] = field(i, j);
    check_petsc(DMDAVecRestoreArray(dm_.get(), global_.get(), &owned));
    check_petsc(DMGlobalToLocal(dm_.get(), global_.get(), INSERT_VALUES, local_.get()));
    std::vector<double> out(grid_.n_ghosted(), 0.0);
    const PetscScalar* const* ghosted = nullptr;
    check_petsc(DMDAVecGetArrayRead(dm_.get(), local_.get(), &ghosted));
    for (int j = grid_.gy_begin(); j < grid_.gy_end(); ++j)
      for (int i = grid_.gx_begin(); i < grid_.gx_end(); ++i) out[grid_.local(i, j)] = ghosted[j][i];
    check_petsc(DMDAVecRestoreArrayRead(dm_.get(), local_.get(), &ghosted));
    return out;
  }

 private:
  const Grid& grid_;
  OwnedDm dm_;
  OwnedVec global_, local_;
};

// Local. The average of `cells` (BoxGhosts::values) at the nodes of this rank's piece, in VTK
// point order (i fastest): over the cells around each node that exist (a periodic x direction
// wraps) and are not excluded (`excluded` non-zero), or over all of them if none is left.
std::vector<double> node_averages(const Grid& grid, const std::vector<double>& cells,
                                  const std::vector<double>* excluded) {
  std::vector<double> nodes;
  nodes.reserve(static_cast<size_t>(grid.x_end() - grid.x_begin() + 1) * (grid.y_end() - grid.y_begin() + 1));
  for (int j = grid.y_begin(); j <= grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i <= grid.x_end(); ++i) {
      double sum_kept = 0.0, sum_all = 0.0;
      int n_kept = 0, n_all = 0;
      for (int cj = j - 1; cj <= j; ++cj) {
        for (int ci = i - 1; ci <= i; ++ci) {
          if (cj < 0 || cj >= grid.cells_y() || (!grid.periodic_x() && (ci < 0 || ci >= grid.cells_x())))
            continue;
          const size_t k = grid.local(ci, cj);
          sum_all += cells[k];
          ++n_all;
          if (excluded == nullptr || (*excluded)[k] == 0.0) {
            sum_kept += cells[k];
            ++n_kept;
          }
        }
      }
      nodes.push_back(n_kept > 0 ? sum_kept / n_kept : sum_all / n_all);
    }
  }
  return nodes;
}

// Point data of one piece: each array's node averages, in the order scalars, then vectors (x, y).
struct PointArrays {
  std::vector<std::vector<double>> scalars;
  std::vector<std::array<std::vector<double>, 2>> vectors;
};

// Collective. The node averages of every array of a piece.
PointArrays point_arrays(const Grid& grid, const std::vector<NamedScalar>& scalars,
                         const std::vector<NamedVector>& vectors, const Field* excluded) {
  BoxGhosts box(grid);
  std::vector<double> mask;
  if (excluded != nullptr) mask = box.values(*excluded);
  const std::vector<double>* mask_or_null = excluded != nullptr ? &mask : nullptr;
  PointArrays points;
  for (const auto& scalar : scalars)
    points.scalars.push_back(node_averages(grid, box.values(*scalar.field), mask_or_null));
  for (const auto& vector : vectors) {
    points.vectors.push_back({node_averages(grid, box.values(vector.field->x), mask_or_null),
                              node_averages(grid, box.values(vector.field->y), mask_or_null)});
  }
  return points;
}

std::string piece_file_name(const std::string& basename, int rank) {
  return basename + "_" + std::to_string(rank) + ".vts";
}

// Local. This rank's piece as a complete .vts document: the nodes of the owned cells as points and
// the owned cells' data. The DMDA's owned order (i fastest) is VTK's cell order, so Grid::owned
// gives the VTK cell id.
std::string piece_document(const Grid& grid, const std::vector<NamedScalar>& scalars,
                           const std::vector<NamedVector>& vectors, const PointArrays& point_values) {
  const int i0 = grid.x_begin(), i1 = grid.x_end(), j0 = grid.y_begin(), j1 = grid.y_end();
  vtkNew<vtkStructuredGrid> piece;
  piece->SetExtent(i0, i1, j0, j1, 0, 0);

  vtkNew<vtkPoints> points;
  points->SetDataTypeToDouble();
  points->SetNumberOfPoints(static_cast<vtkIdType>(i1 - i0 + 1) * (j1 - j0 + 1));
  vtkIdType point = 0;
  for (int j = j0; j <= j1; ++j) {
    for (int i = i0; i <= i1; ++i) {
      const Vec2 p = grid.node(i, j);
      points->SetPoint(point++, p.x, p.y, 0.0);
    }
  }
  piece->SetPoints(points);

  const auto n_cells = static_cast<vtkIdType>(grid.n_owned());
  vtkCellData* cell_data = piece->GetCellData();
  for (const auto& scalar : scalars) {
    vtkNew<vtkDoubleArray> array;
    array->SetName(scalar.name.c_str());
    array->SetNumberOfComponents(1);
    array->SetNumberOfTuples(n_cells);
    for (int j = j0; j < j1; ++j)
      for (int i = i0; i < i1; ++i) array->SetValue(grid.owned(i, j), (*scalar.field)(i, j));
    cell_data->AddArray(array);
  }
  for (const auto& vector : vectors) {
    vtkNew<vtkDoubleArray> array;
    array->SetName(vector.name.c_str());
    array->SetNumberOfComponents(3);
    array->SetNumberOfTuples(n_cells);
    for (int j = j0; j < j1; ++j) {
      for (int i = i0; i < i1; ++i) {
        const Vec2 v = (*vector.field)(i, j);
        array->SetTuple3(grid.owned(i, j), v.x, v.y, 0.0);
      }
    }
    cell_data->AddArray(array);
  }
  vtkNew<vtkDoubleArray> volume;
  volume->SetName(volume_name);
  volume->SetNumberOfComponents(1);
  volume->SetNumberOfTuples(n_cells);
  vtkNew<vtkIntArray> index;
  index->SetName(index_name);
  index->SetNumberOfComponents(2);
  index->SetNumberOfTuples(n_cells);
  for (int j = j0; j < j1; ++j) {
    for (int i = i0; i < i1; ++i) {
      const auto cell = static_cast<vtkIdType>(grid.owned(i, j));
      volume->SetValue(cell, grid.volume(i, j));
      index->SetTypedComponent(cell, 0, i);
      index->SetTypedComponent(cell, 1, j);
    }
  }
  cell_data->AddArray(volume);
  cell_data->AddArray(index);

  vtkPointData* point_data = piece->GetPointData();
  const auto n_points = points->GetNumberOfPoints();
  for (size_t k = 0; k < scalars.size(); ++k) {
    vtkNew<vtkDoubleArray> array;
    array->SetName(scalars[k].name.c_str());
    array->SetNumberOfComponents(1);
    array->SetNumberOfTuples(n_points);
    for (vtkIdType p = 0; p < n_points; ++p)
      array->SetValue(p, point_values.scalars[k][static_cast<size_t>(p)]);
    point_data->AddArray(array);
  }
  for (size_t k = 0; k < vectors.size(); ++k) {
    vtkNew<vtkDoubleArray> array;
    array->SetName(vectors[k].name.c_str());
    array->SetNumberOfComponents(3);
    array->SetNumberOfTuples(n_points);
    const auto& [x, y] = point_values.vectors[k];
    for (vtkIdType p = 0; p < n_points; ++p)
      array->SetTuple3(p, x[static_cast<size_t>(p)], y[static_cast<size_t>(p)], 0.0);
    point_data->AddArray(array);
  }

  vtkNew<vtkXMLStructuredGridWriter> writer;
  writer->SetInputData(piece);
  // Raw appended binary is the smallest uncompressed form; flow-field doubles barely compress, so
  // skipping the compressor keeps output bandwidth-bound. 64-bit headers allow pieces over 4 GiB.
  writer->SetDataModeToAppended();
  writer->EncodeAppendedDataOff();
  writer->SetCompressorTypeToNone();
  writer->SetHeaderTypeToUInt64();
  writer->WriteToOutputStringOn();
  if (writer->Write() == 0) {
    throw Error("vtk output: VTK could not serialise the piece of rank " + std::to_string(grid.rank()) +
                " (VTK error code " + std::to_string(writer->GetErrorCode()) + ")");
  }
  return writer->GetOutputString();
}

// Local (rank 0). The .pvts index: array declarations matching the pieces (types as the piece
// writer stores them) and one Piece per rank with its node extent. `extents` holds
// x_begin, x_end, y_begin, y_end per rank.
std::string index_document(const Grid& grid, const std::vector<NamedScalar>& scalars,
                           const std::vector<NamedVector>& vectors, const std::string& basename,
                           const std::vector<int>& extents) {
  static_assert(sizeof(int) == 4, "cell_index is declared as Int32");
  std::ostringstream out;
  out << "<?xml version=\"1.0\"?>\n"
      << "<VTKFile type=\"PStructuredGrid\" version=\"1.0\" byte_order=\""
      << (std::endian::native == std::endian::little ? "LittleEndian" : "BigEndian")
      << "\" header_type=\"UInt64\">\n"
      << "  <PStructuredGrid WholeExtent=\"0 " << grid.cells_x() << " 0 " << grid.cells_y()
      << " 0 0\" GhostLevel=\"0\">\n"
      << "    <PPointData>\n";
  auto declare = [&out](const char* type, const std::string& name, int n_components) {
    out << "      <PDataArray type=\"" << type << "\" Name=\"" << name << "\" NumberOfComponents=\""
        << n_components << "\"/>\n";
  };
  for (const auto& scalar : scalars) declare("Float64", scalar.name, 1);
  for (const auto& vector : vectors) declare("Float64", vector.name, 3);
  out << "    </PPointData>\n"
      << "    <PCellData>\n";
  for (const auto& scalar : scalars) declare("Float64", scalar.name, 1);
  for (const auto& vector : vectors) declare("Float64", vector.name, 3);
  declare("Float64", volume_name, 1);
  declare("Int32", index_name, 2);
  out << "    </PCellData>\n"
      << "    <PPoints>\n"
      << "      <PDataArray type=\"Float64\" Name=\"Points\" NumberOfComponents=\"3\"/>\n"
      << "    </PPoints>\n";
  for (size_t rank = 0; rank < extents.size() / 4; ++rank) {
    const int* e = &extents[4 * rank];
    out << "    <Piece Extent=\"" << e[0] << ' ' << e[1] << ' ' << e[2] << ' ' << e[3] << " 0 0\" Source=\""
        << piece_file_name(basename, static_cast<int>(rank)) << "\"/>\n";
  }
  out << "  </PStructuredGrid>\n"
      << "</VTKFile>\n";
  return out.str();
}

}  // namespace

std::string write_vtk_fields(const Grid& grid, const std::vector<NamedScalar>& scalars,
                             const std::vector<NamedVector>& vectors, const std::string& directory,
                             const std::string& basename, const Field* excluded) {
  const MPI_Comm comm = grid.comm();
  const int rank = grid.rank();
  const fs::path folder = directory.empty() ? fs::path(".") : fs::path(directory);
  const fs::path index_path = folder / (basename + ".pvts");

  agree(comm, attempt([&] {
          check_request(grid, scalars, vectors, basename);
          if (excluded != nullptr && excluded->data().size() != grid.n_ghosted())
            throw Error("vtk output: the excluded-cell marker does not belong to this grid");
        }),
        "checking the output request");
  const PointArrays point_values = point_arrays(grid, scalars, vectors, excluded);
  std::string directory_error;
  if (rank == 0) directory_error = attempt([&] { make_directory(folder); });
  agree(comm, directory_error, "creating the output directory");
  agree(comm, attempt([&] {
          write_file_atomically(folder / piece_file_name(basename, rank),
                                piece_document(grid, scalars, vectors, point_values), "vtk output");
        }),
        "writing its piece");

  // The index is written after every piece is in place, so it never lists a missing piece.
  const int mine[4] = {grid.x_begin(), grid.x_end(), grid.y_begin(), grid.y_end()};
  int size = 1;
  check_mpi(MPI_Comm_size(comm, &size));
  std::vector<int> extents(rank == 0 ? 4 * static_cast<size_t>(size) : 0);
  check_mpi(MPI_Gather(mine, 4, MPI_INT, extents.data(), 4, MPI_INT, 0, comm));
  std::string index_error;
  if (rank == 0) {
    index_error = attempt([&] {
      write_file_atomically(index_path, index_document(grid, scalars, vectors, basename, extents),
                            "vtk output");
    });
  }
  agree(comm, index_error, "writing the index file");
  return index_path.string();
}

void write_vtk_series(const std::string& path, const std::vector<SeriesEntry>& entries) {
  std::ostringstream out;
  out.precision(17);
  out << "<?xml version=\"1.0\"?>\n"
      << "<VTKFile type=\"Collection\" version=\"0.1\" byte_order=\""
      << (std::endian::native == std::endian::little ? "LittleEndian" : "BigEndian") << "\">\n"
      << "  <Collection>\n";
  for (const SeriesEntry& entry : entries) {
    if (!is_plain_name(entry.file)) {
      throw Error(path + ": series file name '" + entry.file +
                  "' must be non-empty, without control or XML markup characters");
    }
    out << "    <DataSet timestep=\"" << entry.time << "\" group=\"\" part=\"0\" file=\"" << entry.file
        << "\"/>\n";
  }
  out << "  </Collection>\n"
      << "</VTKFile>\n";
  write_file_atomically(path, out.str(), "vtk series");
}

}  // namespace wallrans
