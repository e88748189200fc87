// Numbers in the program's one-line messages.
#pragma once

#include <cmath>
#include <cstdio>
#include <string>

namespace wallrans {

/// Local. `value` with `digits` significant digits ("%.<digits>g": 0.0503, 1.5e-05, 4e+08; "nan"
/// whatever its sign bit).
inline std::string significant(double value, int digits) {
  if (std::isnan(value)) return "nan";
  char text[40];
  std::snprintf(text, sizeof text, "%.*g", digits, value);
  return text;
}

}  // namespace wallrans
