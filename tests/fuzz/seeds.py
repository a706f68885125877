"""Seed inputs for the fuzz targets, collected from the source tree each time the
fuzzer runs, so that they follow the example cases and the tests as these change.

case_file: every cases/*/case.yaml, the hand-written seeds in seeds/case_file/ (a case
that uses every key), and every case text the command-line tests in
tests/cli write (their bad-input cases included). Those texts are collected by running
the tests' methods with the hearth program replaced by a recorder: each call that would
run hearth records the case file it names, its --set overrides written as leading
"#--set KEY=VALUE" lines (fuzz_case_file.cpp reads them back as overrides), and nothing
is run. The tests' assertions then fail, which is expected and ignored.

geometry_guard: every Gmsh script (.geo) of cases/, and every script the command-line
tests write (the geometry-guard tests' unsafe scripts among them), collected the same way.
"""

import glob
import importlib
import os
import shutil
import subprocess
import sys
import tempfile
import time
import unittest

SOURCE = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))


class _Recorder:
    """Stands in for hearth_testlib.run_hearth and records the case each call names."""

    def __init__(self):
        self.texts = []

    def __call__(self, *args, **_kwargs):
        args = [str(a) for a in args]
        overrides = [args[i + 1] for i in range(len(args) - 1) if args[i] == "--set"]
        for arg in args:
            if arg.endswith((".yaml", ".yml")) and os.path.isfile(arg):
                with open(arg, encoding="utf-8", errors="replace") as fh:
                    text = fh.read()
                self.texts.append("".join("#--set %s\n" % o for o in overrides) + text)
        return _NoRun(args)


class _NoRun:
    """What run_hearth returns: a run that printed nothing and exited 0."""

    def __init__(self, args):
        self.returncode = 0
        self.stdout = ""
        self.stderr = ""
        self.args = args

    def describe(self):
        return "not run (seed collection)"


def _refuse(*_args, **_kwargs):
    raise RuntimeError("seed collection runs no programs")


class _Failed:
    """What subprocess.run returns during seed collection: a program that failed."""
    returncode = 1
    stdout = stderr = ""


def _fail(*_args, **_kwargs):
    return _Failed()


def cli_case_texts(cli_dir=None):
    """Every case text the command-line tests write or run hearth on."""
    run, written = _cli_texts(cli_dir)
    return run + written[".yaml"]


def cli_script_texts(cli_dir=None):
    """Every Gmsh script the command-line tests write."""
    return _cli_texts(cli_dir)[1][".geo"]


_collected = {}


def _cli_texts(cli_dir=None):
    """(case texts hearth was run on, {extension: texts written}), collected once."""
    cli_dir = cli_dir or os.path.join(SOURCE, "tests", "cli")
    if cli_dir not in _collected:
        _collected[cli_dir] = _collect_cli_texts(cli_dir)
    return _collected[cli_dir]


def _collect_cli_texts(cli_dir):
    sys.path.insert(0, cli_dir)
    saved = (subprocess.run, subprocess.Popen, time.sleep, tempfile.tempdir)
    # The tests' case folders go into a scratch folder of our own, removed at the end
    # (a test whose set-up fails leaves its folder behind).
    scratch = tempfile.mkdtemp(prefix="hearth-seeds-")
    tempfile.tempdir = scratch
    try:
        import hearth_testlib as H
        recorder = _Recorder()
        written = {".yaml": [], ".geo": []}
        write_text = H.write_text

        def recording_write_text(path, text):
            extension = os.path.splitext(str(path))[1].lower()
            extension = ".yaml" if extension == ".yml" else extension
            if extension in written:
                written[extension].append(text)
            write_text(path, text)

        H.run_hearth = recorder
        H.write_text = recording_write_text
        H.HEARTH = "/nonexistent/hearth"
        subprocess.run = _fail  # also when a module probes a program as it is imported
        subprocess.Popen = _refuse
        time.sleep = lambda _seconds: None
        for path in sorted(glob.glob(os.path.join(cli_dir, "test_*.py"))):
            try:
                module = importlib.import_module(os.path.splitext(os.path.basename(path))[0])
            except Exception as e:  # a module that runs a program while it is imported
                sys.stderr.write("seeds: %s skipped (%s)\n" % (os.path.basename(path), e))
                continue
            suite = unittest.TestLoader().loadTestsFromModule(module)
            with open(os.devnull, "w") as quiet:
                unittest.TextTestRunner(stream=quiet, verbosity=0).run(suite)
        return recorder.texts, written
    finally:
        subprocess.run, subprocess.Popen, time.sleep, tempfile.tempdir = saved
        sys.path.remove(cli_dir)
        shutil.rmtree(scratch, ignore_errors=True)


def case_file_seeds():
    texts = []
    for pattern in (os.path.join(SOURCE, "cases", "*", "case.yaml"),
                    os.path.join(SOURCE, "tests", "fuzz", "seeds", "case_file", "*.yaml")):
        for path in sorted(glob.glob(pattern)):
            with open(path, encoding="utf-8") as fh:
                texts.append(fh.read())
    texts += cli_case_texts()
    return texts


def geometry_guard_seeds():
    texts = []
    for path in sorted(glob.glob(os.path.join(SOURCE, "cases", "*", "*.geo"))):
        with open(path, encoding="utf-8", errors="replace") as fh:
            texts.append(fh.read())
    return texts + cli_script_texts()


# Target name -> function returning its seed texts.
SEEDS = {
    "case_file": case_file_seeds,
    "geometry_guard": geometry_guard_seeds,
}


def write_seeds(name, directory):
    """Writes target `name`'s distinct seeds into `directory` (emptied first); returns their count."""
    os.makedirs(directory, exist_ok=True)
    for old in os.listdir(directory):
        os.remove(os.path.join(directory, old))
    distinct = sorted(set(SEEDS[name]()))
    for i, text in enumerate(distinct):
        with open(os.path.join(directory, "seed_%04d" % i), "w", encoding="utf-8") as fh:
            fh.write(text)
    return len(distinct)


if __name__ == "__main__":
    if len(sys.argv) != 3 or sys.argv[1] not in SEEDS:
        sys.stderr.write("usage: %s {%s} DIRECTORY\n" % (sys.argv[0], "|".join(SEEDS)))
        sys.exit(2)
    print("%d seeds written to %s" % (write_seeds(sys.argv[1], sys.argv[2]), sys.argv[2]))
