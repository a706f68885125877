#!/usr/bin/env python3
"""The parameter-sweep examples of docs/user-guide.md ("Parameter sweeps from
scripts"): docs/examples/sweep_film_coefficient.sh (a shell loop) and
docs/examples/sweep_board.py (Python, standard library only). Each file must appear
in the guide verbatim, is run as the guide says (in a copy of cases/furnace_wall, with
hearth on PATH), and must print what hearth computed: the numbers of every row are
those of the summary.json of that run, and each run's run.json lists the overrides
the script gave. The physical checks are directions of change only: a larger film
coefficient or a more conductive board lets more heat through, and a lower emissivity
less (series thermal resistances, Incropera & DeWitt section 3.1, from memory). The
output quoted in the guide must agree with a fresh run to 1 % (Gmsh's meshes differ
a little from run to run)."""
import csv
import io
import os
import re
import shutil
import subprocess
import tempfile
import unittest

import hearth_testlib as H

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
GUIDE = os.path.join(ROOT, "docs", "user-guide.md")
EXAMPLES = os.path.join(ROOT, "docs", "examples")
DEMO = os.path.join(ROOT, "cases", "furnace_wall")


def fenced_blocks(markdown):
    """(language, text) of every fenced code block."""
    return [(m.group(1), m.group(2)) for m in re.finditer(r"^```(\w*)\n(.*?)^```$", markdown, re.S | re.M)]


def quoted_output(markdown, first_line):
    """The fenced block of the guide that starts with first_line (the quoted output)."""
    for _lang, text in fenced_blocks(markdown):
        if text.startswith(first_line + "\n"):
            return text
    raise AssertionError("the guide quotes no output starting with %r" % first_line)


def rows_of(text):
    return list(csv.DictReader(io.StringIO(text)))


class Sweeps(unittest.TestCase):
    @classmethod
    def setUpClass(cls):
        with open(GUIDE) as fh:
            cls.guide = fh.read()

    def setUp(self):
        self.root = tempfile.mkdtemp(prefix="hearth-sweep-")
        self.addCleanup(shutil.rmtree, self.root, True)
        self.demo = os.path.join(self.root, "furnace_wall")
        shutil.copytree(DEMO, self.demo)
        self.env = dict(os.environ, PATH=os.path.dirname(H.HEARTH) + os.pathsep + os.environ.get("PATH", ""))

    def run_example(self, interpreter, name):
        path = os.path.join(EXAMPLES, name)
        with open(path) as fh:
            script = fh.read()
        self.assertIn(script, [text for _lang, text in fenced_blocks(self.guide)],
                      "%s must appear in docs/user-guide.md verbatim, as a fenced block" % name)
        done = subprocess.run([interpreter, path], cwd=self.demo, env=self.env, capture_output=True, text=True,
                              timeout=900)
        self.assertEqual(done.returncode, 0, done.stderr[-3000:])
        return done.stdout

    def summary(self, name):
        return H.read_json(os.path.join(self.demo, "sweep", name, "summary.json"))

    def overrides(self, name):
        return H.read_json(os.path.join(self.demo, "sweep", name, "run.json"))["overrides"]

    def assert_quoted_output_agrees(self, printed, header):
        quoted = rows_of(quoted_output(self.guide, header))
        fresh = rows_of(printed)
        self.assertEqual(len(quoted), len(fresh))
        for q, f in zip(quoted, fresh):
            for key in q:
                self.assertLessEqual(H.rel_err(float(f[key]), float(q[key])), 0.01, "%s: %s" % (key, q))

    def test_shell_loop_over_film_coefficients(self):
        printed = self.run_example("/bin/bash", "sweep_film_coefficient.sh")
        header = printed.splitlines()[0]
        rows = rows_of(printed)
        self.assertEqual([r["film_coefficient_W_m2K"] for r in rows], ["4", "6", "10", "15"])
        for r in rows:
            h = r["film_coefficient_W_m2K"]
            s = self.summary("h_" + h)
            self.assertEqual(self.overrides("h_" + h), ["boundaries.cold_face.convection.coefficient=" + h])
            self.assertEqual(r["heat_loss_W"], "%.1f" % -s["boundaries"]["cold_face"]["heat_rate"])
            self.assertEqual(r["shell_max_degC"], "%.1f" % s["regions"]["shell"]["temperature"]["max"])
            self.assertLess(abs(s["energy_balance"]["relative_imbalance"]), 1e-8)  # no sources: in = out
        losses = [float(r["heat_loss_W"]) for r in rows]
        shells = [float(r["shell_max_degC"]) for r in rows]
        self.assertEqual(losses, sorted(losses), "more heat passes with a larger film coefficient")
        self.assertEqual(shells, sorted(shells, reverse=True), "and the shell is cooler")
        self.assert_quoted_output_agrees(printed, header)

    def test_python_sweep_over_emissivity_and_board(self):
        printed = self.run_example("/usr/bin/python3", "sweep_board.py")
        header = printed.splitlines()[0]
        rows = rows_of(printed)
        self.assertEqual([(r["emissivity"], r["board_factor"]) for r in rows],
                         [("0.85", "1.0"), ("0.85", "1.3"), ("0.3", "1.0"), ("0.3", "1.3")])
        loss = {}
        for r in rows:
            name = "e%g_k%g" % (float(r["emissivity"]), float(r["board_factor"]))
            s = self.summary(name)
            self.assertEqual(r["heat_loss_W"], "%.1f" % -s["boundaries"]["cold_face"]["heat_rate"])
            self.assertEqual(r["shell_max_degC"], "%.1f" % s["regions"]["shell"]["temperature"]["max"])
            self.assertEqual(r["board_max_degC"], "%.1f" % s["regions"]["backup"]["temperature"]["max"])
            given = self.overrides(name)
            self.assertIn("boundaries.cold_face.radiation.emissivity=" + r["emissivity"], given)
            self.assertTrue(any(o.startswith("materials.backup_board.conductivity={vs_temperature:") for o in given))
            loss[(r["emissivity"], r["board_factor"])] = float(r["heat_loss_W"])
        for e in ("0.85", "0.3"):
            self.assertGreater(loss[(e, "1.3")], loss[(e, "1.0")], "a more conductive board lets more heat through")
        for k in ("1.0", "1.3"):
            self.assertLess(loss[("0.3", k)], loss[("0.85", k)], "a lower emissivity lets less heat out")
        self.assert_quoted_output_agrees(printed, header)


if __name__ == "__main__":
    H.main()
