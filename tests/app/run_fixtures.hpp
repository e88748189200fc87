// Small cases for the end-to-end tests of run directories, launchers and faults: a laminar
// lid-driven cavity whose size, stopping rule and extra sections a test chooses.
#pragma once

#include <sstream>
#include <string>

namespace wallrans::test_support {

/// A lid-driven cavity at Re = 100 on `cells` x `cells` cells, stopping at `residual_drop` or
/// after `max_iterations`, with `extra` appended (e.g. a checkpoint section). A residual drop of
/// 1e-300 is far below the rounding floor of double precision (about 1e-16 relative; 1e-15 was
/// measured to be reached on 16 x 16 cells), so such a run goes on until it is stopped or capped.
inline std::string cavity_case(const std::string& title, int cells, double residual_drop, int max_iterations,
                               const std::string& extra = "") {
  std::ostringstream text;
  text << "title: " << title << "\n"
       << "flow: {kinematic_viscosity: 0.01}\n"
       << "grid: {generator: cavity, cells: [" << cells << ", " << cells << "]}\n"
       << "boundaries:\n"
       << "  - {side: top, kind: wall, velocity: [1.0, 0.0]}\n"
       << "  - {side: bottom, kind: wall}\n"
       << "  - {side: left, kind: wall}\n"
       << "  - {side: right, kind: wall}\n"
       << "iterations: {max: " << max_iterations << ", residual_drop: " << residual_drop
       << ", report_every: 0}\n"
       << extra;
  return text.str();
}

}  // namespace wallrans::test_support
