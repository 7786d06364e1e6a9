#!/usr/bin/env bash
# `npm test`: provisions what the suites need on a throw-away PostgreSQL cluster of its own (so it
# runs beside `npm start`), then runs every suite — type checks, vitest (unit, API integration,
# worker, cross-app integration), the web build and Playwright end to end in Debian's chromium —
# and ends with one plain line `N passed, N failed`. Exits non-zero on any failure, and stops
# everything it started even when a suite fails.
set -uo pipefail
SCRIPT_NAME=test
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$ROOT"
source scripts/lib.sh

# Developer knobs (CI sets none of them): PHASELOOP_TEST_SUITES picks suites out of
# "typecheck vitest e2e"; PHASELOOP_VITEST_ARGS and PHASELOOP_E2E_ARGS narrow vitest and Playwright
# (e.g. one spec file); PHASELOOP_TEST_OUT and PHASELOOP_WEB_DIST move the reports and the web
# build, so that two runs with different PHASELOOP_TEST_PG_DIR can go side by side.
OUT="${PHASELOOP_TEST_OUT:-$ROOT/.phaseloop/test}"
SUITES=" ${PHASELOOP_TEST_SUITES:-typecheck vitest e2e} "
WEB_DIST="${PHASELOOP_WEB_DIST:-$ROOT/apps/web/dist}"
export PHASELOOP_WEB_DIST="$WEB_DIST"
wants() { [[ "$SUITES" == *" $1 "* ]]; }
rm -rf "$OUT"
mkdir -p "$OUT"
TSX="$ROOT/node_modules/.bin/tsx"
REPORTS=()

cleanup() {
  stop_children
  bash scripts/db.sh stop --test >/dev/null 2>&1 || true
}
trap cleanup EXIT
trap 'exit 130' INT TERM

ensure_node_modules || { echo "0 passed, 1 failed"; exit 1; }
[[ -d tests/e2e ]] && ensure_chromium

# ---- database -----------------------------------------------------------------------------
eval "$(bash scripts/db.sh start --test)" || { echo "0 passed, 1 failed"; exit 1; }
export PHASELOOP_TEST_PG_URL
# Databases left by an interrupted earlier run.
psql "$PHASELOOP_TEST_PG_URL" -qAtc "SELECT datname FROM pg_database WHERE datname LIKE 'phaseloop\_%'" 2>/dev/null |
  while read -r db; do psql "$PHASELOOP_TEST_PG_URL" -qc "DROP DATABASE IF EXISTS \"$db\" WITH (FORCE)" >/dev/null 2>&1 || true; done

export PHASELOOP_VERIFICATION_LOG="$OUT/verification.jsonl"
export NODE_ENV=test
export LOG_LEVEL="${LOG_LEVEL:-warn}"

# ---- type checks ----------------------------------------------------------------------------
if wants typecheck; then
log "type checks"
if npm run -s typecheck >"$OUT/typecheck.log" 2>&1; then
  REPORTS+=("check:typecheck=pass")
else
  tail -n 40 "$OUT/typecheck.log"
  REPORTS+=("check:typecheck=fail")
fi
fi

# ---- vitest ---------------------------------------------------------------------------------
if wants vitest; then
  log "vitest (all projects)"
  # shellcheck disable=SC2086 # the developer's arguments are meant to split
  VITE_CONFIG_NATIVE_IGNORE_WARNING=true npx vitest run --reporter=default --reporter=json --outputFile.json="$OUT/vitest.json" ${PHASELOOP_VITEST_ARGS:-}
  REPORTS+=("vitest:$OUT/vitest.json")
fi

# ---- end to end -----------------------------------------------------------------------------
if wants e2e && [[ -f tests/e2e/playwright.config.ts ]]; then
  log "building the web app"
  if npm run -s build -w apps/web -- --outDir "$WEB_DIST" --emptyOutDir >"$OUT/web-build.log" 2>&1; then
    REPORTS+=("check:web-build=pass")
    E2E_DB=phaseloop_e2e
    psql "$PHASELOOP_TEST_PG_URL" -qc "CREATE DATABASE $E2E_DB" >/dev/null
    export DATABASE_URL="${PHASELOOP_TEST_PG_URL%/*}/$E2E_DB"
    "$TSX" apps/api/src/cli/setup-db.ts --seed
    export SMTP_HOST=127.0.0.1
    SMTP_PORT="$(free_port 25525)"
    export SMTP_PORT
    start_child "$TSX" apps/api/src/cli/fake-smtp.ts
    start_child "$TSX" apps/worker/src/index.ts
    E2E_PORT="$(free_port 4199)"
    export E2E_PORT
    export PLAYWRIGHT_JSON_OUTPUT_NAME="$OUT/playwright.json"
    export PLAYWRIGHT_SKIP_BROWSER_DOWNLOAD=1
    log "playwright (chromium) on port $E2E_PORT"
    # shellcheck disable=SC2086
    npx playwright test -c tests/e2e/playwright.config.ts ${PHASELOOP_E2E_ARGS:-}
    REPORTS+=("playwright:$OUT/playwright.json")
  else
    tail -n 40 "$OUT/web-build.log"
    REPORTS+=("check:web-build=fail")
  fi
fi

# ---- verification table ---------------------------------------------------------------------
if [[ -s "$PHASELOOP_VERIFICATION_LOG" ]]; then
  "$TSX" scripts/render-verification.ts "$PHASELOOP_VERIFICATION_LOG" docs/verification.md || REPORTS+=("check:verification-table=fail")
fi

# Stop the servers first, so that nothing they print on the way out follows the closing line.
"$TSX" scripts/summarise-tests.ts "${REPORTS[@]}" >"$OUT/summary.txt"
status=$?
cleanup >/dev/null 2>&1
trap - EXIT
cat "$OUT/summary.txt"
exit "$status"
