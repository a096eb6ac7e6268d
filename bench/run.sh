#!/usr/bin/env bash
# bench/run.sh — builds the benchmarks, makes the corpora, runs every
# benchmark and prints a summary. Results go to bench/out/<stamp>-<mode>/
# (git-ignored; bench/out/latest points at the newest).
#
# Workloads:
#   (i)   sample_corpus/ (the repository's demo archive): bench_index with a
#         256 MiB batch, 5 repeats (it is tiny); bench_query with words taken
#         from its own documents.
#   (ii)  a generated corpus of --mb MB (default 1100) in --scratch: bench_index
#         with each --batch-mb (default 64,256), then bench_query on its index.
#   (iii) full mode only: a corpus a tenth that size with the same batches, so
#         peak RSS can be compared across corpus sizes.
# Quick mode (--quick): 50 MB corpus, batches 16,64 (so the batch flushes
# mid-run), no (iii), 2 query passes: a smoke check in a minute or two.
# Query timing stops adding passes to a configuration after --query-budget
# seconds (default 600): TF-IDF on the 1.1 GB index takes about a second a query.
#
# Usage: bench/run.sh [--quick] [--scratch DIR] [--mb N] [--batch-mb LIST]
#                     [--seed N] [--repeat N] [--query-budget S] [--build DIR] [--no-build]
set -euo pipefail

ROOT=$(cd "$(dirname "$0")/.." && pwd)
SCRATCH=${LODE_BENCH_SCRATCH:-/tmp/lode-bench}
BUILD=$ROOT/build-bench
MODE=full MB= BATCHES= SEED=42 REPEAT= BUDGET=600 NO_BUILD=0

die() { echo "run.sh: $*" >&2; exit 2; }
while [[ $# -gt 0 ]]; do
  case $1 in
    --quick) MODE=quick ;;
    --scratch) SCRATCH=${2:?--scratch needs a folder}; shift ;;
    --mb) MB=${2:?--mb needs a size}; shift ;;
    --batch-mb) BATCHES=${2:?--batch-mb needs a list like 64,256}; shift ;;
    --seed) SEED=${2:?--seed needs a number}; shift ;;
    --repeat) REPEAT=${2:?--repeat needs a number}; shift ;;
    --query-budget) BUDGET=${2:?--query-budget needs seconds}; shift ;;
    --build) BUILD=${2:?--build needs a folder}; shift ;;
    --no-build) NO_BUILD=1 ;;
    -h|--help) sed -n '2,20p' "$0" | sed 's/^# \{0,1\}//'; exit 0 ;;
    *) die "unknown option '$1' (see --help)" ;;
  esac
  shift
done
if [[ $MODE == quick ]]; then : "${MB:=50}" "${BATCHES:=16,64}" "${REPEAT:=2}"
else : "${MB:=1100}" "${BATCHES:=64,256}" "${REPEAT:=3}"; fi
command -v jq >/dev/null || die "jq is needed for the summary (apt-get install jq)"

OUT=$ROOT/bench/out/$(date +%Y%m%d-%H%M%S)-$MODE
mkdir -p "$OUT" "$SCRATCH/work"
ln -sfn "$(basename "$OUT")" "$ROOT/bench/out/latest"
BIN=$BUILD/bench

if [[ $NO_BUILD == 0 ]]; then
  [[ -f $BUILD/CMakeCache.txt ]] || cmake -S "$ROOT" -B "$BUILD" -DCMAKE_BUILD_TYPE=Release >/dev/null
  cmake --build "$BUILD" -j2 --target gen_corpus bench_index bench_query lode >/dev/null
fi
for b in gen_corpus bench_index bench_query; do [[ -x $BIN/$b ]] || die "$BIN/$b is missing (build it, or drop --no-build)"; done
grep -q 'CMAKE_BUILD_TYPE:STRING=Release' "$BUILD/CMakeCache.txt" || echo "run.sh: warning: $BUILD is not a Release build" >&2

{ echo "date: $(date -Is)"; echo "host: $(uname -srm)"; echo "cpu: $(grep -m1 'model name' /proc/cpuinfo | cut -d: -f2- | xargs)";
  echo "cores online: $(nproc)"; echo "load before: $(cut -d' ' -f1-3 /proc/loadavg)";
  echo "compiler: $(grep -m1 CMAKE_CXX_COMPILER: "$BUILD/CMakeCache.txt" | cut -d= -f2) $(g++ -dumpfullversion 2>/dev/null)";
  echo "git: $(git -C "$ROOT" rev-parse --short HEAD 2>/dev/null || echo none) ($(git -C "$ROOT" status --porcelain 2>/dev/null | wc -l) files changed)";
  echo "options: mode=$MODE mb=$MB batches=$BATCHES seed=$SEED repeat=$REPEAT scratch=$SCRATCH"; } > "$OUT/env.txt"

# Generates (or reuses, when its stamp matches) a corpus of $1 MB.
corpus() {
  local mb=$1 dir=$SCRATCH/corpus-${1}mb-s$SEED
  if [[ -f $dir/.lode-bench-corpus.json ]] &&
     jq -e --argjson mb "$mb" --argjson seed "$SEED" '.mb == $mb and .seed == $seed and .ascii == false' \
        "$dir/.lode-bench-corpus.json" >/dev/null; then
    echo "$dir"; return
  fi
  rm -rf "$dir"
  echo "run.sh: generating $mb MB in $dir" >&2
  "$BIN/gen_corpus" --out "$dir" --mb "$mb" --seed "$SEED" > /dev/null
  echo "$dir"
}

