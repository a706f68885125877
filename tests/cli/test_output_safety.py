"""End-to-end tests that results are complete or absent and that nothing already
written is lost (design.md, "Results (the contract)"; docs/errors.md): output folders
checked before any work, one hearth per output folder (lock file), write failures
injected through the documented test hook and, where a size-limited file system can be
mounted, a real full disk. Rules of common practice, no source.

Usage: /usr/bin/python3 test_output_safety.py /path/to/hearth
"""

import hashlib
import os
import shutil
import signal
import subprocess
import sys
import time
import unittest

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import hearth_testlib as H  # noqa: E402

OK, BAD_INPUT = 0, 1

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

# A box fine enough that meshing and solving take a few seconds (about a million
# tetrahedra at this size), so that a second run can start while the first still works.
SLOW_CASE = CASE.replace("size: 0.05", "size: 0.004")


def digests(folder):
    """{relative path: sha256} of every file under folder."""
    out = {}
    for base, _dirs, files in os.walk(folder):
        for f in files:
            p = os.path.join(base, f)
            with open(p, "rb") as fh:
                out[os.path.relpath(p, folder)] = hashlib.sha256(fh.read()).hexdigest()
    return out


class Base(unittest.TestCase):
    def setUp(self):
        self.case = H.wall_case(case=CASE)
        self.addCleanup(self.case.cleanup)
        self.out = os.path.join(self.case.root, "out")

    def run_ok(self, *args, **kw):
        r = H.run_hearth(*args, **kw)
        self.assertEqual(r.returncode, OK, r.describe())
        return r

    def leftovers(self):
        return [n for n in os.listdir(self.case.root) if ".partial-" in n or ".old-" in n or n.endswith(".lock")]


class OutputFolders(Base):
    def refused(self, *args, where="--out"):
        before, entries = self.case.snapshot(), self.case.entries()
        r = H.run_hearth(*args)
        self.assertEqual(r.returncode, BAD_INPUT, r.describe())
        self.assertIn(where, r.stderr)
        self.assertEqual(self.case.snapshot(), before, "nothing changed")
        self.assertEqual(self.case.entries(), entries, "nothing written\n" + r.describe())
        return r.stderr

    def test_a_folder_of_other_files_is_not_replaced(self):
        H.write_text(os.path.join(self.out, "thesis.txt"), "months of work\n")
        err = self.refused("run", self.case.case, "--out", self.out)
        self.assertIn("none of hearth's results", err)
        self.refused("mesh", self.case.case, "--out", self.out)

    def test_an_empty_folder_or_earlier_results_are_replaced(self):
        os.makedirs(self.out)
        self.run_ok("run", self.case.case, "--out", self.out, "--quiet")
        self.run_ok("run", self.case.case, "--out", self.out, "--quiet", "--set", "mesh.size=0.04")
        self.assertTrue(os.path.isfile(os.path.join(self.out, "summary.json")))

    def test_a_file_in_the_way(self):
        err = self.refused("run", self.case.case, "--out", os.path.join(self.case.path("wall.geo"), "res"))
        self.assertIn("is a file, not a folder", err)

    def test_the_root_folder(self):
        self.assertIn("root folder", self.refused("run", self.case.case, "--out", "/"))

    def test_a_folder_holding_an_included_geometry_file(self):
        # The geometry includes a file from a folder of its own; results there would delete it.
        geo = "Include \"shared/size.geo\";\n" + H.WALL_GEO_M
        H.write_text(self.case.path("wall.geo"), geo)
        H.write_text(self.case.path("shared", "size.geo"), "lc = 1;\n")
        err = self.refused("run", self.case.case, "--out", self.case.path("shared"))
        self.assertIn(self.case.path("shared", "size.geo"), err)

    def test_output_directory_key_names_its_line(self):
        text = CASE + "output: {directory: /}\n"
        H.write_text(self.case.case, text)
        err = self.refused("run", self.case.case, where="output.directory")
        self.assertIn("case.yaml:%d" % H.line_of(text, "output:"), err)

    @unittest.skipIf(os.geteuid() == 0, "root may write anywhere")
    def test_an_unwritable_folder(self):
        locked = os.path.join(self.case.root, "locked")
        os.makedirs(locked)
        os.chmod(locked, 0o500)
        self.addCleanup(os.chmod, locked, 0o700)
        err = self.refused("run", self.case.case, "--out", os.path.join(locked, "res"))
        self.assertIn("Permission denied", err)

    def test_a_read_only_file_system(self):
        err = self.refused("run", self.case.case, "--out", "/proc/hearth-results")
        self.assertIn("/proc", err)


