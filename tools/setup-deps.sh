#!/usr/bin/env bash
# Installs the Debian 12 packages wallrans needs to build, test and post-process.
# Idempotent: only missing packages are installed; quick when everything is present.
# Opt-in extras (never part of the default set-up):
#   --fuzz       clang and libFuzzer for tools/fuzz.sh (Debian 12: clang 14)
#   --scheduler  Slurm and munge for the scheduler test (ctest -L scheduler). On a machine with
#                systemd, apt enables the system's slurmctld, slurmd and munge services as well;
#                the test does not use them (it starts a private Slurm of its own).
set -euo pipefail
packages=(
  build-essential cmake pkg-config git
  petsc-dev libhdf5-openmpi-dev libyaml-cpp-dev libvtk9-dev libopenmpi-dev openmpi-bin zlib1g-dev
  libgtest-dev hdf5-tools python3 python3-numpy python3-h5py python3-vtk9
  libcgns-dev cgns-convert python3-sympy python3-matplotlib python3-yaml libcli11-dev nlohmann-json3-dev
)
for option in "$@"; do
  case "$option" in
    --fuzz) packages+=(clang libfuzzer-14-dev) ;;
    --scheduler) packages+=(slurmd slurmctld slurm-client munge) ;;
    *)
      echo "setup-deps: unknown option '$option' (expected --fuzz or --scheduler)" >&2
      exit 2
      ;;
  esac
done
missing=()
for p in "${packages[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if [ ${#missing[@]} -eq 0 ]; then
  echo "setup-deps: all packages present"
  exit 0
fi
echo "setup-deps: installing ${missing[*]}"
export DEBIAN_FRONTEND=noninteractive
SUDO=""
[ "$(id -u)" -eq 0 ] || SUDO="sudo"
$SUDO apt-get update -qq
$SUDO apt-get install -y -qq --no-install-recommends "${missing[@]}"
