#!/usr/bin/env bash
# `npm start`: everything on a fresh machine, then Phaseloop on http://127.0.0.1:4100.
#   npm packages (npm ci) → PostgreSQL (Debian package; project cluster on 127.0.0.1:55432, durable
#   settings) → migrations → demo team → web build → fake mail server, worker(s), API.
# Safe to re-run. Ctrl-C stops everything this run started (a database it found running stays up).
# Settings: PORT (4100), PHASELOOP_PG_PORT (55432), SMTP_PORT (2525), PHASELOOP_WORKERS (1),
# PHASELOOP_SKIP_WEB_BUILD=1 to serve the last build.
set -euo pipefail
SCRIPT_NAME=start
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$ROOT"
source scripts/lib.sh
TSX="$ROOT/node_modules/.bin/tsx"

PORT="${PORT:-4100}"
SMTP_PORT="${SMTP_PORT:-2525}"
WORKERS="${PHASELOOP_WORKERS:-1}"

for p in "$PORT" "$SMTP_PORT"; do
  if ! port_free "$p"; then
    log "port $p on 127.0.0.1 is already in use (is Phaseloop already running?). Stop that process or choose another port: PORT=4200 SMTP_PORT=2626 npm start"
    exit 1
  fi
done

ensure_node_modules

DB_WAS_RUNNING=0
bash scripts/db.sh status >/dev/null 2>&1 && DB_WAS_RUNNING=1
eval "$(bash scripts/db.sh start)"
export DATABASE_URL

cleanup() {
  trap - EXIT INT TERM
  log "stopping"
  stop_children
  if [[ "$DB_WAS_RUNNING" == 0 ]]; then bash scripts/db.sh stop || true; fi
}
trap cleanup EXIT
trap 'exit 130' INT TERM

log "database schema and demo team"
"$TSX" apps/api/src/cli/setup-db.ts --seed

if [[ "${PHASELOOP_SKIP_WEB_BUILD:-0}" != 1 && -f apps/web/index.html ]]; then
  log "building the web app"
  npm run -s build -w apps/web
fi

export PORT HOST=127.0.0.1 SMTP_HOST=127.0.0.1 SMTP_PORT
export APP_URL="${APP_URL:-http://127.0.0.1:$PORT}"
export WEB_DIST="${WEB_DIST:-$ROOT/apps/web/dist}"
export NODE_ENV="${NODE_ENV:-development}"

start_child "$TSX" apps/api/src/cli/fake-smtp.ts
for ((w = 0; w < WORKERS; w++)); do start_child "$TSX" apps/worker/src/index.ts; done
start_child "$TSX" apps/api/src/server.ts

if ! wait_for_http "http://127.0.0.1:$PORT/api/health" 120; then
  log "the API did not come up; see the messages above"
  exit 1
fi

cat <<MSG

  Phaseloop is running:  $APP_URL

  Demo sign-ins (password: phaseloop-demo; all data are invented demo values):
    admin@demo.phaseloop.test     site admin, project admin
    analyst@demo.phaseloop.test   analyst
    reviewer@demo.phaseloop.test  reviewer
    viewer@demo.phaseloop.test    viewer

  Mails (invitations, password resets) are caught locally: Admin → Mail.
  Ctrl-C stops Phaseloop.

MSG

# Stay up until Ctrl-C or until any child exits (then stop the rest).
wait -n "${CHILD_PIDS[@]}" || true
log "a Phaseloop process exited; stopping the others"
