#!/usr/bin/env bash
# One-time setup on a fresh Debian machine: the system packages the browser and editor tests need, then
# the project's npm dependencies from the lock file. Safe to run again.
set -euo pipefail
cd "$(dirname "$0")/.."
PACKAGES=(chromium fonts-liberation libkrb5-dev pkg-config ripgrep)
if command -v apt-get >/dev/null 2>&1; then
  SUDO=""
  if [ "$(id -u)" -ne 0 ]; then SUDO="sudo"; fi
  missing=()
  for p in "${PACKAGES[@]}"; do dpkg -s "$p" >/dev/null 2>&1 || missing+=("$p"); done
  if [ "${#missing[@]}" -gt 0 ]; then
    echo "setup: installing Debian packages: ${missing[*]}"
    export DEBIAN_FRONTEND=noninteractive
    $SUDO apt-get update -q
    $SUDO apt-get install -y -q --no-install-recommends "${missing[@]}"
  fi
else
  echo "setup: not a Debian machine; install these yourself for the browser and editor tests: ${PACKAGES[*]}" >&2
fi
npm ci --no-audit --no-fund
