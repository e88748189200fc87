// The HDF5 return-code check, the one-line error-stack text and the quiet-errors guard.
#include "io/hdf5_handles.hpp"

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

std::string one_line(std::string text) {
  for (char& c : text) {
    if (c == '\n' || c == '\r') c = ' ';
  }
  return text;
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

QuietHdf5Errors::QuietHdf5Errors() {
  saved_ = H5Eget_auto2(H5E_DEFAULT, &saved_function_, &saved_data_) >= 0;
  (void)H5Eset_auto2(H5E_DEFAULT, nullptr, nullptr);
}

QuietHdf5Errors::~QuietHdf5Errors() {
  if (saved_) (void)H5Eset_auto2(H5E_DEFAULT, saved_function_, saved_data_);
}

}  // namespace wallrans
