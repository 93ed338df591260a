#!/usr/bin/python3
"""Compares the results folder of a distributed run with that of the serial engine.

usage: compare_results.py SERIAL_FOLDER DISTRIBUTED_FOLDER

Tables must have the same header, rows and text fields (balance_steps.csv's
newton_iterations and cutbacks apart: each engine's own counts); numbers must agree to 1e-8 in head
(observations.csv head and drawdown, L) and to 1e-8 relative in every other column (the
distributed engine's acceptance criterion). summary.json must have the same keys, and the
same values except the timings and the linear solver's name and counts
(imbalance_percent, a difference of two totals, to 100 * 2e-8 percent). The field set must
index .pvtr files, as many as the serial .vtr files, which VTK's parallel reader reads as
one grid with the serial grid's coordinates and cell values (head, drawdown, saturated thickness
and compaction to 1e-8, others 1e-8 relative above a rounding floor of 1e-13 times the array's
sum of magnitudes, plus for storage rates 1e-13 times the cell's face flows; NaN alike).
Exits 1 naming the first disagreement.
"""
import csv
import json
import math
import os
import re
import sys

HEAD_TOL = 1e-8
REL_TOL = 1e-8
failures = []


def fail(text):
    failures.append(text)


def number(text):
    try:
        return float(text)
    except ValueError:
        return None


# imbalance_percent = 100 (in - out) / ((in + out) / 2): with in and out each within
# REL_TOL, it may differ by 100 * 2 * REL_TOL percent.
IMBALANCE_TOL = 100 * 2 * REL_TOL


def agree(a, b, absolute, tolerance=HEAD_TOL):
    if math.isnan(a) or math.isnan(b):
        return math.isnan(a) and math.isnan(b)
    if absolute:
        return abs(a - b) <= tolerance
    scale = max(abs(a), abs(b))
    return scale == 0.0 or abs(a - b) <= REL_TOL * scale


def compare_csv(name, serial, distributed):
    with open(os.path.join(serial, name)) as f:
        a = list(csv.reader(f))
    with open(os.path.join(distributed, name)) as f:
        b = list(csv.reader(f))
    if a[0] != b[0]:
        return fail(f"{name}: headers differ: {a[0]} / {b[0]}")
    if len(a) != len(b):
        return fail(f"{name}: {len(a) - 1} rows / {len(b) - 1} rows")
    header = a[0]
    worst = 0.0
    for r, (ra, rb) in enumerate(zip(a[1:], b[1:]), start=2):
        for col, va, vb in zip(header, ra, rb):
            if col in ("newton_iterations", "cutbacks"):
                continue  # the engines' own counts (as in summary.json, below)
            na, nb = number(va), number(vb)
            if na is None or nb is None:
                if va != vb:
                    fail(f"{name} line {r} {col}: '{va}' / '{vb}'")
                continue
            absolute = name == "observations.csv" and col in ("head", "drawdown")
            tolerance = HEAD_TOL
            if col == "imbalance_percent":
                absolute, tolerance = True, IMBALANCE_TOL
            if not agree(na, nb, absolute, tolerance):
                fail(f"{name} line {r} {col}: {va} / {vb}")
            elif not absolute and col != "imbalance_percent" and max(abs(na), abs(nb)) > 0:
                worst = max(worst, abs(na - nb) / max(abs(na), abs(nb)))
    print(f"  {name}: {len(a) - 1} rows agree (largest relative difference {worst:.2g})")


def compare_head_array(name, serial, distributed):
    """Head arrays (text or .asc): the same lines; numbers to HEAD_TOL (L)."""
    with open(os.path.join(serial, name)) as f:
        a = f.read().split("\n")
    path = os.path.join(distributed, name)
    if not os.path.exists(path):
        return fail(f"{name}: missing from the distributed run")
    with open(path) as f:
        b = f.read().split("\n")
    if len(a) != len(b):
        return fail(f"{name}: {len(a)} / {len(b)} lines")
    for r, (la, lb) in enumerate(zip(a, b), start=1):
        if la.startswith("#") or la == lb:
            continue
        ta, tb = la.split(), lb.split()
        if len(ta) != len(tb) or not all(
                number(x) is not None and number(y) is not None and agree(number(x), number(y), True)
                or x == y for x, y in zip(ta, tb)):
            return fail(f"{name} line {r}: '{la[:60]}' / '{lb[:60]}'")
    print(f"  {name}: {len(a)} lines agree")


