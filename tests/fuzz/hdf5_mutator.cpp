// Structure-aware mutation of HDF5 file images (hdf5_mutator.hpp): the image is opened with the
// in-memory (core) driver, one edit is made through the HDF5 API and the new image is taken back.
#include "hdf5_mutator.hpp"

#include <cmath>
#include <cstdlib>
#include <cstring>
#include <limits>
#include <random>
#include <string>
#include <vector>

#include "io/hdf5_handles.hpp"

extern "C" size_t LLVMFuzzerMutate(uint8_t* data, size_t size, size_t max_size);

namespace wallrans::fuzz {

namespace {

using Random = std::minstd_rand;

struct Object {
  std::string path;
  bool is_dataset = false;
};

herr_t collect_object(hid_t, const char* name, const H5O_info_t* info, void* data) {
  auto* objects = static_cast<std::vector<Object>*>(data);
  if (info->type == H5O_TYPE_GROUP || info->type == H5O_TYPE_DATASET) {
    const std::string path = std::string(name) == "." ? "/" : "/" + std::string(name);
    objects->push_back({path, info->type == H5O_TYPE_DATASET});
  }
  return 0;
}

herr_t collect_attribute(hid_t, const char* name, const H5A_info_t*, void* data) {
  static_cast<std::vector<std::string>*>(data)->push_back(name);
  return 0;
}

size_t pick(Random& random, size_t n) { return std::uniform_int_distribution<size_t>(0, n - 1)(random); }

std::string parent_of(const std::string& path) {
  const size_t slash = path.rfind('/');
  return slash == 0 ? "/" : path.substr(0, slash);
}

// Values that break assumptions: limits, signs, zero, and small off-by-one sizes.
long long interesting_integer(Random& random) {
  static const long long values[] = {0,       1,       -1,        2,         3,         4,     5,
                                     7,       8,       31,        32,        33,        65535, 65536,
                                     1 << 20, 1 << 30, INT32_MAX, INT32_MIN, INT64_MAX, -1000};
  return values[pick(random, std::size(values))];
}

double interesting_double(Random& random) {
  static const double values[] = {0.0,
                                  -0.0,
                                  1.0,
                                  -1.0,
                                  1e-320,
                                  1e308,
                                  -1e308,
                                  std::numeric_limits<double>::quiet_NaN(),
                                  std::numeric_limits<double>::infinity(),
                                  -std::numeric_limits<double>::infinity(),
                                  0.5,
                                  3.0e9};
  return values[pick(random, std::size(values))];
}

std::string interesting_text(Random& random, const std::string& old) {
  switch (pick(random, 7)) {
    case 0:
      return "";
    case 1:
      return std::string(300, 'x');
    case 2:
      return old.empty() ? "a" : old.substr(0, old.size() - 1);
    case 3:
      return old + "\n" + old;
    case 4:
      return std::string("bad\0name", 8);
    case 5:
      return "\xff\xfe\x80";
    default: {
      static const char* words[] = {"wallrans-checkpoint",
                                    "wallrans-grid",
                                    "left",
                                    "right",
                                    "bottom",
                                    "top",
                                    "wall",
                                    "..",
                                    "/",
                                    "a/b",
                                    "spalart_allmaras",
                                    "standard",
                                    "laminar",
                                    "0"};
      return words[pick(random, std::size(words))];
    }
  }
}

// The names an edit may touch or create: those in the file and a few of every reader's keys.
std::string some_attribute_name(Random& random, const std::vector<std::string>& present) {
  static const char* known[] = {"format",
                                "format_version",
                                "iteration",
                                "cells_x",
                                "cells_y",
                                "turbulence_model",
                                "turbulence_variant",
                                "grid_fingerprint",
                                "case_hash",
                                "side",
                                "first_face",
                                "last_face",
                                "kind",
                                "written_at",
                                "program_version",
                                "reference_u"};
  if (!present.empty() && pick(random, 3) != 0) return present[pick(random, present.size())];
  return known[pick(random, std::size(known))];
}

void write_scalar(hid_t object, const std::string& name, hid_t type, const void* value) {
  const Hdf5Space space(H5Screate(H5S_SCALAR));
  const Hdf5Attribute attribute(
      H5Acreate2(object, name.c_str(), type, space.get(), H5P_DEFAULT, H5P_DEFAULT));
  if (attribute) (void)H5Awrite(attribute.get(), type, value);
}

std::string old_text(hid_t object, const std::string& name) {
  std::string text;
  const Hdf5Attribute attribute(H5Aopen(object, name.c_str(), H5P_DEFAULT));
  if (!attribute) return text;
  const Hdf5Type type(H5Aget_type(attribute.get()));
  if (H5Tget_class(type.get()) != H5T_STRING || H5Tis_variable_str(type.get()) > 0) return text;
  text.resize(H5Tget_size(type.get()));
  if (H5Aread(attribute.get(), type.get(), text.data()) < 0) text.clear();
  return text;
}

// Rewrites (or adds, or deletes) one attribute of `object` with another type or value.
void mutate_attribute(Random& random, hid_t object) {
  std::vector<std::string> present;
  hsize_t position = 0;
  (void)H5Aiterate2(object, H5_INDEX_NAME, H5_ITER_INC, &position, collect_attribute, &present);
  const std::string name = some_attribute_name(random, present);
  const std::string old = old_text(object, name);
  if (H5Aexists(object, name.c_str()) > 0) (void)H5Adelete(object, name.c_str());
  switch (pick(random, 6)) {
    case 0:
      return;  // deleted
    case 1: {
      const auto value = static_cast<int32_t>(interesting_integer(random));
      write_scalar(object, name, H5T_NATIVE_INT32, &value);
      return;
    }
    case 2: {
      const long long value = interesting_integer(random);
      write_scalar(object, name, H5T_NATIVE_LLONG, &value);
      return;
    }
    case 3: {
      const double value = interesting_double(random);
      write_scalar(object, name, H5T_NATIVE_DOUBLE, &value);
      return;
    }
    case 4: {
      const std::string text = interesting_text(random, old);
      const Hdf5Type type(H5Tcopy(H5T_C_S1));
      (void)H5Tset_size(type.get(), std::max<size_t>(text.size(), 1));
      std::string padded = text;
      padded.resize(std::max<size_t>(text.size(), 1), '\0');
      write_scalar(object, name, type.get(), padded.data());
      return;
    }
    default: {
      const hsize_t dims[1] = {2};
      const Hdf5Space space(H5Screate_simple(1, dims, nullptr));
      const Hdf5Attribute attribute(
          H5Acreate2(object, name.c_str(), H5T_NATIVE_INT32, space.get(), H5P_DEFAULT, H5P_DEFAULT));
      const int32_t values[2] = {1, 2};
      if (attribute) (void)H5Awrite(attribute.get(), H5T_NATIVE_INT32, values);
    }
  }
}

// Replaces dataset `path` by one of another shape, type or content.
void mutate_dataset(Random& random, hid_t file, const std::string& path) {
  std::vector<hsize_t> dims;
  std::vector<double> values;
  {
    const Hdf5Dataset dataset(H5Dopen2(file, path.c_str(), H5P_DEFAULT));
    if (!dataset) return;
    const Hdf5Space space(H5Dget_space(dataset.get()));
    const int n_dims = H5Sget_simple_extent_ndims(space.get());
    if (n_dims < 0) return;
    dims.resize(static_cast<size_t>(n_dims));
    (void)H5Sget_simple_extent_dims(space.get(), dims.data(), nullptr);
    const hssize_t n = H5Sget_simple_extent_npoints(space.get());
    if (n < 0 || n > (1 << 20)) return;
    values.resize(static_cast<size_t>(n));
    if (!values.empty() &&
        H5Dread(dataset.get(), H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT, values.data()) < 0)
      return;
  }
  hid_t type = H5T_NATIVE_DOUBLE;
  bool write_values = true;
  Hdf5PropertyList creation(H5Pcreate(H5P_DATASET_CREATE));
  switch (pick(random, 7)) {
    case 0:  // one value changed
      if (!values.empty()) values[pick(random, values.size())] = interesting_double(random);
      break;
    case 1:  // one dimension one more or one less, or a dimension added or dropped
      if (!dims.empty() && pick(random, 2) == 0) {
        hsize_t& d = dims[pick(random, dims.size())];
        d = pick(random, 2) == 0 ? d + 1 : (d > 0 ? d - 1 : 0);
      } else if (pick(random, 2) == 0) {
        dims.push_back(2);
      } else if (!dims.empty()) {
        dims.pop_back();
      }
      break;
    case 2:  // dimensions swapped
      if (dims.size() == 2) std::swap(dims[0], dims[1]);
      break;
    case 3:  // integer values
      type = H5T_NATIVE_INT32;
      break;
    case 4: {  // huge declared size, nothing stored (chunked: reads give the fill value)
      for (hsize_t& d : dims) d = static_cast<hsize_t>(interesting_integer(random) & 0x7fffffff) + 1;
      std::vector<hsize_t> chunk(dims.size(), 1);
      if (chunk.empty() || H5Pset_chunk(creation.get(), static_cast<int>(chunk.size()), chunk.data()) < 0)
        return;
      write_values = false;
      break;
    }
    case 5:  // every value non-finite
      for (double& v : values) v = std::numeric_limits<double>::quiet_NaN();
      break;
    default:  // a single value instead of an array
      dims.clear();
      break;
  }
  (void)H5Ldelete(file, path.c_str(), H5P_DEFAULT);
  const Hdf5Space space(dims.empty() ? H5Screate(H5S_SCALAR)
                                     : H5Screate_simple(static_cast<int>(dims.size()), dims.data(), nullptr));
  if (!space) return;
  const Hdf5Dataset dataset(
      H5Dcreate2(file, path.c_str(), type, space.get(), H5P_DEFAULT, creation.get(), H5P_DEFAULT));
  if (!dataset || !write_values) return;
  const hssize_t n = H5Sget_simple_extent_npoints(space.get());
  if (n < 0) return;
  values.resize(static_cast<size_t>(n), 1.0);
  (void)H5Dwrite(dataset.get(), H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT, values.data());
}

// Deletes, moves, replaces or links objects.
void mutate_structure(Random& random, hid_t file, const std::vector<Object>& objects) {
  const Object& object = objects[pick(random, objects.size())];
  if (object.path == "/") return;
  const Object& other = objects[pick(random, objects.size())];
  switch (pick(random, 6)) {
    case 0:
      (void)H5Ldelete(file, object.path.c_str(), H5P_DEFAULT);
      return;
    case 1:  // renamed within its group
      (void)H5Lmove(file, object.path.c_str(), file, (object.path + "_").c_str(), H5P_DEFAULT, H5P_DEFAULT);
      return;
    case 2:  // replaced by an empty group (a dataset) or a small dataset (a group)
      (void)H5Ldelete(file, object.path.c_str(), H5P_DEFAULT);
      if (object.is_dataset) {
        const Hdf5Group group(H5Gcreate2(file, object.path.c_str(), H5P_DEFAULT, H5P_DEFAULT, H5P_DEFAULT));
      } else {
        const hsize_t dims[1] = {3};
        const Hdf5Space space(H5Screate_simple(1, dims, nullptr));
        const Hdf5Dataset dataset(H5Dcreate2(file, object.path.c_str(), H5T_NATIVE_DOUBLE, space.get(),
                                             H5P_DEFAULT, H5P_DEFAULT, H5P_DEFAULT));
      }
      return;
    case 3:  // replaced by a soft link to another object, or to nothing
      (void)H5Ldelete(file, object.path.c_str(), H5P_DEFAULT);
      (void)H5Lcreate_soft(pick(random, 2) == 0 ? other.path.c_str() : "/nowhere", file, object.path.c_str(),
                           H5P_DEFAULT, H5P_DEFAULT);
      return;
    case 4:  // replaced by a link into a file that does not exist
      (void)H5Ldelete(file, object.path.c_str(), H5P_DEFAULT);
      (void)H5Lcreate_external("wallrans_fuzz_missing.h5", "/x", file, object.path.c_str(), H5P_DEFAULT,
                               H5P_DEFAULT);
      return;
    default: {  // a new member next to it, with an odd name
      static const char* names[] = {"extra", " ", "a.b", "0123456789012345678901234567890123456789", "\x7f"};
      const std::string path = parent_of(object.path) + (parent_of(object.path) == "/" ? "" : "/") +
                               names[pick(random, std::size(names))];
      const Hdf5Group group(H5Gcreate2(file, path.c_str(), H5P_DEFAULT, H5P_DEFAULT, H5P_DEFAULT));
      if (group) mutate_attribute(random, group.get());
    }
  }
}

}  // namespace

size_t mutate_hdf5_image(uint8_t* data, size_t size, size_t max_size, unsigned int seed) {
  const char* raw = std::getenv("WALLRANS_FUZZ_RAW");
  if (raw != nullptr && std::strcmp(raw, "1") == 0) return LLVMFuzzerMutate(data, size, max_size);
  const QuietHdf5Errors quiet;
  Random random(seed);
  std::string image;
  {
    const Hdf5PropertyList access(H5Pcreate(H5P_FILE_ACCESS));
    if (H5Pset_fapl_core(access.get(), 1 << 16, false) < 0 || H5Pset_file_image(access.get(), data, size) < 0)
      return size;
    const Hdf5File file(H5Fopen("wallrans-fuzz-mutant", H5F_ACC_RDWR, access.get()));
    if (!file) return size;
    std::vector<Object> objects;
    if (H5Ovisit(file.get(), H5_INDEX_NAME, H5_ITER_INC, collect_object, &objects) < 0 || objects.empty())
      return size;
    const int n_edits = 1 + static_cast<int>(pick(random, 3));
    for (int k = 0; k < n_edits; ++k) {
      const Object& object = objects[pick(random, objects.size())];
      switch (pick(random, 3)) {
        case 0: {
          const Hdf5Owner<H5Oclose> opened(H5Oopen(file.get(), object.path.c_str(), H5P_DEFAULT));
          if (opened) mutate_attribute(random, opened.get());
          break;
        }
        case 1:
          if (object.is_dataset) mutate_dataset(random, file.get(), object.path);
          break;
        default:
          mutate_structure(random, file.get(), objects);
      }
    }
    if (H5Fflush(file.get(), H5F_SCOPE_GLOBAL) < 0) return size;
    const ssize_t length = H5Fget_file_image(file.get(), nullptr, 0);
    if (length <= 0 || static_cast<size_t>(length) > max_size) return size;
    image.resize(static_cast<size_t>(length));
    if (H5Fget_file_image(file.get(), image.data(), image.size()) < 0) return size;
  }
  std::memcpy(data, image.data(), image.size());
  return image.size();
}

}  // namespace wallrans::fuzz

// libFuzzer's hook: linked into the HDF5 fuzz programs only (not into their replays).
extern "C" size_t LLVMFuzzerCustomMutator(uint8_t* data, size_t size, size_t max_size, unsigned int seed) {
  return wallrans::fuzz::mutate_hdf5_image(data, size, max_size, seed);
}
