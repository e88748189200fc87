// CRC-32 of distributed datasets (each rank's runs of consecutive elements, combined in dataset
// order on rank 0) and the checks of the values read back.
#include "io/checkpoint_checksum.hpp"

#include <zlib.h>

#include <algorithm>
#include <bit>
#include <cmath>
#include <cstdio>
#include <map>

#include "core/error.hpp"

namespace wallrans::checkpoint_checksum {

namespace {

using checkpoint_transfer::Block;

// The stored bytes are IEEE-754 little-endian (H5T_IEEE_F64LE); on such a machine they are the
// bytes of the doubles in memory.
static_assert(std::endian::native == std::endian::little,
              "checkpoint checksums assume a little-endian machine");

// A run of consecutive dataset elements held by this rank: first index, length, CRC.
struct Run {
  uint64_t first, length, crc;
};

// Values per (row, column) entry: the product of the dimensions after the second, which every rank
// writes whole (e.g. the interleaved node coordinates, cells_y+1 x cells_x+1 x 2).
uint64_t entry_size(const Block& block) {
  uint64_t inner = 1;
  for (size_t d = 2; d < block.global.size(); ++d) inner *= block.global[d];
  return inner;
}

std::vector<Run> runs_of(const Block& block, const std::vector<double>& values) {
  std::vector<Run> runs;
  if (block.by_id) {
    for (size_t first = 0; first < block.ids.size();) {
      size_t last = first;
      while (last + 1 < block.ids.size() && block.ids[last + 1] == block.ids[last] + 1) ++last;
      runs.push_back({block.ids[first], last - first + 1, crc32_of(values.data() + first, last - first + 1)});
      first = last + 1;
    }
    return runs;
  }
  if (block.size() == 0) return runs;
  const uint64_t inner = entry_size(block);
  const uint64_t row_length = block.count[1] * inner, width = block.global[1] * inner;
  for (uint64_t r = 0; r < block.count[0]; ++r) {
    runs.push_back({(block.start[0] + r) * width + block.start[1] * inner, row_length,
                    crc32_of(values.data() + r * row_length, row_length)});
  }
  return runs;
}

}  // namespace

uint32_t crc32_of(const double* values, size_t n, uint32_t crc) {
  const auto* bytes = reinterpret_cast<const Bytef*>(values);
  size_t left = n * sizeof(double);
  uLong out = crc;
  while (left > 0) {  // zlib takes lengths of type uInt
    const uInt chunk = static_cast<uInt>(std::min<size_t>(left, 1u << 30));
    out = crc32(out, bytes, chunk);
    bytes += chunk;
    left -= chunk;
  }
  return static_cast<uint32_t>(out);
}

uint32_t dataset_crc32(MPI_Comm comm, const Block& block, const std::vector<double>& values) {
  int rank = 0, size = 1;
  check_mpi(MPI_Comm_rank(comm, &rank));
  check_mpi(MPI_Comm_size(comm, &size));
  const std::vector<Run> mine = runs_of(block, values);
  int count = static_cast<int>(3 * mine.size());
  std::vector<int> counts(static_cast<size_t>(size)), offsets(static_cast<size_t>(size));
  check_mpi(MPI_Gather(&count, 1, MPI_INT, counts.data(), 1, MPI_INT, 0, comm));
  int total = 0;
  for (int r = 0; r < size; ++r) {
    offsets[static_cast<size_t>(r)] = total;
    total += counts[static_cast<size_t>(r)];
  }
  std::vector<uint64_t> all(rank == 0 ? static_cast<size_t>(total) : 0);
  check_mpi(MPI_Gatherv(mine.data(), count, MPI_UINT64_T, all.data(), counts.data(), offsets.data(),
                        MPI_UINT64_T, 0, comm));
  uint32_t crc = 0;
  if (rank == 0) {
    std::vector<Run> runs(all.size() / 3);
    for (size_t k = 0; k < runs.size(); ++k) runs[k] = {all[3 * k], all[3 * k + 1], all[3 * k + 2]};
    std::sort(runs.begin(), runs.end(), [](const Run& a, const Run& b) { return a.first < b.first; });
    // crc32_combine_op with the operator of each run length, generated once per length.
    std::map<uint64_t, uLong> operators;
    uint64_t next = 0;
    uLong combined = 0;
    bool tiles = true;
    for (const Run& run : runs) {
      tiles = tiles && run.first == next;
      next = run.first + run.length;
      auto [it, is_new] = operators.try_emplace(run.length, 0);
      if (is_new) it->second = crc32_combine_gen64(static_cast<z_off64_t>(run.length * sizeof(double)));
      combined = crc32_combine_op(combined, static_cast<uLong>(run.crc), it->second);
    }
    uint64_t size_of_dataset = 1;
    for (const hsize_t g : block.global) size_of_dataset *= g;
    if (!tiles || next != size_of_dataset)
      throw Error("checkpoint checksum: the ranks' blocks do not cover the dataset once");
    crc = static_cast<uint32_t>(combined);
  }
  check_mpi(MPI_Bcast(&crc, 1, MPI_UINT32_T, 0, comm));
  return crc;
}

void write_crc32(hid_t dataset, uint32_t crc) {
  const Hdf5Space space(check_hdf5(H5Screate(H5S_SCALAR), "H5Screate"));
  const Hdf5Attribute attr(check_hdf5(
      H5Acreate2(dataset, attribute, H5T_STD_U32LE, space.get(), H5P_DEFAULT, H5P_DEFAULT), "H5Acreate2"));
  check_hdf5(H5Awrite(attr.get(), H5T_NATIVE_UINT32, &crc), "H5Awrite");
}

std::optional<uint32_t> read_crc32(hid_t dataset, const std::string& label) {
  const htri_t exists = H5Aexists(dataset, attribute);
  if (exists <= 0) return std::nullopt;
  const std::string expected = label + ": attribute 'crc32': expected one unsigned 32-bit integer, got ";
  const Hdf5Attribute attr(check_hdf5(H5Aopen(dataset, attribute, H5P_DEFAULT), "H5Aopen"));
  const Hdf5Type type(check_hdf5(H5Aget_type(attr.get()), "H5Aget_type"));
  const Hdf5Space space(check_hdf5(H5Aget_space(attr.get()), "H5Aget_space"));
  if (H5Tget_class(type.get()) != H5T_INTEGER || H5Sget_simple_extent_npoints(space.get()) != 1)
    throw InputError(expected + "another kind of attribute");
  uint32_t crc = 0;
  check_hdf5(H5Aread(attr.get(), H5T_NATIVE_UINT32, &crc), "H5Aread");
  return crc;
}

std::string hex(uint32_t crc) {
  char text[16];
  std::snprintf(text, sizeof text, "0x%08x", crc);
  return text;
}

long long first_non_finite(MPI_Comm comm, const Block& block, const std::vector<double>& values) {
  long long first = -1;
  for (size_t k = 0; k < values.size() && first < 0; ++k) {
    if (std::isfinite(values[k])) continue;
    if (block.by_id) {
      first = static_cast<long long>(block.ids[k]);
    } else {
      const uint64_t entry = k / entry_size(block);  // index_text names the (i, j) entry
      const uint64_t row = entry / block.count[1], column = entry % block.count[1];
      first = static_cast<long long>((block.start[0] + row) * block.global[1] + block.start[1] + column);
    }
  }
  // The smallest index over the ranks: none is the largest possible value.
  long long smallest = first < 0 ? std::numeric_limits<long long>::max() : first;
  check_mpi(MPI_Allreduce(MPI_IN_PLACE, &smallest, 1, MPI_LONG_LONG, MPI_MIN, comm));
  return smallest == std::numeric_limits<long long>::max() ? -1 : smallest;
}

std::string index_text(const Block& block, long long index, const char* element) {
  if (block.by_id) return std::string(element) + " id " + std::to_string(index);
  const auto width = static_cast<long long>(block.global[1]);
  return std::string(element) + " (" + std::to_string(index % width) + ", " + std::to_string(index / width) +
         ")";
}

}  // namespace wallrans::checkpoint_checksum
