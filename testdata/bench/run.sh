#!/usr/bin/env bash
# make bench: speed, memory and quality figures of undercurrent beside the reference libraries
# (Debian's python3-sklearn, -snowballstemmer, -scipy, -fastcluster, -gensim), run side by side
# in the same run on the same data. Prints one JSON object per line (bench, system, corpus,
# seconds, peak_mb and each benchmark's own figures), then one "ratio" line per comparison.
# Nothing is asserted: these are measurements, and on a shared machine wall times vary, so
# cpu_seconds is printed where a benchmark can measure it.
#
#   make bench                   # everything (about 15-30 minutes on 2 cores)
#   BENCH_ONLY=text make bench   # one part: text, cluster, topics, redact, report, corpora, tag
set -uo pipefail
cd "$(dirname "$0")/../.."
ROOT=$PWD
OUT=${UNDERCURRENT_BENCH_DIR:-/tmp/undercurrent-bench}
mkdir -p "$OUT"
PY=/usr/bin/python3
ALL="$OUT/all.jsonl"
: > "$ALL"
if [ -z "${UNDERCURRENT_SHARED:-}" ]; then
  for d in ../shared ../../shared /work/shared; do
    if [ -d "$d/corpora" ]; then export UNDERCURRENT_SHARED="$(cd "$d" && pwd)"; break; fi
  done
fi
SHARED=${UNDERCURRENT_SHARED:?shared/corpora not found: set UNDERCURRENT_SHARED}
want() { [ -z "${BENCH_ONLY:-}" ] || [[ ",${BENCH_ONLY}," == *",$1,"* ]]; }
emit() { grep --line-buffered '^{' | tee -a "$ALL"; }
note() { echo "bench: $*" >&2; }
for m in sklearn scipy fastcluster gensim snowballstemmer statsmodels; do
  $PY -c "import $m" 2>/dev/null || note "missing python3 module $m (apt-get install python3-$m): its side is skipped"
done

if want text; then
  note "text pipeline (issue 3): undercurrent Build vs scikit-learn CountVectorizer + Snowball"
  UNDERCURRENT_BENCH_JSON=1 go test -run '^$' -bench '^BenchmarkPipeline$' -benchtime 1x ./text | emit
  $PY text/testdata/bench_sklearn.py --csv "$SHARED/corpora/osha-abstracts/osha.csv" --column "Abstract Text" --corpus osha | emit
  UNDERCURRENT_GEN_CORPUS="$OUT/gen100k.csv" go test -run '^TestWriteGeneratedCorpus$' ./text >/dev/null
  $PY text/testdata/bench_sklearn.py --csv "$OUT/gen100k.csv" --column narrative --corpus generated-100k | emit
fi

if want cluster; then
  note "hierarchical clustering (issue 4): Ward and average vs scipy and fastcluster"
  mkdir -p "$OUT/cluster"
  $PY cluster/testdata/bench_ref.py --dump "$OUT/cluster" | emit
  UNDERCURRENT_BENCH_REF="$OUT/cluster" UNDERCURRENT_BENCH_JSON=1 go test -run '^$' -bench 'BenchmarkWardVectors|BenchmarkAverage$|BenchmarkSummary100k' -benchtime 1x -timeout 60m ./cluster | emit
fi

if want topics; then
  note "themes (issue 5): LDA vs scikit-learn batch/online and gensim on a corpus drawn from a known model"
  UNDERCURRENT_BENCH_DIR="$OUT/topics" sh topics/testdata/run_bench.sh | emit
fi

if want redact; then
  note "redaction (issue 6): precision and recall per type"
  UNDERCURRENT_BENCH_JSON=1 go test -run 'Quality|JSON' -v ./text/redact | emit
fi

if want report; then
  note "report (issue 8): size and drawing time of a 100k-narrative report in chromium"
  UNDERCURRENT_BENCH_JSON=1 go test -run '^$' -bench '100k' -benchtime 1x ./report | emit
fi

if want corpora; then
  note "public corpora (issue 9): whole pipeline and fit, NMI against the ground-truth columns"
  go test -run '^$' -bench '^BenchmarkCorpora$' -benchtime 1x -timeout 60m ./cmd/undercurrent | emit
  OMP_NUM_THREADS=1 $PY testdata/bench/corpora_ref.py "$SHARED" | emit
fi

if want tag; then
  note "tagging throughput (issue 9)"
  # 200,000 demo-town rows through the whole tag command (read twice, redact, pipeline, fold-in, write).
  UNDERCURRENT_BENCH_JSON=1 go test -run '^$' -bench '^BenchmarkTagCommand$' -benchtime 200000x -timeout 30m ./cmd/undercurrent | emit
fi

# Ratios: undercurrent against each reference system on the same bench and corpus.
$PY - "$ALL" <<'PY'
import json, sys
rows = [json.loads(l) for l in open(sys.argv[1]) if l.strip().startswith("{")]
def key(r): return (r.get("bench"), r.get("corpus"), r.get("n"))
ours = {key(r): r for r in rows if r.get("system") == "undercurrent"}
for r in rows:
    s = r.get("system")
    if s in (None, "undercurrent", "true-model") or "seconds" not in r:
        continue
    o = ours.get(key(r))
    if not o or not o.get("seconds"):
        continue
    out = {"bench": "ratio", "of": r["bench"], "corpus": r.get("corpus"), "n": r.get("n"), "against": s,
           "speedup": round(r["seconds"] / o["seconds"], 2)}
    if r.get("peak_mb") and o.get("peak_mb"):
        out["memory_ratio"] = round(o["peak_mb"] / r["peak_mb"], 3)
    print(json.dumps(out))
PY
