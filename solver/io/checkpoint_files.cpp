// Local checkpoint helpers that need no HDF5: the FNV-1a fingerprints, the XDMF description and
// pruning of old checkpoint files.
#include <unistd.h>

#include <algorithm>
#include <bit>
#include <cerrno>
#include <charconv>
#include <cstdint>
#include <cstdio>
#include <filesystem>
#include <functional>
#include <memory>
#include <sstream>
#include <system_error>
#include <utility>
#include <vector>

#include "core/atomic_file.hpp"
#include "core/error.hpp"
#include "io/checkpoint.hpp"

namespace wallrans {

namespace {

namespace fs = std::filesystem;

// 64-bit FNV-1a (Fowler, Noll and Vo): offset basis and prime from the published FNV parameters.
class Fnv1a {
 public:
  void add_byte(unsigned char byte) {
    state_ ^= byte;
    state_ *= 0x100000001b3ULL;
  }
  void add_word(uint64_t word) {  // little-endian byte order on every machine
    for (int k = 0; k < 8; ++k) add_byte(static_cast<unsigned char>(word >> (8 * k)));
  }
  std::string hex() const {
    char text[17];
    std::snprintf(text, sizeof text, "%016llx", static_cast<unsigned long long>(state_));
    return text;
  }

 private:
  uint64_t state_ = 0xcbf29ce484222325ULL;
};

std::string escape_xml(const std::string& text) {
  std::string out;
  for (const char c : text) {
    switch (c) {
      case '&':
        out += "&amp;";
        break;
      case '<':
        out += "&lt;";
        break;
      case '>':
        out += "&gt;";
        break;
      case '"':
        out += "&quot;";
        break;
      case '\'':
        out += "&apos;";
        break;
      default:
        out += c;
    }
  }
  return out;
}

// XDMF 3 "DataItem" of doubles stored in the HDF5 file, dimensions slowest first.
std::string data_item(const std::string& h5_file_name, const std::string& dataset,
                      const std::string& dimensions) {
  std::ostringstream out;
  out << "<DataItem Dimensions=\"" << dimensions << "\" NumberType=\"Float\" Precision=\"8\" Format=\"HDF\">"
      << escape_xml(h5_file_name) << ':' << escape_xml(dataset) << "</DataItem>";
  return out.str();
}

std::string dims(int n_slow, int n_fast) { return std::to_string(n_slow) + ' ' + std::to_string(n_fast); }

}  // namespace

std::string grid_fingerprint(const NodeCoordinates& nodes) {
  Fnv1a hash;
  hash.add_word(static_cast<uint64_t>(static_cast<int64_t>(nodes.cells_x)));
  hash.add_word(static_cast<uint64_t>(static_cast<int64_t>(nodes.cells_y)));
  hash.add_word(nodes.nodes.size());
  for (const Vec2& node : nodes.nodes) {
    hash.add_word(std::bit_cast<uint64_t>(node.x));
    hash.add_word(std::bit_cast<uint64_t>(node.y));
  }
  return hash.hex();
}

std::string text_hash(const std::string& text) {
  Fnv1a hash;
  for (const char c : text) hash.add_byte(static_cast<unsigned char>(c));
  return hash.hex();
}

void write_checkpoint_xdmf(const std::string& xdmf_path, const std::string& h5_file_name,
                           const CheckpointMetadata& metadata, const std::vector<std::string>& field_names) {
  if (h5_file_name.empty() || h5_file_name.find_first_of("/:") != std::string::npos) {
    throw Error("checkpoint xdmf '" + xdmf_path + "': HDF5 file name '" + h5_file_name +
                "' must be a bare file name without '/' or ':'");
  }
  if (metadata.cells_x < 1 || metadata.cells_y < 1) {
    throw Error("checkpoint xdmf '" + xdmf_path +
                "': metadata has no grid size (use the metadata the writer returned)");
  }
  for (const std::string& name : field_names) {
    if (name.empty() || name.find_first_of("/:") != std::string::npos) {
      throw Error("checkpoint xdmf '" + xdmf_path + "': field name '" + name +
                  "' is empty or has '/' or ':'");
    }
  }
  const int nx = metadata.cells_x, ny = metadata.cells_y;
  std::ostringstream out;
  out << "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
      << "<Xdmf Version=\"3.0\">\n"
      << "  <Domain>\n"
      << "    <Grid Name=\"wallrans\" GridType=\"Uniform\">\n"
      << "      <Time Value=\"" << metadata.iteration << "\"/>\n"
      << "      <Information Name=\"iteration\" Value=\"" << metadata.iteration << "\"/>\n"
      << "      <Information Name=\"turbulence_model\" Value=\"" << escape_xml(metadata.model) << "\"/>\n"
      << "      <Information Name=\"written_at\" Value=\"" << escape_xml(metadata.written_at) << "\"/>\n"
      << "      <Topology TopologyType=\"2DSMesh\" Dimensions=\"" << ny + 1 << ' ' << nx + 1 << "\"/>\n"
      << "      <Geometry GeometryType=\"XY\">\n"
      << "        " << data_item(h5_file_name, "/grid/xy", dims(ny + 1, nx + 1) + " 2") << "\n"
      << "      </Geometry>\n";
  for (const std::string& name : field_names) {
    out << "      <Attribute Name=\"" << escape_xml(name) << "\" AttributeType=\"Scalar\" Center=\"Cell\">\n"
        << "        " << data_item(h5_file_name, "/fields/" + name, dims(ny, nx)) << "\n"
        << "      </Attribute>\n";
  }
  out << "    </Grid>\n"
      << "  </Domain>\n"
      << "</Xdmf>\n";
  write_file_atomically(xdmf_path, out.str(), "checkpoint xdmf");
}

void prune_checkpoints(const std::string& directory, const std::string& prefix, int keep,
                       const std::function<bool(const std::string&)>& belongs) {
  if (keep < 0) throw Error("prune_checkpoints: keep must be >= 0, got " + std::to_string(keep));
  const std::string head = prefix + "_", tail = ".h5";
  std::vector<std::pair<unsigned long long, fs::path>> found;
  std::error_code error;
  for (fs::directory_iterator entry(directory, error), end; !error && entry != end; entry.increment(error)) {
    const std::string name = entry->path().filename().string();
    if (name.size() <= head.size() + tail.size() || !name.starts_with(head) || !name.ends_with(tail))
      continue;
    const std::string digits = name.substr(head.size(), name.size() - head.size() - tail.size());
    unsigned long long iteration = 0;
    const auto [end_of_number, status] =
        std::from_chars(digits.data(), digits.data() + digits.size(), iteration);
    if (status != std::errc() || end_of_number != digits.data() + digits.size()) continue;
    std::error_code ignored;
    if (entry->is_regular_file(ignored) && (!belongs || belongs(entry->path().string())))
      found.emplace_back(iteration, entry->path());
  }
  if (error) throw Error("prune_checkpoints: cannot list '" + directory + "': " + error.message());
  std::sort(found.begin(), found.end(), [](const auto& a, const auto& b) {
    return a.first != b.first ? a.first > b.first : a.second > b.second;
  });
  for (size_t k = static_cast<size_t>(keep); k < found.size(); ++k) {
    fs::path description = found[k].second;
    description.replace_extension(".xmf");
    for (const fs::path& victim : {found[k].second, description}) {
      fs::remove(victim, error);
      if (error)
        throw Error("prune_checkpoints: cannot delete '" + victim.string() + "': " + error.message());
    }
  }
}

}  // namespace wallrans
