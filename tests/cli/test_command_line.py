"""End-to-end tests of the hearth command line: subcommands, options, exit
statuses, output folders (design.md, "Command line (the contract)").

Usage: /usr/bin/python3 test_command_line.py /path/to/hearth
"""

import json
import os
import re
import sys
import unittest


sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import hearth_testlib as H  # noqa: E402

# Exit statuses, design.md: 0 done; 1 bad input or usage; 2 solve failed; 3 internal.
OK, BAD_INPUT = 0, 1

# A case without probes or lines, and one unlisted surface ("sides").
PLAIN_CASE = """\
title: plane wall
units: {length: m, temperature: degC}
geometry: {file: wall.geo}
mesh: {size: 0.05, order: 1}
materials:
  brick: {conductivity: 1.1}
regions:
  wall: brick
boundaries:
  hot: {temperature: 1000}
  cold: {temperature: 200}
"""

# Two volumes and an internal surface, to see every name listed by 'check'.
TWO_LAYER_GEO = """\
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 0.1, 0.1, 0.1};
Box(2) = {0.1, 0, 0, 0.05, 0.1, 0.1};
BooleanFragments{ Volume{1, 2}; Delete; }{}
Physical Volume("lining") = {1};
Physical Volume("backup") = {2};
hot() = Surface In BoundingBox{-1e-6, -1e-6, -1e-6, 1e-6, 0.1 + 1e-6, 0.1 + 1e-6};
cold() = Surface In BoundingBox{0.15 - 1e-6, -1e-6, -1e-6, 0.15 + 1e-6, 0.1 + 1e-6, 0.1 + 1e-6};
joint() = Surface In BoundingBox{0.1 - 1e-6, -1e-6, -1e-6, 0.1 + 1e-6, 0.1 + 1e-6, 0.1 + 1e-6};
front() = Surface In BoundingBox{-1e-6, -1e-6, -1e-6, 0.15 + 1e-6, 1e-6, 0.1 + 1e-6};
Physical Surface("hot_face") = {hot()};
Physical Surface("cold_face") = {cold()};
Physical Surface("joint") = {joint()};
Physical Surface("front") = {front()};
"""

TWO_LAYER_CASE = """\
title: two layers
geometry: {file: layers.geo}
mesh: {size: 0.05}
materials:
  brick: {conductivity: 1.1}
  board: {conductivity: 0.1}
regions:
  lining: brick
  backup: board
boundaries:
  hot_face: {temperature: 800}
  cold_face:
    convection: {coefficient: 10, ambient: 20}
"""


def results_like(root):
    """Names under root that look like leftovers of a staged write."""
    return [n for n in os.listdir(root) if ".partial-" in n or ".old-" in n]


class Case:
    """Mixin: a fresh plane-wall case folder per test."""

    CASE_TEXT = PLAIN_CASE

    def setUp(self):
        self.case = H.wall_case(case=self.CASE_TEXT)
        self.addCleanup(self.case.cleanup)


class VersionAndHelp(unittest.TestCase):
    def test_version(self):
        r = H.run_hearth("--version")
        self.assertEqual(r.returncode, OK, r.describe())
        self.assertRegex(r.stdout + r.stderr, r"hearth\s+\d+\.\d+")

    def test_help(self):
        r = H.run_hearth("--help")
        self.assertEqual(r.returncode, OK, r.describe())
        for word in ("run", "check", "mesh", "--version"):
            self.assertIn(word, r.stdout, word)

    def test_run_help_lists_options(self):
        r = H.run_hearth("run", "--help")
        self.assertEqual(r.returncode, OK, r.describe())
        for word in ("--out", "--set", "--threads", "--quiet", "--summary-only"):
            self.assertIn(word, r.stdout, word)


