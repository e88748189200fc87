// The shipped periodic-hill case (configs/hill_sa.yaml) as text with some values changed, for
// tests that run the program on a coarser grid.
#pragma once

#include <stdexcept>
#include <string>
#include <utility>
#include <vector>

#include "program_runner.hpp"

namespace wallrans::test_support {

/// configs/hill_sa.yaml with the line of each key (e.g. "cells:") given a new value (the line's
/// comment goes too). Throws if a key is not in the file.
inline std::string hill_case_text(const std::vector<std::pair<std::string, std::string>>& values) {
  std::string text = read_text(std::string(WALLRANS_SOURCE_DIR) + "/configs/hill_sa.yaml");
  for (const auto& [key, value] : values) {
    const size_t at = text.find(key);
    if (at == std::string::npos) throw std::runtime_error("configs/hill_sa.yaml has no " + key);
    text.replace(at, text.find('\n', at) - at, key + " " + value);
  }
  return text;
}

}  // namespace wallrans::test_support
