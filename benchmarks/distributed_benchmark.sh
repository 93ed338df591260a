#!/usr/bin/env bash
# The serial engine and the distributed engine with 1 and 2 ranks on the same generated
# basins, one after the other in the same run (docs/distributed.md).
#   benchmarks/distributed_benchmark.sh BUILD_DIR [SIZES] [STEPS] [VARIANT]
# e.g. benchmarks/distributed_benchmark.sh build 1e6,4e6 5 confined
set -euo pipefail
build=${1:?build folder} sizes=${2:-1e6} steps=${3:-5} variant=${4:-confined}
mpi=(mpirun --allow-run-as-root --oversubscribe -x OMP_NUM_THREADS=1)
for threads in 1 2; do
  echo "== serial engine (basin_benchmark, $threads thread(s))"
  "$build/benchmarks/basin_benchmark" --sizes "$sizes" --steps "$steps" --variant "$variant" --threads "$threads"
done
echo
echo "== distributed engine"
printf '%-10s %8s %5s %5s %9s %9s %7s %6s %7s %10s %11s  %s\n' variant cells ranks steps s/step "1st step" set-up \
  Newton lin.it setup/reuse "MiB/rank" "linear solver"
for size in ${sizes//,/ }; do
  for ranks in 1 2; do
    "${mpi[@]}" -np "$ranks" "$build/benchmarks/distributed_benchmark" --cells "$size" --steps "$steps" --variant "$variant"
  done
done
