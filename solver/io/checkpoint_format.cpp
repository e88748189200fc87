// The checkpoint layout's serial parts: metadata attributes, validation of a file by one rank
// before any collective call touches it, and the metadata byte image for broadcasts.
#include "io/checkpoint_format.hpp"

#include <cmath>
#include <cstdint>
#include <cstring>
#include <type_traits>

#include "core/error.hpp"
#include "io/hdf5_attributes.hpp"
#include "io/text_excerpt.hpp"

namespace wallrans::checkpoint_format {

namespace {

constexpr const char* format_attribute = "format";
constexpr const char* version_attribute = "format_version";

std::string dims_text(const std::vector<unsigned long long>& dims) {
  std::string text;
  for (size_t k = 0; k < dims.size(); ++k) text += (k ? " x " : "") + std::to_string(dims[k]);
  return text;
}

class Packer {
 public:
  template <typename T>
  void put(const T& value) {
    static_assert(std::is_trivially_copyable_v<T>);
    bytes_.append(reinterpret_cast<const char*>(&value), sizeof value);
  }
  void put(const std::string& text) {
    put<uint64_t>(text.size());
    bytes_ += text;
  }
  const std::string& bytes() const { return bytes_; }

 private:
  std::string bytes_;
};

class Unpacker {
 public:
  explicit Unpacker(const std::string& bytes) : bytes_(bytes) {}
  template <typename T>
  T get() {
    static_assert(std::is_trivially_copyable_v<T>);
    T value;
    std::memcpy(&value, take(sizeof value), sizeof value);
    return value;
  }
  std::string get_string() {
    const auto size = static_cast<size_t>(get<uint64_t>());
    return std::string(take(size), size);
  }

