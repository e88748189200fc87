// wallrans-cgns: converts single-zone 2-D structured grids between CGNS and our HDF5 grid layout
// (docs/grid-file.md). A program of its own because libcgns brings the serial HDF5.
#include <cstdio>
#include <exception>
#include <string>

#include "cgns_grid.hpp"
#include "core/error.hpp"
#include "io/grid_file_format.hpp"

namespace {

constexpr const char* usage =
    "usage: wallrans-cgns <command> INPUT OUTPUT\n"
    "  to-cgns GRID.h5 GRID.cgns     our grid file -> CGNS (one structured zone, BC_t per patch)\n"
    "  from-cgns GRID.cgns GRID.h5   CGNS (one 2-D structured zone) -> our grid file\n"
    "exit codes: 0 written, 2 bad input (nothing written), 1 other failure\n";

void report(const char* verb, const std::string& input, const std::string& output,
            const wallrans::GridFileContent& content) {
  std::printf("wallrans-cgns: %s %s -> %s (%d x %d cells, %zu patches)\n", verb, input.c_str(),
              output.c_str(), content.nodes.cells_x, content.nodes.cells_y, content.patches.size());
}

}  // namespace

int main(int argc, char** argv) {
  const std::string command = argc > 1 ? argv[1] : "";
  if (command == "--help" || command == "-h") {
    std::fputs(usage, stdout);
    return 0;
  }
  try {
    if (argc != 4 || (command != "to-cgns" && command != "from-cgns")) {
      throw wallrans::InputError(
          "command line: expected 'to-cgns GRID.h5 GRID.cgns' or 'from-cgns GRID.cgns GRID.h5', got " +
          std::to_string(argc - 1) + " argument(s)" +
          (command.empty() ? "" : " starting with '" + command + "'"));
    }
    const std::string input = argv[2], output = argv[3];
    if (command == "to-cgns") {
      const wallrans::GridFileContent content = wallrans::grid_file_format::read_file(input);
      wallrans::write_cgns_grid(output, content);
      report("converted", input, output, content);
    } else {
      const wallrans::GridFileContent content = wallrans::read_cgns_grid(input);
      wallrans::grid_file_format::write_file(output, content);
      report("converted", input, output, content);
    }
  } catch (const wallrans::InputError& e) {
    std::fprintf(stderr, "wallrans-cgns: error: %s\n", e.what());
    return 2;
  } catch (const std::exception& e) {
    std::fprintf(stderr, "wallrans-cgns: fatal: %s\n", e.what());
    return 1;
  }
  return 0;
}
