// Shared parts of the fuzz targets (fuzz_support.hpp).
#include "fuzz_support.hpp"

#include <mpi.h>
#include <petscsys.h>
#include <unistd.h>

#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>

namespace wallrans::fuzz {

namespace {

// At exit (after HDF5's own clean-up, which is registered later), so a launcher sees a proper end.
void finish_mpi() {
  int finished = 0;
  MPI_Finalized(&finished);
  if (!finished) MPI_Finalize();
}

void finish_petsc() { (void)PetscFinalize(); }

}  // namespace

void start_mpi() {
  int started = 0;
  MPI_Initialized(&started);
  if (started) return;
  // Open MPI's handlers print their own backtrace and would hide the sanitizer's report.
  setenv("OMPI_MCA_opal_signal", "", 0);
  check_mpi(MPI_Init(nullptr, nullptr));
  std::atexit(finish_mpi);
}

void start_petsc() {
  PetscBool started = PETSC_FALSE;
  check_petsc(PetscInitialized(&started));
  if (started) return;
  start_mpi();
  check_petsc(PetscOptionsSetValue(nullptr, "-no_signal_handler", nullptr));
  check_petsc(PetscInitializeNoArguments());
  std::atexit(finish_petsc);  // runs before finish_mpi
}

InputFile::InputFile(const std::string& stem) {
  namespace fs = std::filesystem;
  std::error_code error;
  const fs::path directory =
      fs::is_directory("/dev/shm", error) ? fs::path("/dev/shm") : fs::temp_directory_path();
  path_ = (directory / (stem + "_" + std::to_string(::getpid()))).string();
}

InputFile::~InputFile() { std::remove(path_.c_str()); }

void InputFile::write(const uint8_t* data, size_t size) const {
  std::ofstream out(path_, std::ios::binary | std::ios::trunc);
  out.write(reinterpret_cast<const char*>(data), static_cast<std::streamsize>(size));
  out.close();
  if (!out) finding("cannot write the input to " + path_);
}

void finding(const std::string& what) {
  std::fprintf(stderr, "wallrans fuzz: contract broken: %s\n", what.c_str());
  std::fflush(stderr);
  std::abort();
}

void check_rejection_message(const std::string& message, const std::string& file) {
  if (message.empty()) finding("empty InputError message");
  // Line feed, carriage return, vertical tab and form feed each start a new line on a terminal.
  if (message.find_first_of("\n\r\v\f") != std::string::npos)
    finding("InputError message of more than one line: " + message);
  if (message.find(file) == std::string::npos)
    finding("InputError message does not name " + file + ": " + message);
}

}  // namespace wallrans::fuzz
