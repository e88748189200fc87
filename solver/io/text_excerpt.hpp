// Text read from a file, made fit for a one-line message: line breaks as spaces, other control
// and non-ASCII bytes as '?', and long text cut. Header-only, so that the serial grid-file code
// of the converter can use it.
#pragma once

#include <string>

namespace wallrans {

/// Local. `text` with line breaks and tabs as spaces and every other byte outside printable
/// ASCII as '?'.
inline std::string one_line(const std::string& text) {
  std::string out = text;
  for (char& c : out) {
    if (c == '\n' || c == '\r' || c == '\t') {
      c = ' ';
    } else if (c < 0x20 || c > 0x7e) {
      c = '?';
    }
  }
  return out;
}

/// Local. one_line of the first 60 characters of `text`, with "..." if it was longer.
inline std::string excerpt(const std::string& text) {
  constexpr size_t limit = 60;
  return text.size() > limit ? one_line(text.substr(0, limit)) + "..." : one_line(text);
}

}  // namespace wallrans
