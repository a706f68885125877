#!/bin/bash
# Heat loss and hottest shell temperature of the furnace-wall demo for four film
# coefficients on the shell. Run in cases/furnace_wall; each run's results stay in
# sweep/h_<value>/. Prints CSV on stdout; warnings go to stderr.
set -euo pipefail
echo "film_coefficient_W_m2K,heat_loss_W,shell_max_degC"
for h in 4 6 10 15; do
  hearth run case.yaml --quiet --summary-only --out "sweep/h_$h" \
      --set boundaries.cold_face.convection.coefficient="$h" |
    python3 -c '
import json, sys
s = json.load(sys.stdin)
loss = -s["boundaries"]["cold_face"]["heat_rate"]
shell = s["regions"]["shell"]["temperature"]["max"]
print("%s,%.1f,%.1f" % (sys.argv[1], loss, shell))' "$h"
done
