#!/usr/bin/env bash
# `npm run dev`: Vite with hot reload on http://localhost:5173 plus the API in watch mode.
set -euo pipefail
cd "$(dirname "$0")/.."
mkdir -p .data
pids=()
cleanup() {
  trap - INT TERM EXIT
  for pid in "${pids[@]}"; do kill -TERM "$pid" 2>/dev/null || true; done
  wait 2>/dev/null || true
}
trap cleanup INT TERM EXIT
docker-free-dev/postgres.sh start >/dev/null
export APP_ORIGIN="${APP_ORIGIN:-http://localhost:5173}"
node_modules/.bin/tsx docker-free-dev/standins.ts & pids+=($!)
node_modules/.bin/tsx watch --clear-screen=false server/start.ts & pids+=($!)
node_modules/.bin/vite & pids+=($!)
wait -n "${pids[@]}"
