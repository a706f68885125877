#!/usr/bin/env python3
"""hearth report, output.report and the files for viewers, end to end.

A two-layer wall is solved with output.report: true; then every result file is read
back with a reader that shares no code with hearth: the PNG pictures with VTK's PNG
reader, the SVG plots with Python's XML parser, report.html in headless Chromium (no
network), the VTU and VTP files with VTK's XML readers.

Source of the expected field, used throughout: steady conduction through two layers in
series (Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, section 3.1,
"the composite wall", from memory; a closed form). Layer 1: 0 <= x <= 0.1 m, k = 1.0;
layer 2: 0.1 <= x <= 0.2 m, k = 0.2 W/(m K); T(0) = 500 degC, T(0.2) = 100 degC:
q = (500 - 100) / (0.1/1.0 + 0.1/0.2) = 666.67 W/m2, T(0.1) = 500 - 66.667 = 433.33 degC,
linear within each layer. Linear elements reproduce it exactly on a mesh that has the
interface as a face.

Usage: /usr/bin/python3 test_report.py /path/to/hearth
"""

import json
import os
import re
import shutil
import subprocess
import sys
import tempfile
import unittest
import xml.etree.ElementTree as ET

import numpy as np
import vtk
from vtk.util.numpy_support import vtk_to_numpy

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import hearth_testlib as H  # noqa: E402

SVG = "{http://www.w3.org/2000/svg}"

K1, K2, L1, L2 = 1.0, 0.2, 0.1, 0.1
T_HOT, T_COLD = 500.0, 100.0
Q = (T_HOT - T_COLD) / (L1 / K1 + L2 / K2)  # 666.67 W/m2
T_MID = T_HOT - Q * L1 / K1                  # 433.33 degC


def t_wall(x):
    """Incropera & DeWitt section 3.1 (from memory): the composite wall, closed form."""
    x = np.asarray(x, dtype=float)
    return np.where(x <= L1, T_HOT - Q * x / K1, T_MID - Q * (x - L1) / K2)


WALL_GEO = """\
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 0.1, 0.1, 0.1};
Box(2) = {0.1, 0, 0, 0.1, 0.1, 0.1};
BooleanFragments{ Volume{1, 2}; Delete; }{}
e = 1e-6;
Physical Volume("inner") = Volume In BoundingBox{-e, -e, -e, 0.1 + e, 0.1 + e, 0.1 + e};
Physical Volume("outer") = Volume In BoundingBox{0.1 - e, -e, -e, 0.2 + e, 0.1 + e, 0.1 + e};
Physical Surface("hot") = Surface In BoundingBox{-e, -e, -e, e, 0.1 + e, 0.1 + e};
Physical Surface("cold") = Surface In BoundingBox{0.2 - e, -e, -e, 0.2 + e, 0.1 + e, 0.1 + e};
s() = Surface{:};
s() -= Surface In BoundingBox{-e, -e, -e, e, 0.1 + e, 0.1 + e};
s() -= Surface In BoundingBox{0.2 - e, -e, -e, 0.2 + e, 0.1 + e, 0.1 + e};
s() -= Surface In BoundingBox{0.1 - e, -e, -e, 0.1 + e, 0.1 + e, 0.1 + e};
Physical Surface("sides") = {s()};
"""

WALL_CASE = """\
title: Two-layer wall
units: {length: m, temperature: degC}
geometry: {file: wall.geo}
mesh: {size: 0.025, order: 1}
materials:
  brick: {conductivity: 1.0, max_service_temperature: 1200}
  board: {conductivity: 0.2}
regions: {inner: brick, outer: board}
boundaries:
  hot: {temperature: 500}
  cold: {temperature: 100}
probes:
  middle: [0.1, 0.05, 0.05]
lines:
  through: {from: [0, 0.05, 0.05], to: [0.2, 0.05, 0.05], points: 41}
output: {directory: results, report: true}
"""

