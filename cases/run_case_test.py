#!/usr/bin/env python3
"""Runs one example case as a test: hearth must exit 0, and its summary must show a
converged solve (a transient run: reaching its end time) and an energy balance closed
to the solver tolerance (over the whole run for a transient one) (the heat-rate
method makes the balance exact up to the linear solve; common practice, no source),
and a case with output.report: true must leave report.html."""
import json
import subprocess
import sys
from pathlib import Path

hearth, case, out = sys.argv[1], Path(sys.argv[2]), Path(sys.argv[3])
run = subprocess.run([hearth, "run", str(case), "--out", str(out), "--quiet"], capture_output=True, text=True)
failures = []
if run.returncode != 0:
    failures.append(f"exit status {run.returncode}: {run.stderr.strip()}")
else:
    summary = json.loads((out / "summary.json").read_text())
    if not summary["solve"]["converged"]:
        failures.append("solve not converged")
    if abs(summary["energy_balance"]["relative_imbalance"]) > 1e-8:
        failures.append(f"energy imbalance {summary['energy_balance']['relative_imbalance']}")
    transient = summary.get("analysis", {}).get("type") == "transient"
    field = "temperature.pvd" if transient else "temperature.vtu"
    if not (out / field).is_file():
        failures.append(f"no {field}")
    if transient:
        if not summary["analysis"]["completed"]:
            failures.append("the transient run did not reach its end time")
        for name, t in summary.get("thresholds", {}).items():
            print(f"threshold {name}: first crossed at {t['first_crossed_time']} s")
    if "report: true" in case.read_text() and not (out / "report.html").is_file():
        failures.append("output.report is true but there is no report.html")
    for name, region in summary["regions"].items():
        print(f"{name}: {region['temperature']['min']:.2f} .. {region['temperature']['max']:.2f} {summary['temperature_unit']}")
    for name, boundary in summary["boundaries"].items():
        print(f"{name}: {boundary['heat_rate']:.4g} W")
for f in failures:
    print("FAIL:", f)
print(f"{0 if failures else 1} passed, {1 if failures else 0} failed")
sys.exit(1 if failures else 0)
