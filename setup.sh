#!/usr/bin/env bash
# Installs what is missing, builds, and runs the demo or the tests.
#   ./setup.sh demo   build and run the demo basin (cases/01-marrow-basin)
#   ./setup.sh test   build (with the distributed engine, PETSc and MPI) and run every test
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
cd "$here"
what=${1:-demo}
case "$what" in
  demo) .ci/install-deps ;;
  test) .ci/install-deps --tests ;;
  *) echo "usage: ./setup.sh demo|test" >&2; exit 64 ;;
esac
jobs=$(nproc 2>/dev/null || echo 2)
# The demo is the plain build (no MPI); the tests also build and run the distributed engine
# and the multigrid linear solver (hypre).
petsc=OFF
if [[ $what == test ]]; then petsc=ON; fi
# A unity build (16 sources compiled as one): about 40 % less compiler time (DEVELOPERS.md).
cmake -S . -B build -DCMAKE_BUILD_TYPE=Release -DAQUILEDGER_WITH_PETSC=$petsc \
  -DAQUILEDGER_WITH_HYPRE=$petsc -DCMAKE_UNITY_BUILD=ON -DCMAKE_UNITY_BUILD_BATCH_SIZE=16
cmake --build build -j "$jobs"
case "$what" in
  demo)
    ./build/io/aquiledger check cases/01-marrow-basin/model.toml
    ./build/io/aquiledger run cases/01-marrow-basin/model.toml
    ;;
  test)
    ctest --test-dir build --output-on-failure -j "$jobs"
    ;;
esac
