#!/usr/bin/env bash
# The whole test suite: a fresh PostgreSQL cluster on a free loopback port (removed afterwards), the vitest
# projects `unit` (statistics and reference checks) and `api` (routes against PostgreSQL and the stand-ins), then
# the browser tests against the built client and seeded demo data.
# `npm test -- <vitest args>` runs only the matching vitest files; when they are all unit or reference files
# (or `--project unit`), no PostgreSQL is started. `E2E_ONLY=<part of a spec file name> npm test` runs only the
# matching browser specs (no vitest).
set -uo pipefail
cd "$(dirname "$0")/.."
source scripts/pg.sh

if [ ! -x node_modules/.bin/vitest ]; then
  PLAYWRIGHT_SKIP_BROWSER_DOWNLOAD=1 npm ci --no-audit --no-fund --loglevel=error || exit 1
fi

unit_only=0
if [ $# -gt 0 ]; then
  unit_only=1
  for a in "$@"; do
    case "$a" in tests/unit/*|tests/reference/*|--project|--project=unit|unit) ;; *) unit_only=0 ;; esac
  done
fi
if [ $unit_only -eq 1 ]; then
  exec node_modules/.bin/vitest run --project unit "$@"
fi
pg_install_if_missing

read -r PG_PORT APP_PORT FAKE_OAUTH_PORT FAKE_MEILI_PORT FAKE_DOI_PORT FAKE_SMTP_PORT FAKE_MAILBOX_PORT < <(node scripts/free-ports.mjs 7 | tr '\n' ' ')
export PG_PORT APP_PORT FAKE_OAUTH_PORT FAKE_MEILI_PORT FAKE_DOI_PORT FAKE_SMTP_PORT FAKE_MAILBOX_PORT FAKE_BASE_PORT=0
RUN_ID="test-$$"
RESULTS_DIR=".data/test-results/$RUN_ID"
mkdir -p "$RESULTS_DIR"

PIDS=()
cleanup() {
  for p in "${PIDS[@]}"; do kill "$p" 2>/dev/null; done
  for f in "$RESULTS_DIR"/stand-ins/*.pid; do [ -f "$f" ] && kill "$(cat "$f")" 2>/dev/null; done
  wait 2>/dev/null
  pg_down
  [ -n "${PG_CLUSTER_DIR:-}" ] && rm -rf "$PG_CLUSTER_DIR"
  rm -rf "$RESULTS_DIR/client" "$RESULTS_DIR/stand-ins"
}
trap cleanup EXIT
trap 'exit 130' INT TERM

pg_up "$RUN_ID" "$PG_PORT" scratch || exit 1
pg_create_db chronometa_test
export DB_NAME=chronometa_test
source scripts/local-env.sh
export NODE_ENV=test UPLOAD_DIR="$RESULTS_DIR/uploads" AUTH_RATE_LIMIT_PER_MINUTE=100000 CALLER_BUDGET_PER_MINUTE=100000000

v_pass=0; v_fail=0; vitest_rc=0
if [ -z "${E2E_ONLY:-}" ]; then
node_modules/.bin/vitest run --reporter=default --reporter=json --outputFile="$RESULTS_DIR/vitest.json" "$@"
vitest_rc=$?
read -r v_pass v_fail < <(node -e '
  try { const r = require(process.argv[1]); console.log(r.numPassedTests, r.numFailedTests + (r.numTotalTestSuites && r.success === false && r.numFailedTests === 0 ? 1 : 0)); }
  catch { console.log(0, 1); }' "$PWD/$RESULTS_DIR/vitest.json")
fi

e2e_pass=0; e2e_fail=0; e2e_rc=0
if [ $# -eq 0 ]; then
  echo
  echo "== Browser tests"
  pg_create_db chronometa_e2e
  export DB_NAME=chronometa_e2e
  source scripts/local-env.sh
  export CLIENT_DIR="$RESULTS_DIR/client"
  npm run --silent db:migrate && npm run --silent db:seed || e2e_rc=1
  node_modules/.bin/vite build --logLevel error --outDir "$CLIENT_DIR" || e2e_rc=1
  # Each stand-in in its own process, as under npm start: one failing does not take the others down.
  # A spec may stop one and start it again (tests/e2e/stand-ins.ts): each one writes its own pid to STAND_IN_DIR
  # once listening (the launcher's pid until then).
  export STAND_IN_DIR="$RESULTS_DIR/stand-ins"
  mkdir -p "$STAND_IN_DIR"
  for fake in oauth search doi mail; do
    node_modules/.bin/tsx server/fakes/run.ts "$fake" >> "$RESULTS_DIR/fakes.log" 2>&1 & PIDS+=($!)
    echo $! > "$STAND_IN_DIR/$fake.pid"
  done
  node_modules/.bin/tsx server/index.ts > "$RESULTS_DIR/server.log" 2>&1 & PIDS+=($!)
  for _ in $(seq 1 120); do curl -fsS -o /dev/null "$APP_ORIGIN/api/health" 2>/dev/null && break; sleep 0.5; done
  if [ $e2e_rc -eq 0 ]; then
    node_modules/.bin/tsx tests/e2e/run.ts --results "$RESULTS_DIR/e2e.json"
    e2e_rc=$?
    read -r e2e_pass e2e_fail < <(node -e 'try { const r = require(process.argv[1]); console.log(r.passed, r.failed); } catch { console.log(0, 1); }' "$PWD/$RESULTS_DIR/e2e.json")
  else
    e2e_fail=1
  fi
  [ $e2e_rc -ne 0 ] && { echo "--- server log (last 40 lines)"; tail -n 40 "$RESULTS_DIR/server.log"; }
fi

echo
echo "Summary: $((v_pass + e2e_pass)) passed, $((v_fail + e2e_fail)) failed"
[ $vitest_rc -eq 0 ] && [ $e2e_rc -eq 0 ]
