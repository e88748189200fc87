// The HDF5 return-code check, the one-line error-stack text and the quiet-errors guard.
#include "io/hdf5_handles.hpp"

#include <filesystem>
#include <system_error>
#include <vector>

#include "core/error.hpp"

namespace wallrans {

namespace {

struct StackEntry {
  std::string function, description;
};

herr_t collect_entry(unsigned /*depth*/, const H5E_error2_t* entry, void* client_data) {
  auto* entries = static_cast<std::vector<StackEntry>*>(client_data);
  entries->push_back({entry->func_name ? entry->func_name : "?", entry->desc ? entry->desc : ""});
  return 0;
}

}  // namespace

std::string hdf5_error_text() {
  std::vector<StackEntry> entries;  // outermost (the API call) first
  if (H5Ewalk2(H5E_DEFAULT, H5E_WALK_DOWNWARD, collect_entry, &entries) < 0 || entries.empty()) {
    return "no HDF5 error details";
  }
  const StackEntry& outer = entries.front();
  std::string text = outer.function + ": " + outer.description;
  if (entries.size() > 1) {
    const StackEntry& inner = entries.back();
    text += "; cause: " + inner.function + ": " + inner.description;
  }
  return one_line(text);
}

int64_t check_hdf5(int64_t code, const char* call, const std::source_location& where) {
  if (code >= 0) return code;
  throw Error("HDF5 error in " + std::string(call) + " (" + hdf5_error_text() + ") at " + where.file_name() +
              ":" + std::to_string(where.line()));
}

Hdf5File open_hdf5_read_only(const std::string& path, const std::string& expected) {
  namespace fs = std::filesystem;
  std::error_code error;
  const fs::file_status status = fs::status(path, error);
  if (status.type() == fs::file_type::not_found) throw InputError(expected + "no such file");
  if (error) throw InputError(expected + "an inaccessible path (" + error.message() + ")");
  if (fs::is_directory(status)) throw InputError(expected + "a directory");
  if (!fs::is_regular_file(status)) throw InputError(expected + "something that is not a regular file");
  const htri_t is_hdf5 = H5Fis_hdf5(path.c_str());
  if (is_hdf5 < 0) throw InputError(expected + "an unreadable file (" + hdf5_error_text() + ")");
  if (is_hdf5 == 0) {
    const auto size = fs::file_size(path, error);
    throw InputError(expected + "a file that is not HDF5 (no HDF5 signature in its " +
                     (error ? std::string("?") : std::to_string(size)) + " bytes)");
  }
  const Hdf5PropertyList access(check_hdf5(H5Pcreate(H5P_FILE_ACCESS), "H5Pcreate"));
  check_hdf5(H5Pset_fapl_sec2(access.get()), "H5Pset_fapl_sec2");
  Hdf5File file(H5Fopen(path.c_str(), H5F_ACC_RDONLY, access.get()));
  if (!file) throw InputError(expected + "an unreadable or truncated HDF5 file (" + hdf5_error_text() + ")");
  return file;
}

bool has_object(hid_t file, const std::string& object_path) {
  size_t next = 0;
  do {
    next = object_path.find('/', next + 1);
    if (H5Lexists(file, object_path.substr(0, next).c_str(), H5P_DEFAULT) <= 0) return false;
  } while (next != std::string::npos);
  return true;
}

QuietHdf5Errors::QuietHdf5Errors() {
  saved_ = H5Eget_auto2(H5E_DEFAULT, &saved_function_, &saved_data_) >= 0;
  (void)H5Eset_auto2(H5E_DEFAULT, nullptr, nullptr);
}

QuietHdf5Errors::~QuietHdf5Errors() {
  if (saved_) (void)H5Eset_auto2(H5E_DEFAULT, saved_function_, saved_data_);
}

}  // namespace wallrans
