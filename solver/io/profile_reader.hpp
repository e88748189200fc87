// Reads an inflow profile table (CSV): the coordinate along a boundary side, the velocity u, v and
// the turbulence-model variable, one row per point. The program's own profile_x<x>.csv files have
// these columns, so a precursor run can supply the inflow of another case.
#pragma once

#include <string>

#include "core/inflow_profile.hpp"

namespace wallrans {

/// Local. Reads `path` (a CSV file with a header, read_csv's format) into a profile: the columns
/// `coordinate_column` ("x" or "y"), "u", "v" and, if not empty, `variable_column` (the variable of
/// `model`, named in messages); other columns are ignored. `shift` is added to the coordinates.
/// Throws a one-line InputError starting with the path for a missing or unreadable file, a missing
/// column, fewer than 2 rows, coordinates that do not increase strictly from row to row, or a
/// value that is not finite.
InflowProfile read_inflow_profile(const std::string& path, const std::string& coordinate_column,
                                  const std::string& variable_column, const std::string& model, double shift);

}  // namespace wallrans
