#!/usr/bin/env python3
"""Transient runs from the command line: the time series (temperature.pvd and its
temperature_NNNN.vtu files, read back with Python's XML parser and VTK's own reader),
probes.csv, the summary's history and thresholds against the lumped-capacitance
solution (shared/verification.md C17; Incropera & DeWitt sect. 5.2, from memory), an
interrupted run's valid series, and a restart from a steady result (no drift)."""
import csv
import json
import math
import os
import signal
import subprocess
import time
import unittest
import xml.etree.ElementTree as ET

import hearth_testlib as H

# Aluminium cube of verification.md C17, in millimetres: a = 20 mm, k = 200, rho = 2700,
# c = 900, h = 10 W/(m2 K) to 20 degC on every face, from 300 degC. tau = 810 s.
CUBE_GEO = """\
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 20, 20, 20};
Physical Volume("cube") = {1};
Physical Surface("skin") = {1, 2, 3, 4, 5, 6};
"""

CUBE_CASE = """\
title: aluminium cube cooling
units: {length: mm, temperature: degC}
geometry: {file: cube.geo}
mesh: {size: 5, order: 1}
materials:
  aluminium: {conductivity: 200, density: 2700, specific_heat: 900}
regions: {cube: aluminium}
boundaries:
  skin:
    convection: {coefficient: 10, ambient: 20}
analysis:
  type: transient
  duration: 1620
  time_step: 1
  time_stepping: {method: bdf2, tolerance: 0.002}
  initial_temperature: 300
  output_times: [600, 1620]
thresholds:
  below_100: {region_max: cube, temperature: 100}
  centre_below_200: {probe: centre, temperature: 200}
probes:
  centre: [10, 10, 10]
"""


def lumped(t):
    """Lumped-capacitance temperature of the C17 cube, degC."""
    return 20.0 + 280.0 * math.exp(-t / 810.0)


def read_series(pvd):
    """(time, file) of each DataSet in a .pvd, read with the standard XML parser."""
    root = ET.parse(pvd).getroot()
    return [(float(d.get("timestep")), d.get("file")) for d in root.iter("DataSet")]


class TransientRun(unittest.TestCase):
    @classmethod
    def setUpClass(cls):
        cls.case = H.CaseDir(CUBE_CASE, {"cube.geo": CUBE_GEO})
        cls.out = os.path.join(cls.case.root, "out")
        cls.result = H.run_hearth("run", cls.case.case, "--out", cls.out)
        cls.summary = json.loads(H.read_text(os.path.join(cls.out, "summary.json"))) if cls.result.returncode == 0 else None

    @classmethod
    def tearDownClass(cls):
        cls.case.cleanup()

    def setUp(self):
        self.assertEqual(self.result.returncode, 0, self.result.describe())

    def test_series_lists_complete_fields_with_their_times(self):
        series = read_series(os.path.join(self.out, "temperature.pvd"))
        self.assertEqual([t for t, _ in series], [0.0, 600.0, 1620.0])
        for t, name in series:
            grid = H.read_vtu(os.path.join(self.out, name))
            time_value = grid.GetFieldData().GetArray("TimeValue")
            self.assertAlmostEqual(time_value.GetValue(0), t)
            self.assertIn("temperature", H.point_field_names(grid))
            self.assertEqual(H.field_data_strings(grid, "region_names"), ["cube"])
        first = H.point_field(H.read_vtu(os.path.join(self.out, series[0][1])), "temperature")
        self.assertTrue(all(abs(v - 300.0) < 1e-9 for v in first))  # the starting field

    def test_centre_follows_the_lumped_solution(self):
        # C17: centre 153.5428 degC at 600 s (exact product solution); P1 on a 5 mm mesh, 0.05 K.
        self.assertAlmostEqual(self.summary["history"][0]["time"], 600.0)
        self.assertAlmostEqual(self.summary["history"][0]["regions"]["cube"]["mean"], 153.5, delta=0.1)
        probes = self.read_probes()
        at_600 = [row for row in probes if abs(row[0] - 600.0) < 1e-9]
        self.assertEqual(len(at_600), 1)
        self.assertAlmostEqual(at_600[0][1], 153.5428, delta=0.05)

    def read_probes(self):
        with open(os.path.join(self.out, "probes.csv")) as f:
            rows = list(csv.reader(f))
        self.assertEqual(rows[0], ["time_s", "centre"])
        return [(float(r[0]), float(r[1])) for r in rows[1:]]

    def test_probes_csv_has_every_step(self):
        probes = self.read_probes()
        self.assertEqual(len(probes), self.summary["analysis"]["steps"] + 1)  # and t = 0
        times = [t for t, _ in probes]
        self.assertEqual(times, sorted(times))
        self.assertAlmostEqual(times[-1], 1620.0)

    def test_thresholds_cross_when_the_lumped_solution_does(self):
        # Lumped capacitance: T = 100 degC at t = tau ln(280/80) = 1014.7 s, 200 degC at
        # tau ln(280/180) = 357.9 s (the cube is nearly isothermal, Bi = 1.7e-4).
        t100 = self.summary["thresholds"]["below_100"]["first_crossed_time"]
        t200 = self.summary["thresholds"]["centre_below_200"]["first_crossed_time"]
        self.assertAlmostEqual(t100, 810.0 * math.log(280.0 / 80.0), delta=5.0)
        self.assertAlmostEqual(t200, 810.0 * math.log(280.0 / 180.0), delta=5.0)

    def test_energy_over_the_run_balances(self):
        eb = self.summary["energy_balance"]
        self.assertEqual(eb["unit"], "J")
        self.assertLess(abs(eb["relative_imbalance"]), 1e-8)
        # Heat given up = rho c V (Ti - T(t)) with the lumped T(1620 s) (same source), 0.5 %.
        given_up = 2700 * 900 * 0.02 ** 3 * (300.0 - lumped(1620.0))
        self.assertAlmostEqual(-eb["stored"], given_up, delta=0.005 * given_up)
        self.assertAlmostEqual(eb["boundary_out"], given_up, delta=0.005 * given_up)

    def test_summary_names_the_run(self):
        a = self.summary["analysis"]
        self.assertEqual(a["type"], "transient")
        self.assertTrue(a["completed"])
        self.assertFalse(a["interrupted"])
        self.assertEqual(a["fields"], ["temperature_0000.vtu", "temperature_0001.vtu", "temperature_0002.vtu"])
        self.assertEqual([h["time"] for h in self.summary["history"]], [600.0, 1620.0])
        self.assertIn("skin", self.summary["history"][1]["boundaries"])


