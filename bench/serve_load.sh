#!/usr/bin/env bash
# Load test of `lode serve` with wrk (Debian package wrk) from a second process
# on loopback.
#
# Workload: the sample corpus index; GET /api/v1/search with breakdowns and
# snippets, the queries of sample_corpus/queries.tsv in rotation (one per
# request); 1, 16 and 64 connections, SECONDS_PER_LEVEL each (default 20; the
# issue asks for 10 minutes on a >= 1 GB index too:
# SECONDS_PER_LEVEL=600 INDEX=big.sqlite bench/serve_load.sh).
# Baseline in the same run: GET /api/v1/health (no ranking) at the same
# connection counts, so the cost of search shows beside the cost of HTTP.
# Reports requests/s, p50/p99 latency, and the server's RSS before and after.
#
# Usage: bench/serve_load.sh [BUILD_DIR]
#   env: SECONDS_PER_LEVEL, INDEX, THREADS; QUERIES (a TSV whose 2nd column is
#   the query, default sample_corpus/queries.tsv; for a generated index use the
#   queries-*.tsv that bench_query --dump-queries writes); LEVELS (connection
#   counts, default "1 16 64"); ROUTES (default "search health").
set -euo pipefail
cd "$(dirname "$0")/.."
build="${1:-build}"
lode="$build/lode"
secs="${SECONDS_PER_LEVEL:-20}"
threads="${THREADS:-8}"
queries="${QUERIES:-sample_corpus/queries.tsv}"
levels="${LEVELS:-1 16 64}"
routes="${ROUTES:-search health}"
command -v wrk >/dev/null || { echo "serve_load: wrk is not installed (apt-get install wrk)" >&2; exit 1; }
[ -x "$lode" ] || { echo "serve_load: no lode binary at $lode (build first)" >&2; exit 1; }

out="bench/out/$(date +%Y%m%d-%H%M%S)-serve"
mkdir -p "$out"
index="${INDEX:-$out/sample.sqlite}"
if [ -z "${INDEX:-}" ]; then "$lode" --index "$index" index -q sample_corpus/archive; fi

# wrk script: rotate through the query file, URL-encoded.
lua="$out/queries.lua"
{
  echo 'local q = {'
  cut -f2 "$queries" | python3 -c '
import sys, urllib.parse
for line in sys.stdin:
    line = line.strip()
    if line: print("  \"%s\"," % urllib.parse.quote_plus(line))'
  echo '}'
  echo 'local i = 0'
  echo 'request = function() i = i % #q + 1; return wrk.format("GET", "/api/v1/search?top=10&q=" .. q[i]) end'
} > "$lua"

"$lode" --index "$index" serve --port 0 --threads "$threads" >"$out/url.txt" 2>"$out/serve.log" &
pid=$!
trap 'kill $pid 2>/dev/null || true' EXIT
for _ in $(seq 100); do [ -s "$out/url.txt" ] && break; sleep 0.1; done
url=$(head -1 "$out/url.txt")
url=${url%/}
rss() { awk '/VmRSS/ {print $2 " kB"}' "/proc/$pid/status"; }
curl -fsS "$url/api/v1/search?q=storm" >/dev/null  # readers opened once before measuring

{
  echo "lode serve load test: $(date -u +%FT%TZ), $(nproc) cores, server threads $threads, ${secs}s per level, load $(cut -d' ' -f1-3 /proc/loadavg)"
  echo "queries: $queries"
  echo "index: $index ($("$lode" --index "$index" stats --json | python3 -c 'import json,sys; print(json.load(sys.stdin)["documents"])') documents)"
  echo "RSS before: $(rss)"
  printf '%-8s %-6s %12s %10s %10s %8s\n' route conns "requests/s" p50 p99 errors
} | tee "$out/summary.txt"

for conns in $levels; do
  t=$(( conns < 2 ? 1 : 2 ))
  for route in $routes; do
    if [ "$route" = search ]; then args=(-s "$lua" "$url/"); else args=("$url/api/v1/health"); fi
    wrk -t"$t" -c"$conns" -d"${secs}s" --latency "${args[@]}" >"$out/wrk-$route-$conns.txt"
    f="$out/wrk-$route-$conns.txt"
    rps=$(awk '/Requests\/sec/ {print $2}' "$f")
    p50=$(awk '$1 == "50%" {print $2}' "$f")
    p99=$(awk '$1 == "99%" {print $2}' "$f")
    errs=$( (grep -E 'Non-2xx|Socket errors' "$f" || true) | tr -s ' ' | paste -sd';' -)
    printf '%-8s %-6s %12s %10s %10s %8s\n' "$route" "$conns" "$rps" "$p50" "$p99" "${errs:-0}" | tee -a "$out/summary.txt"
  done
done
echo "RSS after: $(rss)" | tee -a "$out/summary.txt"
echo "full wrk output in $out/"
