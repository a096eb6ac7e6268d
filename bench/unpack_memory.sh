#!/usr/bin/env bash
# Peak memory of `lode index` on compressed files that unpack far past what
# they hold (the promise: about the batch plus 130 MB, whatever -j).
#
# Workloads (generated here, invented log text):
#   1. one .gz of log lines (2.4 MB) that unpacks to 470 MiB;
#   2. four copies of it, indexed with -j 4;
#   3. a DOCX whose word/document.xml is 1 GiB (3 MB zipped).
# Baseline beside them: four plain 64 MB text files (what the text limit
# keeps of each .gz) with -j 4 — the cost of the text itself.
#
# Usage: bench/unpack_memory.sh [path/to/lode]
set -euo pipefail
LODE=${1:-build/lode}
WORK=${BENCH_WORK:-/tmp/lode-unpack-bench}
mkdir -p "$WORK"/gz1 "$WORK"/gz4 "$WORK"/docx "$WORK"/plain4
if [ ! -f "$WORK/docx/big.docx" ]; then
  /usr/bin/python3 - "$WORK" <<'PY'
import gzip, shutil, sys, zipfile
w = sys.argv[1]
line = ''.join('the lamp keeper logged the tide and the fog at the north pier %d\n' % (i % 10) for i in range(10))
chunk = (line * ((1 << 20) // len(line) + 1))[: 1 << 20].encode()
with gzip.open(w + '/gz1/log.txt.gz', 'wb', compresslevel=6) as g:
    for _ in range(470):
        g.write(chunk)
for k in range(4):
    shutil.copy(w + '/gz1/log.txt.gz', w + '/gz4/log%d.txt.gz' % k)
    with open(w + '/plain4/p%d.txt' % k, 'wb') as p:
        for _ in range(64):
            p.write(chunk)
ct = (b'<?xml version="1.0"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">'
      b'<Override PartName="/word/document.xml" ContentType="application/'
      b'vnd.openxmlformats-officedocument.wordprocessingml.document.main+xml"/></Types>')
with zipfile.ZipFile(w + '/docx/big.docx', 'w', zipfile.ZIP_DEFLATED) as z:
    z.writestr('[Content_Types].xml', ct)
    with z.open('word/document.xml', 'w', force_zip64=True) as f:
        f.write(b'<?xml version="1.0"?><w:document xmlns:w="http://schemas.openxmlformats.org/'
                b'wordprocessingml/2006/main"><w:body>')
        para = b'<w:p><w:r><w:t>the lamp keeper logged the tide</w:t></w:r></w:p>' * 1000
        n = 0
        while n < (1 << 30):
            f.write(para)
            n += len(para)
        f.write(b'</w:body></w:document>')
PY
fi

measure() {  # label, folder, extra options...: peak RSS and wall time of a fresh index
  local label=$1 folder=$2; shift 2
  rm -f "$WORK/index.sqlite" "$WORK/index.sqlite-wal" "$WORK/index.sqlite-shm"
  local rc=0
  /usr/bin/time -f "%e %M" -o "$WORK/time.txt" "$LODE" --index "$WORK/index.sqlite" index -q "$@" "$WORK/$folder" \
    > /dev/null 2> "$WORK/err.txt" || rc=$?
  read -r secs rss < <(tail -1 "$WORK/time.txt")
  echo "$label: peak RSS $((rss / 1024)) MiB, ${secs}s wall, exit $rc"
}

measure "one .gz unpacking to 470 MiB" gz1
measure "four of them, -j 4" gz4 -j 4
measure "DOCX with a 1 GiB part (refused)" docx
measure "baseline: four plain 64 MiB text files, -j 4" plain4 -j 4
