"""Helpers for the end-to-end tests of the hearth program.

Each test script is run as

    /usr/bin/python3 tests/cli/<script>.py /path/to/hearth

(Debian's python3 with python3-vtk9 and numpy). The helpers write a case folder
into a temporary directory, run hearth on it, and read the result files back with
readers that share no code with hearth: VTK's own XML reader for the VTU files,
Python's json and csv modules for the rest.
"""

import csv
import json
import os
import re
import shutil
import subprocess
import sys
import tempfile
import textwrap
import unittest
import weakref

import numpy as np
import vtk
from vtk.util.numpy_support import vtk_to_numpy

HEARTH = None  # set by main() from argv[1]

# VTK cell types (vtkCellType.h)
VTK_TETRA = 10
VTK_QUADRATIC_TETRA = 24

# A plain prism 0 <= x <= 0.25, 0 <= y, z <= 0.1 (metres). OpenCASCADE box faces:
# 1 x=xmin, 2 x=xmax, 3 y=ymin, 4 y=ymax, 5 z=zmin, 6 z=zmax.
WALL_GEO_M = """\
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 0.25, 0.1, 0.1};
Physical Volume("wall") = {1};
Physical Surface("hot") = {1};
Physical Surface("cold") = {2};
Physical Surface("sides") = {3, 4, 5, 6};
"""

# The same prism written in millimetres.
WALL_GEO_MM = """\
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 250, 100, 100};
Physical Volume("wall") = {1};
Physical Surface("hot") = {1};
Physical Surface("cold") = {2};
Physical Surface("sides") = {3, 4, 5, 6};
"""

# Plane wall of verification.md C01(a): k = 1.1, T(0) = 1000 degC, T(0.25) = 200 degC.
WALL_CASE = """\
title: plane wall C01
units: {length: m, temperature: degC}
geometry:
  file: wall.geo
mesh:
  size: 0.05
  order: 1
materials:
  brick:
    conductivity: 1.1
regions:
  wall: brick
boundaries:
  hot: {temperature: 1000}
  cold: {temperature: 200}
probes:
  mid: [0.1, 0.05, 0.05]
  off_axis: [0.1732, 0.0213, 0.0871]
lines:
  through: {from: [0, 0.05, 0.05], to: [0.25, 0.05, 0.05], points: 11}
output:
  directory: results
"""


def dedent(text):
    return textwrap.dedent(text)


class CaseDir:
    """A case folder in a fresh temporary directory: <tmp>/case/{case.yaml, files...}."""

    def __init__(self, case_text, files=None, case_name="case.yaml"):
        self.root = tempfile.mkdtemp(prefix="hearth-cli-")
        # Removed when the object goes or the test program ends, even where a test
        # never calls cleanup() (many folders were left in /tmp otherwise).
        self._remove = weakref.finalize(self, shutil.rmtree, self.root, True)
        self.dir = os.path.join(self.root, "case")
        os.makedirs(self.dir)
        self.case = os.path.join(self.dir, case_name)
        write_text(self.case, case_text)
        for name, text in (files or {}).items():
            write_text(os.path.join(self.dir, name), text)

    def path(self, *parts):
        return os.path.join(self.dir, *parts)

    def cleanup(self):
        self._remove()

    def snapshot(self):
        """{relative path: bytes} of every file under the temporary root."""
        out = {}
        for base, _dirs, files in os.walk(self.root):
            for f in files:
                p = os.path.join(base, f)
                with open(p, "rb") as fh:
                    out[os.path.relpath(p, self.root)] = fh.read()
        return out

    def entries(self):
        """Every path (files and folders) under the temporary root, relative to it."""
        out = set()
        for base, dirs, files in os.walk(self.root):
            for n in dirs + files:
                out.add(os.path.relpath(os.path.join(base, n), self.root))
        return out


def wall_case(geo=WALL_GEO_M, case=WALL_CASE, extra_files=None):
    files = {"wall.geo": geo}
    files.update(extra_files or {})
    return CaseDir(case, files)


def write_text(path, text):
    os.makedirs(os.path.dirname(path), exist_ok=True)
    with open(path, "w") as fh:
        fh.write(text)


def read_text(path):
    with open(path) as fh:
        return fh.read()


