#!/usr/bin/env bash
# One command: PostgreSQL on loopback, the local stand-ins, migrations, demo data, the built client, the server.
set -euo pipefail
cd "$(dirname "$0")/.."
source scripts/pg.sh
source scripts/supervise.sh

if [ ! -x node_modules/.bin/tsx ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  echo "Installing npm packages..."
  PLAYWRIGHT_SKIP_BROWSER_DOWNLOAD=1 npm ci --no-audit --no-fund --loglevel=error
fi

export PG_PORT="${CHRONOMETA_PG_PORT:-54329}"
export APP_PORT="${PORT:-3000}"
export FAKE_BASE_PORT="${CHRONOMETA_FAKE_BASE_PORT:-4101}"
export DB_NAME=chronometa
external_db="${DATABASE_URL:-}"

LOG_DIR=".data/logs"
mkdir -p "$LOG_DIR"
TAIL_PID=""
cleanup() {
  [ -n "$TAIL_PID" ] && kill "$TAIL_PID" 2>/dev/null
  stop_supervised
  [ -z "$external_db" ] && pg_down
  true
}
trap cleanup EXIT
trap 'exit 130' INT TERM

if [ -z "$external_db" ]; then
  echo "Starting PostgreSQL on 127.0.0.1:$PG_PORT..."
  pg_up dev "$PG_PORT"
  pg_create_db "$DB_NAME"
fi
source scripts/local-env.sh
[ -n "$external_db" ] && export DATABASE_URL="$external_db"
export NODE_ENV=production

# Each stand-in in its own process, restarted if it crashes.
for fake in oauth search doi mail; do
  supervise "$fake stand-in" "$LOG_DIR/fake-$fake.log" node_modules/.bin/tsx server/fakes/run.ts "$fake"
done
npm run --silent db:migrate
npm run --silent db:seed
echo "Building the client..."
node_modules/.bin/vite build --logLevel error
# The server is restarted if it crashes; PostgreSQL and the stand-ins keep running meanwhile.
supervise server "$LOG_DIR/server.log" node_modules/.bin/tsx server/index.ts
SERVER_SUPERVISOR=$!
tail -n 0 -F "$LOG_DIR/server.log" 2>/dev/null &
TAIL_PID=$!
for _ in $(seq 1 120); do
  curl -fsS -o /dev/null "$APP_ORIGIN/api/health" 2>/dev/null && break
  sleep 0.5
done
echo
echo "Chronometa is up: $APP_ORIGIN"
echo "Sign in as one of the demo people: admin, curator, coder1, coder2, reviewer, reader. Ctrl-C stops everything."
echo "Logs: $LOG_DIR/"
# Ends when the server could not be kept running (or on Ctrl-C); cleanup stops everything else.
wait "$SERVER_SUPERVISOR" || true
