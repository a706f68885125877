#!/usr/bin/env python3
"""hearth study and run.json: level folders, study.csv / study.json / SVG plots, resume,
provenance, interrupts; nested levels (--ratio 2), --jobs and --order 1,2.

Study: the slab with uniform generation (verification.md C06(a); Incropera & DeWitt
section 3.5, from memory) is reproduced exactly by 10-node elements on every remeshed
level, so its heat rates and peak temperature must be reported as converged to
round-off with the closed-form values T_max = 141.6667 degC and -62.5 W per face.

NestedStudy: the temperature-dependent slab of verification.md C20(a), whose closed
form is given beside the case below, on levels split from one mesh."""
import json
import math
import os
import shutil
import signal
import subprocess
import time
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

# A box whose second level (size 0.012) takes several seconds to mesh.
INTERRUPT_GEO = """\
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 1, 1, 1};
Physical Volume("box") = {1};
Physical Surface("hot") = {1};
Physical Surface("cold") = {2};
"""

INTERRUPT_CASE = """\
units: {length: m, temperature: degC}
geometry: {file: box.geo}
mesh: {size: 0.1}
materials:
  m: {conductivity: 1.0}
regions: {box: m}
boundaries:
  hot: {temperature: 100}
  cold: {temperature: 0}
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

    def test_sigterm_stops_the_levels_and_keeps_the_finished_ones(self):
        """An interrupted study exits 143 (the command-line contract), passes the signal on
        to the level it is running, and keeps the levels already finished (common
        practice, no source)."""
        box = H.CaseDir(INTERRUPT_CASE, {"box.geo": INTERRUPT_GEO})
        self.addCleanup(box.cleanup)
        out = os.path.join(box.root, "study")
        proc = subprocess.Popen([H.HEARTH, "study", box.case, "--sizes", "0.1,0.012", "--out", out, "--quiet"],
                                stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
        first = os.path.join(out, "level_0", "summary.json")
        deadline = time.time() + 120
        while not os.path.exists(first) and time.time() < deadline and proc.poll() is None:
            time.sleep(0.05)
        time.sleep(0.5)  # the second level is meshing a million tetrahedra
        proc.send_signal(signal.SIGTERM)
        _out, err = proc.communicate(timeout=120)
        self.assertEqual(proc.returncode, 143, err)
        self.assertTrue(os.path.isfile(first), "the finished level is kept")
        self.assertFalse(os.path.exists(os.path.join(out, "level_1")))
        self.assertFalse(os.path.exists(os.path.join(out, "study.json")))
        self.assertEqual([e for e in os.listdir(out) if "partial" in e], [])
        left = subprocess.run(["pgrep", "-f", out], capture_output=True, text=True)
        self.assertEqual(left.stdout.strip(), "", "no level process may be left")

    def test_a_failing_level_is_reported_with_its_own_message(self):
        r = H.run_hearth("study", self.case.case, "--out", self.out, "--quiet", "--jobs", "2",
                         "--set", "probes.far=[5, 5, 5]")
        self.assertEqual(r.returncode, 1, r.describe())
        self.assertIn("level 0: --set probes.far: probe 'far'", r.stderr)
        self.assertIn("lies outside the body", r.stderr)
        self.assertFalse(os.path.exists(os.path.join(self.out, "study.json")))

    def test_bad_study_options_exit_1(self):
        for args in (["--levels", "1"], ["--ratio", "0.9"], ["--quantity", "boundaries.nowhere.heat_rate"],
                     ["--order", "3"], ["--order", "1,1"], ["--jobs", "0"], ["--sizes", "0.03,0.03"]):
            r = H.run_hearth("study", self.case.case, "--out", self.out, "--quiet", *args)
            self.assertEqual(r.returncode, 1, r.describe())


# verification.md C20(a): slab L = 0.2 m, k(T) = 0.8 (1 + 0.001 T) (T in degC), T(0) =
# 1000 degC, T(L) = 100 degC, 1D in 3D (0.1 m x 0.1 m section, sides insulated). Through
# the Kirchhoff variable U = T + 0.001 T^2 / 2, linear in x (Carslaw & Jaeger, from
# memory): q'' = (0.8/L) [(T1 - T2) + (0.001/2)(T1^2 - T2^2)] = 5580 W/m2, so 55.80 W
# through the 0.01 m2 section; T(x) = -1000 + sqrt(2000^2 - 2 q'' x / 0.0008), and
# T(0.05) = 817.2782, T(0.10) = 614.0012, T(0.15) = 381.1227 degC (C20's numbers). The
# slab is cut into four slices so that these points, on an edge of the section, are
# corners of the geometry and so nodes of every mesh.
C20_GEO = """\
SetFactory("OpenCASCADE");
Box(1) = {0.00, 0, 0, 0.05, 0.1, 0.1};
Box(2) = {0.05, 0, 0, 0.05, 0.1, 0.1};
Box(3) = {0.10, 0, 0, 0.05, 0.1, 0.1};
Box(4) = {0.15, 0, 0, 0.05, 0.1, 0.1};
BooleanFragments{ Volume{1}; Delete; }{ Volume{2, 3, 4}; Delete; }
Physical Volume("q1") = {1};
Physical Volume("q2") = {2};
Physical Volume("q3") = {3};
Physical Volume("q4") = {4};
Physical Surface("hot_face") = Surface In BoundingBox{-1e-6, -1e-6, -1e-6, 1e-6, 0.100001, 0.100001};
Physical Surface("cold_face") = Surface In BoundingBox{0.199999, -1e-6, -1e-6, 0.200001, 0.100001, 0.100001};
"""

C20_CASE = """\
units: {length: m, temperature: degC}
geometry: {file: slab.geo}
mesh: {size: 0.05, order: 1}
materials:
  board: {conductivity: {vs_temperature: [[0, 0.8], [2000, 2.4]]}}
