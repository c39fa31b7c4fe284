#!/usr/bin/env bash
# Runs every benchmark in tests/bench/ in turn. A fresh PostgreSQL cluster (free port, removed afterwards) with
# a migrated `chronometa_bench` database and the loopback configuration are provided to each benchmark
# (DATABASE_URL, FAKE_*_PORT ...); a benchmark that needs the stand-ins starts them with startFakes().
# `npm run bench -- pool` runs only benchmarks whose file name contains "pool".
set -uo pipefail
cd "$(dirname "$0")/.."
source scripts/pg.sh
pg_install_if_missing
read -r PG_PORT APP_PORT FAKE_OAUTH_PORT FAKE_MEILI_PORT FAKE_DOI_PORT FAKE_SMTP_PORT FAKE_MAILBOX_PORT < <(node scripts/free-ports.mjs 7 | tr '\n' ' ')
export PG_PORT APP_PORT FAKE_OAUTH_PORT FAKE_MEILI_PORT FAKE_DOI_PORT FAKE_SMTP_PORT FAKE_MAILBOX_PORT FAKE_BASE_PORT=0
RUN_ID="bench-$$"
cleanup() { pg_down; [ -n "${PG_CLUSTER_DIR:-}" ] && rm -rf "$PG_CLUSTER_DIR"; }
trap cleanup EXIT
trap 'exit 130' INT TERM
pg_up "$RUN_ID" "$PG_PORT" scratch || exit 1
pg_create_db chronometa_bench
export DB_NAME=chronometa_bench
source scripts/local-env.sh
export NODE_ENV=test AUTH_RATE_LIMIT_PER_MINUTE=100000000 CALLER_BUDGET_PER_MINUTE=100000000 JOBS_ENABLED=false
npm run --silent db:migrate >/dev/null || exit 1

status=0
for f in tests/bench/*.bench.ts; do
  [ -e "$f" ] || continue
  if [ $# -gt 0 ] && [[ "$f" != *"$1"* ]]; then continue; fi
  echo "== $f"
  node_modules/.bin/tsx "$f" || status=1
done
exit $status
