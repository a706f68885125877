#!/usr/bin/env bash
# The sanitised checks that CI (.ci/run) runs after the normal build and tests:
#   1. build-sanitize/: gcc with AddressSanitizer + UndefinedBehaviorSanitizer
#      (HEARTH_SANITIZE=ON); runs the unit and fast verification tests
#      (ctest -L "unit|verification" -LE slow), the fuzzers' kept regressions among them.
#   2. build-fuzz/: clang with libFuzzer (HEARTH_FUZZ=ON); runs each fuzz target for
#      HEARTH_FUZZ_SECONDS (default 60) on one worker (ctest -L fuzz).
# Needs the packages of tools/setup-deps.sh. HEARTH_JOBS sets the build's parallelism
# (default: the number of cores). Set CMAKE_CXX_COMPILER_LAUNCHER=ccache (and
# CMAKE_C_COMPILER_LAUNCHER) in the environment to reuse compiled objects.
set -euo pipefail

here="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
jobs="${HEARTH_JOBS:-$(nproc)}"
sanitize_build="${HEARTH_SANITIZE_BUILD_DIR:-$here/build-sanitize}"
fuzz_build="${HEARTH_FUZZ_BUILD_DIR:-$here/build-fuzz}"
fuzz_seconds="${HEARTH_FUZZ_SECONDS:-60}"

step() { echo "hearth sanitised checks: $* ($(date +%T))" >&2; }
start=$SECONDS

step "building the tests with AddressSanitizer and UndefinedBehaviorSanitizer in $sanitize_build"
cmake -S "$here" -B "$sanitize_build" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DHEARTH_SANITIZE=ON >/dev/null
cmake --build "$sanitize_build" -j "$jobs" --target test_io test_mesh test_solver
built=$SECONDS
step "running the unit and fast verification tests under the sanitisers"
(cd "$sanitize_build" && ctest --output-on-failure --timeout 1800 -L "unit|verification" -LE slow)
tested=$SECONDS

step "building the fuzz targets with clang and libFuzzer in $fuzz_build"
cmake -S "$here" -B "$fuzz_build" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DHEARTH_FUZZ=ON \
      -DCMAKE_C_COMPILER=clang -DCMAKE_CXX_COMPILER=clang++ -DHEARTH_FUZZ_SECONDS="$fuzz_seconds" >/dev/null
cmake --build "$fuzz_build" -j "$jobs" --target hearth_fuzz_targets
fuzz_built=$SECONDS
step "fuzzing each target for $fuzz_seconds s on one worker"
(cd "$fuzz_build" && ctest --output-on-failure -V -L fuzz)
fuzzed=$SECONDS

echo "hearth sanitised checks: passed; sanitised build $((built - start)) s, its tests $((tested - built)) s," \
     "fuzz build $((fuzz_built - tested)) s, fuzzing $((fuzzed - fuzz_built)) s" >&2
