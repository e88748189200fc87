// What a grid file holds (node coordinates and named boundary patches) and the checks that need
// no HDF5, shared by the solver and the CGNS converter (docs/grid-file.md describes the layout).
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "core/case_spec.hpp"
#include "meshes/node_coordinates.hpp"

namespace wallrans {

/// A named run of boundary faces on one block side: faces first_face..last_face (0-based,
/// inclusive), counted along the side by increasing i (bottom, top) or j (left, right).
struct GridPatch {
  std::string name;
  Side side = Side::bottom;
  int first_face = 0;
  int last_face = 0;
  std::string kind;  ///< informational boundary kind (e.g. "wall"); empty if none

  bool operator==(const GridPatch&) const = default;
};

struct GridFileContent {
  NodeCoordinates nodes;
  std::vector<GridPatch> patches;
};

namespace grid_file_layout {

inline constexpr const char* marker = "wallrans-grid";
inline constexpr int version = 1;
inline constexpr const char* x_dataset = "/grid/x";
inline constexpr const char* y_dataset = "/grid/y";
inline constexpr const char* grid_group = "grid";
inline constexpr const char* patches_group = "patches";
/// Longest patch name: the limit of a CGNS node name, so every patch converts.
inline constexpr int max_name_length = 32;

}  // namespace grid_file_layout

/// Local. The side's name in files and case files ("left", ...), and back (nothing if unknown).
const char* side_name(Side side);
std::optional<Side> side_from_name(const std::string& name);

/// Local. Faces along `side` of a cells_x x cells_y block.
int faces_on_side(Side side, int cells_x, int cells_y);

/// Local. True if `name` is a valid patch name: 1 to 32 printable ASCII characters without '/',
/// not "." or "..".
bool is_valid_patch_name(const std::string& name);

/// Local. Checks a patch against a cells_x x cells_y block: its name, its kind (empty or letters,
/// digits and '_') and its face range. Throws InputError "<label>: expected ..., got ..." where
/// `label` names the file and the patch.
void check_patch(const GridPatch& patch, int cells_x, int cells_y, const std::string& label);

/// Local. Checks that every node coordinate is finite and that no two patches share a name;
/// InputError names `path` and the first offending node (i, j) or patch.
void check_content(const GridFileContent& content, const std::string& path);

/// Local. One-line-per-patch text image of the patches, for broadcasts, and back.
std::string pack_patches(const std::vector<GridPatch>& patches);
std::vector<GridPatch> unpack_patches(const std::string& text);

}  // namespace wallrans
