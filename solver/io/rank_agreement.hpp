// Failure agreement across ranks: a step that fails on some ranks becomes the same exception on
// every rank, so no rank is left waiting in the next collective call.
#pragma once

#include <mpi.h>

#include <exception>
#include <optional>
#include <string>

#include "core/error.hpp"

namespace wallrans {

/// What went wrong in one step on one rank: the message, and whether it was bad input.
struct Failure {
  std::string message;
  bool is_input = false;
};

/// Local. Runs `step`; returns its failure (InputError keeps its kind) or nothing on success.
template <typename Step>
std::optional<Failure> attempt(Step&& step) {
  try {
    step();
    return std::nullopt;
  } catch (const InputError& e) {
    return Failure{e.what(), true};
  } catch (const std::exception& e) {
    return Failure{e.what(), false};
  }
}

/// Collective. If any rank reports a failure, every rank throws the failure of the lowest failing
/// rank (InputError if it was one, Error otherwise), with the same message everywhere.
void agree(MPI_Comm comm, const std::optional<Failure>& local_failure);

/// Collective. Broadcasts `text` from rank `root` (resized on the other ranks).
void broadcast_text(MPI_Comm comm, int root, std::string& text);

/// Collective. Runs `produce` (returning std::string) on rank 0 only and returns its result on
/// every rank; if it throws there, every rank throws the same error.
template <typename Produce>
std::string run_on_root(MPI_Comm comm, Produce&& produce) {
  int rank = 0;
  check_mpi(MPI_Comm_rank(comm, &rank));
  std::string result;
  std::optional<Failure> failure;
  if (rank == 0) failure = attempt([&] { result = produce(); });
  agree(comm, failure);
  broadcast_text(comm, 0, result);
  return result;
}

}  // namespace wallrans
