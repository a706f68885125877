#!/usr/bin/env python3
"""Furnace-wall demo: heat loss and temperatures for two shell emissivities (0.85 as
in the case, 0.3 for a bright metal cladding) and two states of the backup board (as
new, and conducting 30 % more). Standard library only; run in cases/furnace_wall.
Each run's results stay in sweep/<name>/; prints CSV on stdout."""
import csv
import json
import subprocess
import sys

# The backup board's conductivity table of case.yaml: [degC, W/(m K)].
BOARD = [[20, 0.06], [400, 0.09], [800, 0.14], [1000, 0.18]]


def run(name, settings):
    """hearth run with --set KEY=VALUE for each setting; returns summary.json."""
    command = ["hearth", "run", "case.yaml", "--quiet", "--summary-only", "--out", "sweep/" + name]
    for key, value in settings.items():
        command += ["--set", "%s=%s" % (key, value)]
    done = subprocess.run(command, capture_output=True, text=True)
    if done.returncode != 0:
        sys.exit("hearth run %s failed (exit %d):\n%s" % (name, done.returncode, done.stderr))
    return json.loads(done.stdout)


out = csv.writer(sys.stdout, lineterminator="\n")
out.writerow(["emissivity", "board_factor", "heat_loss_W", "shell_max_degC", "board_max_degC"])
for emissivity in (0.85, 0.3):
    for factor in (1.0, 1.3):
        table = [[t, round(k * factor, 4)] for t, k in BOARD]
        s = run("e%g_k%g" % (emissivity, factor), {
            "boundaries.cold_face.radiation.emissivity": emissivity,
            "materials.backup_board.conductivity": "{vs_temperature: %s}" % json.dumps(table),
        })
        out.writerow([emissivity, factor,
                      "%.1f" % -s["boundaries"]["cold_face"]["heat_rate"],
                      "%.1f" % s["regions"]["shell"]["temperature"]["max"],
                      "%.1f" % s["regions"]["backup"]["temperature"]["max"]])
