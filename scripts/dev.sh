#!/usr/bin/env bash
# Development: PostgreSQL and the stand-ins as in `npm start`, the API under tsx watch, Vite's dev server on 5173.
set -euo pipefail
cd "$(dirname "$0")/.."
source scripts/pg.sh
source scripts/supervise.sh
export PG_PORT="${CHRONOMETA_PG_PORT:-54329}" APP_PORT="${PORT:-3000}" FAKE_BASE_PORT="${CHRONOMETA_FAKE_BASE_PORT:-4101}" DB_NAME=chronometa
pids=()
LOG_DIR=".data/logs"
mkdir -p "$LOG_DIR"
cleanup() { stop_supervised; for p in "${pids[@]}"; do kill "$p" 2>/dev/null; done; wait 2>/dev/null; pg_down; }
trap cleanup EXIT
trap 'exit 130' INT TERM
pg_up dev "$PG_PORT"
pg_create_db "$DB_NAME"
source scripts/local-env.sh
export NODE_ENV=development
# Each stand-in in its own process, restarted if it crashes (as under npm start).
for fake in oauth search doi mail; do
  supervise "$fake stand-in" "$LOG_DIR/fake-$fake.log" node_modules/.bin/tsx server/fakes/run.ts "$fake"
done
npm run --silent db:migrate
npm run --silent db:seed
node_modules/.bin/tsx watch server/index.ts & pids+=($!)
node_modules/.bin/vite --host 127.0.0.1 & pids+=($!)
echo "API on $APP_ORIGIN, client with hot reload on http://127.0.0.1:5173"
wait
