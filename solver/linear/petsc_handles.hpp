// Move-only owners of PETSc objects; destructors never throw.
#pragma once

#include <petscdm.h>
#include <petscksp.h>
#include <petscmat.h>
#include <petscvec.h>

#include <utility>

namespace wallrans {

template <typename Handle, PetscErrorCode (*destroy)(Handle*)>
class PetscOwner {
 public:
  PetscOwner() = default;
  explicit PetscOwner(Handle h) : handle_(h) {}
  PetscOwner(const PetscOwner&) = delete;
  PetscOwner& operator=(const PetscOwner&) = delete;
  PetscOwner(PetscOwner&& other) noexcept : handle_(std::exchange(other.handle_, nullptr)) {}
  PetscOwner& operator=(PetscOwner&& other) noexcept {
    if (this != &other) {
      reset();
      handle_ = std::exchange(other.handle_, nullptr);
    }
    return *this;
  }
  ~PetscOwner() { reset(); }

  void reset() noexcept {
    if (handle_) (void)destroy(&handle_);
    handle_ = nullptr;
  }
  Handle get() const { return handle_; }
  Handle* out() {  // for PETSc create functions
    reset();
    return &handle_;
  }
  explicit operator bool() const { return handle_ != nullptr; }

 private:
  Handle handle_ = nullptr;
};

using OwnedVec = PetscOwner<Vec, VecDestroy>;
using OwnedMat = PetscOwner<Mat, MatDestroy>;
using OwnedKsp = PetscOwner<KSP, KSPDestroy>;
using OwnedDm = PetscOwner<DM, DMDestroy>;
using OwnedNullSpace = PetscOwner<MatNullSpace, MatNullSpaceDestroy>;

}  // namespace wallrans
