#!/usr/bin/env bash
# Builds arcsieve and runs the whole test suite. `--sanitize` does the same in build-asan with
# AddressSanitizer and UndefinedBehaviorSanitizer. Installs missing Debian packages first.
set -euo pipefail
cd "$(dirname "$0")/.."
build_dir=build
extra=()
if [ "${1:-}" = "--sanitize" ]; then
  build_dir=build-asan
  extra=(-DARCSIEVE_SANITIZE=ON -DARCSIEVE_BENCH=OFF -DCMAKE_BUILD_TYPE=RelWithDebInfo)
  export ASAN_OPTIONS=detect_leaks=1:abort_on_error=1
  export UBSAN_OPTIONS=print_stacktrace=1:halt_on_error=1
  export ARCSIEVE_TEST_SCALE=sanitize
fi
bash scripts/setup-debian.sh
cmake -S . -B "$build_dir" -DCMAKE_BUILD_TYPE=Release "${extra[@]}"
cmake --build "$build_dir" -j "$(nproc)"
ctest --test-dir "$build_dir" --output-on-failure -j "$(nproc)"