def compare_summary(serial, distributed):
    with open(os.path.join(serial, "summary.json")) as f:
        a = json.load(f)
    with open(os.path.join(distributed, "summary.json")) as f:
        b = json.load(f)
    if list(a) != list(b):
        return fail(f"summary.json: keys differ: {list(a)} / {list(b)}")
    own = {"wall_time_seconds", "output_time_seconds", "linear_solver", "linear_solver_reason",
           "linear_iterations", "factorizations", "factorization_reuses",
           # Newton may take one iteration more or less with an iterative linear solver.
           "iterations_per_step", "iterations_per_step_stats", "newton_iterations"}
    for key in a:
        if key in own:
            continue
        va, vb = a[key], b[key]
        if isinstance(va, float) and isinstance(vb, (int, float)):
            same = agree(va, vb, "imbalance" in key, IMBALANCE_TOL)
        else:
            same = va == vb
        if not same:
            fail(f"summary.json {key}: {va} / {vb}")
    if a.get("iterations_per_step") != b.get("iterations_per_step"):
        print(f"  note: Newton iterations differ: {a.get('newton_iterations')} / {b.get('newton_iterations')}")
    print(f"  summary.json: {len(a)} keys agree")


def compare_fields(serial, distributed):
    import numpy
    import vtk
    from vtk.util.numpy_support import vtk_to_numpy
    with open(os.path.join(serial, "fields.pvd")) as f:
        files_a = re.findall(r'file="([^"]+)"', f.read())
    with open(os.path.join(distributed, "fields.pvd")) as f:
        files_b = re.findall(r'file="([^"]+)"', f.read())
    if len(files_a) != len(files_b) or not all(x.endswith(".pvtr") for x in files_b):
        return fail(f"fields.pvd: {files_a} / {files_b}")
    for fa, fb in zip(files_a, files_b):
        ra = vtk.vtkXMLRectilinearGridReader()
        ra.SetFileName(os.path.join(serial, fa))
        ra.Update()
        rb = vtk.vtkXMLPRectilinearGridReader()
        rb.SetFileName(os.path.join(distributed, fb))
        rb.Update()
        ga, gb = ra.GetOutput(), rb.GetOutput()
        if ga.GetDimensions() != gb.GetDimensions():
            return fail(f"{fb}: dimensions {gb.GetDimensions()} / {ga.GetDimensions()}")
        for axis in ("GetXCoordinates", "GetYCoordinates"):
            ca = vtk_to_numpy(getattr(ga, axis)())
            cb = vtk_to_numpy(getattr(gb, axis)())
            if ca.shape != cb.shape or abs(ca - cb).max() > 0:
                return fail(f"{fb}: coordinates differ")
        cells_a, cells_b = ga.GetCellData(), gb.GetCellData()
        # |flow| over each cell's four faces: its east and north faces and the east face of
        # its west neighbour and north face of its south neighbour (x fastest).
        nx, ny = ga.GetDimensions()[0] - 1, ga.GetDimensions()[1] - 1
        east = numpy.nan_to_num(abs(vtk_to_numpy(cells_a.GetArray("flow_east")).astype(float)))
        north = numpy.nan_to_num(abs(vtk_to_numpy(cells_a.GetArray("flow_north")).astype(float)))
        east, north = east.reshape(ny, nx), north.reshape(ny, nx)
        faces = east + north
        faces[:, 1:] += east[:, :-1]
        faces[1:, :] += north[:-1, :]
        cell_face_flows = faces.reshape(-1)
        for k in range(cells_a.GetNumberOfArrays()):
            name = cells_a.GetArrayName(k)
            xa = cells_a.GetArray(name)
            xb = cells_b.GetArray(name)
            if xb is None:
                return fail(f"{fb}: no cell array {name}")
            if name == "state" and not (xa.GetDataType() == xb.GetDataType() == vtk.VTK_INT):
                return fail(f"{fb}: state is not an integer array in both")
            va, vb = vtk_to_numpy(xa).astype(float), vtk_to_numpy(xb).astype(float)
            if va.shape != vb.shape:
                return fail(f"{fb} {name}: {vb.shape} values / {va.shape}")
            # Below the rounding floor of the array's sum (the engine's rounding_factor, 1e-13,
            # times the sum of its magnitudes) a difference is rounding: a face flow of 3e-11
            # against 0 beside flows of 1e2. A cell's storage rates balance its face flows, so
            # they carry the rounding of those flows too: their floor adds rounding_factor
            # times the cell's four face flows (as FlowSystem::rounding_floor counts them).
            floor = 1e-13 * float(abs(va[~numpy.isnan(va)]).sum())
            floors = numpy.full(va.shape, floor)
            if name.startswith("storage"):
                floors += 1e-13 * cell_face_flows
            lengths = name in ("head", "drawdown", "saturated_thickness", "compaction")
            for x, y, f in zip(va, vb, floors):
                x, y = float(x), float(y)
                if abs(x - y) <= f and not lengths:
                    continue
                if not agree(x, y, lengths):
                    return fail(f"{fb} {name}: {y} / {x}")
        ta = ga.GetFieldData().GetArray("TIME")
        tb = gb.GetFieldData().GetArray("TIME")
        if tb is None or ta.GetValue(0) != tb.GetValue(0):
            fail(f"{fb}: TIME differs or is missing")
    print(f"  fields: {len(files_b)} .pvtr sets read as one grid each, equal to the serial .vtr")