class UsageErrors(Case, unittest.TestCase):
    def assert_usage_error(self, *args):
        before = self.case.entries()
        r = H.run_hearth(*args, cwd=self.case.root)
        self.assertEqual(r.returncode, BAD_INPUT, r.describe())
        self.assertTrue(r.stderr.strip(), "a usage error says what is wrong on stderr:\n" + r.describe())
        self.assertEqual(self.case.entries(), before, "a usage error writes nothing")
        return r

    def test_no_subcommand(self):
        self.assert_usage_error()

    def test_unknown_subcommand(self):
        self.assert_usage_error("frobnicate", self.case.case)

    def test_unknown_option_at_top(self):
        self.assert_usage_error("--bogus")

    def test_unknown_option_of_run(self):
        r = self.assert_usage_error("run", self.case.case, "--bogus")
        self.assertIn("--bogus", r.stderr)

    def test_run_without_case(self):
        self.assert_usage_error("run")

    def test_missing_case_file(self):
        r = self.assert_usage_error("run", self.case.path("nonexistent.yaml"))
        self.assertIn("nonexistent.yaml", r.stderr)

    def test_threads_must_be_positive(self):
        self.assert_usage_error("run", self.case.case, "--threads", "0")

    def test_set_without_equals(self):
        r = self.assert_usage_error("run", self.case.case, "--set", "mesh.size")
        self.assertIn("mesh.size", r.stderr)

    def test_set_unknown_key(self):
        r = self.assert_usage_error("run", self.case.case, "--set", "mesh.sise=0.02")
        self.assertIn("mesh.sise", r.stderr)
        self.assertIn("size", r.stderr.replace("mesh.sise", ""))


class CheckCommand(unittest.TestCase):
    def setUp(self):
        self.case = H.CaseDir(TWO_LAYER_CASE, {"layers.geo": TWO_LAYER_GEO})
        self.addCleanup(self.case.cleanup)

    def test_lists_every_name_and_marks_insulated_surfaces(self):
        before = self.case.snapshot()
        r = H.run_hearth("check", self.case.case)
        self.assertEqual(r.returncode, OK, r.describe())
        text = r.stdout + r.stderr
        for name in ("lining", "backup", "hot_face", "cold_face", "joint", "front"):
            self.assertRegex(text, r"\b%s\b" % name, "check must list '%s'\n%s" % (name, text))
        lines = text.splitlines()

        def line_naming(name):
            found = [l for l in lines if re.search(r"(^|\s)%s(\s|$)" % name, l)]
            self.assertTrue(found, name)
            return found[0]

        # unlisted surfaces are insulated by default (design.md, boundaries)
        self.assertIn("insulated by default", line_naming("front"))
        for listed in ("hot_face", "cold_face"):
            self.assertNotIn("insulated by default", line_naming(listed))
        # no results: nothing written anywhere, inputs untouched
        self.assertEqual(self.case.snapshot(), before)
        self.assertFalse(os.path.exists(self.case.path("results")))

    def test_check_with_set(self):
        r1 = H.run_hearth("check", self.case.case)
        r2 = H.run_hearth("check", self.case.case, "--set", "mesh.size=0.02")
        self.assertEqual(r1.returncode, OK, r1.describe())
        self.assertEqual(r2.returncode, OK, r2.describe())
        n = [int(re.search(r"(\d+) nodes", r.stdout + r.stderr).group(1)) for r in (r1, r2)]
        self.assertGreater(n[1], n[0])


class MeshCommand(Case, unittest.TestCase):
    def test_mesh_vtu_with_region_and_quality(self):
        out = os.path.join(self.case.root, "meshout")
        r = H.run_hearth("mesh", self.case.case, "--out", out)
        self.assertEqual(r.returncode, OK, r.describe())
        grid = H.read_vtu(os.path.join(out, "mesh.vtu"))
        self.assertFalse(os.path.exists(os.path.join(out, "temperature.vtu")))
        region = H.cell_field(grid, "region")
        quality = H.cell_field(grid, "quality").astype(float)
        self.assertEqual(len(region), grid.GetNumberOfCells())
        self.assertEqual(len(quality), grid.GetNumberOfCells())
        # Gmsh's gamma lies in (0, 1] for valid tets (design.md)
        self.assertGreater(quality.min(), 0.0)
        self.assertLessEqual(quality.max(), 1.0)
        tags = H.field_data_ints(grid, "region_tags")
        self.assertEqual(H.field_data_strings(grid, "region_names"), ["wall"])
        self.assertEqual(set(int(v) for v in region), set(tags))
        self.assertFalse(results_like(self.case.root))
        self.assertFalse(os.path.exists(self.case.path("results")))

    def test_mesh_default_folder(self):
        r = H.run_hearth("mesh", self.case.case)
        self.assertEqual(r.returncode, OK, r.describe())
        self.assertTrue(os.path.isfile(self.case.path("results", "mesh.vtu")))

    def test_mesh_order_2(self):
        out = os.path.join(self.case.root, "meshout")
        r = H.run_hearth("mesh", self.case.case, "--out", out, "--set", "mesh.order=2")
        self.assertEqual(r.returncode, OK, r.describe())
        grid = H.read_vtu(os.path.join(out, "mesh.vtu"))
        self.assertEqual(set(H.cell_types(grid)), {H.VTK_QUADRATIC_TETRA})

    def test_set_mesh_size_changes_the_node_count(self):
        counts = []
        for size in ("0.05", "0.025"):
            out = os.path.join(self.case.root, "mesh_" + size)
            r = H.run_hearth("mesh", self.case.case, "--out", out, "--set", "mesh.size=" + size)
            self.assertEqual(r.returncode, OK, r.describe())
            counts.append(H.read_vtu(os.path.join(out, "mesh.vtu")).GetNumberOfPoints())
        # halving the size gives several times the nodes: common practice, no source
        self.assertGreater(counts[1], 2 * counts[0])


