#!/usr/bin/env bash
# `npm run bench [NAME...]`: runs bench/*.bench.ts (or only bench/NAME.bench.ts). Each benchmark
# rewrites its own section of bench/results.md (bench/lib/results.ts); this script only runs them.
# Benchmarks measure speed; tests never assert timings.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$ROOT"
shopt -s nullglob
# The CHOLMOD reference (../shared/bench/cholmod-ref) is only a fair anchor with an optimised BLAS:
# libsuitesparse-dev alone brings the reference BLAS, several times slower on large fronts.
if command -v apt-get >/dev/null && ! dpkg -s libopenblas0-serial >/dev/null 2>&1; then
  echo "bench: installing libopenblas0-serial (optimised BLAS for the CHOLMOD reference)"
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq libopenblas0-serial >/dev/null 2>&1 ||
    { apt-get update -qq >/dev/null 2>&1 && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq libopenblas0-serial >/dev/null 2>&1; } ||
    echo "bench: could not install libopenblas0-serial; CHOLMOD times will use the reference BLAS" >&2
fi
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
