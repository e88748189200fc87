// The phases of one outer iteration as PETSc log stages, so that -log_view splits the time of a
// run by phase (bench/run.py reads every stage whose name starts with "wr_").
#pragma once

#include "linear/log_stage.hpp"

namespace wallrans {

/// Local: the stage ids, registered by the first solver of a process and looked up by later ones.
struct IterationStages {
  PetscLogStage momentum_assembly = log_stage("wr_momentum_assembly");
  PetscLogStage momentum_solve = log_stage("wr_momentum_solve");
  PetscLogStage pressure_assembly = log_stage("wr_pressure_assembly");  ///< flux prediction and p' matrix
  PetscLogStage pressure_solve = log_stage("wr_pressure_solve");        ///< incl. preconditioner set-up
  PetscLogStage correction_gradients = log_stage("wr_correction_gradients");
  PetscLogStage turbulence = log_stage("wr_turbulence");  ///< model update: assembly and solve
  PetscLogStage monitors = log_stage("wr_monitors");      ///< wall shear, boundary fluxes, residuals
};

}  // namespace wallrans