def compare_properties(serial, distributed):
    """aquifer_properties.vtr against the distributed set aquifer_properties.pvtr (each rank's
    piece of its own rows): the inputs as read, so every array equal bit for bit (NaN where
    the serial file has NaN)."""
    import numpy
    import vtk
    from vtk.util.numpy_support import vtk_to_numpy
    ra = vtk.vtkXMLRectilinearGridReader()
    ra.SetFileName(os.path.join(serial, "aquifer_properties.vtr"))
    ra.Update()
    path_b = os.path.join(distributed, "aquifer_properties.pvtr")
    if not os.path.exists(path_b):
        return fail("aquifer_properties.pvtr missing")
    rb = vtk.vtkXMLPRectilinearGridReader()
    rb.SetFileName(path_b)
    rb.Update()
    ga, gb = ra.GetOutput(), rb.GetOutput()
    if ga.GetDimensions() != gb.GetDimensions():
        return fail(f"aquifer_properties: dimensions {gb.GetDimensions()} / {ga.GetDimensions()}")
    cells_a, cells_b = ga.GetCellData(), gb.GetCellData()
    names = [cells_a.GetArrayName(k) for k in range(cells_a.GetNumberOfArrays())]
    for name in names:
        xb = cells_b.GetArray(name)
        if xb is None:
            return fail(f"aquifer_properties.pvtr: no cell array {name}")
        va, vb = vtk_to_numpy(cells_a.GetArray(name)), vtk_to_numpy(xb)
        if va.shape != vb.shape or not numpy.array_equal(va, vb, equal_nan=va.dtype.kind == "f"):
            return fail(f"aquifer_properties.pvtr {name} differs from the serial file")
    print(f"  aquifer_properties: {len(names)} cell arrays equal bit for bit")


def main():
    serial, distributed = sys.argv[1], sys.argv[2]
    for name in sorted(os.listdir(serial)):
        if name.endswith(".csv"):
            compare_csv(name, serial, distributed)
        elif name.startswith("head_at_") and name.endswith((".txt", ".asc")):
            compare_head_array(name, serial, distributed)
    compare_summary(serial, distributed)
    if os.path.exists(os.path.join(serial, "fields.pvd")):
        compare_fields(serial, distributed)
    if os.path.exists(os.path.join(serial, "aquifer_properties.vtr")):
        compare_properties(serial, distributed)
    for text in failures[:20]:
        print("DIFFERS:", text)
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