class InterruptedTransient(unittest.TestCase):
    def test_sigint_leaves_a_readable_series(self):
        text = CUBE_CASE.replace("duration: 1620", "duration: 100000").replace(
            "time_stepping: {method: bdf2, tolerance: 0.002}", "time_stepping: {adaptive: false}").replace(
            "output_times: [600, 1620]", "output_times: [5, 100000]")
        case = H.CaseDir(text, {"cube.geo": CUBE_GEO})
        self.addCleanup(case.cleanup)
        out = os.path.join(case.root, "out")
        proc = subprocess.Popen([H.HEARTH, "run", case.case, "--out", out], stderr=subprocess.PIPE, text=True)
        steps = 0
        for line in proc.stderr:  # wait until a few steps are done
            if "t = " in line and "step" in line:
                steps += 1
                if steps == 20:
                    proc.send_signal(signal.SIGINT)
                    break
        rest = proc.stderr.read()
        proc.stderr.close()
        proc.wait(timeout=120)
        self.assertEqual(proc.returncode, 130, rest)
        series = read_series(os.path.join(out, "temperature.pvd"))
        self.assertGreaterEqual(len(series), 3)  # t = 0, t = 5 s, and the step it stopped after
        for _t, name in series:
            H.read_vtu(os.path.join(out, name))
        summary = json.loads(H.read_text(os.path.join(out, "summary.json")))
        self.assertTrue(summary["analysis"]["interrupted"])
        self.assertAlmostEqual(summary["analysis"]["end_time"], series[-1][0])
        self.assertLess(summary["analysis"]["end_time"], 100000)


WALL_CASE = """\
units: {length: m, temperature: degC}
geometry: {file: wall.geo}
mesh: {size: 0.04, order: 2}
materials:
  brick: {conductivity: 1.1, density: 2000, specific_heat: 900}
regions: {wall: brick}
heat_sources: {wall: 2000}
boundaries:
  hot: {temperature: 600}
  cold:
    convection: {coefficient: 12, ambient: 25}
output: {directory: steady}
"""


class RestartFromSteady(unittest.TestCase):
    def test_steady_result_is_kept_and_a_changed_geometry_refused(self):
        case = H.CaseDir(WALL_CASE, {"wall.geo": H.WALL_GEO_M})
        self.addCleanup(case.cleanup)
        steady = H.run_hearth("run", case.case)
        self.assertEqual(steady.returncode, 0, steady.describe())
        transient_text = WALL_CASE.replace("output: {directory: steady}", "output: {directory: later}") + (
            "analysis:\n  type: transient\n  duration: 36000\n  time_step: 60\n"
            "  initial_temperature: {result: steady}\n")
        H.write_text(os.path.join(case.dir, "later.yaml"), transient_text)
        later = H.run_hearth("run", os.path.join(case.dir, "later.yaml"))
        self.assertEqual(later.returncode, 0, later.describe())
        before = H.point_field(H.read_vtu(case.path("steady", "temperature.vtu")), "temperature")
        series = read_series(case.path("later", "temperature.pvd"))
        after = H.point_field(H.read_vtu(case.path("later", series[-1][1])), "temperature")
        self.assertEqual(len(before), len(after))  # the same mesh, node for node
        self.assertLess(max(abs(a - b) for a, b in zip(before, after)), 1e-6)  # no drift
        summary = json.loads(H.read_text(case.path("later", "summary.json")))
        self.assertTrue(summary["analysis"]["initial_temperature"]["from"].endswith("steady"))
        # The geometry changed since the steady run: its mesh no longer belongs to the case.
        H.write_text(case.path("wall.geo"), H.WALL_GEO_M.replace("0.25", "0.3"))
        refused = H.run_hearth("run", os.path.join(case.dir, "later.yaml"))
        self.assertEqual(refused.returncode, 1, refused.describe())
        self.assertIn("analysis.initial_temperature.result", refused.stderr)
        self.assertIn("different version of wall.geo", refused.stderr)


class TransientInput(unittest.TestCase):
    def test_time_table_in_a_steady_case_is_refused_with_its_line(self):
        text = WALL_CASE.replace("hot: {temperature: 600}", "hot: {temperature: {vs_time: [[0, 20], [60, 600]]}}")
        case = H.CaseDir(text, {"wall.geo": H.WALL_GEO_M})
        self.addCleanup(case.cleanup)
        r = H.run_hearth("run", case.case)
        self.assertEqual(r.returncode, 1, r.describe())
        self.assertIn("case.yaml:9: boundaries.hot.temperature.vs_time: a table in time needs analysis.type: transient",
                      r.stderr)
        self.assertFalse(os.path.exists(case.path("steady")))


if __name__ == "__main__":
    H.main()
