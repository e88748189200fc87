// Collects fixed-width rows of numbers from all ranks on rank 0 (for CSV outputs).
#pragma once

#include <mpi.h>

#include <vector>

namespace wallrans {

/// Collective. Returns on rank 0 the rows of every rank, rank by rank; empty elsewhere.
std::vector<std::vector<double>> gather_rows(MPI_Comm comm, const std::vector<std::vector<double>>& rows,
                                             int width);

}  // namespace wallrans