# The same wall heating up (a demo of the transient report; densities and heats invented).
TRANSIENT_CASE = WALL_CASE.replace("""  brick: {conductivity: 1.0, max_service_temperature: 1200}
  board: {conductivity: 0.2}""", """  brick: {conductivity: 1.0, density: 200, specific_heat: 1000}
  board: {conductivity: 0.2, density: 30, specific_heat: 1000}""").replace(
    "cold: {temperature: 100}", "cold: {convection: {coefficient: 10, ambient: 20}}").replace(
    "output: {directory: results, report: true}", """output: {directory: results, report: true}
analysis:
  type: transient
  duration: 7200
  time_step: 60
  initial_temperature: 20
  output_times: [1800, 3600, 7200]
safety: {touch_surfaces: [cold], touch_limit: 25}
thresholds:
  middle_warm: {probe: middle, temperature: 100}""")

PICTURES = ["picture_isometric.png", "picture_boundary.png", "picture_section.png"]


def have_display():
    return bool(os.environ.get("DISPLAY")) or shutil.which("Xvfb") is not None


def needs_display(cls):
    return unittest.skipUnless(have_display(), "neither an X display nor Xvfb (Debian package xvfb) is available")(cls)


# ---------------------------------------------------------------- pictures

def read_png(path):
    """(height, width, 3) uint8 array, row 0 at the top (VTK's PNG reader, independent of hearth)."""
    reader = vtk.vtkPNGReader()
    reader.SetFileName(path)
    reader.Update()
    image = reader.GetOutput()
    width, height, _ = image.GetDimensions()
    pixels = vtk_to_numpy(image.GetPointData().GetScalars()).reshape(height, width, -1)[:, :, :3]
    return pixels[::-1].astype(np.int32)


def srgb_lightness(rgb255):
    """CIE 1976 L* of sRGB colours (IEC 61966-2-1 transfer, BT.709 weights)."""
    c = np.asarray(rgb255, dtype=float) / 255.0
    lin = np.where(c <= 0.04045, c / 12.92, ((c + 0.055) / 1.055) ** 2.4)
    y = lin @ np.array([0.2126, 0.7152, 0.0722])
    return np.where(y > 216 / 24389, 116 * np.cbrt(y) - 16, 24389 / 27 * y)


