#!/usr/bin/env python3
"""Interrupted runs (command-line contract in the design): SIGTERM or SIGINT ends a run
with exit status 143 or 130, writes nothing into the output folder and leaves no worker
process or staging folder behind (common practice, no source)."""
import os
import signal
import subprocess
import time
import unittest

import hearth_testlib as H

BOX_GEO = """\
SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 1, 1, 1};
Physical Volume("box") = {1};
Physical Surface("hot") = {1};
Physical Surface("cold") = {2};
"""

CASE = """\
units: {length: m, temperature: degC}
geometry: {file: box.geo}
mesh: {size: 0.012}
materials:
  m: {conductivity: 1.0}
regions: {box: m}
boundaries:
  hot: {temperature: 100}
  cold: {temperature: 0}
"""


class Interrupts(unittest.TestCase):
    def interrupt(self, sig, status):
        case = H.CaseDir(CASE, {"box.geo": BOX_GEO})
        self.addCleanup(case.cleanup)
        out = os.path.join(case.root, "out")
        proc = subprocess.Popen([H.HEARTH, "run", case.case, "--out", out, "--quiet"],
                                stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
        time.sleep(0.8)  # meshing a million tetrahedra takes several seconds
        proc.send_signal(sig)
        _out, err = proc.communicate(timeout=120)
        self.assertEqual(proc.returncode, status, err)
        self.assertFalse(os.path.exists(out), "nothing may be written")
        self.assertEqual([e for e in os.listdir(case.root) if "partial" in e], [])
        # An orphaned worker (its hearth gone, so its parent is init) must not remain; the
        # workers of other hearth runs on the same machine still have their parents.
        workers = subprocess.run(["pgrep", "-f", "__mesh-worker"], capture_output=True, text=True)
        orphans = []
        for pid in workers.stdout.split():
            try:
                with open("/proc/%s/stat" % pid) as f:
                    parent = int(f.read().rsplit(")", 1)[1].split()[1])
            except (OSError, ValueError, IndexError):
                continue  # gone meanwhile
            if parent in (1, proc.pid):
                orphans.append(pid)
        self.assertEqual(orphans, [], "the meshing worker must be gone")

    def test_sigterm_exits_143(self):
        self.interrupt(signal.SIGTERM, 143)

    def test_sigint_exits_130(self):
        self.interrupt(signal.SIGINT, 130)


if __name__ == "__main__":
    H.main()
