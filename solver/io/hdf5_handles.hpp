// Move-only owners of HDF5 identifiers and the one checking helper for HDF5 return codes. This
// header pulls in hdf5.h: include it from .cpp files (and tests) only, never from a public header.
#pragma once

#include <hdf5.h>

#include <cstdint>
#include <source_location>
#include <string>
#include <utility>

#include "core/error.hpp"
#include "io/text_excerpt.hpp"

namespace wallrans {

/// Local. Throws wallrans::Error if `code` is negative (HDF5's failure value for herr_t, htri_t and
/// hid_t); the one-line message names `call`, HDF5's own error-stack text and the call site.
/// Returns `code` unchanged otherwise, so identifiers can be checked where they are made.
int64_t check_hdf5(int64_t code, const char* call,
                   const std::source_location& where = std::source_location::current());

/// Local. The calling thread's current HDF5 error stack on one line: the outermost failing call
/// and, if different, the innermost cause (for example "H5Fopen: unable to open file; cause:
/// H5F__super_read: truncated file: eof = 4096, ..."). "no HDF5 error details" if the stack is empty.
std::string hdf5_error_text();

/// Local. While alive, HDF5 does not print its error stack to stderr (our callers report failures
/// through check_hdf5 or an InputError instead); the previous setting is restored on destruction.
class QuietHdf5Errors {
 public:
  QuietHdf5Errors();
  QuietHdf5Errors(const QuietHdf5Errors&) = delete;
  QuietHdf5Errors& operator=(const QuietHdf5Errors&) = delete;
  ~QuietHdf5Errors();

 private:
  H5E_auto2_t saved_function_ = nullptr;
  void* saved_data_ = nullptr;
  bool saved_ = false;
};

/// Owner of one HDF5 identifier, closed with `Close` on destruction (errors ignored there: a
/// destructor never throws). Use close_checked() where the close itself can fail meaningfully,
/// as for a file whose close flushes data.
template <herr_t (*Close)(hid_t)>
class Hdf5Owner {
 public:
  Hdf5Owner() = default;
  explicit Hdf5Owner(hid_t id) : id_(id) {}
  Hdf5Owner(const Hdf5Owner&) = delete;
  Hdf5Owner& operator=(const Hdf5Owner&) = delete;
  Hdf5Owner(Hdf5Owner&& other) noexcept : id_(std::exchange(other.id_, H5I_INVALID_HID)) {}
  Hdf5Owner& operator=(Hdf5Owner&& other) noexcept {
    if (this != &other) {
      reset();
      id_ = std::exchange(other.id_, H5I_INVALID_HID);
    }
    return *this;
  }
  ~Hdf5Owner() { reset(); }

  void reset() noexcept {
    if (id_ >= 0) (void)Close(id_);
    id_ = H5I_INVALID_HID;
  }
  /// Closes now; throws Error (naming `call`) if HDF5 reports a failure.
  void close_checked(const char* call) {
    const hid_t id = std::exchange(id_, H5I_INVALID_HID);
    if (id >= 0) check_hdf5(Close(id), call);
  }
  hid_t get() const { return id_; }
  explicit operator bool() const { return id_ >= 0; }

 private:
  hid_t id_ = H5I_INVALID_HID;
};

using Hdf5File = Hdf5Owner<H5Fclose>;
using Hdf5Group = Hdf5Owner<H5Gclose>;
using Hdf5Dataset = Hdf5Owner<H5Dclose>;
using Hdf5Attribute = Hdf5Owner<H5Aclose>;
using Hdf5Space = Hdf5Owner<H5Sclose>;
using Hdf5Type = Hdf5Owner<H5Tclose>;
using Hdf5PropertyList = Hdf5Owner<H5Pclose>;

/// Local. Opens the HDF5 file <path> read-only with the serial (sec2) driver. A missing path, a
/// directory or other non-regular file, a file without the HDF5 signature and an unreadable or
/// truncated file throw InputError "<expected><what was found>", where `expected` starts the
/// message (e.g. "run/c_5.h5: expected a wallrans checkpoint (HDF5 with attribute 'format'), got ").
Hdf5File open_hdf5_read_only(const std::string& path, const std::string& expected);

/// Local. Runs `read`, which reads a file the user gave, and returns its result. An Error inside
/// it (HDF5 failing on a damaged file, which can pass every structural check and fail later)
/// becomes InputError "<expected>a damaged HDF5 file (<the error>)", so a bad file is bad input
/// however deep the damage sits; an InputError passes unchanged. `expected` as for
/// open_hdf5_read_only.
template <typename Read>
decltype(auto) read_input_file(const std::string& expected, Read&& read) {
  try {
    return read();
  } catch (const InputError&) {
    throw;
  } catch (const Error& e) {
    throw InputError(expected + "a damaged HDF5 file (" + one_line(e.what()) + ")");
  }
}

/// Local. True if every group on the way to `object_path` ("/fields/u") and the object exist.
bool has_object(hid_t file, const std::string& object_path);

}  // namespace wallrans
