#!/usr/bin/python3
"""Viewer check: render the head cell array of the last field file of a .pvd offscreen.

Usage: /usr/bin/python3 render_fields.py fields.pvd out.png

Reads the collection with a plain XML parser, opens its last .vtr with VTK's own reader,
colours the head cell array (hidden cells blanked through the ghost array), writes a PNG,
and fails unless the picture shows the field: enough non-background pixels and enough
distinct colours. Needs an X display (run under xvfb-run) and Debian's VTK Python module.
"""
import math
import os
import sys
import xml.etree.ElementTree as ET

from vtkmodules.vtkIOXML import vtkXMLRectilinearGridReader
from vtkmodules.vtkIOImage import vtkPNGWriter
from vtkmodules.vtkRenderingCore import (vtkActor, vtkDataSetMapper, vtkRenderer,
                                         vtkRenderWindow, vtkWindowToImageFilter)
from vtkmodules.vtkCommonCore import vtkLookupTable
from vtkmodules.vtkFiltersGeometry import vtkGeometryFilter
from vtkmodules.vtkFiltersParallel import vtkRemoveGhosts
import vtkmodules.vtkRenderingOpenGL2  # noqa: F401  (registers the OpenGL back end)

BACKGROUND = (1.0, 1.0, 1.0)  # white; the colour map below never produces pure white
NAN_COLOUR = (0.5, 0.5, 0.5)  # grey; must not appear once inactive cells are blanked
WIDTH, HEIGHT = 800, 600
# Thresholds (common practice for smoke tests of plots): the grid fills the view after
# ResetCamera, so far more than 10 % of the pixels are field; a colour-mapped field with a
# head range shows many shades, a flat or failed render shows one or two.
MIN_FIELD_FRACTION = 0.10
MIN_DISTINCT_COLOURS = 16


def fail(message):
    print(f"FAILED: {message}", file=sys.stderr)
    sys.exit(1)


def last_field_file(pvd_path):
    root = ET.parse(pvd_path).getroot()
    if root.get("type") != "Collection":
        fail(f"{pvd_path} is not a VTK collection")
    datasets = root.findall("./Collection/DataSet")
    if not datasets:
        fail(f"{pvd_path} lists no field files")
    folder = os.path.dirname(os.path.abspath(pvd_path))
    for ds in datasets:
        if not os.path.isfile(os.path.join(folder, ds.get("file", ""))):
            fail(f"{pvd_path} names a missing file: {ds.get('file')}")
    last = max(datasets, key=lambda ds: float(ds.get("timestep")))
    return os.path.join(folder, last.get("file"))


def read_grid(vtr_path):
    reader = vtkXMLRectilinearGridReader()
    reader.SetFileName(vtr_path)
    reader.Update()
    if reader.GetErrorCode() != 0:
        fail(f"VTK could not read {vtr_path}")
    grid = reader.GetOutput()
    head = grid.GetCellData().GetArray("head")
    if head is None:
        fail(f"{vtr_path} has no cell array 'head'")
    values = [head.GetValue(i) for i in range(head.GetNumberOfTuples())]
    finite = [v for v in values if not math.isnan(v)]
    if not finite:
        fail(f"{vtr_path}: every head is NaN")
    return grid, (min(finite), max(finite))


def visible_surface(grid):
    """The grid's cells minus those flagged HIDDENCELL in vtkGhostType (the blanking)."""
    surface = vtkGeometryFilter()
    surface.SetInputData(grid)
    visible = vtkRemoveGhosts()
    visible.SetInputConnection(surface.GetOutputPort())
    visible.Update()
    shown = visible.GetOutput()
    n_visible = sum(1 for i in range(grid.GetNumberOfCells()) if grid.IsCellVisible(i))
    if shown.GetNumberOfCells() != n_visible:
        fail(f"{shown.GetNumberOfCells()} cells shown, {n_visible} visible in the grid")
    head = shown.GetCellData().GetArray("head")
    if any(math.isnan(head.GetValue(i)) for i in range(head.GetNumberOfTuples())):
        fail("a visible cell has a NaN head: inactive cells are not all blanked")
    return shown


def render(grid, head_range, png_path):
    lut = vtkLookupTable()
    lut.SetHueRange(0.667, 0.0)  # blue (low head) to red (high head)
    lut.SetNumberOfTableValues(256)
    lut.SetNanColor(*NAN_COLOUR, 1.0)
    lut.Build()
    lo, hi = head_range
    if hi <= lo:
        hi = lo + 1.0
    mapper = vtkDataSetMapper()
    mapper.SetInputData(visible_surface(grid))
    mapper.SetScalarModeToUseCellFieldData()
    mapper.SelectColorArray("head")
    mapper.SetLookupTable(lut)
    mapper.SetScalarRange(lo, hi)
    mapper.ScalarVisibilityOn()
    actor = vtkActor()
    actor.SetMapper(mapper)
    renderer = vtkRenderer()
    renderer.AddActor(actor)
    renderer.SetBackground(*BACKGROUND)
    renderer.ResetCamera()
    window = vtkRenderWindow()
    window.SetOffScreenRendering(1)
    window.SetSize(WIDTH, HEIGHT)
    window.AddRenderer(renderer)
    window.Render()
    grab = vtkWindowToImageFilter()
    grab.SetInput(window)
    grab.SetInputBufferTypeToRGB()
    grab.ReadFrontBufferOff()
    grab.Update()
    writer = vtkPNGWriter()
    writer.SetFileName(png_path)
    writer.SetInputConnection(grab.GetOutputPort())
    writer.Write()
    return grab.GetOutput()


def check_image(image):
    from vtkmodules.util.numpy_support import vtk_to_numpy
    pixels = vtk_to_numpy(image.GetPointData().GetScalars())[:, :3]
    background = tuple(round(255 * c) for c in BACKGROUND)
    is_field = (pixels != background).any(axis=1)
    fraction = is_field.mean()
    distinct = len({tuple(p) for p in pixels[is_field][:: max(1, is_field.sum() // 20000)]})
    nan = tuple(round(255 * c) for c in NAN_COLOUR)
    nan_pixels = int((pixels == nan).all(axis=1).sum())
    print(f"field pixels {fraction:.1%}, distinct colours {distinct}, NaN-coloured {nan_pixels}")
    if nan_pixels > 0:
        fail(f"{nan_pixels} pixels show the NaN colour: blanked cells were drawn")
    if fraction < MIN_FIELD_FRACTION:
        fail(f"only {fraction:.1%} of the image shows the field")
    if distinct < MIN_DISTINCT_COLOURS:
        fail(f"only {distinct} distinct colours: the head is not colour mapped")


def main():
    if len(sys.argv) != 3:
        print(__doc__, file=sys.stderr)
        sys.exit(64)
    pvd, png = sys.argv[1], sys.argv[2]
    vtr = last_field_file(pvd)
    grid, head_range = read_grid(vtr)
    print(f"rendering {os.path.basename(vtr)}: head {head_range[0]:.6g} .. {head_range[1]:.6g}")
    image = render(grid, head_range, png)
    check_image(image)
    print(f"wrote {png}")


if __name__ == "__main__":
    main()
