#!/usr/bin/env bash
# Peak resident memory of every rank of `aquiledger run --engine petsc` on the generated
# basins of ../shared/bench/gen_basin.py (confined, read from its array files), with 1 and 2
# ranks, 4 steps (2 per period; the peak is the set-up and the first solves). Prints, per
# run, the wall time of the whole run and each rank's peak (MiB). docs/distributed.md.
#   benchmarks/band_memory.sh AQUILEDGER WORK_DIR [N_PER_SIDE...]
# e.g. benchmarks/band_memory.sh build/io/aquiledger /tmp/bands 1000 2000
set -euo pipefail
bin=$(realpath "${1:?aquiledger}") work=${2:?work folder}
shift 2
sizes=${*:-1000 2000}
gen=$(dirname "$0")/../../shared/bench/gen_basin.py
[ -f "$gen" ] || gen=/work/shared/bench/gen_basin.py
mkdir -p "$work"
printf '%9s %5s %8s  %s\n' cells ranks "wall s" "peak MiB per rank"
for n in $sizes; do
  model=$work/basin_confined_$n/model.toml
  if [ ! -f "$model" ]; then
    /usr/bin/python3 "$gen" --n "$n" --condition confined --out "$work" > /dev/null
    sed -i 's/^steps = .*/steps = 2/' "$model"
  fi
  for ranks in 1 2; do
    out=$work/out_${n}_$ranks
    rm -rf "$out"
    start=$(date +%s.%N)
    mpirun --allow-run-as-root --oversubscribe -x OMP_NUM_THREADS=1 -np "$ranks" \
      bash -c '/usr/bin/time -f "peak %M" -o "$0_$OMPI_COMM_WORLD_RANK" "$@"' \
      "$work/time_${n}_${ranks}" "$bin" run "$model" -o "$out" --engine petsc -q --threads 1 \
      > /dev/null
    end=$(date +%s.%N)
    peaks=""
    for r in $(seq 0 $((ranks - 1))); do
      kib=$(awk '/^peak/ {print $2}' "$work/time_${n}_${ranks}_$r")
      peaks="$peaks${peaks:+ / }$((kib / 1024))"
    done
    printf '%9d %5d %8.1f  %s\n' $((n * n)) "$ranks" "$(echo "$end - $start" | bc)" "$peaks"
  done
done
