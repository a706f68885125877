#!/usr/bin/env python3
"""End-to-end checks of the nonlinear and anisotropic case-file forms through the hearth
program: k(T) tables, radiation with convection, a rotated orthotropic tensor, thermal
contact across an interface, the material library, the touch limit and their bad inputs.
Expected values are closed forms from the shared verification notes (sources named at
each check)."""
import json
import os
import unittest

import hearth_testlib as H

BLOCKS_GEO = """\
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 0.02, 0.03, 0.03};
Box(2) = {0.02, 0, 0, 0.02, 0.03, 0.03};
v() = BooleanFragments{ Volume{1, 2}; Delete; }{};
eps = 1e-7;
Physical Volume("left") = {Volume In BoundingBox{-eps, -eps, -eps, 0.02 + eps, 0.03 + eps, 0.03 + eps}};
Physical Volume("right") = {Volume In BoundingBox{0.02 - eps, -eps, -eps, 0.04 + eps, 0.03 + eps, 0.03 + eps}};
Physical Surface("hot") = {Surface In BoundingBox{-eps, -eps, -eps, eps, 0.03 + eps, 0.03 + eps}};
Physical Surface("cold") = {Surface In BoundingBox{0.04 - eps, -eps, -eps, 0.04 + eps, 0.03 + eps, 0.03 + eps}};
Physical Surface("joint") = {Surface In BoundingBox{0.02 - eps, -eps, -eps, 0.02 + eps, 0.03 + eps, 0.03 + eps}};
"""

SLAB_GEO = """\
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 0.2, 0.05, 0.05};
Physical Volume("wall") = {1};
Physical Surface("inner") = {1};
Physical Surface("outer") = {2};
"""


def summary(out):
    with open(os.path.join(out, "summary.json")) as fh:
        return json.load(fh)


