// An inflow profile read from a table: velocity and the turbulence-model variable against the
// coordinate along a boundary side, interpolated linearly between the rows.
#pragma once

#include <string>
#include <vector>

#include "core/vec2.hpp"

namespace wallrans {

/// Values of a profile at one coordinate.
struct ProfileValue {
  Vec2 velocity;          ///< [m/s]
  double model_variable;  ///< the model's transported variable (0 when the model has none)
};

/// Rows of a profile file, coordinates strictly increasing (checked by the reader). Local.
struct InflowProfile {
  std::string file;               ///< absolute path of the table, for messages and the resolved case
  double shift = 0.0;             ///< added to the file's coordinates [m]
  std::string coordinate_column;  ///< "y" on left/right sides, "x" on bottom/top sides
  std::string variable_column;    ///< column of the model variable ("" when the model has none)
  std::vector<double> coordinate, u, v, model_variable;  ///< shifted coordinates and the values

  /// The first and last coordinate (after the shift).
  double front() const { return coordinate.front(); }
  double back() const { return coordinate.back(); }
  /// True if s lies within [front(), back()] (with a round-off margin of 1e-12 of the range).
  bool covers(double s) const;
  /// Linear interpolation between the two rows around s; s must be covered.
  ProfileValue at(double s) const;
};

/// The column name of a turbulence model's transported variable in profile files: "nu_tilde"
/// (spalart_allmaras), "k" (k_equation), "nu_rt" (baldwin_barth), "" for models without one.
std::string model_variable_column(const std::string& model);

}  // namespace wallrans
