// Force-included in fuzz builds with clang 14 (CMakeLists.txt, WALLRANS_FUZZ). libstdc++ 12
// defines std::source_location only if the compiler has __builtin_source_location, which clang
// gained in version 15; clang 14 has the older __builtin_FILE/LINE/FUNCTION/COLUMN, which give the
// same call-site values. Debian 12's clang is 14, so this stand-in lets it build our sources.
#pragma once

#include <source_location>

#ifndef __cpp_lib_source_location
namespace std {
struct source_location {
  static constexpr source_location current(const char* file = __builtin_FILE(),
                                           const char* function = __builtin_FUNCTION(),
                                           unsigned line = __builtin_LINE(),
                                           unsigned column = __builtin_COLUMN()) noexcept {
    source_location location;
    location.file_ = file;
    location.function_ = function;
    location.line_ = line;
    location.column_ = column;
    return location;
  }
  constexpr const char* file_name() const noexcept { return file_; }
  constexpr const char* function_name() const noexcept { return function_; }
  constexpr unsigned line() const noexcept { return line_; }
  constexpr unsigned column() const noexcept { return column_; }

 private:
  const char* file_ = "";
  const char* function_ = "";
  unsigned line_ = 0;
  unsigned column_ = 0;
};
}  // namespace std
#endif
