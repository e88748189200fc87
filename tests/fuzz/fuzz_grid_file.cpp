// Fuzz target: grid-file bytes -> a file -> the solver's reader (read_grid_file, MPI-IO driver, one
// rank) and the converter's reader (grid_file_format::read_file, serial driver). A bad file must
// end in a one-line InputError naming it in both; both must accept the same files and return the
// same content, which must be a usable grid (sizes, finite nodes, valid patches).
#include <mpi.h>

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <string>

#include "fuzz_support.hpp"
#include "io/grid_file.hpp"
#include "io/grid_file_format.hpp"

namespace {

using namespace wallrans;

const fuzz::InputFile input("wallrans_fuzz_grid_file");

void check_usable(const GridFileContent& content, const std::string& path) {
  const NodeCoordinates& nodes = content.nodes;
  if (nodes.cells_x < 1 || nodes.cells_y < 1) fuzz::finding("accepted a grid without cells");
  if (nodes.nodes.size() != static_cast<size_t>(nodes.cells_x + 1) * static_cast<size_t>(nodes.cells_y + 1)) {
    fuzz::finding("accepted a grid whose node count differs from its size");
  }
  for (const Vec2& node : nodes.nodes) {
    if (!std::isfinite(node.x) || !std::isfinite(node.y)) fuzz::finding("accepted a non-finite node");
  }
  for (const GridPatch& patch : content.patches) {
    try {
      check_patch(patch, nodes.cells_x, nodes.cells_y, path);
    } catch (const std::exception& e) {
      fuzz::finding(std::string("accepted a patch that check_patch rejects: ") + e.what());
    }
  }
}

bool same_content(const GridFileContent& a, const GridFileContent& b) {
  if (a.nodes.cells_x != b.nodes.cells_x || a.nodes.cells_y != b.nodes.cells_y) return false;
  if (a.patches != b.patches || a.nodes.nodes.size() != b.nodes.nodes.size()) return false;
  for (size_t k = 0; k < a.nodes.nodes.size(); ++k) {
    if (a.nodes.nodes[k].x != b.nodes.nodes[k].x || a.nodes.nodes[k].y != b.nodes.nodes[k].y) return false;
  }
  return true;
}

}  // namespace

extern "C" int LLVMFuzzerInitialize(int*, char***) {
  fuzz::start_mpi();
  return 0;
}

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  const std::string& path = input.path();
  input.write(data, size);
  GridFileContent solver_view, converter_view;
  const bool solver_accepts = fuzz::accepts(path, [&] { solver_view = read_grid_file(MPI_COMM_SELF, path); });
  const bool converter_accepts = fuzz::accepts(path, [&] {
    const QuietHdf5Errors quiet;
    converter_view = grid_file_format::read_file(path);
  });
  if (solver_accepts != converter_accepts) {
    fuzz::finding(std::string("the solver's reader ") + (solver_accepts ? "accepts" : "rejects") +
                  " a file that the converter's reader " + (converter_accepts ? "accepts" : "rejects"));
  }
  if (!solver_accepts) return 0;
  check_usable(solver_view, path);
  if (!same_content(solver_view, converter_view)) fuzz::finding("the two readers return different content");
  return 0;
}
