#include "io/gather.hpp"

#include "core/error.hpp"

namespace wallrans {

std::vector<std::vector<double>> gather_rows(MPI_Comm comm, const std::vector<std::vector<double>>& rows,
                                             int width) {
  int rank = 0, size = 1;
  check_mpi(MPI_Comm_rank(comm, &rank));
  check_mpi(MPI_Comm_size(comm, &size));
  std::vector<double> flat;
  for (const auto& r : rows) flat.insert(flat.end(), r.begin(), r.end());
  int count = static_cast<int>(flat.size());
  std::vector<int> counts(size), offsets(size);
  check_mpi(MPI_Gather(&count, 1, MPI_INT, counts.data(), 1, MPI_INT, 0, comm));
  int total = 0;
  for (int k = 0; k < size; ++k) {
    offsets[k] = total;
    total += counts[k];
  }
  std::vector<double> all(rank == 0 ? total : 0);
  check_mpi(MPI_Gatherv(flat.data(), count, MPI_DOUBLE, all.data(), counts.data(), offsets.data(), MPI_DOUBLE,
                        0, comm));
  std::vector<std::vector<double>> out;
  if (rank == 0) {
    for (int k = 0; k + width <= total; k += width)
      out.emplace_back(all.begin() + k, all.begin() + k + width);
  }
  return out;
}

}  // namespace wallrans
