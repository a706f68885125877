"""End-to-end tests of bad input: each case below must exit with status 1, print a
message on stderr that says where (file:line), which key, and what is wrong, and
write nothing (design.md: exit status 1 "bad input or usage (a message that says
what and where)").

Usage: /usr/bin/python3 test_bad_input.py /path/to/hearth
"""

import os
import re
import sys
import unittest

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import hearth_testlib as H  # noqa: E402

BAD_INPUT = 1

HEADER = """\
title: bad input
units: {length: m, temperature: degC}
geometry:
  file: wall.geo
mesh:
  size: 0.05
materials:
  brick:
    conductivity: 1.1
regions:
  wall: brick
"""

GOOD_BOUNDARIES = """\
boundaries:
  hot: {temperature: 1000}
  cold: {temperature: 200}
"""

TWO_VOLUME_GEO = """\
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 0.1, 0.1, 0.1};
Box(2) = {0.1, 0, 0, 0.05, 0.1, 0.1};
BooleanFragments{ Volume{1, 2}; Delete; }{}
Physical Volume("lining") = {1};
Physical Volume("backup") = {2};
hot() = Surface In BoundingBox{-1e-6, -1e-6, -1e-6, 1e-6, 0.1 + 1e-6, 0.1 + 1e-6};
Physical Surface("hot") = {hot()};
"""

# A semicolon missing at the end of line 3.
BROKEN_GEO = """\
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 0.25, 0.1, 0.1};
Physical Volume("wall") = {1}
Physical Surface("hot") = {1};
Physical Surface("cold") = {2};
"""


