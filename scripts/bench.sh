#!/usr/bin/env bash
# Runs every benchmark in tests/bench/ in turn. Benchmarks that need the database bring it up themselves.
set -uo pipefail
cd "$(dirname "$0")/.."
status=0
for f in tests/bench/*.bench.ts; do
  [ -e "$f" ] || continue
  echo "== $f"
  node_modules/.bin/tsx "$f" || status=1
done
exit $status
