#!/usr/bin/env bash
# Builds the model-reader fuzz target with clang's libFuzzer, AddressSanitizer and
# UndefinedBehaviorSanitizer, seeds it with every model of the project, and runs it.
#   tests/fuzz/build_and_run.sh [SECONDS [RUNS [SEED]]]   defaults: 60 s, no run limit, seed 0
# (SEED 0: libFuzzer picks one, so each run explores anew; a fixed SEED with a RUNS limit
# repeats the same inputs, which is what the CI wants: its verdict does not change by chance.)
# Needs clang++ and its runtime (.ci/install-deps --fuzz). Build folder: build-fuzz/.
# A crash, hang (20 s per input) or sanitizer report stops the run with status non-zero and
# leaves the input as build-fuzz/crash-* (or timeout-*, leak-*): add it to tests/data/fuzz/.
set -euo pipefail
source_dir=$(cd "$(dirname "$0")/../.." && pwd)
seconds=${1:-60}
runs=${2:--1}
fuzz_seed=${3:-0}
build="$source_dir/build-fuzz"
cxx=$(command -v clang++-14 || command -v clang++ || true)
if [[ -z "$cxx" ]]; then
  echo "fuzz: clang++ not found; run .ci/install-deps --fuzz" >&2
  exit 1
fi
mkdir -p "$build/obj"

# The reader and what it needs; TOML++ compiled from its headers so that the fuzzer sees
# (and steers by) its branches too.
# (The pumping-test file's and the estimation set-up's readers, and the fitted model's writer,
# share the folder but not the model reader; they need the fitting numerics of postproc/ and
# are left out.)
mapfile -t reader_sources < <(cd "$source_dir" && ls io/model_file/*.cpp |
  grep -v -e pumping_test_reader -e estimation_reader -e fitted_model_writer)
sources=(
  "${reader_sources[@]}" io/files/input_file_guard.cpp io/files/calendar.cpp
  io/files/csv_table.cpp postproc/land_surface.cpp mesh/rectilinear_grid.cpp
  mesh/raster_resampling.cpp
  mesh/polyline_crossing.cpp tests/fuzz/fuzz_model_reader.cpp
)
# Two checks are off because they fire inside TOML++ 3.3 (Debian's), not in our code, on
# input that its parser then rejects properly: its own debug assertions (off in the shipped
# library too; one fires on "[" followed by a NUL byte), and UBSan's check of
# __builtin_unreachable, reached by its Unicode white-space table for a non-ASCII character
# right after a value (e.g. "x = 1" followed by a Latin-1 letter). Our code uses neither.
flags=(-std=c++20 -O2 -g -fno-omit-frame-pointer -fsanitize=fuzzer-no-link,address,undefined
       -fno-sanitize=unreachable -fno-sanitize-recover=undefined -DTOML_HEADER_ONLY=1 "-DTOML_ASSERT(expr)=static_assert(true)" -I"$source_dir"
       -I/usr/include/eigen3 -I/usr/include/gdal)
# (Eigen: the solver settings' reader names the linear solvers; GDAL: the raster reader.)
# New flags rebuild everything.
if [[ "$(cat "$build/flags" 2>/dev/null)" != "${flags[*]}" ]]; then
  rm -f "$build"/obj/*.o
  echo "${flags[*]}" >"$build/flags"
fi
compile() {  # source -> object, only when the source or a header changed since
  local src=$1 obj="$build/obj/$(echo "$1" | tr / _).o"
  if [[ ! -f "$obj" || -n $(find "$source_dir/io" "$source_dir/mesh" "$source_dir/solver" \
        "$source_dir/tests/fuzz" -newer "$obj" -name '*.?pp' -print -quit) ]]; then
    "$cxx" "${flags[@]}" -c "$source_dir/$src" -o "$obj"
  fi
  echo "$obj"
}
export -f compile
export cxx build source_dir
export flags_string="${flags[*]}"
objects=$(printf '%s\n' "${sources[@]}" |
  xargs -P 2 -I{} bash -c 'flags=($flags_string); compile {}')
"$cxx" -fsanitize=fuzzer,address,undefined $objects -lfmt -lgdal -o "$build/fuzz_model_reader"

# Seeds: every model of the project, each marked with its folder; the folders themselves are
# copied, so the fuzzer reads (never writes) copies of the array files.
root=$(mktemp -d)
trap 'rm -rf "$root"' EXIT
corpus="$build/corpus"
mkdir -p "$corpus"
mapfile -t seeds < <(cd "$source_dir" && find tests/data cases -name '*.toml' -not -path 'tests/data/fuzz/*' | sort)
for seed in "${seeds[@]}"; do
  folder=$(dirname "$seed")
  mkdir -p "$root/$folder"
  cp -r "$source_dir/$folder/." "$root/$folder/"
  { echo "#@$folder"; cat "$source_dir/$seed"; } >"$corpus/seed-$(echo "$seed" | tr / _)"
done
# The regression inputs are seeds too: each must keep passing.
cp "$source_dir"/tests/data/fuzz/* "$corpus/" 2>/dev/null || true

cd "$build"
echo "fuzz: ${#seeds[@]} seed models, ${seconds} s, runs ${runs}, seed ${fuzz_seed}"
AQUILEDGER_FUZZ_ROOT="$root" ASAN_OPTIONS=detect_leaks=1 UBSAN_OPTIONS=print_stacktrace=1 \
  ./fuzz_model_reader -max_total_time="$seconds" -runs="$runs" -seed="$fuzz_seed" -timeout=20 -rss_limit_mb=4096 \
  -max_len=65536 -print_final_stats=1 "$corpus"
