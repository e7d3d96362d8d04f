#!/usr/bin/env bash
# `npm start`: PostgreSQL, migrations, demo network (once), the local stand-ins, the client build,
# and the app with its worker on http://localhost:3000. Ctrl-C stops everything this script started.
set -euo pipefail
cd "$(dirname "$0")/.."
mkdir -p .data

pids=()
pg_started=no
cleanup() {
  trap - INT TERM EXIT
  for pid in "${pids[@]}"; do kill -TERM "$pid" 2>/dev/null || true; done
  for pid in "${pids[@]}"; do wait "$pid" 2>/dev/null || true; done
  if [ "$pg_started" = yes ]; then docker-free-dev/postgres.sh stop >/dev/null || true; fi
  echo "Benchrelay stopped."
}
trap cleanup INT TERM EXIT

echo "• PostgreSQL on 127.0.0.1:${PGPORT:-5544}"
state="$(docker-free-dev/postgres.sh start)"
[ "$state" = started ] && pg_started=yes

if [ -z "${OIDC_ISSUER:-}${S3_ENDPOINT:-}${SMTP_HOST:-}" ]; then
  echo "• Local stand-ins: identity provider, S3-compatible storage, mail catcher"
  node_modules/.bin/tsx docker-free-dev/standins.ts &
  pids+=($!)
fi

echo "• Building the client"
node_modules/.bin/vite build --logLevel warn

echo "• Starting Benchrelay (migrations, demo network, app and worker)"
node_modules/.bin/tsx server/start.ts &
pids+=($!)
wait -n "${pids[@]}"
