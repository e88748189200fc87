// VTK XML output of cell fields. Each piece is serialised by VTK's structured-grid writer (raw
// binary appended data); the small parallel index is written here directly, following VTK's
// documented XML file format, because it needs only the gathered piece extents.
#include "io/vtk_writer.hpp"

#include <unistd.h>
#include <vtkCellData.h>
#include <vtkDoubleArray.h>
#include <vtkIntArray.h>
#include <vtkNew.h>
#include <vtkPoints.h>
#include <vtkStructuredGrid.h>
#include <vtkXMLStructuredGridWriter.h>

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

std::string piece_file_name(const std::string& basename, int rank) {
  return basename + "_" + std::to_string(rank) + ".vts";
}

// Local. This rank's piece as a complete .vts document: the nodes of the owned cells as points and
// the owned cells' data. The DMDA's owned order (i fastest) is VTK's cell order, so Grid::owned
// gives the VTK cell id.
std::string piece_document(const Grid& grid, const std::vector<NamedScalar>& scalars,
                           const std::vector<NamedVector>& vectors) {
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
      << "    <PCellData>\n";
  auto declare = [&out](const char* type, const std::string& name, int n_components) {
    out << "      <PDataArray type=\"" << type << "\" Name=\"" << name << "\" NumberOfComponents=\""
        << n_components << "\"/>\n";
  };
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
                             const std::string& basename) {
  const MPI_Comm comm = grid.comm();
  const int rank = grid.rank();
  const fs::path folder = directory.empty() ? fs::path(".") : fs::path(directory);
  const fs::path index_path = folder / (basename + ".pvts");

  agree(comm, attempt([&] { check_request(grid, scalars, vectors, basename); }),
        "checking the output request");
  std::string directory_error;
  if (rank == 0) directory_error = attempt([&] { make_directory(folder); });
  agree(comm, directory_error, "creating the output directory");
  agree(comm, attempt([&] {
          write_file_atomically(folder / piece_file_name(basename, rank),
                                piece_document(grid, scalars, vectors), "vtk output");
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

}  // namespace wallrans