class NonlinearCases(unittest.TestCase):
    def run_case(self, text, geo_name, geo, *extra):
        case = H.CaseDir(text, {geo_name: geo})
        self.addCleanup(case.cleanup)
        out = os.path.join(case.root, "out")
        r = H.run_hearth("run", case.case, "--out", out, "--quiet", *extra)
        return case, out, r

    # C05: aluminium 2024-T6 blocks, R''_tc = 2e-4 m2K/W (Incropera & DeWitt section 3.1.4,
    # from memory): q'' = 187 798.4 W/m2, jump 37.5597 K.
    def test_contact_interface(self):
        text = """\
units: {length: m, temperature: degC}
geometry: {file: blocks.geo}
mesh: {size: 0.008}
materials:
  al: {conductivity: 177}
regions: {left: al, right: al}
boundaries:
  hot: {temperature: 100}
  cold: {temperature: 20}
interfaces:
  joint: {conductance: 5000}
probes:
  left_side: [0.0199999, 0.015, 0.015]
  right_side: [0.0200001, 0.015, 0.015]
"""
        _case, out, r = self.run_case(text, "blocks.geo", BLOCKS_GEO)
        self.assertEqual(r.returncode, 0, r.describe())
        s = summary(out)
        area = 0.03 * 0.03
        self.assertAlmostEqual(s["boundaries"]["hot"]["heat_rate"] / area, 187798.4, delta=0.2)
        self.assertAlmostEqual(abs(s["boundaries"]["joint"]["heat_rate"]) / area, 187798.4, delta=0.2)
        self.assertTrue(s["boundaries"]["joint"]["internal"])
        jump = s["probes"]["left_side"]["temperature"] - s["probes"]["right_side"]["temperature"]
        self.assertAlmostEqual(jump, 37.5597, delta=0.01)
        self.assertLess(abs(s["energy_balance"]["relative_imbalance"]), 1e-8)

    # C21: inner 1100 degC, k = 0.5, L = 0.2; outer h = 10 to 300 K and emissivity 0.8 to 300 K.
    # Surface energy balance (Incropera & DeWitt ch. 1, from memory): Ts = 425.2961 K,
    # q'' = 2369.635 W/m2. The case is in kelvin, to check the unit path as well.
    def test_radiation_and_convection_in_kelvin(self):
        text = """\
units: {length: m, temperature: K}
geometry: {file: slab.geo}
mesh: {size: 0.025}
materials:
  wall: {conductivity: 0.5}
regions: {wall: wall}
boundaries:
  inner: {temperature: 1373.15}
  outer:
    convection: {coefficient: 10, ambient: 300}
    radiation: {emissivity: 0.8, surroundings: 300}
"""
        _case, out, r = self.run_case(text, "slab.geo", SLAB_GEO)
        self.assertEqual(r.returncode, 0, r.describe())
        s = summary(out)
        self.assertAlmostEqual(s["boundaries"]["outer"]["temperature"]["mean"], 425.2961, delta=0.1)  # P1 on a random mesh: 0.052 K seen
        self.assertAlmostEqual(s["boundaries"]["inner"]["heat_rate"] / 0.0025, 2369.635, delta=0.05)
        self.assertGreater(s["solve"]["nonlinear_iterations"], 1)
        self.assertTrue(s["solve"]["converged"])

    # C20(a): k = 0.8 (1 + 0.001 T[degC]), T = 1000 / 100 degC across 0.2 m; Kirchhoff transform
    # (Carslaw & Jaeger, from memory): q'' = 5580.0 W/m2, T(0.10) = 614.0012 degC.
    def test_conductivity_table(self):
        text = """\
units: {length: m, temperature: degC}
geometry: {file: slab.geo}
mesh: {size: 0.02, order: 2}
materials:
  refractory:
    conductivity: {vs_temperature: [[0, 0.8], [1000, 1.6]]}
regions: {wall: refractory}
boundaries:
  inner: {temperature: 1000}
  outer: {temperature: 100}
probes:
  middle: [0.1, 0.02, 0.03]
safety: {touch_surfaces: [outer], touch_limit: 60}
"""
        _case, out, r = self.run_case(text, "slab.geo", SLAB_GEO)
        self.assertEqual(r.returncode, 0, r.describe())
        s = summary(out)
        self.assertAlmostEqual(s["boundaries"]["inner"]["heat_rate"] / 0.0025, 5580.0, delta=0.6)
        self.assertAlmostEqual(s["probes"]["middle"]["temperature"], 614.0012, delta=0.1)  # P1 on a random mesh: 0.052 K seen
        touch = s["safety"]["touch"]["outer"]
        self.assertTrue(touch["exceeded"])
        self.assertAlmostEqual(touch["max"], 100.0, delta=1e-6)
        self.assertAlmostEqual(touch["limit"], 60.0, delta=1e-9)
        self.assertTrue(any("touch limit" in w for w in s["warnings"]))

    # Orthotropic in a rotated frame: principal [1, 10, 2] along axis_1 = (0, cos 30, sin 30),
    # axis_2 = x. Then k_xx = 10 and k_xy = k_xz = 0, so with T fixed on the x faces and the
    # sides insulated the field is exactly linear (closed form of the rotated tensor,
    # verification.md C24): q'' = 10 x 180 / 0.2 = 9000 W/m2, 22.5 W through 0.0025 m2, on
    # any mesh. The same tensor written out in global axes must give the same.
    def test_orthotropic_in_a_rotated_frame_and_its_tensor(self):
        base = """\
units: {length: m, temperature: degC}
geometry: {file: slab.geo}
mesh: {size: 0.03}
materials:
  laminate:
    conductivity: %s
regions: {wall: laminate}
boundaries:
  inner: {temperature: 200}
  outer: {temperature: 20}
"""
        for form in ("{principal: [1, 10, 2], axis_1: [0, 0.8660254038, 0.5], axis_2: [1, 0, 0]}",
                     "{tensor: [[10, 0, 0], [0, 1.25, -0.4330127019], [0, -0.4330127019, 1.75]]}"):
            _case, out, r = self.run_case(base % form, "slab.geo", SLAB_GEO)
            self.assertEqual(r.returncode, 0, r.describe())
            self.assertAlmostEqual(summary(out)["boundaries"]["inner"]["heat_rate"], 22.5, delta=1e-8)

    # Library entry with an override (library values: Incropera & DeWitt Table A.1, see
    # data/materials.yaml): the run uses the overriding conductivity.
    def test_library_entry_with_override(self):
        text = """\
units: {length: m, temperature: degC}
geometry: {file: slab.geo}
mesh: {size: 0.025}
materials:
  steel: {library: carbon_steel, conductivity: 50}
regions: {wall: steel}
boundaries:
  inner: {temperature: 120}
  outer: {temperature: 20}
"""
        _case, out, r = self.run_case(text, "slab.geo", SLAB_GEO)
        self.assertEqual(r.returncode, 0, r.describe())
        # Fourier's law: q = k dT / L = 50 x 100 / 0.2 = 25 000 W/m2 (closed form).
        self.assertAlmostEqual(summary(out)["boundaries"]["inner"]["heat_rate"] / 0.0025, 25000.0, delta=1e-3)

    def test_bad_nonlinear_inputs_exit_1_with_the_line(self):
        header = """\
units: {length: m, temperature: degC}
geometry: {file: slab.geo}
mesh: {size: 0.05}
materials:
  wall: {conductivity: 1.0}
regions: {wall: wall}
"""
        cases = {
            "boundaries:\n  inner: {temperature: 100}\n  outer:\n    radiation: {emissivity: 1.5, surroundings: 20}\n":
                ("case.yaml:10", "emissivity"),
            "boundaries:\n  inner: {temperature: 100}\ninterfaces:\n  outer: {conductance: 100}\n":
                ("case.yaml:10", "not an internal surface"),
            "boundaries:\n  inner: {temperature: 100}\nsafety: {touch_surfaces: [shell]}\n":
                ("case.yaml:9", "shell"),
        }
        for tail, (where, what) in cases.items():
            case = H.CaseDir(header + tail, {"slab.geo": SLAB_GEO})
            self.addCleanup(case.cleanup)
            r = H.run_hearth("run", case.case, "--out", os.path.join(case.root, "out"))
            self.assertEqual(r.returncode, 1, r.describe())
            self.assertIn(where, r.stderr, r.describe())
            self.assertIn(what, r.stderr, r.describe())
            self.assertFalse(os.path.exists(os.path.join(case.root, "out")))


if __name__ == "__main__":
    H.main()
