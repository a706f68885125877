#!/usr/bin/env python3
"""The benchmark program and its end-to-end case (tools/bench, docs/methods.md,
"Performance"). Behaviour only, no timings (those are the benchmark's own output):

- hearth_bench --json on the lining panel gives one row per size with the figures the
  docs table quotes, and its reference column (raw hypre calls with the same settings
  on the same matrix) converges in the same number of iterations as hearth's solver,
  give or take one (common practice, no source: the same algorithm on the same matrix).
- The end-to-end case tools/bench/lining_panel/case.yaml, run coarse by hearth, lets
  through a heat rate between the two classical bounds of a composite wall: parallel
  paths with adiabatic sides between them (anchor column and plain wall side by side:
  the lower bound) and isothermal planes between the layers (each layer's conductances
  in parallel: the upper bound), from the thermal resistances of Incropera & DeWitt,
  section 3.1 (from memory); the bounds are those of the variational principle for
  conduction (common practice, no source). The hot and the cold face carry the same
  heat (first law)."""
import json
import math
import os
import shutil
import subprocess
import tempfile
import unittest

import hearth_testlib as H

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
CASE = os.path.join(ROOT, "tools", "bench", "lining_panel")


class Bench(unittest.TestCase):
    def test_json_rows_with_a_reference_column_that_agrees(self):
        bench = os.path.join(os.path.dirname(H.HEARTH), "hearth_bench")
        proc = subprocess.run([bench, "--geometry", "lining", "--sizes", "0.06,0.04", "--repeat", "1", "--json"],
                              capture_output=True, text=True, timeout=300)
        self.assertEqual(proc.returncode, 0, proc.stderr[-4000:])
        run = json.loads(proc.stdout)
        self.assertEqual(run["geometry"], "lining")
        self.assertEqual(len(run["rows"]), 2)
        for row in run["rows"]:
            self.assertNotIn("note", row)
            self.assertGreater(row["unknowns"], 1000)
            self.assertLessEqual(row["unknowns"], row["nodes"])  # fixed hot-face nodes are not unknowns
            self.assertGreater(row["iterations"], 0)
            self.assertGreater(row["peak_bytes"], 0)
            self.assertLessEqual(abs(row["raw_hypre"]["iterations"] - row["iterations"]), 1)
        self.assertLess(run["rows"][0]["unknowns"], run["rows"][1]["unknowns"])
        self.assertGreater(run["iteration_growth"], 0)

    def test_unknown_geometry_is_refused(self):
        bench = os.path.join(os.path.dirname(H.HEARTH), "hearth_bench")
        proc = subprocess.run([bench, "--geometry", "sphere"], capture_output=True, text=True, timeout=60)
        self.assertEqual(proc.returncode, 1)
        self.assertIn("unknown bench geometry 'sphere'", proc.stderr)


class EndToEndCase(unittest.TestCase):
    def test_far_field_temperature_is_the_series_wall(self):
        root = tempfile.mkdtemp(prefix="hearth-bench-case-")
        self.addCleanup(shutil.rmtree, root, True)
        case_dir = os.path.join(root, "lining_panel")
        shutil.copytree(CASE, case_dir)
        r = H.run_hearth("run", os.path.join(case_dir, "case.yaml"), "--set", "mesh.size=0.04", "--quiet",
                         timeout=600)
        self.assertEqual(r.returncode, 0, r.describe())
        with open(os.path.join(case_dir, "results", "summary.json")) as fh:
            s = json.load(fh)
        t_hot, t_air, h = 1000.0, 27.0, 10.0
        k_refractory, k_board, k_steel = 1.0, 0.05, 50.0
        a = math.pi * 0.04 ** 2  # anchor's cross-section, m2, in a 1 m2 panel
        # Parallel paths: the anchor column (50 mm of refractory, then 400 mm of steel)
        # beside the plain wall (200 mm refractory, 200 mm board, 50 mm steel).
        r_column = 0.05 / k_refractory + 0.4 / k_steel + 1 / h
        r_wall = 0.2 / k_refractory + 0.2 / k_board + 0.05 / k_steel + 1 / h
        lower = (t_hot - t_air) * (a / r_column + (1 - a) / r_wall)
        # Isothermal planes: layer by layer, the anchor's share in parallel.
        def layer(thickness, k_around):
            return thickness / ((1 - a) * k_around + a * k_steel)
        r_planes = 0.05 / k_refractory + layer(0.15, k_refractory) + layer(0.2, k_board) + 0.05 / k_steel + 1 / h
        upper = (t_hot - t_air) / r_planes
        hot = s["boundaries"]["hot_face"]["heat_rate"]
        cold = s["boundaries"]["cold_face"]["heat_rate"]
        self.assertAlmostEqual(hot, -cold, delta=1e-6 * abs(hot))
        self.assertGreater(abs(hot), lower)  # 256 W
        self.assertLess(abs(hot), upper)  # 1040 W
        self.assertGreater(abs(hot), 1.02 * lower)  # the anchor conducts sideways into the refractory


if __name__ == "__main__":
    H.main()
