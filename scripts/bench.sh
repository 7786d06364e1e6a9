#!/usr/bin/env bash
# `npm run bench [NAME...]`: runs bench/*.bench.ts (or only bench/NAME.bench.ts). Each benchmark
# rewrites its own section of bench/results.md (bench/lib/results.ts); this script only runs them.
# Benchmarks measure speed; tests never assert timings.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$ROOT"
shopt -s nullglob
if [[ $# -gt 0 ]]; then
  benches=()
  for name in "$@"; do benches+=("bench/${name%.bench.ts}.bench.ts"); done
else
  benches=(bench/*.bench.ts)
fi
if [[ ${#benches[@]} -eq 0 ]]; then
  echo "bench: no benchmarks yet (add bench/NAME.bench.ts)"
  exit 0
fi
for b in "${benches[@]}"; do
  [[ -f "$b" ]] || { echo "bench: no such benchmark $b" >&2; exit 2; }
  echo "bench: $b"
  node_modules/.bin/tsx "$b"
done
echo "bench: results in bench/results.md"