regions: {q1: board, q2: board, q3: board, q4: board}
boundaries:
  hot_face: {temperature: 1000}
  cold_face: {temperature: 100}
solver: {tolerance: 1.0e-12, nonlinear: {tolerance: 1.0e-12}}
probes:
  x05: [0.05, 0.0, 0.0]
  x10: [0.10, 0.0, 0.0]
  x15: [0.15, 0.0, 0.0]
"""

C20_Q = 5580.0 * 0.01  # W, C20(a)
C20_PROBES = {"x05": 817.2782, "x10": 614.0012, "x15": 381.1227}  # degC, C20(a)


def c20_temperature(x):
    """T(x) of C20(a), closed form above."""
    return -1000.0 + math.sqrt(2000.0 ** 2 - 2 * 5580.0 * x / 0.0008)


def c20_slice_mean(a, b):
    """Mean of T over a <= x <= b: the integral of the square root in T(x), closed form."""
    u = lambda x: 2000.0 ** 2 - 2 * 5580.0 * x / 0.0008
    integral = lambda x: -(0.0008 / (2 * 5580.0)) * (2.0 / 3.0) * u(x) ** 1.5
    return (integral(b) - integral(a)) / (b - a) - 1000.0


C20_MEANS = {"q%d" % (i + 1): c20_slice_mean(0.05 * i, 0.05 * (i + 1)) for i in range(4)}


def numbers_of(summary):
    """Every number of a summary.json by its dotted path, wall times left out."""
    out = {}

    def walk(node, path):
        if isinstance(node, dict):
            for k, v in node.items():
                walk(v, path + [k])
        elif isinstance(node, list):
            for i, v in enumerate(node):
                walk(v, path + [str(i)])
        elif isinstance(node, (int, float)) and not isinstance(node, bool) and path[-1] != "seconds":
            out[".".join(path)] = node
    walk(summary, [])
    return out


class NestedStudy(unittest.TestCase):
    """hearth study --ratio 2: one mesh split into nested levels; --jobs; --order 1,2."""

    def setUp(self):
        self.case = H.CaseDir(C20_CASE, {"slab.geo": C20_GEO})
        self.addCleanup(self.case.cleanup)

    def study(self, out, *args):
        r = H.run_hearth("study", self.case.case, "--ratio", "2", "--out", out, *args, timeout=900)
        self.assertEqual(r.returncode, 0, r.describe())
        return r

    def check_triplet_verdicts(self, quantities):
        """asymptotic_range follows from the two finest triplet orders (10 %, the project's tolerance)."""
        for name, q in quantities.items():
            orders = q["triplet_orders"]
            if len(orders) < 2 or orders[-1] is None or not q["status"].startswith("monotonic"):
                continue
            agree = orders[-2] is not None and abs(orders[-1] - orders[-2]) <= 0.1 * orders[-1]
            self.assertEqual(q["asymptotic_range"], "asymptotic" if agree else "not_asymptotic", name)

    def test_four_node_levels_orders_resume_and_jobs(self):
        out = os.path.join(self.case.root, "serial")
        r = self.study(out, "--levels", "4", "--threads", "1")
        for k in range(4):
            run = H.read_json(os.path.join(out, "level_%d" % k, "run.json"))
            self.assertIn("mesh.refinements=%d" % k, run["overrides"])
            self.assertEqual(run["base_mesh"], os.path.join(out, "base_mesh.bin"))
            self.assertIn("--base-mesh", run["command_line"])
        study = H.read_json(os.path.join(out, "study.json"))
        self.assertEqual(study["levels_by"], "splitting")
        self.assertEqual(study["element_order"], 1)
        q = study["quantities"]
        # Nested: each level has eight times the elements of the one before, so h halves.
        h = q["regions.q1.temperature.mean"]["h"]
        for a, b in zip(h, h[1:]):
            self.assertAlmostEqual(a / b, 2.0, places=12)
        # Heat rates through the fixed faces, from the reactions: C20(a), 55.80 W.
        for name, sign in (("hot_face", 1), ("cold_face", -1)):
            self.assertLess(H.rel_err(q["boundaries.%s.heat_rate" % name]["extrapolated"], sign * C20_Q), 1e-6)
        # Slice means converge at order 2 (O(h^2p) for a smooth functional, Babuska &
        # Miller 1984, from memory); the extrapolated values approach the closed form and
        # the GCI band of the finest value holds it.
        for name, exact in C20_MEANS.items():
            e = q["regions.%s.temperature.mean" % name]
            self.assertAlmostEqual(e["observed_order"], 2.0, delta=0.3, msg=name)
            self.assertAlmostEqual(e["extrapolated"], exact, delta=0.01, msg=name)
            self.assertLessEqual(abs(e["values"][-1] - exact), e["gci_fine"] * abs(e["values"][-1]), name)
        # Probes at nodes of every level: C20(a)'s proposed tolerance, 0.05 K, at the finest.
        for name, exact in C20_PROBES.items():
            self.assertAlmostEqual(q["probes.%s.temperature" % name]["values"][-1], exact, delta=0.05, msg=name)
        self.check_triplet_verdicts(q)

        # Resume: the base mesh and every level are kept.
        again = self.study(out, "--levels", "4", "--threads", "1")
        self.assertEqual(again.stderr.count("already solved"), 4, again.describe())
        self.assertIn("base mesh: kept", again.stderr)

        # --jobs 2 on the same base mesh: the same numbers as the serial study, level by level.
        parallel = os.path.join(self.case.root, "parallel")
        os.makedirs(parallel)
        for name in ("base_mesh.bin", "base_mesh.json"):
            shutil.copy(os.path.join(out, name), parallel)
        self.study(parallel, "--levels", "3", "--jobs", "2", "--threads", "1")
        for k in range(3):
            serial_summary = H.read_json(os.path.join(out, "level_%d" % k, "summary.json"))
            parallel_summary = H.read_json(os.path.join(parallel, "level_%d" % k, "summary.json"))
            self.assertEqual(numbers_of(serial_summary), numbers_of(parallel_summary), "level %d" % k)

    def test_two_orders_compared(self):
        out = os.path.join(self.case.root, "orders")
        r = self.study(out, "--levels", "3", "--order", "1,2", "--jobs", "2")
        for order in (1, 2):
            for k in range(3):
                summary = H.read_json(os.path.join(out, "order_%d" % order, "level_%d" % k, "summary.json"))
                self.assertEqual(summary["mesh"]["order"], order)
            self.assertEqual(H.read_json(os.path.join(out, "order_%d" % order, "study.json"))["element_order"], order)
        self.assertFalse(os.path.exists(os.path.join(out, "level_0")))
        top = H.read_json(os.path.join(out, "study.json"))
        self.assertEqual(top["element_orders"], [1, 2])
        p2 = top["studies"]["order_2"]["quantities"]
        # 10-node elements: slice means at O(h^4) (2p, as above), probes at nodes
        # extrapolated to C20(a)'s numbers (given to 4 decimals).
        for name, exact in C20_MEANS.items():
            e = p2["regions.%s.temperature.mean" % name]
            self.assertAlmostEqual(e["observed_order"], 4.0, delta=0.5, msg=name)
            self.assertAlmostEqual(e["extrapolated"], exact, delta=1e-4, msg=name)
        # At the probes the 10-node levels already agree to about 1e-4 K, where the
        # differences between levels are near the Newton tolerance and may change sign:
        # the study then rightly gives no extrapolation (about one run in ten on Gmsh's
        # unrepeatable base meshes). The finest value is checked always, the
        # extrapolated one where there is one.
        for name, exact in C20_PROBES.items():
            probe = p2["probes.%s.temperature" % name]
            self.assertAlmostEqual(probe["values"][-1], exact, delta=1e-3, msg=name)
            if probe["extrapolated"] is not None:
                self.assertAlmostEqual(probe["extrapolated"], exact, delta=1e-3, msg=name)
        for name, c in top["comparison"].items():
            v1, v2 = c["finest"]["order_1"], c["finest"]["order_2"]
            self.assertAlmostEqual(c["relative_difference"], (v2 - v1) / abs(v2), places=12, msg=name)
        header, rows = H.read_csv(os.path.join(out, "study.csv"))
        self.assertEqual(header, ["quantity", "level", "size", "dofs", "value", "order"])
        self.assertEqual(len(rows), 2 * 3 * len(p2))
        self.assertIn("comparison of the element orders", r.stdout)


if __name__ == "__main__":
    H.main()
