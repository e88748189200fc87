// Failure agreement across ranks (one Allreduce, then a broadcast only when something failed).
#include "io/rank_agreement.hpp"

namespace wallrans {

void broadcast_text(MPI_Comm comm, int root, std::string& text) {
  unsigned long long size = text.size();
  check_mpi(MPI_Bcast(&size, 1, MPI_UNSIGNED_LONG_LONG, root, comm));
  text.resize(static_cast<size_t>(size));
  if (size > 0) check_mpi(MPI_Bcast(text.data(), static_cast<int>(size), MPI_CHAR, root, comm));
}

void agree(MPI_Comm comm, const std::optional<Failure>& local_failure) {
  int rank = 0, size = 1;
  check_mpi(MPI_Comm_rank(comm, &rank));
  check_mpi(MPI_Comm_size(comm, &size));
  const int mine = local_failure ? rank : size;
  int first = size;
  check_mpi(MPI_Allreduce(&mine, &first, 1, MPI_INT, MPI_MIN, comm));
  if (first == size) return;
  std::string message = local_failure ? local_failure->message : std::string();
  int is_input = local_failure && local_failure->is_input ? 1 : 0;
  check_mpi(MPI_Bcast(&is_input, 1, MPI_INT, first, comm));
  broadcast_text(comm, first, message);
  if (is_input) throw InputError(message);
  throw Error(message);
}

}  // namespace wallrans