class RunCommand(Case, unittest.TestCase):
    def run_ok(self, *args, cwd=None):
        r = H.run_hearth("run", *args, cwd=cwd)
        self.assertEqual(r.returncode, OK, r.describe())
        return r

    def test_default_output_folder_is_relative_to_the_case(self):
        # run from the parent folder with a relative case path
        self.run_ok(os.path.join("case", "case.yaml"), "--quiet", cwd=self.case.root)
        self.assertTrue(os.path.isfile(self.case.path("results", "summary.json")))
        self.assertTrue(os.path.isfile(self.case.path("results", "temperature.vtu")))
        self.assertFalse(os.path.exists(os.path.join(self.case.root, "results")))

    def test_out_writes_there(self):
        out = os.path.join(self.case.root, "elsewhere", "deep", "res")
        self.run_ok(self.case.case, "--out", out, "--quiet")
        self.assertTrue(os.path.isfile(os.path.join(out, "summary.json")))
        self.assertTrue(os.path.isfile(os.path.join(out, "temperature.vtu")))
        self.assertFalse(os.path.exists(self.case.path("results")))

    def test_relative_out_is_relative_to_the_working_folder(self):
        self.run_ok(self.case.case, "--out", "rel_out", "--quiet", cwd=self.case.root)
        self.assertTrue(os.path.isfile(os.path.join(self.case.root, "rel_out", "summary.json")))

    def test_output_directory_key(self):
        text = PLAIN_CASE + "output: {directory: ../from_key}\n"
        H.write_text(self.case.case, text)
        self.run_ok(self.case.case, "--quiet")
        self.assertTrue(os.path.isfile(os.path.join(self.case.root, "from_key", "summary.json")))

    def test_set_overrides(self):
        out1 = os.path.join(self.case.root, "coarse")
        out2 = os.path.join(self.case.root, "fine")
        self.run_ok(self.case.case, "--out", out1, "--quiet")
        self.run_ok(self.case.case, "--out", out2, "--quiet", "--set", "mesh.size=0.025", "--set", "mesh.order=2")
        s1 = H.read_json(os.path.join(out1, "summary.json"))
        s2 = H.read_json(os.path.join(out2, "summary.json"))
        self.assertGreater(s2["mesh"]["nodes"], s1["mesh"]["nodes"])
        self.assertEqual(s1["mesh"]["order"], 1)
        self.assertEqual(s2["mesh"]["order"], 2)
        # a boundary value by --set: T(0) = 1200 -> heat rate 1.1 * 1000 / 0.25 * 0.01 = 44 W
        # (Fourier's law; Incropera & DeWitt Table 3.3 (from memory); closed form)
        out3 = os.path.join(self.case.root, "hotter")
        self.run_ok(self.case.case, "--out", out3, "--quiet", "--set", "boundaries.hot.temperature=1200")
        s3 = H.read_json(os.path.join(out3, "summary.json"))
        self.assertLess(H.rel_err(s3["boundaries"]["hot"]["heat_rate"], 44.0), 1e-9)
        self.assertLess(H.rel_err(s3["boundaries"]["hot"]["temperature"]["max"], 1200.0), 1e-9)

    def test_rerun_replaces_the_folder_whole(self):
        out = os.path.join(self.case.root, "res")
        self.run_ok(self.case.case, "--out", out, "--quiet")
        stray = os.path.join(out, "stray.txt")
        H.write_text(stray, "left over from an earlier run\n")
        H.write_text(os.path.join(out, "sub", "nested.txt"), "also left over\n")
        self.run_ok(self.case.case, "--out", out, "--quiet", "--set", "mesh.size=0.04")
        self.assertFalse(os.path.exists(stray), "a rerun must replace the folder as a whole")
        self.assertFalse(os.path.exists(os.path.join(out, "sub")))
        self.assertEqual(sorted(os.listdir(out)),
                         ["inputs.json", "run.json", "summary.json", "surface.vtp", "temperature.vtu"])
        self.assertEqual(results_like(self.case.root), [])
        s = H.read_json(os.path.join(out, "summary.json"))
        grid = H.read_vtu(os.path.join(out, "temperature.vtu"))
        self.assertEqual(s["mesh"]["nodes"], grid.GetNumberOfPoints())

    def test_summary_only_prints_the_summary(self):
        out = os.path.join(self.case.root, "res")
        r = self.run_ok(self.case.case, "--out", out, "--summary-only")
        printed = json.loads(r.stdout)
        self.assertEqual(printed, H.read_json(os.path.join(out, "summary.json")))

    def test_summary_only_with_quiet(self):
        out = os.path.join(self.case.root, "res")
        r = self.run_ok(self.case.case, "--out", out, "--summary-only", "--quiet")
        self.assertEqual(json.loads(r.stdout), H.read_json(os.path.join(out, "summary.json")))
        self.assertEqual(r.stderr, "")

    def test_quiet_prints_nothing_for_a_clean_run(self):
        out = os.path.join(self.case.root, "res")
        r = self.run_ok(self.case.case, "--out", out, "--quiet")
        self.assertEqual(r.stderr, "", "--quiet: nothing on stderr for a run without warnings")
        # results go to files, never to stdout (design.md)
        self.assertEqual(r.stdout, "")

    def test_not_quiet_reports_progress_on_stderr_only(self):
        out = os.path.join(self.case.root, "res")
        r = self.run_ok(self.case.case, "--out", out)
        self.assertEqual(r.stdout, "")
        self.assertIn("hot", r.stderr)
        self.assertIn("insulated", r.stderr)  # 'sides' is left insulated and the summary says so

    def test_threads_option(self):
        out = os.path.join(self.case.root, "res")
        self.run_ok(self.case.case, "--out", out, "--quiet", "--threads", "1")
        self.assertTrue(os.path.isfile(os.path.join(out, "summary.json")))

    def assert_refuses_folder(self, *args, cwd=None):
        before = self.case.snapshot()
        entries = self.case.entries()
        r = H.run_hearth("run", *args, cwd=cwd)
        self.assertEqual(r.returncode, BAD_INPUT, r.describe())
        self.assertTrue(r.stderr.strip())
        self.assertEqual(self.case.snapshot(), before, "the inputs must be untouched")
        self.assertEqual(self.case.entries(), entries, "nothing may be written")
        return r

    def test_out_may_not_be_the_case_folder(self):
        r = self.assert_refuses_folder(self.case.case, "--out", self.case.dir)
        self.assertIn("--out", r.stderr)

    def test_out_may_not_be_the_case_folder_relative(self):
        self.assert_refuses_folder("case.yaml", "--out", ".", cwd=self.case.dir)

    def test_out_may_not_contain_the_case(self):
        self.assert_refuses_folder(self.case.case, "--out", self.case.root)

    def test_output_directory_key_may_not_be_the_case_folder(self):
        H.write_text(self.case.case, PLAIN_CASE + "output: {directory: .}\n")
        r = self.assert_refuses_folder(self.case.case)
        self.assertIn("output.directory", r.stderr)


class Reliability(Case, unittest.TestCase):
    def test_repeated_runs_all_succeed(self):
        """The same small case run 20 times (default threads) must succeed every time."""
        statuses = []
        detail = ""
        for i in range(20):
            out = os.path.join(self.case.root, "rep%d" % i)
            r = H.run_hearth("run", self.case.case, "--out", out, "--quiet")
            statuses.append(r.returncode)
            if r.returncode != 0 and not detail:
                detail = r.describe()
        self.assertEqual(statuses, [0] * 20, detail)


if __name__ == "__main__":
    H.main()
