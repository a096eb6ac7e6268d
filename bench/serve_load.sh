#!/usr/bin/env bash
# Load test of `lode serve` with wrk (Debian package wrk) from a second process
# on 127.0.0.1 only.
#
# Workload, at 1, 16 and 64 connections (LEVELS), SECONDS_PER_LEVEL each
# (default 20), every route on the same server:
#   health    GET /api/v1/health: HTTP, the connection loop and one small
#             index read, no ranking. The same-run baseline.
#   cached    GET /api/v1/search for one query, over and over (after the
#             first request, every answer comes from the result cache).
#   uncached  GET /api/v1/search over the query set (QUERIES: a TSV whose 2nd
#             column is the query), one query per request, made distinct per
#             wrk thread, level and pass through `offset` (0, 1, ... < 8 per
#             pass of the set, so the result cache never answers: every
#             request ranks; the deeper page changes the work by a few heap
#             slots only).
# Default search options (breakdowns and snippets on), top 10. The server's
# access log goes to a file, as a service would have it.
# Reports requests/s, p50/p99 latency, errors, and the server's RSS before,
# after each level, and its peak (VmHWM), plus the cache counters.
#
# Usage: bench/serve_load.sh [BUILD_DIR]
#   env: INDEX (default: the sample corpus, indexed here), QUERIES (default
#   sample_corpus/queries.tsv; for a generated index use the queries-*.tsv that
#   bench_query --dump-queries writes), SECONDS_PER_LEVEL, THREADS (server
#   workers, default 8), LEVELS (default "1 16 64"), ROUTES (default
#   "health cached uncached"), SERVE_ARGS (more `lode serve` options).
set -euo pipefail
cd "$(dirname "$0")/.."
build="${1:-build}"
lode="$build/lode"
secs="${SECONDS_PER_LEVEL:-20}"
threads="${THREADS:-8}"
queries="${QUERIES:-sample_corpus/queries.tsv}"
levels="${LEVELS:-1 16 64}"
routes="${ROUTES:-health cached uncached}"
command -v wrk >/dev/null || { echo "serve_load: wrk is not installed (apt-get install wrk)" >&2; exit 1; }
[ -x "$lode" ] || { echo "serve_load: no lode binary at $lode (build first)" >&2; exit 1; }

out="bench/out/$(date +%Y%m%d-%H%M%S)-serve"
mkdir -p "$out"
index="${INDEX:-$out/sample.sqlite}"
if [ -z "${INDEX:-}" ]; then "$lode" --index "$index" index -q sample_corpus/archive; fi

# The query set as a Lua table, URL-encoded.
cut -f2 "$queries" | python3 -c '
import sys, urllib.parse
print("local q = {")
for line in sys.stdin:
    line = line.strip()
    if line: print("  \"%s\"," % urllib.parse.quote_plus(line))
print("}")' >"$out/queries-table.lua"
first_query=$(sed -n '2{s/^ *"//;s/",$//;p}' "$out/queries-table.lua")

# uncached: per wrk thread a distinct offset family; the level is passed as an argument.
{
  cat "$out/queries-table.lua"
  cat <<'LUA'
local counter = 0
function setup(thread) thread:set("tid", counter); counter = counter + 1 end
local i, salt = 0, 0
function init(args) salt = tonumber(args[1] or "0") end
request = function()
  local qi = i % #q + 1
  local pass = math.floor(i / #q)
  i = i + 1
  local offset = pass * 8 + salt * 2 + (tid or 0)
  return wrk.format("GET", "/api/v1/search?top=10&offset=" .. offset .. "&q=" .. q[qi])
end
LUA
} >"$out/uncached.lua"

serve_log="$out/access.log"
# shellcheck disable=SC2086
"$lode" --index "$index" serve --port 0 --threads "$threads" --access-log "$serve_log" ${SERVE_ARGS:-} \
  >"$out/url.txt" 2>"$out/serve.log" &
pid=$!
trap 'kill $pid 2>/dev/null || true' EXIT
for _ in $(seq 300); do [ -s "$out/url.txt" ] && break; sleep 0.1; done
url=$(head -1 "$out/url.txt")
url=${url%/}
case "$url" in http://127.0.0.1:*) ;; *) echo "serve_load: the server did not start: $(cat "$out/serve.log")" >&2; exit 1 ;; esac
rss() { awk '/VmRSS|RssAnon|RssFile/ {printf "%s %s kB  ", $1, $2}' "/proc/$pid/status"; }
hwm() { awk '/VmHWM/ {print $2 " kB"}' "/proc/$pid/status"; }
curl -fsS "$url/api/v1/search?q=storm" >/dev/null  # readers opened once before measuring

{
  echo "lode serve load test: $(date -u +%FT%TZ), $(nproc) cores, server threads $threads, ${secs}s per level, load $(cut -d' ' -f1-3 /proc/loadavg)"
  echo "queries: $queries ($(grep -c . "$queries") lines); cached query: $first_query"
  echo "index: $index ($("$lode" --index "$index" stats --json | python3 -c 'import json,sys; print(json.load(sys.stdin)["documents"])') documents)"
  echo "RSS before: $(rss)"
  printf '%-9s %-6s %12s %10s %10s  %s\n' route conns "requests/s" p50 p99 errors
} | tee "$out/summary.txt"

level_no=0
for conns in $levels; do
  t=$(( conns < 2 ? 1 : 2 ))
  for route in $routes; do
    case "$route" in
      health) args=("$url/api/v1/health") ;;
      cached) args=("$url/api/v1/search?top=10&q=$first_query") ;;
      uncached) args=(-s "$out/uncached.lua" "$url/" -- "$level_no") ;;
      *) echo "serve_load: unknown route $route" >&2; exit 1 ;;
    esac
    f="$out/wrk-$route-$conns.txt"
    wrk -t"$t" -c"$conns" -d"${secs}s" --timeout 10s --latency "${args[@]}" >"$f"
    rps=$(awk '/Requests\/sec/ {print $2}' "$f")
    p50=$(awk '$1 == "50%" {print $2}' "$f")
    p99=$(awk '$1 == "99%" {print $2}' "$f")
    errs=$( (grep -E 'Non-2xx|Socket errors' "$f" || true) | tr -s ' ' | paste -sd';' -)
    printf '%-9s %-6s %12s %10s %10s  %s\n' "$route" "$conns" "$rps" "$p50" "$p99" "${errs:-0}" | tee -a "$out/summary.txt"
  done
  echo "RSS after $conns connections: $(rss)" | tee -a "$out/summary.txt"
  level_no=$((level_no + 1))
done
{
  echo "RSS peak (VmHWM): $(hwm)"
  echo "health: $(curl -fsS "$url/api/v1/health")"
  echo "access log lines: $(wc -l <"$serve_log")"
} | tee -a "$out/summary.txt"
echo "full wrk output in $out/"
