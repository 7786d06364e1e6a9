# Shared helpers of start.sh and test.sh (sourced, not run).

log() { echo "[$SCRIPT_NAME] $*"; }

port_free() {
  ! (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null
}

free_port() {
  local p="$1"
  while ! port_free "$p"; do p=$((p + 1)); done
  echo "$p"
}

# npm packages: installed from the committed lock when missing or older than the lock.
ensure_node_modules() {
  if [[ ! -d node_modules || ! -f node_modules/.package-lock.json || package-lock.json -nt node_modules/.package-lock.json ]]; then
    log "installing npm packages (npm ci)"
    PLAYWRIGHT_SKIP_BROWSER_DOWNLOAD=1 npm ci --no-audit --no-fund
  fi
}

ensure_chromium() {
  if [[ ! -x /usr/bin/chromium ]]; then
    log "installing Debian's chromium for the end-to-end tests"
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq || true
    apt-get install -y -qq chromium >/dev/null
  fi
}

wait_for_http() {
  local url="$1" tries="${2:-120}"
  for ((i = 0; i < tries; i++)); do
    if node -e "fetch(process.argv[1]).then(r=>process.exit(r.status<500?0:1),()=>process.exit(1))" "$url" 2>/dev/null; then return 0; fi
    sleep 0.5
  done
  return 1
}

# Background children, stopped in reverse order on exit.
CHILD_PIDS=()
start_child() {
  "$@" &
  CHILD_PIDS+=("$!")
}
stop_children() {
  local pid
  for ((i = ${#CHILD_PIDS[@]} - 1; i >= 0; i--)); do
    pid="${CHILD_PIDS[$i]}"
    kill -TERM "$pid" 2>/dev/null || true
  done
  for pid in "${CHILD_PIDS[@]}"; do
    for _ in $(seq 1 40); do kill -0 "$pid" 2>/dev/null || break; sleep 0.25; done
    kill -KILL "$pid" 2>/dev/null || true
  done
  CHILD_PIDS=()
}