 private:
  const char* take(size_t size) {
    if (size > bytes_.size() - position_) throw Error("checkpoint metadata: broadcast image is truncated");
    const char* start = bytes_.data() + position_;
    position_ += size;
    return start;
  }
  const std::string& bytes_;
  size_t position_ = 0;
};

}  // namespace

bool is_valid_name(const std::string& name) {
  if (name.empty() || name == "." || name == "..") return false;
  for (const char c : name) {
    const bool ok = (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') || c == '_' ||
                    c == '-' || c == '.';
    if (!ok) return false;
  }
  return true;
}

void write_metadata(hid_t file, const CheckpointMetadata& metadata) {
  write_string_attribute(file, format_attribute, marker);
  write_int_attribute(file, version_attribute, version);
  write_int_attribute(file, "iteration", metadata.iteration);
  write_string_attribute(file, "turbulence_model", metadata.model);
  write_string_attribute(file, "turbulence_variant", metadata.variant);
  write_int_attribute(file, "cells_x", metadata.cells_x);
  write_int_attribute(file, "cells_y", metadata.cells_y);
  write_string_attribute(file, "grid_fingerprint", metadata.grid_fingerprint);
  write_string_attribute(file, "case_hash", metadata.case_hash);
  write_string_attribute(file, "program_version", metadata.program_version);
  write_string_attribute(file, "written_at", metadata.written_at);
  // Creation order is tracked so the scalars read back in the order they were given.
  const Hdf5PropertyList creation(check_hdf5(H5Pcreate(H5P_GROUP_CREATE), "H5Pcreate"));
  check_hdf5(H5Pset_attr_creation_order(creation.get(), H5P_CRT_ORDER_TRACKED | H5P_CRT_ORDER_INDEXED),
             "H5Pset_attr_creation_order");
  const Hdf5Group scalars(
      check_hdf5(H5Gcreate2(file, scalars_group, H5P_DEFAULT, creation.get(), H5P_DEFAULT), "H5Gcreate2"));
  for (const auto& [name, value] : metadata.scalars) write_double_attribute(scalars.get(), name, value);
}

std::string expected_checkpoint(const std::string& path) {
  return path + ": expected a wallrans checkpoint (HDF5 with attribute 'format'), got ";
}

Hdf5File open_for_validation(const std::string& path, int* version_out) {
  const std::string expected = expected_checkpoint(path);
  Hdf5File file = open_hdf5_read_only(path, expected);
  if (!has_attribute(file.get(), format_attribute)) {
    throw InputError(expected + "an HDF5 file without attribute 'format'");
  }
  const std::string format =
      read_string_attribute(file.get(), format_attribute, path + ": attribute 'format'");
  if (format != marker) throw InputError(expected + "attribute 'format' = '" + excerpt(format) + "'");
  const int found_version =
      read_int_attribute(file.get(), version_attribute, path + ": attribute 'format_version'");
  if (found_version < oldest_readable_version || found_version > version) {
    // Version 1 kept boundary fluxes per block side and partly inside the east/north face
    // fields; no converter is provided.
    const std::string advice =
        found_version == 1
            ? " (an older checkpoint with boundary arrays per block side, which this wallrans cannot "
              "read: rerun the case from the start)"
            : "";
    throw InputError(path + ": attribute 'format_version': expected " +
                     std::to_string(oldest_readable_version) + " or " + std::to_string(version) + ", got " +
                     std::to_string(found_version) + advice);
  }
  if (version_out) *version_out = found_version;
  return file;
}

CheckpointMetadata read_metadata(hid_t file, const std::string& path) {
  auto label = [&path](const std::string& name) { return path + ": attribute '" + name + "'"; };
  auto read_string = [&](const char* name) { return read_string_attribute(file, name, label(name)); };
  auto read_int = [&](const char* name) { return read_int_attribute(file, name, label(name)); };
  CheckpointMetadata metadata;
  metadata.iteration = read_int("iteration");
  metadata.model = read_string("turbulence_model");
  metadata.variant = read_string("turbulence_variant");
  auto read_positive = [&](const char* name) {
    const int value = read_int(name);
    if (value < 1)
      throw InputError(label(name) + ": expected a positive integer, got " + std::to_string(value));
    return value;
  };
  metadata.cells_x = read_positive("cells_x");
  metadata.cells_y = read_positive("cells_y");
  metadata.grid_fingerprint = read_string("grid_fingerprint");
  metadata.case_hash = read_string("case_hash");
  metadata.program_version = read_string("program_version");
  metadata.written_at = read_string("written_at");

  const std::string group_path = std::string("/") + scalars_group;
  const std::string group_label = path + ": group '" + group_path + "'";
  if (!has_object(file, group_path))
    throw InputError(group_label + ": expected a group of scalars, got none");
  const Hdf5Group group(H5Gopen2(file, scalars_group, H5P_DEFAULT));
  if (!group) throw InputError(group_label + ": expected a group of scalars, got another kind of object");
  for (const std::string& name : attribute_names(group.get())) {
    const std::string label = path + ": attribute '" + excerpt(name) + "' of '" + group_path + "'";
    const double value = read_double_attribute(group.get(), name, label);
    if (!std::isfinite(value))
      throw InputError(label + ": expected a finite number, got " + std::to_string(value));
    metadata.scalars.emplace_back(name, value);
  }
  return metadata;
}

void check_dataset(hid_t file, const std::string& path, const std::string& dataset_path,
                   const std::vector<unsigned long long>& expected, const std::string& meaning) {
  const std::string label = path + ": dataset '" + dataset_path + "'";
  const std::string expectation =
      ": expected " + dims_text(expected) + " (" + meaning + ") floating-point values, got ";
  if (!has_object(file, dataset_path)) throw InputError(label + expectation + "no such dataset");
  const Hdf5Dataset dataset(H5Dopen2(file, dataset_path.c_str(), H5P_DEFAULT));
  if (!dataset) throw InputError(label + expectation + "an object that is not a dataset");
  const Hdf5Space space(check_hdf5(H5Dget_space(dataset.get()), "H5Dget_space"));
  const H5S_class_t space_class = H5Sget_simple_extent_type(space.get());
  if (space_class != H5S_SIMPLE) {
    throw InputError(label + expectation + (space_class == H5S_SCALAR ? "a single value" : "no values"));
  }
  const int n_dims =
      static_cast<int>(check_hdf5(H5Sget_simple_extent_ndims(space.get()), "H5Sget_simple_extent_ndims"));
  std::vector<hsize_t> dims(static_cast<size_t>(n_dims));
  check_hdf5(H5Sget_simple_extent_dims(space.get(), dims.data(), nullptr), "H5Sget_simple_extent_dims");
  const std::vector<unsigned long long> found(dims.begin(), dims.end());
  if (found != expected) throw InputError(label + expectation + dims_text(found));
  const Hdf5Type type(check_hdf5(H5Dget_type(dataset.get()), "H5Dget_type"));
  const H5T_class_t type_class = H5Tget_class(type.get());
  if (type_class != H5T_FLOAT) {
    throw InputError(label + expectation + dims_text(found) + " values of another type (" +
                     type_class_text(type_class) + ")");
  }
}

std::string pack(const CheckpointMetadata& metadata) {
  Packer packer;
  packer.put(metadata.iteration);
  packer.put(metadata.model);
  packer.put(metadata.variant);
  packer.put(metadata.cells_x);
  packer.put(metadata.cells_y);
  packer.put(metadata.grid_fingerprint);
  packer.put(metadata.case_hash);
  packer.put(metadata.program_version);
  packer.put(metadata.written_at);
  packer.put<uint64_t>(metadata.scalars.size());
  for (const auto& [name, value] : metadata.scalars) {
    packer.put(name);
    packer.put(value);
  }
  return packer.bytes();
}

CheckpointMetadata unpack(const std::string& bytes) {
  Unpacker unpacker(bytes);
  CheckpointMetadata metadata;
  metadata.iteration = unpacker.get<int>();
  metadata.model = unpacker.get_string();
  metadata.variant = unpacker.get_string();
  metadata.cells_x = unpacker.get<int>();
  metadata.cells_y = unpacker.get<int>();
  metadata.grid_fingerprint = unpacker.get_string();
  metadata.case_hash = unpacker.get_string();
  metadata.program_version = unpacker.get_string();
  metadata.written_at = unpacker.get_string();
  const auto n_scalars = static_cast<size_t>(unpacker.get<uint64_t>());
  for (size_t k = 0; k < n_scalars; ++k) {
    std::string name = unpacker.get_string();
    metadata.scalars.emplace_back(std::move(name), unpacker.get<double>());
  }
  return metadata;
}

}  // namespace wallrans::checkpoint_format
