"""End-to-end tests of the geometry guard and the meshing sandbox: a geometry script
that would run a program or write files is refused before Gmsh sees it (exit 1, the
message names the file, line and construct and --trust-geometry), unless the user
trusts it; and where bubblewrap works, the meshing worker cannot write even when the
scan is skipped. What the constructs do is Gmsh's documented behaviour (Gmsh reference
manual, "General scripting commands", from memory).

Usage: /usr/bin/python3 test_geometry_guard.py /path/to/hearth
"""

import os
import re
import shutil
import subprocess
import sys
import unittest

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import hearth_testlib as H  # noqa: E402

BAD_INPUT = 1

CASE = """\
units: {length: m, temperature: degC}
geometry: {file: wall.geo}
mesh: {size: 0.05}
materials:
  brick: {conductivity: 1.1}
regions: {wall: brick}
boundaries:
  hot: {temperature: 1000}
  cold: {temperature: 200}
"""


def with_lines(*extra):
    return H.WALL_GEO_M + "".join(line + "\n" for line in extra)


class Guard(unittest.TestCase):
    def case(self, geo, files=None):
        files = dict(files or {})
        files["wall.geo"] = geo
        case = H.CaseDir(CASE, files)
        self.addCleanup(case.cleanup)
        return case

    def refused(self, case, command="run", marker=None):
        """Runs `command` on the case; it must be refused and write nothing anywhere."""
        before, entries = case.snapshot(), case.entries()
        args = [command, case.case]
        if command in ("run", "mesh", "study"):
            args += ["--out", os.path.join(case.root, "out")]
        r = H.run_hearth(*args)
        self.assertEqual(r.returncode, BAD_INPUT, r.describe())
        self.assertIn("--trust-geometry", r.stderr)
        self.assertEqual(case.snapshot(), before, "inputs untouched")
        self.assertEqual(case.entries(), entries, "nothing written\n" + r.describe())
        if marker:
            self.assertFalse(os.path.exists(marker), "the script's command must not have run")
        return r.stderr

    def test_system_call_is_refused_with_file_and_line(self):
        marker = os.path.join("/tmp", "hearth-guard-%d" % os.getpid())
        case = self.case(with_lines('SystemCall "touch %s";' % marker))
        err = self.refused(case, marker=marker)
        line = H.line_of(with_lines('SystemCall "touch %s";' % marker), "SystemCall")
        self.assertIn("%s:%d: SystemCall" % (case.path("wall.geo"), line), err)

    def test_every_command_is_refused(self):
        for command in ("run", "check", "mesh", "study"):
            case = self.case(with_lines('Save "copy.msh";'))
            err = self.refused(case, command)
            self.assertRegex(err, r"wall\.geo:\d+: Save", command)
            self.assertFalse(os.path.exists(case.path("copy.msh")))

    def test_construct_in_an_included_file_is_refused(self):
        case = self.case(with_lines('Include "parts/extra.geo";'),
                         {"parts/extra.geo": 'lc = 1;\nPrintf("x") > "../leak.txt";\n'})
        err = self.refused(case)
        self.assertIn(case.path("parts", "extra.geo") + ":2: Printf > file", err)

    def test_computed_include_is_refused(self):
        case = self.case(with_lines('Include StrCat(CurrentDirectory, "extra.geo");'),
                         {"extra.geo": "lc = 1;\n"})
        err = self.refused(case, "check")
        self.assertIn("Include with a computed file name", err)

    def test_commands_in_comments_and_strings_are_not_refused(self):
        geo = with_lines('// SystemCall "rm -rf /";', '/* Save "a.msh"; */', 'Printf("Save and Print");')
        case = self.case(geo)
        r = H.run_hearth("check", case.case)
        self.assertEqual(r.returncode, 0, r.describe())

    def test_trust_geometry_runs_the_script(self):
        # A trusted script may write: here it saves a copy of its mesh beside itself.
        case = self.case(with_lines("Mesh 3;", 'Save "copy.msh";'))
        out = os.path.join(case.root, "out")
        for command in ("run", "mesh"):
            r = H.run_hearth(command, case.case, "--out", out, "--quiet", "--trust-geometry")
            self.assertEqual(r.returncode, 0, r.describe())
            self.assertTrue(os.path.isfile(case.path("copy.msh")), command)
            os.remove(case.path("copy.msh"))
        r = H.run_hearth("check", case.case, "--trust-geometry")
        self.assertEqual(r.returncode, 0, r.describe())


def sandbox_works():
    bwrap = "/usr/bin/bwrap"
    if not os.access(bwrap, os.X_OK):
        return False
    probe = subprocess.run([bwrap, "--ro-bind", "/", "/", "--dev", "/dev", "--proc", "/proc", "--unshare-all",
                            "--new-session", "--die-with-parent", "/bin/true"], capture_output=True)
    return probe.returncode == 0


class Sandbox(unittest.TestCase):
    @unittest.skipUnless(sandbox_works(), "bubblewrap cannot make a sandbox here")
    def test_the_sandbox_alone_stops_writes(self):
        # The test hook skips the scan and keeps the sandbox: Gmsh then runs the commands,
        # and the read-only file system refuses them (bubblewrap's --ro-bind).
        case = H.CaseDir(CASE, {"wall.geo": with_lines('CreateDir "made_by_script";',
                                                       'SystemCall "touch touched_by_script";',
                                                       'Save "saved_by_script.msh";')})
        self.addCleanup(case.cleanup)
        env = dict(os.environ, HEARTH_TEST_SANDBOX_WITHOUT_GUARD="1")
        proc = subprocess.run([H.HEARTH, "check", case.case], cwd=case.dir, capture_output=True, text=True,
                              env=env, timeout=300)
        for name in ("made_by_script", "touched_by_script", "saved_by_script.msh"):
            self.assertFalse(os.path.exists(case.path(name)), name + "\n" + proc.stderr)
        # Gmsh reports the refused Save; hearth turns it into an input error.
        self.assertEqual(proc.returncode, BAD_INPUT, proc.stderr)
        self.assertIn("saved_by_script.msh", proc.stderr)

    @unittest.skipUnless(sandbox_works(), "bubblewrap cannot make a sandbox here")
    def test_sandboxed_run_gives_the_same_result(self):
        # The plane wall of verification.md C01(a): 35.2 W through 0.01 m2 of k = 1.1
        # across 0.25 m and 800 K (Fourier's law, closed form); sandboxed or trusted alike.
        case = H.CaseDir(CASE, {"wall.geo": H.WALL_GEO_M})
        self.addCleanup(case.cleanup)
        rates = []
        for extra in ([], ["--trust-geometry"]):
            out = os.path.join(case.root, "out%d" % len(rates))
            r = H.run_hearth("run", case.case, "--out", out, "--quiet", *extra)
            self.assertEqual(r.returncode, 0, r.describe())
            rates.append(H.read_json(os.path.join(out, "summary.json"))["boundaries"]["hot"]["heat_rate"])
        for rate in rates:
            self.assertLess(H.rel_err(rate, 1.1 * 800 / 0.25 * 0.01), 1e-9)


if __name__ == "__main__":
    H.main()