class Result:
    def __init__(self, proc, args):
        self.returncode = proc.returncode
        self.stdout = proc.stdout
        self.stderr = proc.stderr
        self.args = args

    def describe(self):
        return "hearth %s\nexit %d\n--- stdout ---\n%s\n--- stderr ---\n%s" % (
            " ".join(self.args), self.returncode, self.stdout[-4000:], self.stderr[-4000:])


def run_hearth(*args, cwd=None, timeout=300):
    args = [str(a) for a in args]
    proc = subprocess.run([HEARTH] + args, cwd=cwd, capture_output=True, text=True, timeout=timeout)
    return Result(proc, args)


# ---------------------------------------------------------------- VTU reading

def read_vtu(path):
    if not os.path.isfile(path):
        raise AssertionError("no such VTU file: %s" % path)
    reader = vtk.vtkXMLUnstructuredGridReader()
    reader.SetFileName(path)
    reader.Update()
    grid = reader.GetOutput()
    if grid is None or grid.GetNumberOfPoints() == 0:
        raise AssertionError("VTK read no points from %s" % path)
    return grid


def points(grid):
    return vtk_to_numpy(grid.GetPoints().GetData()).astype(float)


def point_field(grid, name):
    a = grid.GetPointData().GetArray(name)
    if a is None:
        raise AssertionError("VTU has no point field '%s' (has: %s)" % (name, point_field_names(grid)))
    return vtk_to_numpy(a).astype(float)


def cell_field(grid, name):
    a = grid.GetCellData().GetArray(name)
    if a is None:
        raise AssertionError("VTU has no cell field '%s' (has: %s)" % (name, cell_field_names(grid)))
    return vtk_to_numpy(a)


def point_field_names(grid):
    pd = grid.GetPointData()
    return [pd.GetArrayName(i) for i in range(pd.GetNumberOfArrays())]


def cell_field_names(grid):
    cd = grid.GetCellData()
    return [cd.GetArrayName(i) for i in range(cd.GetNumberOfArrays())]


def field_data_strings(grid, name):
    a = grid.GetFieldData().GetAbstractArray(name)
    if a is None:
        return None
    return [a.GetValue(i) for i in range(a.GetNumberOfValues())]


def field_data_ints(grid, name):
    a = grid.GetFieldData().GetArray(name)
    if a is None:
        return None
    return [int(a.GetTuple1(i)) for i in range(a.GetNumberOfTuples())]


def cell_types(grid):
    return [grid.GetCellType(i) for i in range(grid.GetNumberOfCells())]


def cell_connectivity(grid):
    """(n_cells, nodes_per_cell) array; all cells must have the same node count."""
    n = grid.GetNumberOfCells()
    ids = vtk.vtkIdList()
    rows = []
    for c in range(n):
        grid.GetCellPoints(c, ids)
        rows.append([ids.GetId(k) for k in range(ids.GetNumberOfIds())])
    return np.array(rows, dtype=np.int64)


# VTK_QUADRATIC_TETRA node order: vertices 0..3, then the mid-edge nodes of
# edges (0,1), (1,2), (2,0), (0,3), (1,3), (2,3) (vtkQuadraticTetra.h).
QUADRATIC_TETRA_EDGES = [(0, 1), (1, 2), (2, 0), (0, 3), (1, 3), (2, 3)]


def barycentric(vertices, point):
    """Barycentric coordinates of point in the tet with the given 4 vertices."""
    v = np.asarray(vertices, dtype=float)
    m = np.column_stack([v[1] - v[0], v[2] - v[0], v[3] - v[0]])
    l123 = np.linalg.solve(m, np.asarray(point, dtype=float) - v[0])
    return np.concatenate([[1.0 - l123.sum()], l123])


def shape_functions(lam, n_nodes):
    """Lagrange shape functions of the linear (4) or quadratic (10) tetrahedron at
    barycentric coordinates lam (straight edges, mid-edge nodes at the midpoints)."""
    if n_nodes == 4:
        return np.array(lam)
    if n_nodes == 10:
        vertex = [lam[i] * (2.0 * lam[i] - 1.0) for i in range(4)]
        edge = [4.0 * lam[i] * lam[j] for i, j in QUADRATIC_TETRA_EDGES]
        return np.array(vertex + edge)
    raise AssertionError("unexpected cell with %d nodes" % n_nodes)


