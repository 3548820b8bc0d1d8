#!/usr/bin/env bash
# One step for a newcomer: install the Debian packages, build arcsieve, and run the whole job on
# the built-in default problem (ratio-sum, N = 14).
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/setup-debian.sh
cmake -S . -B build -DCMAKE_BUILD_TYPE=Release
cmake --build build -j "$(nproc)" --target arcsieve
./build/arcsieve solve