# bench_index + bench_query on one corpus; $1 label, $2 corpus, $3 batches, $4.. extra query options.
bench() {
  local label=$1 dir=$2 batches=$3; shift 3
  local repeat=1; [[ $label == sample ]] && repeat=5
  echo "run.sh: bench_index $label (batches $batches MiB)" >&2
  "$BIN/bench_index" --corpus "$dir" --work "$SCRATCH/work" --batch-mb "$batches" --label "$label" \
    --baseline-repeat "$repeat" --index-repeat "$repeat" --keep-index "$SCRATCH/$label.sqlite" \
    --json-out "$OUT/index-$label.json" > "$OUT/index-$label.txt"
  sed '$d' "$OUT/index-$label.txt"
  "$BUILD/lode" --index "$SCRATCH/$label.sqlite" stats --json > "$OUT/stats-$label.json"
  echo "run.sh: bench_query $label" >&2
  "$BIN/bench_query" --index "$SCRATCH/$label.sqlite" --repeat "$REPEAT" --budget-s "$BUDGET" --label "$label" --seed "$SEED" "$@" \
    --dump-queries "$OUT/queries-$label.tsv" --json-out "$OUT/query-$label.json" > "$OUT/query-$label.txt"
  sed '$d' "$OUT/query-$label.txt"
}

bench sample "$ROOT/sample_corpus/archive" 256 --words-from-index
if [[ $MODE == full ]]; then
  small=$(( (MB + 9) / 10 ))
  bench "gen-${small}mb" "$(corpus "$small")" "$BATCHES"
fi
bench "gen-${MB}mb" "$(corpus "$MB")" "$BATCHES"
echo "load after: $(cut -d' ' -f1-3 /proc/loadavg)" >> "$OUT/env.txt"

# ---- summary ---------------------------------------------------------------
{
echo
echo "== lode benchmark summary ($MODE) — $OUT =="
cat "$OUT/env.txt"
echo
echo "indexing (MB = 10^6 bytes of input files; one thread)"
printf '  %-14s %6s %8s %9s %8s %10s %14s %16s %13s %10s %10s\n' corpus "batch" "MB/s" "MB/CPU-s" "docs/s" "x baseline" "baseline MB/s" "baseline MB/CPU-s" "peak RSS MiB" "index/raw" "B/posting"
for f in "$OUT"/index-*.json; do
  jq -r '. as $r | ($r.baseline.raw.bytes / 1e6 / ($r.baseline.raw.read_analyze.cpu_user_s + $r.baseline.raw.read_analyze.cpu_sys_s)) as $bc |
         .index[] | [$r.label, .batch_mib, .mb_s, .mb_per_cpu_s, .docs_s, .ratio_to_baseline,
         $r.baseline.read_analyze_mb_s, $bc, .peak_rss_mib, .index_to_raw, .bytes_per_posting] | @tsv' "$f"
done | while IFS=$'\t' read -r l b mbs mbc d ratio base basec rss ir bpp; do
  printf '  %-14s %6s %8.1f %9.1f %8.0f %10.3f %14.1f %16.1f %13.1f %10.2f %10.1f\n' "$l" "$b" "$mbs" "$mbc" "$d" "$ratio" "$base" "$basec" "$rss" "$ir" "$bpp"
done
echo
echo "peak RSS MiB by tenth of the corpus (flat = bounded by the batch, not the corpus)"
for f in "$OUT"/index-*.json; do
  jq -r '. as $r | .index[] | "  \($r.label) batch \(.batch_mib): " + ([.raw.rss_peak_by_tenth_kib[] / 1024 | floor | tostring] | join(" "))' "$f"
done
echo
echo "query latency, ms (warm; nearest-rank percentiles)"
printf '  %-14s %-20s %9s %9s %9s %9s %12s\n' index config mean p50 p90 p99 "CPU mean"
for f in "$OUT"/query-*.json; do
  jq -r '. as $r | .configs[] | [$r.label, .config, .latency.all.mean_ms, .latency.all.p50_ms, .latency.all.p90_ms,
         .latency.all.p99_ms, (.latency.cpu.mean_ms // 0)] | @tsv' "$f"
done | while IFS=$'\t' read -r l c m p50 p90 p99 cpu; do
  printf '  %-14s %-20s %9.4f %9.4f %9.4f %9.4f %12.4f\n' "$l" "$c" "$m" "$p50" "$p90" "$p99" "$cpu"
done
echo
echo "targets on gen-${MB}mb: indexing >= 20 MB/s on one core; peak RSS <= 512 MiB with the default 256 MiB batch"
jq -r '.index[] | "  batch \(.batch_mib) MiB: \(.mb_s*10|round/10) MB/s " +
  (if .mb_s >= 20 then "(met)" else "(NOT met)" end) + "; peak RSS \(.peak_rss_mib|round) MiB " +
  (if .batch_mib != 256 then "(2 x batch = \(2 * .batch_mib))" elif .peak_rss_mib <= 512 then "(met)"
   else "(NOT met)" end)' "$OUT/index-gen-${MB}mb.json"
} | tee "$OUT/summary.txt"
