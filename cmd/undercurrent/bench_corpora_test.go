package main

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"testing"
	"time"

	"undercurrent/topics"
)

// sharedCorpora finds ../shared/corpora: $UNDERCURRENT_SHARED, else the nearest parent folder
// holding shared/corpora.
func sharedCorpora(tb testing.TB) string {
	tb.Helper()
	if d := os.Getenv("UNDERCURRENT_SHARED"); d != "" {
		return filepath.Join(d, "corpora")
	}
	wd, _ := os.Getwd()
	for d := wd; ; d = filepath.Dir(d) {
		c := filepath.Join(d, "shared", "corpora")
		if st, err := os.Stat(c); err == nil && st.IsDir() {
			return c
		}
		if filepath.Dir(d) == d {
			break
		}
	}
	tb.Fatal("shared/corpora not found: set UNDERCURRENT_SHARED or put shared/ beside the repository")
	return ""
}

// peakMB is the process's peak resident set (VmHWM) in MB, or NaN where /proc is missing.
func peakMB() float64 {
	b, err := os.ReadFile("/proc/self/status")
	if err != nil {
		return math.NaN()
	}
	for _, line := range strings.Split(string(b), "\n") {
		if strings.HasPrefix(line, "VmHWM:") {
			f := strings.Fields(line)
			kb, _ := strconv.ParseFloat(f[1], 64)
			return kb / 1024
		}
	}
	return math.NaN()
}

// corpusCase is one public corpus with its ground-truth columns (../shared/corpora/SOURCES.md).
type corpusCase struct {
	name  string
	files func(dir string) []string
	truth []string
	k     int
	in    inputFlags
}

var corpusCases = []corpusCase{
	{name: "osha-abstracts", files: func(d string) []string { return []string{filepath.Join(d, "osha-abstracts", "osha.csv")} },
		truth: []string{"Event type", "Nature of Injury"}, k: 15},
	{name: "safenet", files: func(d string) []string {
		m, _ := filepath.Glob(filepath.Join(d, "safenet", "SAFENET_*.csv"))
		return m
	}, truth: []string{"Event Incident Type"}, k: 15},
}

// BenchmarkCorpora runs the pipeline and the final fit on the public corpora and prints one
// JSON line per corpus: time, peak memory, NMI of the dominant theme against each
// ground-truth column, mean NPMI of the themes' top-10 words, and stability across two
// chains. Nothing is asserted; `make bench` prints these beside the reference libraries.
func BenchmarkCorpora(b *testing.B) {
	dir := sharedCorpora(b)
	for _, cc := range corpusCases {
		b.Run(cc.name, func(b *testing.B) {
			for it := 0; it < b.N; it++ {
				start := time.Now()
				var so, se bytes.Buffer
				e := &env{stdout: &so, stderr: &se, quiet: true}
				in := cc.in
				in.groups = strings.Join(cc.truth, ",")
				tf, rf := textFlags{}, redactFlags{}
				p, err := prepare(context.Background(), e, &in, &tf, &rf, "", cc.files(dir))
				if err != nil {
					b.Fatal(err)
				}
				prepTime := time.Since(start)
				mf := modelFlags{themes: cc.k, seed: 1, chains: 2}
				m, err := fitModel(context.Background(), e, p, &mf, cc.k)
				if err != nil {
					b.Fatal(err)
				}
				total := time.Since(start)
				dom := m.Dominant()
				rec := map[string]any{"bench": "corpus-themes", "system": "undercurrent", "corpus": cc.name,
					"docs": len(p.fitRows), "k": cc.k, "seconds": total.Seconds(), "pipeline_seconds": prepTime.Seconds(),
					"peak_mb": peakMB(), "gomaxprocs": runtime.GOMAXPROCS(0), "stability": m.Stability}
				for g, col := range p.set.GroupNames {
					ids := map[string]int{}
					truth := make([]int, len(p.fitRows))
					for j, i := range p.fitRows {
						v := p.set.Records[i].Groups[g]
						if _, ok := ids[v]; !ok {
							ids[v] = len(ids)
						}
						truth[j] = ids[v]
					}
					rec["nmi_"+strings.ReplaceAll(strings.ToLower(col), " ", "_")] = topics.NMI(dom, truth)
				}
				ci := topics.NewCoherenceIndex(p.fitCounts)
				sum := 0.0
				for _, top := range m.TopIDs(10) {
					sum += ci.NPMI(top)
				}
				rec["npmi"] = sum / float64(cc.k)
				line, _ := json.Marshal(rec)
				fmt.Println(string(line))
			}
		})
	}
}
