#!/usr/bin/env bash
# Indexing a real archive with the `lode` binary.
#
# Workloads (both from Debian packages, nothing invented):
#   1. the Linux kernel source tree (package linux-source: the tarball in
#      /usr/src, unpacked under /tmp), about 75,000 files;
#   2. the PDFs of texlive-latex-recommended-doc (/usr/share/doc/texlive-doc),
#      copied flat into one folder.
# For each: a fresh index (files/s, MB/s, peak RSS), a re-index with nothing
# changed, and a re-index after 1% of the files were changed (one line
# appended to every 100th file). Baseline beside it: `cat` of every file to
# /dev/null (the cost of reading the bytes at all).
#
# Usage: bench/formats_bench.sh [path/to/lode] [jobs]
set -euo pipefail
LODE=${1:-build-formats/lode}
JOBS=${2:-0}
WORK=${BENCH_WORK:-/tmp/lode-formats-bench}
mkdir -p "$WORK"

SRC=${LINUX_SRC:-$WORK/linux}   # LINUX_SRC: an already unpacked tree to use instead
if [ ! -d "$SRC" ]; then
  tarball=$(ls /usr/src/linux-source-*.tar.xz | head -1)
  mkdir -p "$SRC" && tar -C "$SRC" -xf "$tarball"
fi
PDFS=$WORK/pdfs
if [ ! -d "$PDFS" ]; then
  mkdir -p "$PDFS"
  find /usr/share/doc/texlive-doc -name '*.pdf' -exec cp -t "$PDFS" {} + 2>/dev/null || true
fi

measure() {  # label, command...: prints seconds, CPU seconds, peak RSS (KiB), exit code, summary
  local label=$1; shift
  local rc=0
  /usr/bin/time -f "%e %M %U %S" -o "$WORK/time.txt" "$@" > /dev/null 2> "$WORK/err.txt" || rc=$?
  read -r secs rss usr sys < <(tail -1 "$WORK/time.txt")
  echo "$label: ${secs}s wall, $(awk -v u="$usr" -v s="$sys" 'BEGIN { print u + s }')s CPU, peak RSS $((rss / 1024)) MiB, exit $rc, load $(cut -d' ' -f1-3 /proc/loadavg)"
  # lode's summary (per-kind counts and totals): every stderr line but the per-file ones
  (grep -v '^lode: \(skipped\|warning\)' "$WORK/err.txt" || true) | sed 's/^/  | /'
}

run_tree() {  # name, folder
  local name=$1 dir=$2 idx=$WORK/$1.sqlite
  rm -f "$idx" "$idx-wal" "$idx-shm" "$idx.lock"
  local files bytes
  files=$(find "$dir/" -type f | wc -l)
  bytes=$(du -sb "$dir/" | cut -f1)
  echo "== $name: $files files, $((bytes / 1000000)) MB"
  measure "baseline cat" sh -c "find '$dir/' -type f -print0 | xargs -0 cat > /dev/null"
  local jobs_opt=()
  [ "$JOBS" != 0 ] && jobs_opt=(--jobs "$JOBS")
  measure "fresh index" "$LODE" --index "$idx" index "${jobs_opt[@]}" "$dir"
  read -r secs _ < <(tail -1 "$WORK/time.txt")
  awk -v f="$files" -v b="$bytes" -v s="$secs" 'BEGIN { printf "  %.0f files/s, %.1f MB/s\n", f / s, b / 1e6 / s }'
  echo "  files skipped: $(grep -c "^lode: skipped" "$WORK/err.txt" || true), warnings: $(grep -c "^lode: warning" "$WORK/err.txt" || true)"
  cp "$WORK/err.txt" "$WORK/$name-fresh.err"
  measure "re-index, nothing changed" "$LODE" --index "$idx" index "${jobs_opt[@]}" "$dir"
  find "$dir/" -type f | awk 'NR % 100 == 0' | while read -r f; do echo "lode bench change" >> "$f"; done
  measure "re-index, 1% changed" "$LODE" --index "$idx" index "${jobs_opt[@]}" "$dir"
  echo "  index size: $(du -h "$idx" | cut -f1)"
}

run_tree linux "$SRC"
[ -n "$(ls -A "$PDFS")" ] && run_tree pdfs "$PDFS"
