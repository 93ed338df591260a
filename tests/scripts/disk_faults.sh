#!/usr/bin/env bash
# Disk and file faults (docs/robustness.md): an output folder that cannot be created or
# written, a full disk, a file-size limit, and an array file deleted between `check` and
# `run`. Each must give a clear message and a non-zero exit status, and leave every result
# file complete (the previous version or the new one, never a torn file, no temporaries).
set -euo pipefail
exe=$1
src=$2
t=$(mktemp -d)
mounted=()
cleanup() {
  for m in "${mounted[@]}"; do umount "$m" 2>/dev/null || true; done
  rm -rf "$t"
}
trap cleanup EXIT
fail() { echo "FAIL: $*"; exit 1; }
small="$src/tests/data/robust/nonconvergent.toml"  # stops with status 2 after 2 steps
big="$src/tests/data/robust/restart.toml"          # ~0.5 MB per field file, 37 of them

# expect STATUS PATTERN command...: runs it, checks the exit status and the message.
expect() {
  local want=$1 pattern=$2
  shift 2
  set +e
  msg=$("$@" 2>&1)
  local status=$?
  set -e
  [[ $status -eq $want ]] || fail "'$*': exit status $status, expected $want; $msg"
  grep -Eq "$pattern" <<<"$msg" || fail "'$*': message lacks '$pattern': $msg"
  echo "  status $status: $(grep -E "$pattern" <<<"$msg" | head -1)"
}

# Every file in the folder is complete: CSVs without torn rows, a parseable fields.pvd that
# names only existing files, field files that end with their closing tag, no temporaries.
check_complete() {
  python3 - "$1" <<'PY'
import csv, os, sys
import xml.etree.ElementTree as ET
r = sys.argv[1]
names = os.listdir(r)
assert not [n for n in names if ".tmp-" in n], "temporaries left: " + str(names)
for n in names:
    p = os.path.join(r, n)
    if n.endswith(".csv"):
        text = open(p).read()
        assert text.endswith("\n"), n + " does not end with a newline"
        rows = list(csv.reader(text.splitlines()))
        assert rows and all(len(x) == len(rows[0]) for x in rows), n + ": torn rows"
    elif n.endswith(".vtr"):
        assert open(p, "rb").read().rstrip().endswith(b"</VTKFile>"), n + " is torn"
if "fields.pvd" in names:
    for d in ET.parse(os.path.join(r, "fields.pvd")).getroot().iter("DataSet"):
        assert d.get("file") in names, "fields.pvd names a missing " + d.get("file")
print("    %d files, all complete" % len(names))
PY
}

echo "output folder below a regular file"
touch "$t/plain_file"
expect 3 "cannot create output folder" "$exe" run "$small" -q -o "$t/plain_file/results"
[[ -f "$t/plain_file" && ! -s "$t/plain_file" ]] || fail "the regular file was changed"

echo "read-only output folder"
mkdir -p "$t/ro"
if [[ $(id -u) -eq 0 ]] && mount --bind "$t/ro" "$t/ro" 2>/dev/null; then
  mounted+=("$t/ro")
  mount -o remount,bind,ro "$t/ro"
  expect 3 "not writable" "$exe" run "$small" -q -o "$t/ro"
else
  chmod 555 "$t/ro"
  if touch "$t/ro/probe" 2>/dev/null; then
    echo "  (no read-only bind mount and permissions do not stop this user: skipped)"
  else
    expect 3 "not writable" "$exe" run "$small" -q -o "$t/ro"
  fi
fi

echo "disk full"
mkdir -p "$t/full"
if [[ $(id -u) -eq 0 ]] && mount -t tmpfs -o size=1m tmpfs "$t/full" 2>/dev/null; then
  mounted+=("$t/full")
  # A complete earlier result set first, then a run that fills the disk over it.
  "$exe" run "$small" -q -o "$t/full/results" 2>/dev/null || true
  expect 3 "No space left on device" "$exe" run "$big" -q -o "$t/full/results"
  check_complete "$t/full/results"
  # The earlier run's summary is gone: no folder pairs an old summary with newer tables.
  [[ ! -f "$t/full/results/summary.json" ]] || fail "a stale summary.json was left"
else
  echo "  (tmpfs not mountable here: covered by the file-size limit below)"
fi

echo "file-size limit (ulimit -f), SIGXFSZ ignored so that the write fails with EFBIG"
"$exe" run "$small" -q -o "$t/limited" 2>/dev/null || true
check_complete "$t/limited"
expect 3 "File too large" bash -c "ulimit -f 200; exec \"$exe\" run \"$big\" -q -o \"$t/limited\""
check_complete "$t/limited"

echo "array file deleted between check and run"
cp "$src/tests/data/robust/nonconvergent.toml" "$src/tests/data/robust/k_contrast.txt" "$t/"
"$exe" check "$t/nonconvergent.toml" >/dev/null || fail "check of the copied model failed"
"$exe" run "$t/nonconvergent.toml" -q -o "$t/earlier" 2>/dev/null || true
cp -r "$t/earlier" "$t/earlier_copy"
rm "$t/k_contrast.txt"
expect 1 "cannot open array file .*k_contrast.txt" "$exe" run "$t/nonconvergent.toml" -q -o "$t/earlier"
diff -r "$t/earlier" "$t/earlier_copy" >/dev/null || fail "earlier results were touched"
echo "  earlier results untouched"
echo "disk_faults: ok"
