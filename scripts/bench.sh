#!/usr/bin/env bash
# `npm run bench`: runs every bench/*.bench.ts (each prints Markdown) and writes bench/results.md
# with the machine it ran on. Benchmarks measure speed; tests never assert timings.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$ROOT"
shopt -s nullglob
benches=(bench/*.bench.ts)
if [[ ${#benches[@]} -eq 0 ]]; then
  echo "bench: no benchmarks yet (add bench/NAME.bench.ts printing Markdown)"
  exit 0
fi
out="bench/results.md"
{
  echo "# Benchmarks"
  echo
  echo "Written by \`npm run bench\` on $(date -u +%Y-%m-%d) — $(nproc) cores, $(awk '/MemTotal/ {printf "%.0f GiB", $2/1048576}' /proc/meminfo), Node $(node -v), commit $(git rev-parse --short HEAD 2>/dev/null || echo unknown)."
  for b in "${benches[@]}"; do
    echo
    echo "## $(basename "$b" .bench.ts)"
    echo
    node_modules/.bin/tsx "$b"
  done
} >"$out.tmp"
mv "$out.tmp" "$out"
echo "bench: wrote $out"
