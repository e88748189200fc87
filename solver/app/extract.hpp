// The `extract` command: wall data and profiles of a checkpoint, written into a folder of the
// user's choice without iterating and without touching the run directory.
#pragma once

#include <mpi.h>

#include <optional>
#include <string>
#include <vector>

namespace wallrans {

struct ExtractOptions {
  std::string case_file;
  std::string checkpoint;                       ///< the checkpoint to read (any rank count)
  std::string into;                             ///< the folder to write into (not a run directory)
  std::optional<std::vector<double>> stations;  ///< profile stations x [m]; else output.profiles_at_x
};

/// Local. Parses "0.5,1.0,-2e-3" (finite numbers, comma-separated, no empty entries). Throws
/// InputError "command line: --stations: expected ..., got ..." otherwise.
std::vector<double> parse_station_list(const std::string& text);

/// Collective. Loads the case and the checkpoint as a restart does, refreshes the wall data as at
/// the end of a run and writes <into>/wall.csv and <into>/profile_x<x>.csv for each station, then
/// prints the answers table (rank 0). Refuses (InputError, nothing written) a station outside the
/// grid, an `into` that is the case's run directory, the checkpoint's folder or any run directory
/// (it holds summary.json), and every input the restart refuses. Returns 0.
int extract_from_checkpoint(MPI_Comm comm, const ExtractOptions& options);

}  // namespace wallrans