class BadInput(unittest.TestCase):
    def run_bad(self, case_text, files=None, command="run", extra=()):
        """Run hearth on a case that must be refused; return (stderr, case text)."""
        geo = {"wall.geo": H.WALL_GEO_M}
        geo.update(files or {})
        case = H.CaseDir(case_text, geo)
        self.addCleanup(case.cleanup)
        before = case.snapshot()
        entries = case.entries()
        args = [command, case.case] + list(extra)
        if command == "run":
            args += ["--out", os.path.join(case.root, "out")]
        r = H.run_hearth(*args)
        self.assertEqual(r.returncode, BAD_INPUT, r.describe())
        self.assertEqual(r.stdout, "", "errors go to stderr")
        self.assertEqual(case.snapshot(), before, "inputs must be untouched")
        self.assertEqual(case.entries(), entries, "a refused case writes nothing\n" + r.describe())
        return r.stderr

    def assert_where(self, stderr, case_text, needle, key):
        """The message names case.yaml:LINE with LINE the line that holds needle, and the key."""
        expected = H.line_of(case_text, needle)
        lines = [int(m) for m in H.FILE_LINE.findall(stderr)]
        self.assertIn(expected, lines, "expected case.yaml:%d in:\n%s" % (expected, stderr))
        self.assertIn(key, stderr)

    # --- case-file keys -----------------------------------------------------

    def test_unknown_key_with_suggestion(self):
        text = HEADER + """\
boundaries:
  hot: {temperature: 1000}
  cold:
    convection: {coefficent: 10, ambient: 20}
"""
        err = self.run_bad(text)
        self.assert_where(err, text, "coefficent", "coefficent")
        self.assertIn("boundaries.cold.convection", err)
        self.assertRegex(err, r"did you mean '?coefficient'?")

    def test_unknown_top_level_key_with_suggestion(self):
        text = HEADER.replace("materials:", "materals:") + GOOD_BOUNDARIES
        err = self.run_bad(text, command="check")
        self.assert_where(err, text, "materals", "materals")
        self.assertRegex(err, r"did you mean '?materials'?")

    def test_value_out_of_range(self):
        text = HEADER.replace("size: 0.05", "size: -0.05") + GOOD_BOUNDARIES
        err = self.run_bad(text)
        self.assert_where(err, text, "size: -0.05", "mesh.size")

    def test_unknown_material(self):
        text = HEADER.replace("wall: brick", "wall: steel") + GOOD_BOUNDARIES
        err = self.run_bad(text)
        self.assert_where(err, text, "wall: steel", "regions.wall")
        self.assertIn("steel", err)
        self.assertIn("brick", err)  # lists the materials that are defined

    def test_bad_set_value(self):
        text = HEADER + GOOD_BOUNDARIES
        err = self.run_bad(text, extra=["--set", "mesh.size=abc"])
        self.assertIn("mesh.size", err)
        self.assertIn("abc", err)

    # --- geometry -------------------------------------------------------------

    def test_missing_geometry_file(self):
        text = HEADER.replace("file: wall.geo", "file: no_such_part.geo") + GOOD_BOUNDARIES
        err = self.run_bad(text)
        self.assert_where(err, text, "no_such_part.geo", "geometry.file")
        self.assertIn("no_such_part.geo", err)

    def test_geo_syntax_error(self):
        text = HEADER + GOOD_BOUNDARIES
        err = self.run_bad(text, files={"wall.geo": BROKEN_GEO})
        self.assertIn("wall.geo", err)
        # the geometry script's own line: Gmsh reports the line where parsing failed,
        # the missing ';' at the end of line 3 is found on line 3 or 4
        m = re.search(r"wall\.geo(?:'?,? line |:)(\d+)", err)
        self.assertIsNotNone(m, "message must name wall.geo and its line:\n" + err)
        self.assertIn(int(m.group(1)), (3, 4))
        self.assertIn("syntax error", err)

    def test_region_absent_from_geometry(self):
        text = HEADER + "  furnace: brick\n" + GOOD_BOUNDARIES
        err = self.run_bad(text)
        self.assert_where(err, text, "furnace: brick", "regions.furnace")
        self.assertIn("'furnace'", err)
        self.assertRegex(err, r"volumes are: wall\b")  # lists the geometry's volumes

    def test_region_absent_from_geometry_in_check(self):
        text = HEADER + "  furnace: brick\n" + GOOD_BOUNDARIES
        err = self.run_bad(text, command="check")
        self.assert_where(err, text, "furnace: brick", "regions.furnace")

    def test_volume_without_material(self):
        text = HEADER.replace("wall: brick", "lining: brick") + "boundaries:\n  hot: {temperature: 1000}\n"
        err = self.run_bad(text, files={"wall.geo": TWO_VOLUME_GEO})
        self.assertIn("'backup'", err)
        self.assertIn("regions", err)
        # the line of the regions block (its key or its first entry)
        lines = [int(m) for m in H.FILE_LINE.findall(err)]
        block = (H.line_of(text, "regions:"), H.line_of(text, "lining: brick"))
        self.assertTrue(set(lines) & set(block), "expected case.yaml:%s in:\n%s" % (block, err))

    def test_boundary_absent_from_geometry(self):
        text = HEADER + GOOD_BOUNDARIES + "  warm: {temperature: 500}\n"
        err = self.run_bad(text)
        self.assert_where(err, text, "warm:", "boundaries.warm")
        self.assertIn("'warm'", err)
        for name in ("hot", "cold", "sides"):  # lists the geometry's surfaces
            self.assertIn(name, err.split("'warm'", 1)[1])

    def test_probe_outside_the_body(self):
        text = HEADER + GOOD_BOUNDARIES + """\
probes:
  inside: [0.1, 0.05, 0.05]
  far_away: [0.5, 0.05, 0.05]
"""
        err = self.run_bad(text)
        self.assert_where(err, text, "far_away:", "probes.far_away")
        self.assertIn("'far_away'", err)
        self.assertNotIn("'inside'", err)

    def test_probe_outside_the_body_in_check(self):
        text = HEADER + GOOD_BOUNDARIES + "probes:\n  far_away: [0.5, 0.05, 0.05]\n"
        err = self.run_bad(text, command="check")
        self.assert_where(err, text, "far_away:", "probes.far_away")

    # --- boundary conditions -------------------------------------------------

    def test_temperature_undetermined(self):
        text = HEADER + """\
boundaries:
  hot: {heat_flux: 3520}
  cold: {heat_flux: -3520}
"""
        err = self.run_bad(text)
        self.assertIn("undetermined", err)
        self.assert_where(err, text, "boundaries:", "boundaries")

    def test_temperature_undetermined_without_boundaries(self):
        text = HEADER
        err = self.run_bad(text, command="check")
        self.assertIn("undetermined", err)
        self.assertIn("case.yaml", err)

    def test_temperature_with_convection(self):
        text = HEADER + """\
boundaries:
  hot:
    temperature: 1000
    convection: {coefficient: 10, ambient: 20}
  cold: {temperature: 200}
"""
        err = self.run_bad(text)
        self.assert_where(err, text, "hot:", "boundaries.hot")
        self.assertIn("temperature", err)
        self.assertIn("convection", err)

    # --- an earlier result survives a refused run -----------------------------

    def test_failed_run_keeps_the_old_results(self):
        case = H.wall_case(case=HEADER + GOOD_BOUNDARIES)
        self.addCleanup(case.cleanup)
        out = os.path.join(case.root, "out")
        r = H.run_hearth("run", case.case, "--out", out, "--quiet")
        self.assertEqual(r.returncode, 0, r.describe())
        marker = os.path.join(out, "my_notes.txt")
        H.write_text(marker, "notes kept beside the results\n")
        before = case.snapshot()
        entries = case.entries()
        for bad in (HEADER + GOOD_BOUNDARIES + "  warm: {temperature: 500}\n",   # refused after meshing
                    HEADER + GOOD_BOUNDARIES + "probes:\n  p: [9, 9, 9]\n",     # refused after the solve
                    HEADER.replace("conductivity", "conductivty") + GOOD_BOUNDARIES):  # refused on reading
            H.write_text(case.case, bad)
            r = H.run_hearth("run", case.case, "--out", out)
            self.assertEqual(r.returncode, BAD_INPUT, r.describe())
            now = case.snapshot()
            now.pop(os.path.join("case", "case.yaml"))
            expected = dict(before)
            expected.pop(os.path.join("case", "case.yaml"))
            self.assertEqual(now, expected, "the old results must be left as they were")
            self.assertEqual(case.entries(), entries)


if __name__ == "__main__":
    H.main()
