#!/usr/bin/env bash
# Installs the Debian packages hearth needs to build, test and run. Idempotent:
# apt-get skips what is already installed. Run as root (or with sudo).
set -euo pipefail

packages=(
  build-essential cmake pkg-config git procps
  libgmsh-dev gmsh               # meshing SDK (with OpenCASCADE for STEP/BREP)
  libeigen3-dev                  # dense/sparse linear algebra
  libvtk9-dev                    # VTK XML writers and off-screen rendering (the report's pictures)
  libx11-dev                     # X display check before rendering
  xvfb                           # a virtual X display where there is none (servers, CI)
  chromium                       # headless browser: the report tests open report.html in it
  libyaml-cpp-dev                # case-file parsing
  libgtest-dev                   # unit tests
  libsuitesparse-dev             # CHOLMOD sparse Cholesky
  libhypre-dev mpi-default-dev mpi-default-bin   # BoomerAMG (Debian builds hypre with MPI)
  libcli11-dev                   # command-line parsing
  nlohmann-json3-dev             # summary.json
  libopenblas-dev libopenblas0-pthread   # fast BLAS under CHOLMOD
  python3-vtk9 python3-numpy     # independent reader used by the result tests
  bubblewrap                     # sandbox for parsing geometry from others (tools/driver/sandbox.hpp)
  clang-14 libclang-rt-14-dev libomp-14-dev   # fuzzing build: clang, libFuzzer and sanitiser runtimes, OpenMP
)

SUDO=""
if [ "$(id -u)" -ne 0 ]; then SUDO="sudo"; fi

missing=()
for p in "${packages[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if [ ${#missing[@]} -gt 0 ]; then
  echo "hearth setup: installing ${missing[*]}" >&2
  export DEBIAN_FRONTEND=noninteractive
  $SUDO apt-get update -qq
  $SUDO apt-get install -y -qq --no-install-recommends "${missing[@]}"
else
  echo "hearth setup: all Debian packages present" >&2
fi

# CHOLMOD runs its supernodal factorisation on the system BLAS: make it OpenBLAS.
for alt in libblas.so.3-x86_64-linux-gnu liblapack.so.3-x86_64-linux-gnu; do
  cand=$(update-alternatives --list "$alt" 2>/dev/null | grep -m1 openblas-pthread || true)
  if [ -n "$cand" ]; then $SUDO update-alternatives --set "$alt" "$cand" >/dev/null; fi
done
