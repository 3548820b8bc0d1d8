#!/usr/bin/env bash
# Installs arcsieve's build and test dependencies on Debian 12 from Debian's own packages.
# Idempotent: packages already present are left alone; safe to run any number of times.
# Boost 1.81 (not the default 1.74): its multiprecision default precision is thread-local, so
# threads computing at different precisions do not race (1.74 keeps one process-wide static).
set -euo pipefail
packages=(
  build-essential cmake pkg-config clang-format
  libgmp-dev libmpfr-dev libmpfi-dev libboost1.81-dev
  libtbb-dev libgtest-dev libgmock-dev libbenchmark-dev
  libcli11-dev nlohmann-json3-dev libfmt-dev
  libflint-arb-dev libflint-dev
  libopenmpi-dev openmpi-bin
)
missing=()
for p in "${packages[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if [ ${#missing[@]} -eq 0 ]; then
  echo "setup: all ${#packages[@]} packages already installed"
  exit 0
fi
SUDO=""
[ "$(id -u)" -eq 0 ] || SUDO=sudo
echo "setup: installing ${missing[*]}"
$SUDO apt-get update -qq
DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq --no-install-recommends "${missing[@]}"
