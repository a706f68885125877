#!/usr/bin/env python3
"""hearth study and run.json: level folders, study.csv / study.json / SVG plots, resume,
and provenance. The slab with uniform generation (verification.md C06(a); Incropera &
DeWitt section 3.5, from memory) is reproduced exactly by 10-node elements on every
mesh, so its heat rates and peak temperature must be reported as converged to round-off
with the closed-form values T_max = 141.6667 degC and -62.5 W per face."""
import json
import os
import xml.dom.minidom
import unittest

import hearth_testlib as H

SLAB_GEO = """\
SetFactory("OpenCASCADE");
Box(1) = {-0.05, 0, 0, 0.1, 0.05, 0.05};
Physical Volume("slab") = {1};
Physical Surface("left") = {1};
Physical Surface("right") = {2};
"""

CASE = """\
units: {length: m, temperature: degC}
geometry: {file: slab.geo}
mesh: {size: 0.03, order: 2}
materials:
  steel: {conductivity: 15}
regions: {slab: steel}
heat_sources: {slab: 5.0e5}
boundaries:
  left: {temperature: 100}
  right: {temperature: 100}
probes:
  centre: [0.0, 0.025, 0.025]
"""


class Study(unittest.TestCase):
    def setUp(self):
        self.case = H.CaseDir(CASE, {"slab.geo": SLAB_GEO})
        self.addCleanup(self.case.cleanup)
        self.out = os.path.join(self.case.root, "study")

    def test_levels_files_estimates_and_resume(self):
        r = H.run_hearth("study", self.case.case, "--levels", "3", "--ratio", "1.4", "--out", self.out)
        self.assertEqual(r.returncode, 0, r.describe())
        for k in range(3):
            for name in ("summary.json", "temperature.vtu", "run.json"):
                self.assertTrue(os.path.isfile(os.path.join(self.out, "level_%d" % k, name)))
        with open(os.path.join(self.out, "study.json")) as fh:
            study = json.load(fh)
        q = study["quantities"]
        for name in ("boundaries.left.heat_rate", "regions.slab.temperature.max", "probes.centre.temperature"):
            self.assertIn(name, q)
            for key in ("h", "dofs", "values", "observed_order", "extrapolated", "gci_fine", "gci_medium",
                        "asymptotic_ratio", "status"):
                self.assertIn(key, q[name])
            self.assertEqual(len(q[name]["values"]), 3)
            self.assertTrue(all(a > b for a, b in zip(q[name]["h"], q[name]["h"][1:])), "h must fall")
        # Closed form (C06(a)): exact on every level, so converged to round-off.
        self.assertIn("converged exactly", q["regions.slab.temperature.max"]["status"])
        self.assertAlmostEqual(q["regions.slab.temperature.max"]["extrapolated"], 141.6667, delta=1e-4)
        self.assertAlmostEqual(q["probes.centre.temperature"]["values"][-1], 141.6667, delta=1e-4)
        self.assertAlmostEqual(q["boundaries.left.heat_rate"]["extrapolated"], -62.5, delta=1e-6)
        with open(os.path.join(self.out, "study.csv")) as fh:
            rows = fh.read().splitlines()
        self.assertEqual(rows[0], "quantity,level,size,dofs,value")
        self.assertEqual(len(rows) - 1, 3 * len(q))
        svg = os.path.join(self.out, "regions_slab_temperature_mean.svg")
        xml.dom.minidom.parse(svg)  # a well-formed picture
        self.assertIn("finest", r.stdout)  # the table
        # Resume: nothing is solved again.
        again = H.run_hearth("study", self.case.case, "--levels", "3", "--ratio", "1.4", "--out", self.out)
        self.assertEqual(again.returncode, 0, again.describe())
        self.assertEqual(again.stderr.count("already solved"), 3, again.describe())

    def test_run_json_records_how_the_result_was_made(self):
        out1, out2 = os.path.join(self.case.root, "a"), os.path.join(self.case.root, "b")
        r1 = H.run_hearth("run", self.case.case, "--out", out1, "--quiet", "--set", "mesh.size=0.04")
        r2 = H.run_hearth("run", self.case.case, "--out", out2, "--quiet", "--set", "mesh.size=0.05")
        self.assertEqual(r1.returncode, 0, r1.describe())
        self.assertEqual(r2.returncode, 0, r2.describe())
        with open(os.path.join(out1, "run.json")) as fh:
            a = json.load(fh)
        with open(os.path.join(out2, "run.json")) as fh:
            b = json.load(fh)
        for key in ("hearth_version", "case_file", "input_digest", "overrides", "command_line", "threads", "seconds"):
            self.assertIn(key, a)
        self.assertEqual(a["overrides"], ["mesh.size=0.04"])
        self.assertIn("--set mesh.size=0.04", a["command_line"])
        self.assertNotEqual(a["input_digest"], b["input_digest"])

    def test_bad_study_options_exit_1(self):
        for args in (["--levels", "1"], ["--ratio", "0.9"], ["--quantity", "boundaries.nowhere.heat_rate"]):
            r = H.run_hearth("study", self.case.case, "--out", self.out, "--quiet", *args)
            self.assertEqual(r.returncode, 1, r.describe())


if __name__ == "__main__":
    H.main()
