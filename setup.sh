#!/usr/bin/env bash
# Installs what is missing, builds, and runs the demo or the tests.
#   ./setup.sh demo   build and run the demo basin (cases/01-marrow-basin)
#   ./setup.sh test   build and run every test
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
cmake -S . -B build -DCMAKE_BUILD_TYPE=Release
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
