#!/usr/bin/env bash
# Installs the locked dependencies when node_modules is missing or older than the lockfile.
set -euo pipefail
cd "$(dirname "$0")/.."
marker=node_modules/.package-lock.json
if [ ! -f "$marker" ] || [ package-lock.json -nt "$marker" ] || [ ! -d node_modules/better-sqlite3/build ]; then
  echo "Installing dependencies (npm ci; better-sqlite3 compiles from source, about two minutes)…"
  JOBS=max npm ci --no-audit --no-fund
fi
