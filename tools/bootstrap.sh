#!/usr/bin/env bash
# One command from a fresh Debian machine to results (or to a test run):
#   tools/bootstrap.sh          install packages, build, run the furnace-wall demo
#   tools/bootstrap.sh --test   install packages, build, run the whole test suite
# Idempotent: packages already present are skipped, the build is incremental.
set -euo pipefail

here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build="${HEARTH_BUILD_DIR:-$here/build}"
jobs="${HEARTH_JOBS:-$(nproc)}"

"$here/tools/setup-deps.sh"

cmake -S "$here" -B "$build" -DCMAKE_BUILD_TYPE=Release >/dev/null
cmake --build "$build" -j "$jobs"

if [ "${1:-}" = "--test" ]; then
  cd "$build"
  ctest --output-on-failure --timeout 1800
else
  demo="$here/cases/furnace_wall"
  "$build/tools/hearth" run "$demo/case.yaml"
  echo "hearth: demo results in $demo/results (report.html in a browser, temperature.vtu in a VTK viewer; heat rates in summary.json)"
fi
