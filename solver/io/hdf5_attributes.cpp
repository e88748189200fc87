// Typed single-value HDF5 attributes: writing, and reading with one-line input messages.
#include "io/hdf5_attributes.hpp"

#include <cstdint>
#include <limits>

#include "core/error.hpp"

namespace wallrans {

namespace {

void write_attribute(hid_t object, const std::string& name, hid_t file_type, hid_t memory_type,
                     const void* value) {
  const Hdf5Space space(check_hdf5(H5Screate(H5S_SCALAR), "H5Screate"));
  const Hdf5Attribute attribute(check_hdf5(
      H5Acreate2(object, name.c_str(), file_type, space.get(), H5P_DEFAULT, H5P_DEFAULT), "H5Acreate2"));
  check_hdf5(H5Awrite(attribute.get(), memory_type, value), "H5Awrite");
}

// An open attribute, its type and its class, after checking that it exists and holds one value.
struct OpenAttribute {
  Hdf5Attribute attribute;
  Hdf5Type type;
  H5T_class_t type_class = H5T_NO_CLASS;
};

OpenAttribute open_single(hid_t object, const std::string& name, const std::string& label,
                          const std::string& expected) {
  if (!has_attribute(object, name)) throw InputError(label + ": expected " + expected + ", got none");
  OpenAttribute open;
  open.attribute = Hdf5Attribute(H5Aopen(object, name.c_str(), H5P_DEFAULT));
  if (!open.attribute) throw InputError(label + ": expected " + expected + ", got an unreadable attribute");
  const Hdf5Space space(check_hdf5(H5Aget_space(open.attribute.get()), "H5Aget_space"));
  const hssize_t n_values =
      check_hdf5(H5Sget_simple_extent_npoints(space.get()), "H5Sget_simple_extent_npoints");
  open.type = Hdf5Type(check_hdf5(H5Aget_type(open.attribute.get()), "H5Aget_type"));
  open.type_class = H5Tget_class(open.type.get());
  if (n_values != 1) {
    throw InputError(label + ": expected " + expected + ", got " + std::to_string(n_values) + " values");
  }
  return open;
}

}  // namespace

std::string type_class_text(H5T_class_t type_class) {
  switch (type_class) {
    case H5T_INTEGER:
      return "an integer";
    case H5T_FLOAT:
      return "a floating-point number";
    case H5T_STRING:
      return "a string";
    case H5T_COMPOUND:
      return "a compound value";
    case H5T_ENUM:
      return "an enumeration";
    case H5T_ARRAY:
      return "an array";
    case H5T_VLEN:
      return "a variable-length sequence";
    default:
      return "a value of HDF5 type class " + std::to_string(static_cast<int>(type_class));
  }
}

void write_string_attribute(hid_t object, const std::string& name, const std::string& value) {
  const Hdf5Type type(check_hdf5(H5Tcopy(H5T_C_S1), "H5Tcopy"));
  check_hdf5(H5Tset_size(type.get(), value.size() + 1), "H5Tset_size");
  check_hdf5(H5Tset_strpad(type.get(), H5T_STR_NULLTERM), "H5Tset_strpad");
  check_hdf5(H5Tset_cset(type.get(), H5T_CSET_UTF8), "H5Tset_cset");
  write_attribute(object, name, type.get(), type.get(), value.c_str());
}

void write_int_attribute(hid_t object, const std::string& name, int value) {
  write_attribute(object, name, H5T_STD_I32LE, H5T_NATIVE_INT, &value);
}

void write_double_attribute(hid_t object, const std::string& name, double value) {
  write_attribute(object, name, H5T_IEEE_F64LE, H5T_NATIVE_DOUBLE, &value);
}

bool has_attribute(hid_t object, const std::string& name) {
  return check_hdf5(H5Aexists(object, name.c_str()), "H5Aexists") > 0;
}

std::string read_string_attribute(hid_t object, const std::string& name, const std::string& label) {
  const OpenAttribute open = open_single(object, name, label, "a string");
  if (open.type_class != H5T_STRING) {
    throw InputError(label + ": expected a string, got " + type_class_text(open.type_class));
  }
  const htri_t is_variable = check_hdf5(H5Tis_variable_str(open.type.get()), "H5Tis_variable_str");
  if (is_variable > 0) {
    const Hdf5Type memory_type(check_hdf5(H5Tcopy(H5T_C_S1), "H5Tcopy"));
    check_hdf5(H5Tset_size(memory_type.get(), H5T_VARIABLE), "H5Tset_size");
    char* text = nullptr;
    check_hdf5(H5Aread(open.attribute.get(), memory_type.get(), &text), "H5Aread");
    std::string value = text ? text : "";
    H5free_memory(text);
    return value;
  }
  const size_t size = H5Tget_size(open.type.get());
  if (size == 0) throw Error(label + ": HDF5 reports a string of size 0");
  std::string buffer(size, '\0');
  check_hdf5(H5Aread(open.attribute.get(), open.type.get(), buffer.data()), "H5Aread");
  return buffer.substr(0, buffer.find('\0'));
}

int read_int_attribute(hid_t object, const std::string& name, const std::string& label) {
  const OpenAttribute open = open_single(object, name, label, "an integer");
  if (open.type_class != H5T_INTEGER) {
    throw InputError(label + ": expected an integer, got " + type_class_text(open.type_class));
  }
  long long value = 0;
  check_hdf5(H5Aread(open.attribute.get(), H5T_NATIVE_LLONG, &value), "H5Aread");
  if (value < std::numeric_limits<int>::min() || value > std::numeric_limits<int>::max()) {
    throw InputError(label + ": expected an integer that fits 32 bits, got " + std::to_string(value));
  }
  return static_cast<int>(value);
}

double read_double_attribute(hid_t object, const std::string& name, const std::string& label) {
  const OpenAttribute open = open_single(object, name, label, "a floating-point number");
  if (open.type_class != H5T_FLOAT) {
    throw InputError(label + ": expected a floating-point number, got " + type_class_text(open.type_class));
  }
  double value = 0.0;
  check_hdf5(H5Aread(open.attribute.get(), H5T_NATIVE_DOUBLE, &value), "H5Aread");
  return value;
}

namespace {

herr_t collect_name(hid_t /*object*/, const char* name, const H5A_info_t* /*info*/, void* client_data) {
  static_cast<std::vector<std::string>*>(client_data)->push_back(name);
  return 0;
}

}  // namespace

std::vector<std::string> attribute_names(hid_t object) {
  std::vector<std::string> names;
  hsize_t position = 0;
  if (H5Aiterate2(object, H5_INDEX_CRT_ORDER, H5_ITER_INC, &position, collect_name, &names) >= 0) {
    return names;
  }
  names.clear();  // creation order not tracked for this object: fall back to name order
  position = 0;
  check_hdf5(H5Aiterate2(object, H5_INDEX_NAME, H5_ITER_INC, &position, collect_name, &names), "H5Aiterate2");
  return names;
}

}  // namespace wallrans
