# undercurrent — the two commands a newcomer needs are `make demo` and `make test`.

GO      ?= go
OUT     ?= out/demo
BIN     := bin/undercurrent

.PHONY: all build demo test vet fuzz-seeds bench assets-check assets-fetch clean

all: build

build:
	$(GO) build -o $(BIN) ./cmd/undercurrent

## demo: the whole job on the built-in invented corpus; prints where the report is.
demo: build
	$(BIN) demo --out $(OUT)

## test: every test (unit, reference fixtures, fuzz seed corpora, corpus accounting, browser).
test: assets-check
	@unformatted="$$(gofmt -l .)"; if [ -n "$$unformatted" ]; then echo "gofmt needed: $$unformatted"; exit 1; fi
	$(GO) vet ./...
	$(GO) test -count=1 ./...

## assets-check: the embedded echarts runtime matches its recorded checksum (offline).
assets-check:
	@if [ -x report/assets/verify.sh ]; then report/assets/verify.sh --offline; fi

## assets-fetch: fetch echarts from the npm registry again and check its integrity.
assets-fetch:
	report/assets/verify.sh

## bench: speed, memory and quality figures beside the reference libraries, one JSON object
## per line (needs Debian's python3-sklearn, -scipy, -gensim, -statsmodels, -snowballstemmer,
## -fastcluster).
bench: build
	testdata/bench/run.sh

clean:
	rm -rf bin out
