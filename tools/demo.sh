#!/usr/bin/env bash
# Installs what is missing, builds wallrans into build/ and runs the main demo case on 2 MPI ranks.
# Usage: tools/demo.sh            (from any directory; as root on a fresh Debian 12, or with sudo)
# Idempotent: packages are installed only when missing and the build is incremental; every run
# recomputes the case and overwrites out/demo/.
set -euo pipefail

# The case to demonstrate (a path relative to the repository root).
DEMO_CASE="configs/plate_sa.yaml"   # turbulent flat plate, Spalart-Allmaras, Re_L = 1e7
DEMO_OUT="out/demo"
DEMO_RANKS=2

root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"

tools/setup-deps.sh
cmake -S . -B build -DCMAKE_BUILD_TYPE=Release
cmake --build build -j2

# OpenMPI refuses to run as root without these; they change nothing for other users. Allowing
# oversubscription lets the 2-rank demo start on a single-core machine too.
export OMPI_ALLOW_RUN_AS_ROOT=1 OMPI_ALLOW_RUN_AS_ROOT_CONFIRM=1
export OMPI_MCA_rmaps_base_oversubscribe=1

echo "demo: running ${DEMO_CASE} on ${DEMO_RANKS} MPI ranks"
mpirun -np "${DEMO_RANKS}" build/wallrans run "${DEMO_CASE}" --output-dir "${DEMO_OUT}"

cat <<MSG

demo: results are in ${root}/${DEMO_OUT}/
  fields.pvts, fields_<rank>.vts  cell and point data: velocity, pressure, eddy_viscosity,
                                  nu_tilde, wall_distance, y_plus (cell_volume, cell_index)
  residuals.csv                   residuals and linear-solver iterations of every equation
  wall.csv                        segment, side, x, y, s, tangent, Cf, Cp, wall shear, y+
  profile_x<X>.csv                y, y+, U+, nu_t/nu from the nearest wall at x = 0.25, 0.5, 0.9 m
  checkpoint_<N>.h5 / .xmf        restart file (parallel HDF5) and its XDMF description
  summary.json                    how the run ended, final residuals, and the answers: forces,
                                  Cf, y+, separation and reattachment per wall
  progress.log                    everything the run printed
  case.resolved.yaml              the case with every default written out (itself a valid case)

To view the fields, open ${DEMO_OUT}/fields.pvts (the index of the per-rank pieces) in any VTK
viewer, e.g. 'paraview ${DEMO_OUT}/fields.pvts', and colour by 'velocity', 'eddy_viscosity' or 'y_plus'.
RANS results are model-dependent: validate them for your case and defer to applicable codes and
licensed engineering practice.
From Python (Debian's python3-vtk9):
  /usr/bin/python3 -c "from vtkmodules.vtkIOXML import vtkXMLPStructuredGridReader as R; \\
r = R(); r.SetFileName('${DEMO_OUT}/fields.pvts'); r.Update(); print(r.GetOutput().GetNumberOfCells(), 'cells')"
MSG
