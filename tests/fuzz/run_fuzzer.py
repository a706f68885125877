"""Runs one libFuzzer target for a bounded time (the ctest entries fuzz.NAME, CI).

    /usr/bin/python3 run_fuzzer.py --fuzzer build-fuzz/tests/fuzz/fuzz_case_file \\
        --name case_file --seconds 60 --work build-fuzz/tests/fuzz/case_file [--dict FILE]

1. Replays the inputs kept in tests/fuzz/regressions/NAME/ (each once).
2. Writes the seeds (seeds.py) to WORK/seeds and fuzzes on one worker for --seconds,
   growing the corpus in WORK/corpus (kept between runs, so later runs start where
   earlier ones stopped). An input that crashes, leaks, trips a sanitiser or runs
   longer than --input-timeout is written to WORK/artifacts/.
3. Prints how many inputs ran, how fast, and what was found; exits 1 if anything was.
   libFuzzer's whole output is kept in WORK/last_run.log.

An input found here becomes a regression: copy it to tests/fuzz/regressions/NAME/,
fix the code, and the replay in the normal test suite keeps it fixed.
"""

import argparse
import glob
import os
import re
import subprocess
import sys
import time

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import seeds  # noqa: E402

HERE = os.path.dirname(os.path.abspath(__file__))


def parse_args():
    p = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    p.add_argument("--fuzzer", required=True, help="the fuzz_NAME executable")
    p.add_argument("--name", required=True, choices=sorted(seeds.SEEDS), help="target name")
    p.add_argument("--seconds", type=int, default=60, help="fuzzing time (default 60)")
    p.add_argument("--work", required=True, help="folder for the corpus, seeds and artifacts")
    p.add_argument("--dict", help="libFuzzer dictionary")
    p.add_argument("--input-timeout", type=int, default=10,
                   help="seconds one input may take before it counts as a hang (default 10)")
    return p.parse_args()


def replay_regressions(args):
    kept = sorted(glob.glob(os.path.join(HERE, "regressions", args.name, "*")))
    kept = [k for k in kept if os.path.basename(k) != "README.md"]
    if not kept:
        return 0
    r = subprocess.run([args.fuzzer, "-timeout=%d" % args.input_timeout] + kept,
                       stdout=subprocess.PIPE, stderr=subprocess.STDOUT, text=True, errors="replace")
    if r.returncode != 0:
        sys.stdout.write(r.stdout[-8000:])
        print("fuzz.%s: a kept regression input fails again (exit %d)" % (args.name, r.returncode))
        sys.exit(1)
    print("fuzz.%s: %d regression inputs replayed, all pass" % (args.name, len(kept)))
    return len(kept)


def main():
    args = parse_args()
    replay_regressions(args)

    corpus = os.path.join(args.work, "corpus")
    seed_dir = os.path.join(args.work, "seeds")
    artifacts = os.path.join(args.work, "artifacts")
    for d in (corpus, artifacts):
        os.makedirs(d, exist_ok=True)
    n_seeds = seeds.write_seeds(args.name, seed_dir)
    before = set(os.listdir(artifacts))

    command = [args.fuzzer, corpus, seed_dir,
               "-max_total_time=%d" % args.seconds,
               "-timeout=%d" % args.input_timeout,
               "-rss_limit_mb=2048",
               "-print_final_stats=1",
               "-artifact_prefix=%s/" % artifacts]
    if args.dict:
        command.append("-dict=%s" % args.dict)
    print("fuzz.%s: %d seeds, fuzzing for %d s on one worker:\n  %s" % (
        args.name, n_seeds, args.seconds, " ".join(command)), flush=True)
    log_path = os.path.join(args.work, "last_run.log")
    start = time.monotonic()
    output = []
    with open(log_path, "w") as log:
        # The whole output goes to the log; the periodic status lines also to the terminal.
        proc = subprocess.Popen(command, stdout=subprocess.PIPE, stderr=subprocess.STDOUT, text=True,
                                errors="replace")
        for line in proc.stdout:
            log.write(line)
            output.append(line)
            if re.match(r"#\d+\s+(pulse|DONE|INITED)", line):
                sys.stdout.write("  " + line)
                sys.stdout.flush()
        returncode = proc.wait()
    seconds = time.monotonic() - start
    text = "".join(output)

    execs = re.findall(r"stat::number_of_executed_units:\s*(\d+)", text)
    coverage = re.findall(r"#\d+\s+(?:DONE|pulse|NEW|REDUCE)\s+cov: (\d+) ft: (\d+) corp: (\d+)", text)
    found = sorted(set(os.listdir(artifacts)) - before)
    print("fuzz.%s: %s inputs in %.0f s (%s a second); coverage %s edges, %s features; corpus %s inputs" % (
        args.name,
        execs[-1] if execs else "?",
        seconds,
        "%.0f" % (int(execs[-1]) / seconds) if execs and seconds > 0 else "?",
        coverage[-1][0] if coverage else "?",
        coverage[-1][1] if coverage else "?",
        len(os.listdir(corpus))))
    if returncode != 0 or found:
        sys.stdout.write(text[-12000:])
        # The reason and the input itself are printed last, where a cut log still
        # shows them: the artifact folder is gone with the CI machine.
        for line in re.findall(r"^\s*what\(\):.*$|^==\d+==\s*ERROR:.*$|^SUMMARY:.*$", text, re.M)[-6:]:
            print("fuzz.%s: %s" % (args.name, line.strip()))
        for name in found:
            path = os.path.join(artifacts, name)
            with open(path, "rb") as f:
                data = f.read()
            print("fuzz.%s: found %s (%d bytes), as a Python bytes literal:\n%r" % (
                args.name, path, len(data), data[:4000]))
        print("fuzz.%s: the fuzzer stopped with exit %d; copy the input to tests/fuzz/regressions/%s/, "
              "reproduce it with '%s INPUT', fix it and keep it as a regression (full output: %s)" % (
                  args.name, returncode, args.name, args.fuzzer, log_path))
        sys.exit(1)
    print("fuzz.%s: nothing found" % args.name)


if __name__ == "__main__":
    main()
