#!/bin/sh
# Side-by-side benchmark for topics (meant for `make bench`): writes the shared synthetic
# corpus if needed, runs scikit-learn and gensim (testdata/bench_ref.py, Debian python3),
# then our Go benchmarks, and prints every JSON line plus speed ratios. Nothing is asserted.
# The machine is shared: wall times vary with load; cpu_seconds_* fields help compare.
set -e
DIR=${UNDERCURRENT_BENCH_DIR:-/tmp/undercurrent-bench}
HERE=$(cd "$(dirname "$0")" && pwd)
mkdir -p "$DIR"
OMP_NUM_THREADS=1 OPENBLAS_NUM_THREADS=1 /usr/bin/python3 "$HERE/bench_ref.py" "$DIR" > "$DIR/ref.jsonl"
cd "$HERE/.."
UNDERCURRENT_BENCH_DIR="$DIR" go test -run XXX -bench 'Synthetic|OSHA' -benchtime 1x . | grep '^{' > "$DIR/go.jsonl"
cat "$DIR/ref.jsonl" "$DIR/go.jsonl"
/usr/bin/python3 - "$DIR/ref.jsonl" "$DIR/go.jsonl" <<'PY'
import json, sys
rows = [json.loads(l) for f in sys.argv[1:] for l in open(f) if l.strip()]
ours = next(r for r in rows if r["system"] == "undercurrent" and r["bench"] == "synthetic-lda")
for r in rows:
    if r["bench"] == "synthetic-lda" and r["system"] not in ("undercurrent", "true-model"):
        print(f'{r["system"]:>15}: {r["seconds"] / ours["seconds"]:.1f}x our wall time; '
              f'hellinger {r["hellinger"]} vs {ours["hellinger"]}, ll {r["ll_per_token"]} vs {ours["ll_per_token"]}, '
              f'nmi {r["nmi"]} vs {ours["nmi"]}')
PY
