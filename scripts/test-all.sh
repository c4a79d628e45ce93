#!/usr/bin/env bash
# The whole Blendbench test suite: type check, unit tests, then end-to-end tests in Debian's chromium.
# Installs Debian packages it needs (chromium, poppler-utils) when missing and run as root;
# otherwise stops and prints the exact command to run.
set -euo pipefail
cd "$(dirname "$0")/.."

need=()
command -v "${CHROMIUM_PATH:-chromium}" >/dev/null 2>&1 || [ -x "${CHROMIUM_PATH:-/usr/bin/chromium}" ] || need+=(chromium)
command -v pdftotext >/dev/null 2>&1 || need+=(poppler-utils)
if [ ${#need[@]} -gt 0 ]; then
  if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null 2>&1; then
    echo "test-all: installing Debian packages: ${need[*]}"
    apt-get update -qq
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "${need[@]}" >/dev/null
  else
    echo "test-all: missing Debian packages: ${need[*]}" >&2
    echo "test-all: run:  sudo apt-get update && sudo apt-get install -y ${need[*]}" >&2
    exit 1
  fi
fi

echo "== type check"
npx tsc --noEmit
echo "== unit tests"
npx vitest run
echo "== end-to-end tests (builds the app, serves it on 127.0.0.1, drives chromium)"
npx vitest run --config vitest.e2e.config.ts
