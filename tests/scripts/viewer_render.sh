#!/usr/bin/env bash
# Viewer check: run the demo basin, then render the head of its last field file offscreen
# with VTK (as an open viewer would) and check the picture shows a colour-mapped field.
#   bash viewer_render.sh <aquiledger> <source-dir>
# Prints "SKIPPED: ..." and exits 0 only when xvfb-run or Debian's VTK Python module is
# missing; ctest reports that as skipped (SKIP_REGULAR_EXPRESSION). Any other problem fails.
set -euo pipefail
exe=${1:?usage: viewer_render.sh <aquiledger> <source-dir>}
src=${2:?usage: viewer_render.sh <aquiledger> <source-dir>}
python=/usr/bin/python3  # Debian's VTK module loads only with the system Python

if ! command -v xvfb-run >/dev/null 2>&1; then
  echo "SKIPPED: xvfb-run is not installed (Debian packages xvfb xauth)"
  exit 0
fi
if ! "$python" -c 'import vtkmodules.vtkRenderingOpenGL2, vtkmodules.vtkIOXML' >/dev/null 2>&1; then
  echo "SKIPPED: $python has no VTK module (Debian package python3-vtk9)"
  exit 0
fi

tmpdir=$(mktemp -d)
trap 'rm -rf "$tmpdir"' EXIT

"$exe" run "$src/cases/01-marrow-basin/model.toml" --output "$tmpdir"
if [[ ! -f "$tmpdir/fields.pvd" ]]; then
  echo "FAILED: the run wrote no $tmpdir/fields.pvd" >&2
  exit 1
fi
# The summary must be valid JSON (RFC 8259) for scripts that read it.
"$python" -c 'import json, sys; json.load(open(sys.argv[1]))' "$tmpdir/summary.json"
xvfb-run -a -s '-screen 0 1024x768x24' "$python" "$src/tests/scripts/render_fields.py" \
  "$tmpdir/fields.pvd" "$tmpdir/out.png"
echo "viewer render: OK"