def colour_bar(pixels):
    """The colour bar's colours from its cold (bottom) end to its hot (top) end: the
    longest vertical run of coloured pixels in the right fifth of the picture."""
    height, width, _ = pixels.shape
    best = (0, None, None, None)
    for col in range(int(0.8 * width), width):
        coloured = np.abs(pixels[:, col, :] - 255).sum(axis=1) > 60
        run, start = 0, 0
        for row in range(height):
            if coloured[row]:
                if run == 0:
                    start = row
                run += 1
                if run > best[0]:
                    best = (run, col, start, row)
            else:
                run = 0
    run, col, top, bottom = best
    if run < 0.4 * height:
        raise AssertionError("no colour bar found (longest run %d px)" % run)
    # the middle column of the bar: all columns with nearly as long a run
    cols = [c for c in range(col - 40, col + 40)
            if 0 <= c < width and (np.abs(pixels[top + 3:bottom - 3, c, :] - 255).sum(axis=1) > 60).all()]
    mid = cols[len(cols) // 2]
    return pixels[bottom - 2:top + 2:-1, mid, :]  # bottom to top, ends trimmed of the frame


def map_fractions(pixels, bar, region, tolerance=12):
    """For each pixel in region (rows, cols slices): the fraction along the colour bar
    (0 cold end, 1 hot end) of the nearest bar colour, NaN where no bar colour is within
    `tolerance` (lines, text, background)."""
    block = pixels[region]
    flat = block.reshape(-1, 3)
    keys = flat[:, 0] * 65536 + flat[:, 1] * 256 + flat[:, 2]
    unique, inverse = np.unique(keys, return_inverse=True)
    colours = np.stack([unique // 65536, (unique // 256) % 256, unique % 256], axis=1)
    distance = np.linalg.norm(colours[:, None, :] - bar[None, :, :], axis=2)
    nearest = distance.argmin(axis=1)
    fraction = np.where(distance[np.arange(len(unique)), nearest] <= tolerance, nearest / (len(bar) - 1), np.nan)
    return fraction[inverse].reshape(block.shape[:2])


def scene(pixels):
    """The part of the picture that shows the body: left of the colour bar, below the
    title, above the scale bar, and not the axis triad's corner (hearth's picture layout,
    io/picture_scene.cpp)."""
    height, width, _ = pixels.shape
    return (slice(int(0.14 * height), int(0.80 * height)), slice(0, int(0.82 * width)))


# ---------------------------------------------------------------- the run

@needs_display
class WallReport(unittest.TestCase):
    """One run of the two-layer wall with output.report: true, read back."""

    @classmethod
    def setUpClass(cls):
        cls.case = H.CaseDir(WALL_CASE, {"wall.geo": WALL_GEO})
        cls.out = os.path.join(cls.case.root, "out")
        env = dict(os.environ)
        env.pop("DISPLAY", None)  # render through a private Xvfb, as in CI
        proc = subprocess.run([H.HEARTH, "run", cls.case.case, "--out", cls.out], capture_output=True, text=True,
                              timeout=300, env=env)
        cls.run_result = proc
        if proc.returncode != 0:
            raise AssertionError("run failed (%d):\n%s" % (proc.returncode, proc.stderr[-4000:]))
        cls.summary = H.read_json(os.path.join(cls.out, "summary.json"))

    @classmethod
    def tearDownClass(cls):
        cls.case.cleanup()

    def path(self, name):
        return os.path.join(self.out, name)

    def test_the_run_made_the_report(self):
        for name in PICTURES + ["plot_line_through.svg", "report.html", "surface.vtp", "inputs.json"]:
            self.assertTrue(os.path.isfile(self.path(name)), name)
        self.assertIn("report:", self.run_result.stderr)
        self.assertIn("(Xvfb)", self.run_result.stderr)  # DISPLAY was unset: hearth started its own

    # --- pictures ---------------------------------------------------------

    def test_pictures_are_not_blank(self):
        for name in PICTURES:
            px = read_png(self.path(name))
            self.assertEqual(px.shape, (900, 1200, 3), name)
            body = px[scene(px)]
            not_white = (np.abs(body - 255).sum(axis=2) > 30).mean()
            colours = len(np.unique(body.reshape(-1, 3), axis=0))
            # thresholds: common practice, no source (a blank or flat picture has ~1 colour)
            self.assertGreater(not_white, 0.15, name)
            self.assertGreater(colours, 200, name)

    def test_colour_bar_is_the_published_map(self):
        # Ends: inferno's first and last entries, matplotlib _cm_listed.py (_inferno_data
        # rows 0 and 255) times 255; lightness rising from end to end (a rainbow's does not).
        bar = colour_bar(read_png(self.path("picture_section.png")))
        self.assertGreater(len(bar), 400)
        np.testing.assert_allclose(bar[0], [0.001462 * 255, 0.000466 * 255, 0.013866 * 255], atol=6)
        np.testing.assert_allclose(bar[-1], [0.988362 * 255, 0.998364 * 255, 0.644924 * 255], atol=6)
        lightness = srgb_lightness(bar[:: max(1, len(bar) // 20)])
        self.assertTrue(np.all(np.diff(lightness) > 0), lightness)

    def test_section_shows_the_closed_form_profile(self):
        px = read_png(self.path("picture_section.png"))
        bar = colour_bar(px)
        f = map_fractions(px, bar, scene(px))
        matched = np.isfinite(f)
        self.assertGreater(matched.mean(), 0.2)
        # Both ends of the map appear: the section holds the hot and the cold face.
        self.assertLess(np.nanmin(f), 0.03)
        self.assertGreater(np.nanmax(f), 0.97)
        # The cut (z through the hottest point) shows x from left to right; its extent in
        # pixels maps columns to x, and each column's colour must be the closed form's.
        cols = np.where(matched.sum(axis=0) > 0.3 * matched.sum(axis=0).max())[0]
        left, right = cols.min(), cols.max()
        checked = 0
        for c in range(left + 6, right - 5):
            column = f[:, c][np.isfinite(f[:, c])]
            if len(column) < 20:
                continue  # the line drawn at the layer border
            x = (c + 0.5 - left) / (right + 1 - left) * (L1 + L2)
            expected = (float(t_wall(x)) - T_COLD) / (T_HOT - T_COLD)
            self.assertAlmostEqual(float(np.median(column)), expected, delta=0.02, msg="column %d, x = %.4f" % (c, x))
            checked += 1
        self.assertGreater(checked, 0.8 * (right - left))

    def test_view_onto_the_largest_boundary(self):
        # "sides" (4 x 0.02 m2) is the largest named boundary; its temperatures run from
        # 100 to 500 degC along x, so the picture holds both ends of the map.
        px = read_png(self.path("picture_boundary.png"))
        f = map_fractions(px, colour_bar(px), scene(px))
        self.assertGreater(np.isfinite(f).mean(), 0.2)
        self.assertLess(np.nanmin(f), 0.03)
        self.assertGreater(np.nanmax(f), 0.97)
        html = H.read_text(self.path("report.html"))
        self.assertIn("View onto sides", html)

    def test_mesh_edges_on_request(self):
        plain = read_png(self.path("picture_isometric.png"))
        r = H.run_hearth("report", self.out, "--mesh-edges", "--quiet")
        self.assertEqual(r.returncode, 0, r.describe())
        edged = read_png(self.path("picture_isometric.png"))
        grey = lambda p: (np.abs(p - 107).max(axis=2) < 12).sum()  # the edge grey (0.42), io/field_pictures.cpp
        self.assertGreater(grey(edged), grey(plain) + 2000)
        self.assertIn("edges of the mesh", H.read_text(self.path("report.html")))
        self.assertEqual(H.run_hearth("report", self.out, "--quiet").returncode, 0)

    # --- plots ------------------------------------------------------------

    def test_line_plot_parses_and_holds_the_closed_form(self):
        root = ET.parse(self.path("plot_line_through.svg")).getroot()
        panels = {g.get("data-name"): g for g in root.iter(SVG + "g") if g.get("class") == "panel"}
        self.assertEqual(set(panels), {"temperature", "heat-flux"})

        def values(panel, cls):
            p = {k: float(panel.get("data-" + k)) for k in
                 ("x-min", "x-max", "y-min", "y-max", "left", "top", "width", "height")}
            out = []
            for line in panel.iter(SVG + "polyline"):
                if cls not in line.get("class").split():
                    continue
                pairs = [tuple(map(float, xy.split(","))) for xy in line.get("points").split()]
                self.assertEqual(int(line.get("data-points")), len(pairs))
                for u, v in pairs:
                    out.append((p["x-min"] + (u - p["left"]) / p["width"] * (p["x-max"] - p["x-min"]),
                                p["y-min"] + (p["top"] + p["height"] - v) / p["height"] * (p["y-max"] - p["y-min"])))
            return np.array(out)

        t = values(panels["temperature"], "temperature")
        q = values(panels["heat-flux"], "heat-flux")
        self.assertEqual(len(t), 41)  # lines.through.points
        self.assertEqual(len(q), 41)
        # Points are drawn to 0.01 px: 0.01 / 190 px of a 440 K range is 0.02 K.
        np.testing.assert_allclose(t[:, 1], t_wall(t[:, 0]), atol=0.05)
        np.testing.assert_allclose(q[:, 1], Q, atol=0.5)  # uniform flux: Q = 666.67 W/m2
        borders = [float(l.get("data-x")) for l in root.iter(SVG + "line") if l.get("class") == "region-boundary"]
        self.assertEqual(len(borders), 2)  # the same border in both panels
        for x in borders:
            self.assertAlmostEqual(x, L1, delta=1e-8)  # the layers meet at x = 0.1 m (wall.geo); bisected to 1e-9 of 0.2 m
        names = [e.text for e in root.iter(SVG + "text")]
        self.assertIn("inner", names)
        self.assertIn("outer", names)

    # --- report.html ------------------------------------------------------

    def test_report_html_is_self_contained(self):
        html = H.read_text(self.path("report.html"))
        # No external reference: no http(s) in src/href/url(), and no <script>.
        self.assertIsNone(re.search(r"(src|href)\s*=\s*[\"']?(https?:|//)", html))
        self.assertIsNone(re.search(r"url\(\s*['\"]?(https?:|//)", html))
        self.assertNotIn("<script", html)
        self.assertEqual(html.count("data:image/png;base64,"), 3)
        self.assertIn("Two-layer wall", html)
        self.assertIn("qualified person", html)
        self.assertIn("local codes and practice", html)
        self.assertIn("@media print", html)

    def test_report_tables_hold_the_run_figures(self):
        html = H.read_text(self.path("report.html"))
        rate = self.summary["boundaries"]["hot"]["heat_rate"]
        self.assertAlmostEqual(rate, Q * 0.01, delta=1e-6 * Q)  # closed form: 6.6667 W through 0.01 m2
        self.assertIn("%.6g" % rate, html)
        self.assertIn("temperature held at 500 \u00b0C", html)  # the condition as solved, with its unit
        self.assertIn("brick", html)
        self.assertIn(self.summary["hearth_version"], html)
        run = H.read_json(self.path("run.json"))
        self.assertIn(run["input_digest"], html)

    def test_report_opens_in_headless_chromium(self):
        browser = shutil.which("chromium")
        if not browser:
            self.skipTest("chromium is not installed (Debian package chromium)")
        work = tempfile.mkdtemp(prefix="hearth-report-view-")
        self.addCleanup(shutil.rmtree, work, True)
        # A copy in a folder of its own: it must need nothing beside it. A page script,
        # added for the test only, records what the page loaded into the DOM.
        probe = """<script>
window.addEventListener('error', e => console.error('page error: ' + (e.message || e.target.src)), true);
window.addEventListener('load', () => {
  const b = document.body;
  b.setAttribute('data-image-widths', [...document.images].map(i => i.naturalWidth).join(','));
  b.setAttribute('data-fetched', performance.getEntriesByType('resource').map(r => r.name)
                                   .filter(n => !n.startsWith('data:')).join(' '));
  b.setAttribute('data-svgs', document.querySelectorAll('svg').length);
  b.setAttribute('data-tables', document.querySelectorAll('table').length);
});
</script>"""
        page = os.path.join(work, "report.html")
        H.write_text(page, H.read_text(self.path("report.html")).replace("</body>", probe + "</body>"))
        flags = [browser, "--headless", "--disable-gpu", "--no-sandbox", "--no-first-run", "--disable-extensions",
                 "--proxy-server=127.0.0.1:9", "--host-resolver-rules=MAP * ~NOTFOUND",  # no network at all
                 "--enable-logging=stderr", "--v=0", "--virtual-time-budget=5000",
                 "--user-data-dir=" + os.path.join(work, "profile")]
        url = "file://" + page
        dom = subprocess.run(flags + ["--dump-dom", url], capture_output=True, text=True, timeout=120)
        self.assertEqual(dom.returncode, 0, dom.stderr[-3000:])
        body = re.search(r"<body([^>]*)>", dom.stdout)
        self.assertIsNotNone(body, dom.stdout[:2000])
        attrs = dict(re.findall(r'(data-[a-z-]+)="([^"]*)"', body.group(1)))
        widths = [int(w) for w in attrs["data-image-widths"].split(",")]
        self.assertEqual(widths, [1200, 1200, 1200])  # every picture decoded: naturalWidth > 0
        self.assertEqual(attrs["data-fetched"], "")   # nothing was fetched from outside
        self.assertGreaterEqual(int(attrs["data-svgs"]), 1)
        self.assertGreaterEqual(int(attrs["data-tables"]), 8)
        consoles = [l for l in dom.stderr.splitlines() if "CONSOLE" in l]
        self.assertEqual(consoles, [])  # no console errors (the page has no script of its own)
        self.assertIn("<h1>Two-layer wall</h1>", dom.stdout)
        # Warnings come first: before the first table.
        self.assertLess(dom.stdout.find("Warnings"), dom.stdout.find("<table"))

        shot = os.path.join(work, "shot.png")
        r = subprocess.run(flags + ["--hide-scrollbars", "--window-size=1000,4000", "--screenshot=" + shot, url],
                           capture_output=True, text=True, timeout=120)
        self.assertEqual(r.returncode, 0, r.stderr[-3000:])
        px = read_png(shot)
        title_rows = px[:120]
        self.assertGreater((title_rows.sum(axis=2) < 150).sum(), 500)  # dark title text at the top
        saturated = (px.max(axis=2) - px.min(axis=2) > 100).mean()
        self.assertGreater(saturated, 0.02)  # the pictures' colours are on the page
        table_rules = (np.abs(px - 185).max(axis=2) < 6).sum()  # the tables' grey rules (#b9b9b9)
        self.assertGreater(table_rules, 2000)

        pdf = os.path.join(work, "report.pdf")
        r = subprocess.run(flags + ["--no-pdf-header-footer", "--print-to-pdf=" + pdf, url],
                           capture_output=True, text=True, timeout=120)
        self.assertEqual(r.returncode, 0, r.stderr[-3000:])
        with open(pdf, "rb") as fh:
            data = fh.read()
        self.assertTrue(data.startswith(b"%PDF"))
        pages = len(re.findall(rb"/Type\s*/Page[^s]", data))
        self.assertGreaterEqual(pages, 3)
        self.assertGreater(len(data), 100000)  # the pictures went into the PDF

    # --- files for viewers ------------------------------------------------

    def test_vtu_and_vtp_read_back_with_names(self):
        grid = H.read_vtu(self.path("temperature.vtu"))
        self.assertEqual(H.field_data_strings(grid, "region_names"), ["inner", "outer"])
        self.assertEqual(H.field_data_strings(grid, "title"), ["Two-layer wall"])
        self.assertIn("temperature=degC", H.field_data_strings(grid, "units"))
        reader = vtk.vtkXMLPolyDataReader()
        reader.SetFileName(self.path("surface.vtp"))
        reader.Update()
        surf = reader.GetOutput()
        names = [surf.GetFieldData().GetAbstractArray("boundary_names").GetValue(i)
                 for i in range(surf.GetFieldData().GetAbstractArray("boundary_names").GetNumberOfValues())]
        tags = vtk_to_numpy(surf.GetFieldData().GetArray("boundary_tags"))
        self.assertEqual(sorted(names), ["cold", "hot", "sides"])
        boundary = vtk_to_numpy(surf.GetCellData().GetArray("boundary"))
        exterior = vtk_to_numpy(surf.GetCellData().GetArray("exterior"))
        region = vtk_to_numpy(surf.GetCellData().GetArray("region"))
        xyz = vtk_to_numpy(surf.GetPoints().GetData()).astype(float)
        tri = vtk_to_numpy(surf.GetPolys().GetConnectivityArray()).reshape(-1, 3)
        a, b, c = xyz[tri[:, 0]], xyz[tri[:, 1]], xyz[tri[:, 2]]
        normal = np.cross(b - a, c - a) / 2
        area = np.linalg.norm(normal, axis=1)
        centre = np.array([0.1, 0.05, 0.05])
        self.assertTrue(exterior.all())  # no internal named surface in this case
        # Outward: on a box every exterior normal points away from its centre (convex).
        self.assertTrue((np.einsum("ij,ij->i", normal, (a + b + c) / 3 - centre) > 0).all())
        for name, tag in zip(names, tags):
            self.assertAlmostEqual(area[boundary == tag].sum(), self.summary["boundaries"][name]["area"], delta=1e-12)
        self.assertAlmostEqual(area.sum(), 2 * 0.01 + 4 * 0.02, delta=1e-12)  # box 0.2 x 0.1 x 0.1: closed form
        region_tags = dict(zip(H.field_data_strings(grid, "region_names"), H.field_data_ints(grid, "region_tags")))
        hot_tri = boundary == tags[names.index("hot")]
        self.assertTrue((region[hot_tri] == region_tags["inner"]).all())  # the hot face bounds the inner layer
        # The node map: surface temperatures are the VTU's at those nodes, and the closed form.
        node = vtk_to_numpy(surf.GetPointData().GetArray("node"))
        t_surface = vtk_to_numpy(surf.GetPointData().GetArray("temperature"))
        np.testing.assert_array_equal(t_surface, H.point_field(grid, "temperature")[node])
        np.testing.assert_allclose(t_surface, t_wall(xyz[:, 0]), rtol=1e-9)

    def test_inputs_json_states_what_was_solved(self):
        inputs = H.read_json(self.path("inputs.json"))
        self.assertEqual(inputs["temperature_unit"], "degC")
        self.assertEqual(inputs["materials"]["brick"]["regions"], ["inner"])
        self.assertEqual(inputs["materials"]["brick"]["conductivity"], {"kind": "isotropic", "value": 1.0})
        self.assertAlmostEqual(inputs["materials"]["brick"]["max_service_temperature"], 1200, delta=1e-9)
        self.assertAlmostEqual(inputs["boundaries"]["hot"]["temperature"], 500, delta=1e-9)


# ---------------------------------------------------------------- other result folders

@needs_display
class OtherResults(unittest.TestCase):
    def setUp(self):
        self.case = H.CaseDir(WALL_CASE.replace("report: true", "report: false"), {"wall.geo": WALL_GEO})
        self.addCleanup(self.case.cleanup)

    def run_wall(self, out, *extra):
        r = H.run_hearth("run", self.case.case, "--out", out, "--quiet", *extra)
        self.assertEqual(r.returncode, 0, r.describe())
        return out

    def test_ascii_files_read_back_the_same(self):
        out = self.run_wall(os.path.join(self.case.root, "ascii"), "--ascii")
        for name in ("temperature.vtu", "surface.vtp"):
            text = H.read_text(os.path.join(out, name))
            self.assertIn('format="ascii"', text)
            self.assertNotIn("<AppendedData", text)
        grid = H.read_vtu(os.path.join(out, "temperature.vtu"))
        t = H.point_field(grid, "temperature")
        np.testing.assert_allclose(t, t_wall(H.points(grid)[:, 0]), rtol=1e-9)  # composite wall, closed form
        self.assertEqual(H.field_data_strings(grid, "region_names"), ["inner", "outer"])

    def test_quadratic_surface_is_split_into_quarters(self):
        out = self.run_wall(os.path.join(self.case.root, "p2"), "--set", "mesh.order=2")
        reader = vtk.vtkXMLPolyDataReader()
        reader.SetFileName(os.path.join(out, "surface.vtp"))
        reader.Update()
        surf = reader.GetOutput()
        parent = vtk_to_numpy(surf.GetCellData().GetArray("element_face"))
        self.assertEqual(surf.GetNumberOfCells(), 4 * (parent.max() + 1))
        self.assertTrue((np.bincount(parent) == 4).all())
        report = H.run_hearth("report", out, "--quiet", "--mesh-edges")
        self.assertEqual(report.returncode, 0, report.describe())

    def test_transient_run_pictures_its_last_field_and_plots_probe_histories(self):
        # The wall heated from 20 degC with the hot face held at 500 degC and the cold face
        # losing heat by convection: the series starts uniform, so only the last field
        # (t = 7200 s) gives a section that spans the colour map.
        case = H.CaseDir(TRANSIENT_CASE, {"wall.geo": WALL_GEO})
        self.addCleanup(case.cleanup)
        out = os.path.join(case.root, "out")
        r = H.run_hearth("run", case.case, "--out", out, "--quiet")
        self.assertEqual(r.returncode, 0, r.describe())
        summary = H.read_json(os.path.join(out, "summary.json"))
        fields = summary["analysis"]["fields"]
        self.assertGreater(len(fields), 2)
        px = read_png(os.path.join(out, "picture_section.png"))
        f = map_fractions(px, colour_bar(px), scene(px))
        self.assertLess(np.nanmin(f), 0.03)
        self.assertGreater(np.nanmax(f), 0.97)
        html = H.read_text(os.path.join(out, "report.html"))
        self.assertIn(fields[-1], html)  # "from temperature_NNNN.vtu": the last of the series
        self.assertIn("Transient result", html)
        self.assertIn("<h3>Time integration</h3>", html)
        self.assertIn("<h2>History</h2>", html)
        self.assertIn("<h3>Thresholds</h3>", html)
        when = summary["safety"]["touch"]["cold"]["first_exceeded_time"]
        self.assertIsNotNone(when)
        self.assertIn("%.6g s" % when, html)  # the touch limit's first crossing, in the limits table
        self.assertIn("energy_balance", summary)
        self.assertIn("in through boundaries J", html)  # the run's balance is in joules
        _, rows = H.read_csv(os.path.join(out, "probes.csv"))
        root = ET.parse(os.path.join(out, "plot_probes.svg")).getroot()
        lines = [l for l in root.iter(SVG + "polyline") if "probe" in l.get("class").split()]
        self.assertEqual(len(lines), 1)  # one per probe column
        self.assertEqual(len(lines[0].get("points").split()), len(rows))  # one point per row of probes.csv
        self.assertGreater(len(rows), 5)

    def test_unconverged_run_reports_the_warning_first(self):
        case = H.CaseDir(WALL_CASE.replace("cold: {temperature: 100}",
                                           "cold: {radiation: {emissivity: 0.9, surroundings: 20}}")
                         + "solver: {nonlinear: {max_iterations: 1}}\n", {"wall.geo": WALL_GEO})
        self.addCleanup(case.cleanup)
        out = os.path.join(case.root, "out")
        r = H.run_hearth("run", case.case, "--out", out, "--quiet")
        self.assertEqual(r.returncode, 2, r.describe())  # design: 2 = the solve failed
        html = H.read_text(os.path.join(out, "report.html"))
        warning = html.find("did not converge")
        self.assertGreater(warning, 0)
        self.assertLess(warning, html.find("<table"))
        self.assertIn("temperature_unconverged.vtu", html)

    def test_study_report_holds_the_convergence_plots(self):
        study = os.path.join(self.case.root, "study")
        r = H.run_hearth("study", self.case.case, "--levels", "2", "--out", study, "--quiet",
                         "--set", "output.report=true")
        self.assertEqual(r.returncode, 0, r.describe())
        html = H.read_text(os.path.join(study, "report.html"))
        self.assertIn("Mesh-convergence study", html)
        plots = [f for f in os.listdir(study) if f.endswith(".svg") and not f.startswith("plot_")]
        self.assertGreater(len(plots), 0)
        self.assertEqual(html.count("<svg"), len(plots) + 1)  # each convergence plot, and the line plot
        for k in range(2):  # the levels made no report of their own
            self.assertFalse(os.path.exists(os.path.join(study, "level_%d" % k, "report.html")))


class WithoutADisplay(unittest.TestCase):
    """No DISPLAY and no Xvfb on PATH: a clear message and exit status 1."""

    def setUp(self):
        self.case = H.CaseDir(WALL_CASE, {"wall.geo": WALL_GEO})
        self.addCleanup(self.case.cleanup)
        self.env = {k: v for k, v in os.environ.items() if k != "DISPLAY"}
        self.env["PATH"] = os.path.join(self.case.root, "empty")

    def hearth(self, *args):
        return subprocess.run([H.HEARTH] + list(args), capture_output=True, text=True, timeout=300, env=self.env)

    def test_run_with_report_stops_before_anything_is_written(self):
        out = os.path.join(self.case.root, "out")
        r = self.hearth("run", self.case.case, "--out", out)
        self.assertEqual(r.returncode, 1, r.stderr)
        self.assertIn("Xvfb is not installed", r.stderr)
        self.assertIn("apt-get install xvfb", r.stderr)
        self.assertIn("output.report", r.stderr)
        self.assertFalse(os.path.exists(out))

    def test_report_says_what_to_install(self):
        out = os.path.join(self.case.root, "out")
        ok = self.hearth("run", self.case.case, "--out", out, "--set", "output.report=false", "--quiet")
        self.assertEqual(ok.returncode, 0, ok.stderr)
        r = self.hearth("report", out)
        self.assertEqual(r.returncode, 1, r.stderr)
        self.assertIn("Xvfb is not installed", r.stderr)
        self.assertFalse(os.path.exists(os.path.join(out, "report.html")))

    def test_not_a_results_folder(self):
        r = H.run_hearth("report", self.case.dir)
        self.assertEqual(r.returncode, 1, r.describe())
        self.assertIn("summary.json", r.stderr)


if __name__ == "__main__":
    H.main()
