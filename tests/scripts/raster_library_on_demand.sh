#!/usr/bin/env bash
# GDAL is loaded on the first raster, not at start-up (io/model_file/gdal_library.cpp,
# docs/performance.md "Seventh pass"). Checked against the dynamic linker's own record of the
# libraries it loads (LD_DEBUG=libs, glibc's ld.so(8)) and GDAL's own gdalinfo tool:
#  1. neither `--version` nor a run of a model without rasters or coordinate system loads
#     libgdal;
#  2. a run that writes GeoTIFF fields loads it, and gdalinfo reads the files it wrote with the
#     model's size (6 x 5 pixels of 100 m);
#  3. a second run reads one of those GeoTIFFs back as its conductivity raster, and a missing
#     raster is still a clear error naming the file, line and key.
set -euo pipefail
exe=$1
t=$(mktemp -d)
trap 'rm -rf "$t"' EXIT
fail() { echo "FAIL: $*"; exit 1; }

# The whole log first: grep -q would stop reading early and pipefail see the writer's SIGPIPE.
loads_gdal() {
  LD_DEBUG=libs "$@" 2>"$t/ld.log" >/dev/null || true
  grep -q 'calling init: .*libgdal\.so' "$t/ld.log"
}

cat >"$t/model.toml" <<'EOF'
[model]
title = "rasters on demand"
length_unit = "m"
time_unit = "d"

[grid]
nrow = 5
ncol = 6
dx = 100.0
dy = 100.0

[aquifer]
top = 30.0
bottom = 0.0
k = 10.0
condition = "water_table"
specific_yield = 0.2

[initial]
head = 20.0

[[period]]
name = "pumping"
length = 10.0
steps = 2

[[fixed_head]]
name = "west edge"
edge = "west"
head = 20.0

[[well]]
name = "well"
x = 450.0
y = 250.0
pumping_rate = 50.0

[output]
folder = "results"
fields = "period_end"
EOF

loads_gdal "$exe" --version && fail "--version loaded libgdal"
loads_gdal "$exe" run "$t/model.toml" -q -o "$t/plain" && fail "a run without rasters loaded libgdal"
echo "no raster: libgdal not loaded"

# With a coordinate system (checked through GDAL too) and GeoTIFF fields.
sed -e 's/^fields = "period_end"/fields = "period_end"\ngeotiff = true/' \
  -e 's/^dy = 100.0/dy = 100.0\nepsg = 32633/' "$t/model.toml" >"$t/tif.toml"
loads_gdal "$exe" run "$t/tif.toml" -q -o "$t/tif" || fail "a run writing GeoTIFFs did not load libgdal"
ls "$t/tif"/head_*.tif >/dev/null 2>&1 || fail "no head GeoTIFF written"
if command -v gdalinfo >/dev/null; then
  tif=$(ls "$t/tif"/head_*.tif | tail -1)
  gdalinfo "$tif" | grep -q 'Size is 6, 5' || fail "gdalinfo does not read $tif as 6 x 5"
  gdalinfo "$tif" | grep -q 'Pixel Size = (100.000000000000000,-100.000000000000000)' ||
    fail "gdalinfo does not read 100 m pixels in $tif"
  echo "GeoTIFF written through the loaded library, read by gdalinfo: 6 x 5 pixels of 100 m"
fi

cp "$(ls "$t/tif"/head_*.tif | tail -1)" "$t/k.tif"
sed 's/^k = 10.0/k = { raster = "k.tif" }/' "$t/tif.toml" >"$t/read.toml"
"$exe" run "$t/read.toml" -q -o "$t/read" || fail "a run reading a GeoTIFF failed"
echo "GeoTIFF read back as a conductivity raster"

sed 's/k.tif/missing.tif/' "$t/read.toml" >"$t/missing.toml"
if "$exe" run "$t/missing.toml" -q -o "$t/missing" 2>"$t/err.txt"; then fail "a missing raster ran"; fi
grep -q 'missing.toml:.*\[aquifer\]\.k\.raster: cannot open raster .*missing.tif' "$t/err.txt" ||
  fail "unexpected message: $(cat "$t/err.txt")"
echo "a missing raster: $(head -1 "$t/err.txt" | sed "s|$t/||g")"