def locate(grid, point):
    """(cell id, barycentric coordinates) of the cell that contains point: the cell is
    found with a vtkCellLocator; a point on a face or edge that the locator misses
    (round-off) falls back to the cell whose barycentric coordinates are least
    negative, which must be within 1e-9."""
    locator = vtk.vtkCellLocator()
    locator.SetDataSet(grid)
    locator.BuildLocator()
    xyz = points(grid)
    conn = cell_connectivity(grid)
    cell_id = locator.FindCell([float(c) for c in point])
    if cell_id >= 0:
        lam = barycentric(xyz[conn[cell_id, :4]], point)
        if lam.min() >= -1e-9:
            return cell_id, lam
    best, best_lam = -1, None
    for c in range(len(conn)):
        lam = barycentric(xyz[conn[c, :4]], point)
        if best_lam is None or lam.min() > best_lam.min():
            best, best_lam = c, lam
    if best_lam.min() < -1e-9:
        raise AssertionError("point %s is outside the mesh" % (list(point),))
    return best, best_lam


def fe_interpolate(grid, field, point):
    """The FE interpolant of a point field at a point, computed here: the containing
    cell from locate(), then the linear or quadratic Lagrange shape functions."""
    conn = cell_connectivity(grid)
    cell_id, lam = locate(grid, point)
    nodes = conn[cell_id]
    return float(np.dot(shape_functions(lam, len(nodes)), np.asarray(field)[nodes]))


def tet_volumes(xyz, conn):
    a = xyz[conn[:, 0]]
    b = xyz[conn[:, 1]]
    c = xyz[conn[:, 2]]
    d = xyz[conn[:, 3]]
    return np.abs(np.einsum("ij,ij->i", b - a, np.cross(c - a, d - a))) / 6.0


def volume_mean(grid, field):
    """Volume-weighted mean of the FE field over the mesh, computed here from the VTU:
    linear tet: V * mean of the 4 vertex values; quadratic (straight-edged) tet:
    V * (-sum(vertex)/20 + sum(edge)/5). Returns (mean, total volume)."""
    xyz = points(grid)
    conn = cell_connectivity(grid)
    vol = tet_volumes(xyz, conn)
    f = field[conn]
    if conn.shape[1] == 4:
        integral = vol * f.mean(axis=1)
    elif conn.shape[1] == 10:
        integral = vol * (-f[:, :4].sum(axis=1) / 20.0 + f[:, 4:].sum(axis=1) / 5.0)
    else:
        raise AssertionError("unexpected cell size %d" % conn.shape[1])
    return float(integral.sum() / vol.sum()), float(vol.sum())


# ---------------------------------------------------------------- other result files

def read_json(path):
    with open(path) as fh:
        return json.load(fh)


def read_csv(path):
    """(header list, rows as lists of strings)."""
    with open(path, newline="") as fh:
        rows = list(csv.reader(fh))
    return rows[0], rows[1:]


def rel_err(value, expected):
    return abs(value - expected) / max(abs(expected), 1e-300)


FILE_LINE = re.compile(r"case\.yaml:(\d+)")


def line_of(text, needle):
    """1-based number of the first line of text that contains needle."""
    for i, line in enumerate(text.splitlines(), start=1):
        if needle in line:
            return i
    raise ValueError("%r not in text" % needle)


# ---------------------------------------------------------------- runner

def main():
    global HEARTH
    if len(sys.argv) < 2:
        sys.stderr.write("usage: %s /path/to/hearth [unittest args]\n" % sys.argv[0])
        sys.exit(2)
    HEARTH = os.path.abspath(sys.argv[1])
    if not os.access(HEARTH, os.X_OK):
        sys.stderr.write("not an executable: %s\n" % HEARTH)
        sys.exit(2)
    argv = [sys.argv[0]] + sys.argv[2:]
    program = unittest.main(module="__main__", argv=argv, exit=False, verbosity=2)
    result = program.result
    failed = len(result.failures) + len(result.errors) + len(result.unexpectedSuccesses)
    passed = result.testsRun - failed - len(result.skipped)
    print("%d passed, %d failed%s" % (passed, failed,
                                      ", %d skipped" % len(result.skipped) if result.skipped else ""))
    sys.exit(0 if failed == 0 else 1)