class Lock(Base):
    def test_second_run_on_the_same_folder_is_refused(self):
        H.write_text(self.case.case, SLOW_CASE)
        first = subprocess.Popen([H.HEARTH, "run", self.case.case, "--out", self.out, "--quiet"],
                                 stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
        try:
            lock = os.path.join(self.case.root, ".out.lock")
            for _ in range(200):  # the lock is taken before meshing starts
                if os.path.exists(lock):
                    break
                time.sleep(0.02)
            self.assertTrue(os.path.exists(lock), "the first run holds a lock file beside its folder")
            for command in ("run", "mesh", "study"):
                r = H.run_hearth(command, self.case.case, "--out", self.out, "--quiet")
                self.assertEqual(r.returncode, BAD_INPUT, r.describe())
                self.assertIn("being written by another hearth", r.stderr)
                self.assertIn("process %d" % first.pid, r.stderr)
        finally:
            first.send_signal(signal.SIGTERM)
            first.communicate(timeout=120)
        self.assertEqual(self.leftovers(), [], "no lock file or staging folder stays behind")

    def test_a_lock_left_by_a_killed_run_does_not_block(self):
        H.write_text(self.case.case, SLOW_CASE)
        first = subprocess.Popen([H.HEARTH, "run", self.case.case, "--out", self.out, "--quiet"],
                                 stdout=subprocess.PIPE, stderr=subprocess.PIPE)
        lock = os.path.join(self.case.root, ".out.lock")
        for _ in range(200):
            if os.path.exists(lock):
                break
            time.sleep(0.02)
        first.kill()  # SIGKILL: no clean-up at all
        first.communicate(timeout=60)
        time.sleep(0.5)  # the meshing worker dies with it (bubblewrap --die-with-parent, or on its own)
        self.assertTrue(os.path.exists(lock), "a killed run leaves its lock file")
        H.write_text(self.case.case, CASE)
        self.run_ok("run", self.case.case, "--out", self.out, "--quiet")
        self.assertFalse(os.path.exists(lock))
        self.assertTrue(os.path.isfile(os.path.join(self.out, "summary.json")))

    def test_different_folders_run_side_by_side(self):
        other = os.path.join(self.case.root, "other")
        H.write_text(self.case.case, SLOW_CASE.replace("0.004", "0.008"))
        first = subprocess.Popen([H.HEARTH, "run", self.case.case, "--out", self.out, "--quiet"],
                                 stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
        r = H.run_hearth("run", self.case.case, "--out", other, "--quiet", "--set", "mesh.size=0.05")
        _out, err = first.communicate(timeout=600)
        self.assertEqual(r.returncode, OK, r.describe())
        self.assertEqual(first.returncode, OK, err)


class WriteFailures(Base):
    def fail_writing(self, name, command="run"):
        env = dict(os.environ, HEARTH_TEST_FAIL_WRITE=name)
        args = [H.HEARTH, command, self.case.case, "--out", self.out, "--quiet", "--set", "mesh.size=0.04"]
        return subprocess.run(args, capture_output=True, text=True, env=env, timeout=300)

    def test_earlier_results_stay_intact(self):
        self.run_ok("run", self.case.case, "--out", self.out, "--quiet")
        before = digests(self.out)
        for name in ("temperature.vtu", "summary.json", "run.json"):
            proc = self.fail_writing(name)
            self.assertEqual(proc.returncode, BAD_INPUT, proc.stderr)
            self.assertIn("cannot write %s: No space left on device" % os.path.join(self.out, name), proc.stderr)
            self.assertIn("earlier results in %s are unchanged" % self.out, proc.stderr)
            self.assertEqual(digests(self.out), before, name)
            self.assertEqual(self.leftovers(), [])

    def test_a_first_run_leaves_nothing(self):
        entries = self.case.entries()
        proc = self.fail_writing("temperature.vtu")
        self.assertEqual(proc.returncode, BAD_INPUT, proc.stderr)
        self.assertIn("nothing was written to " + self.out, proc.stderr)
        self.assertEqual(self.case.entries(), entries)

    def test_mesh_command(self):
        self.run_ok("mesh", self.case.case, "--out", self.out, "--quiet")
        before = digests(self.out)
        proc = self.fail_writing("mesh.json", command="mesh")
        self.assertEqual(proc.returncode, BAD_INPUT, proc.stderr)
        self.assertEqual(digests(self.out), before)

    def test_no_vtk_noise_on_the_terminal(self):
        proc = self.fail_writing("*")
        self.assertEqual(proc.returncode, BAD_INPUT, proc.stderr)
        self.assertEqual(len(proc.stderr.strip().splitlines()), 1, proc.stderr)
        self.assertTrue(proc.stderr.startswith("error: cannot write"), proc.stderr)


def can_mount_small_tmpfs():
    if not shutil.which("unshare"):
        return False
    probe = subprocess.run(["unshare", "-rm", "sh", "-c", "mount -t tmpfs -o size=64k tmpfs /mnt"],
                           capture_output=True)
    return probe.returncode == 0


class FullDisk(Base):
    @unittest.skipUnless(can_mount_small_tmpfs(), "no private size-limited tmpfs here (unshare -rm)")
    def test_a_full_disk_keeps_the_earlier_results(self):
        # In a private mount namespace: a 120 KB tmpfs holds the coarse results (about
        # 9 KB) but not the fine ones; the second run must fail cleanly.
        disk = os.path.join(self.case.root, "disk")
        os.makedirs(disk)
        keep = os.path.join(self.case.root, "seen")
        res = os.path.join(disk, "res")
        script = (
            'mount -t tmpfs -o size=120k tmpfs "{disk}" || exit 99\n'
            '"{hearth}" run "{case}" --out "{res}" --quiet || exit 98\n'
            'cp -a "{res}" "{keep}.before"\n'
            '"{hearth}" run "{case}" --out "{res}" --quiet --set mesh.size=0.012 2> "{keep}.stderr"\n'
            'echo $? > "{keep}.status"\n'
            'cp -a "{disk}" "{keep}.after"\n'
        ).format(disk=disk, hearth=H.HEARTH, case=self.case.case, res=res, keep=keep)
        proc = subprocess.run(["unshare", "-rm", "sh", "-c", script], capture_output=True, text=True, timeout=600)
        self.assertEqual(proc.returncode, 0, proc.stdout + proc.stderr)
        self.assertEqual(H.read_text(keep + ".status").strip(), str(BAD_INPUT), H.read_text(keep + ".stderr"))
        err = H.read_text(keep + ".stderr")
        self.assertIn("No space left on device", err)
        self.assertIn("earlier results in %s are unchanged" % res, err)
        self.assertEqual(digests(keep + ".after"), {os.path.join("res", k): v
                                                   for k, v in digests(keep + ".before").items()})


if __name__ == "__main__":
    H.main()
