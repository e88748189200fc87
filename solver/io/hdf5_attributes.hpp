// Typed HDF5 attributes (one string, integer or double per attribute) with input validation on
// reading. Internal to the checkpoint library: includes hdf5.h through hdf5_handles.hpp.
#pragma once

#include <string>
#include <vector>

#include "io/hdf5_handles.hpp"

namespace wallrans {

/// Collective on a file opened with the MPI-IO driver (every rank passes the same value), local
/// otherwise. Creates attribute `name` on `object`: a UTF-8 fixed-length string, a 32-bit integer
/// or a 64-bit float, each a single value. Throws Error on HDF5 failure.
void write_string_attribute(hid_t object, const std::string& name, const std::string& value);
void write_int_attribute(hid_t object, const std::string& name, int value);
void write_double_attribute(hid_t object, const std::string& name, double value);

/// Local. True if `object` has an attribute `name`.
bool has_attribute(hid_t object, const std::string& name);

/// Local. Reads the single value of attribute `name`. `label` starts any message, e.g.
/// "run/c_5.h5: attribute 'iteration'"; a missing attribute, more than one value or another type
/// throws InputError "<label>: expected <kind>, got <what was found>". Strings may be fixed-length
/// or variable-length; integers must fit an int; doubles must be stored as floating point.
std::string read_string_attribute(hid_t object, const std::string& name, const std::string& label);
int read_int_attribute(hid_t object, const std::string& name, const std::string& label);
double read_double_attribute(hid_t object, const std::string& name, const std::string& label);

/// Local. Names of the attributes of `object`, in creation order if the object tracks it and in
/// name order otherwise. Throws Error on HDF5 failure.
std::vector<std::string> attribute_names(hid_t object);

/// Local. Words for an HDF5 type class in messages ("integer", "string", ...).
std::string type_class_text(H5T_class_t type_class);

}  // namespace wallrans
