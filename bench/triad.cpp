// Memory-bandwidth ceiling for bench/run.py: the triad a[i] = b[i] + s c[i] on arrays far larger
// than the caches, run by every MPI process at once on its own arrays. Each repetition starts
// behind a barrier and lasts until the slowest process is done; the best repetition is reported
// as one JSON line, counting 3 arrays x 8 bytes per element (write-allocate traffic not counted).
#include <mpi.h>

#include <algorithm>
#include <cstdio>
#include <cstdlib>
#include <string>
#include <vector>

namespace {

int fail(const char* message) {
  std::fprintf(stderr, "wallrans_triad: %s\nusage: wallrans_triad [MIB_PER_ARRAY] [REPETITIONS]\n", message);
  return 2;
}

}  // namespace

int main(int argc, char** argv) {
  MPI_Init(&argc, &argv);
  int rank = 0, size = 1;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  MPI_Comm_size(MPI_COMM_WORLD, &size);
  const long mib = argc > 1 ? std::atol(argv[1]) : 160;
  const int repetitions = argc > 2 ? std::atoi(argv[2]) : 10;
  if (mib < 1 || repetitions < 1) {
    const int code = rank == 0 ? fail("expected positive numbers") : 2;
    MPI_Finalize();
    return code;
  }
  const size_t n = static_cast<size_t>(mib) * 1024 * 1024 / sizeof(double);
  // Each process touches its own arrays first, so the pages sit on its memory node.
  std::vector<double> a(n, 0.0), b(n, 1.0), c(n, 2.0);
  const double s = 3.0;
  double best_all = 1e300, best_own = 1e300;
  for (int r = 0; r < repetitions; ++r) {
    MPI_Barrier(MPI_COMM_WORLD);
    const double t0 = MPI_Wtime();
    double* __restrict pa = a.data();
    const double* __restrict pb = b.data();
    const double* __restrict pc = c.data();
    for (size_t i = 0; i < n; ++i) pa[i] = pb[i] + s * pc[i];
    const double own = MPI_Wtime() - t0;
    double slowest = 0.0;
    MPI_Allreduce(&own, &slowest, 1, MPI_DOUBLE, MPI_MAX, MPI_COMM_WORLD);
    best_all = std::min(best_all, slowest);
    best_own = std::min(best_own, own);
  }
  // The result is read back, so the compiler cannot drop the loop.
  double check = 0.0;
  for (size_t i = 0; i < n; i += 4096) check += a[i];
  const double bytes = 3.0 * sizeof(double) * static_cast<double>(n);
  const double own_gbs = bytes / best_own * 1e-9;
  std::vector<double> per_process(static_cast<size_t>(size), 0.0);
  MPI_Gather(&own_gbs, 1, MPI_DOUBLE, per_process.data(), 1, MPI_DOUBLE, 0, MPI_COMM_WORLD);
  if (rank == 0) {
    std::string list;
    for (int p = 0; p < size; ++p) list += (p ? ", " : "") + std::to_string(per_process[p]);
    std::printf(
        "{\"processes\": %d, \"mib_per_array\": %ld, \"repetitions\": %d, \"gb_per_s\": %.4f, "
        "\"per_process_gb_per_s\": [%s], \"check\": %.1f}\n",
        size, mib, repetitions, size * bytes / best_all * 1e-9, list.c_str(), check);
  }
  MPI_Finalize();
  return 0;
}
