// Grid-file checks that need no HDF5: patch names and ranges, finite coordinates, and the text
// image of the patches that rank 0 broadcasts.
#include "io/grid_file_content.hpp"

#include <array>
#include <cmath>
#include <set>
#include <sstream>
#include <utility>

#include "core/error.hpp"
#include "io/text_excerpt.hpp"

namespace wallrans {

namespace {

constexpr std::array<std::pair<Side, const char*>, 4> side_names{
    {{Side::left, "left"}, {Side::right, "right"}, {Side::bottom, "bottom"}, {Side::top, "top"}}};

bool is_valid_kind(const std::string& kind) {
  for (const char c : kind) {
    const bool ok = (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') || c == '_';
    if (!ok) return false;
  }
  return kind.size() <= static_cast<size_t>(grid_file_layout::max_name_length);
}

}  // namespace

const char* side_name(Side side) {
  for (const auto& [value, name] : side_names) {
    if (value == side) return name;
  }
  return "?";
}

std::optional<Side> side_from_name(const std::string& name) {
  for (const auto& [value, text] : side_names) {
    if (name == text) return value;
  }
  return std::nullopt;
}

int faces_on_side(Side side, int cells_x, int cells_y) {
  return side == Side::bottom || side == Side::top ? cells_x : cells_y;
}

bool is_valid_patch_name(const std::string& name) {
  if (name.empty() || name.size() > static_cast<size_t>(grid_file_layout::max_name_length)) return false;
  if (name == "." || name == "..") return false;
  for (const char c : name) {
    if (c < 0x20 || c > 0x7e || c == '/') return false;
  }
  return true;
}

void check_patch(const GridPatch& patch, int cells_x, int cells_y, const std::string& label) {
  if (!is_valid_patch_name(patch.name)) {
    throw InputError(label + ": expected a name of 1 to 32 printable ASCII characters without '/', got '" +
                     excerpt(patch.name) + "'");
  }
  if (!is_valid_kind(patch.kind)) {
    throw InputError(label + ": attribute 'kind': expected letters, digits and '_' (at most 32), got '" +
                     excerpt(patch.kind) + "'");
  }
  const int n = faces_on_side(patch.side, cells_x, cells_y);
  if (patch.first_face < 0 || patch.last_face >= n || patch.first_face > patch.last_face) {
    throw InputError(label + ": expected faces 0 <= first_face <= last_face <= " + std::to_string(n - 1) +
                     " on side '" + side_name(patch.side) + "' (" + std::to_string(n) + " faces), got [" +
                     std::to_string(patch.first_face) + ", " + std::to_string(patch.last_face) + "]");
  }
}

void check_content(const GridFileContent& content, const std::string& path) {
  const NodeCoordinates& nodes = content.nodes;
  for (int j = 0; j <= nodes.cells_y; ++j) {
    for (int i = 0; i <= nodes.cells_x; ++i) {
      const Vec2 p = nodes.at(i, j);
      if (!std::isfinite(p.x) || !std::isfinite(p.y)) {
        std::ostringstream got;
        got << "(" << p.x << ", " << p.y << ")";
        throw InputError(path + ": node (" + std::to_string(i) + ", " + std::to_string(j) +
                         "): expected finite coordinates, got " + got.str());
      }
    }
  }
  std::set<std::string> names;
  for (const GridPatch& patch : content.patches) {
    const std::string label = path + ": patch '" + excerpt(patch.name) + "'";
    check_patch(patch, nodes.cells_x, nodes.cells_y, label);
    if (!names.insert(patch.name).second) throw InputError(label + ": expected a unique name, got it twice");
  }
}

std::string pack_patches(const std::vector<GridPatch>& patches) {
  // Names are printable ASCII and kinds are identifiers, so tabs and newlines separate safely.
  std::string text;
  for (const GridPatch& p : patches) {
    text += p.name + '\t' + side_name(p.side) + '\t' + std::to_string(p.first_face) + '\t' +
            std::to_string(p.last_face) + '\t' + p.kind + '\n';
  }
  return text;
}

std::vector<GridPatch> unpack_patches(const std::string& text) {
  std::vector<GridPatch> patches;
  std::istringstream lines(text);
  std::string line;
  while (std::getline(lines, line)) {
    std::istringstream fields(line);
    std::string name, side, first, last, kind;
    std::getline(fields, name, '\t');
    std::getline(fields, side, '\t');
    std::getline(fields, first, '\t');
    std::getline(fields, last, '\t');
    std::getline(fields, kind, '\t');
    const auto parsed_side = side_from_name(side);
    if (!parsed_side) throw Error("grid file patches: broadcast image is damaged");
    patches.push_back({name, *parsed_side, std::stoi(first), std::stoi(last), kind});
  }
  return patches;
}

}  // namespace wallrans
