// Collective test helpers of the checkpoint tests: ranks, a shared scratch directory, and the
// one-line InputError a call must throw alike on every rank.
#pragma once

#include <gtest/gtest.h>
#include <mpi.h>

#include <filesystem>
#include <random>
#include <string>

#include "core/error.hpp"

namespace wallrans::checkpoint_test {

namespace fs = std::filesystem;

inline int world_rank() {
  int rank = 0;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  return rank;
}

inline int world_size() {
  int size = 0;
  MPI_Comm_size(MPI_COMM_WORLD, &size);
  return size;
}

// Collective: a fresh directory chosen and created by rank 0 and shared; removed at the end.
class ScratchDirectory {
 public:
  ScratchDirectory() {
    std::string name;
    if (world_rank() == 0) {
      std::random_device entropy;
      for (int attempt = 0; attempt < 100 && name.empty(); ++attempt) {
        const fs::path candidate =
            fs::temp_directory_path() /
            ("wallrans_checkpoint_test_" + std::to_string(entropy()) + "_" + std::to_string(entropy()));
        if (fs::create_directory(candidate)) name = candidate.string();
      }
    }
    int size = static_cast<int>(name.size());
    MPI_Bcast(&size, 1, MPI_INT, 0, MPI_COMM_WORLD);
    name.resize(static_cast<size_t>(size));
    MPI_Bcast(name.data(), size, MPI_CHAR, 0, MPI_COMM_WORLD);
    path_ = name;
  }
  ScratchDirectory(const ScratchDirectory&) = delete;
  ScratchDirectory& operator=(const ScratchDirectory&) = delete;
  ~ScratchDirectory() {
    MPI_Barrier(MPI_COMM_WORLD);
    std::error_code ignored;
    if (world_rank() == 0) fs::remove_all(path_, ignored);
  }
  std::string file(const std::string& name) const { return (path_ / name).string(); }
  const fs::path& path() const { return path_; }

 private:
  fs::path path_;
};

// Collective: the InputError message `call` throws ("" and a test failure if none or another kind),
// checked to be one line that starts with `path` and to be the same on every rank.
template <typename Call>
std::string input_error(const std::string& path, Call&& call) {
  std::string message;
  try {
    call();
    ADD_FAILURE() << "no exception for " << path;
  } catch (const InputError& e) {
    message = e.what();
  } catch (const std::exception& e) {
    ADD_FAILURE() << "expected InputError for " << path << ", got: " << e.what();
  }
  EXPECT_EQ(message.find('\n'), std::string::npos) << message;
  EXPECT_EQ(message.rfind(path + ": ", 0), 0u) << message;
  std::string first = message;
  int size = static_cast<int>(first.size());
  MPI_Bcast(&size, 1, MPI_INT, 0, MPI_COMM_WORLD);
  first.resize(static_cast<size_t>(size));
  MPI_Bcast(first.data(), size, MPI_CHAR, 0, MPI_COMM_WORLD);
  EXPECT_EQ(message, first) << "ranks disagree about the error";
  return message;
}

inline void expect_contains(const std::string& text, const std::string& fragment) {
  EXPECT_NE(text.find(fragment), std::string::npos) << "'" << fragment << "' not in: " << text;
}

}  // namespace wallrans::checkpoint_test
