package text

import (
	"context"
	"encoding/csv"
	"fmt"
	"math/rand/v2"
	"os"
	"runtime"
	"strings"
	"syscall"
	"testing"
	"time"
)

// genCorpus makes n synthetic incident narratives from an invented vocabulary (no real people
// or places), seeded, with abbreviations, times, codes and some OCR noise.
func genCorpus(n int, seed uint64) []string {
	r := rand.New(rand.NewPCG(seed, 2))
	subj := []string{"RP", "subj", "susp", "the vic", "Ofc Quarrendel", "the caller", "a juv", "the driver"}
	verbs := []string{"reported", "stated", "observed", "advised", "located", "contacted", "struck", "fled from", "argued with", "followed"}
	objs := []string{"a blue veh", "the res on Alder Ct", "a neighbor", "the store clerk", "a bicycle", "the traffic stop", "an unknown male", "the apt door", "mental health staff", "a parked vehicle"}
	tails := []string{"GOA.", "UTL.", "10-50 no inj.", "w/ minor damage.", "approx 20 min later.", "per dispatch.", "and left NB on Birch St.", "0fficer cleared.", "see supplemental.", "resi-\ndence checked."}
	// An invented open vocabulary (syllable words, Zipf-distributed) so that the corpus has
	// thousands of word types, as real narratives do.
	syl := []string{"ka", "lo", "mir", "den", "tas", "vel", "or", "un", "bri", "sto", "quen", "al", "ter", "ning", "post", "ed", "ment", "ish", "ra", "go"}
	words := make([]string, 20000)
	for i := range words {
		var w strings.Builder
		for k := 2 + r.IntN(3); k > 0; k-- {
			w.WriteString(syl[r.IntN(len(syl))])
		}
		words[i] = w.String()
	}
	zipf := rand.NewZipf(r, 1.1, 1, uint64(len(words)-1))
	docs := make([]string, n)
	var b strings.Builder
	for i := range docs {
		b.Reset()
		k := 2 + r.IntN(6)
		fmt.Fprintf(&b, "At %02d%02d hrs on %d/%d/2026 ", r.IntN(24), r.IntN(60), 1+r.IntN(12), 1+r.IntN(28))
		for j := 0; j < k; j++ {
			fmt.Fprintf(&b, "%s %s %s near the %s %s %s ", subj[r.IntN(len(subj))], verbs[r.IntN(len(verbs))], objs[r.IntN(len(objs))],
				words[zipf.Uint64()], words[zipf.Uint64()], tails[r.IntN(len(tails))])
		}
		docs[i] = b.String()
	}
	return docs
}

func totalBytes(docs []string) int64 {
	var n int64
	for _, d := range docs {
		n += int64(len(d))
	}
	return n
}

// cpuSeconds is the process's user+system CPU time. On a shared machine wall-clock MB/s
// depends on the other users; MB per CPU-second (reported as MB/cpu-s) does much less.
func cpuSeconds() float64 {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	tv := func(t syscall.Timeval) float64 { return float64(t.Sec) + float64(t.Usec)/1e6 }
	return tv(ru.Utime) + tv(ru.Stime)
}

// peakMB is the process's peak resident set (VmHWM), in 10^6 bytes, or 0 if unknown.
func peakMB() float64 {
	b, err := os.ReadFile("/proc/self/status")
	if err != nil {
		return 0
	}
	for _, line := range strings.Split(string(b), "\n") {
		if v, ok := strings.CutPrefix(line, "VmHWM:"); ok {
			var kb float64
			fmt.Sscan(strings.TrimSuffix(strings.TrimSpace(v), " kB"), &kb)
			return kb * 1024 / 1e6
		}
	}
	return 0
}

// coreSettings keep only the steps the scikit-learn baseline has (tokenize, stopwords, stem,
// count, prune): no abbreviations, repair, phrases or routine detection.
func coreSettings() Settings {
	s := DefaultSettings()
	s.Abbrev.NoShipped = true
	s.Repair.Enabled = false
	s.Phrases.Enabled = false
	s.Routine = RoutineSettings{}
	return s
}

func benchBuild(b *testing.B, name string, docs []string) {
	benchBuildWith(b, name, docs, DefaultSettings())
}

func benchBuildWith(b *testing.B, name string, docs []string, s Settings) {
	n := totalBytes(docs)
	b.SetBytes(n)
	b.ReportAllocs()
	b.ResetTimer()
	cpu0, t0 := cpuSeconds(), time.Now()
	var c *Corpus
	for i := 0; i < b.N; i++ {
		var err error
		if c, _, err = Build(context.Background(), docs, s); err != nil {
			b.Fatal(err)
		}
	}
	wall, cpu := time.Since(t0).Seconds()/float64(b.N), (cpuSeconds()-cpu0)/float64(b.N)
	b.ReportMetric(float64(n)/1e6/cpu, "MB/cpu-s")
	b.ReportMetric(modelMB(c), "model-MB")
	if os.Getenv("UNDERCURRENT_BENCH_JSON") != "" {
		fmt.Printf("\n{\"bench\":\"pipeline\",\"system\":\"undercurrent\",\"corpus\":%q,\"seconds\":%.4f,\"mb_per_s\":%.3f,\"peak_mb\":%.1f,\"cpu_seconds\":%.4f,\"docs\":%d,\"vocab\":%d,\"nnz\":%d,\"model_mb\":%.1f,\"gomaxprocs\":%d}\n",
			name, wall, float64(n)/1e6/wall, peakMB(), cpu, len(docs), len(c.Vocab), c.Counts.NNZ(), modelMB(c), runtime.GOMAXPROCS(0))
	}
}

// modelMB is the size of the vocabulary (terms and display forms) and the count matrix in
// 10^6 bytes: CSR arrays (8-byte row pointers, 4-byte columns, 8-byte values) plus strings.
func modelMB(c *Corpus) float64 {
	n := 8*len(c.Counts.Indptr) + 12*c.Counts.NNZ()
	for i := range c.Vocab {
		n += len(c.Vocab[i]) + len(c.Display[i]) + 32 + 8
	}
	return float64(n) / 1e6
}

// BenchmarkPipeline1M builds a generated corpus of one million narratives once, for the
// memory goal (vocabulary and matrix within 2 GB); it is skipped unless UNDERCURRENT_BENCH_1M
// is set (it needs about 0.5 GB for the text alone and minutes of CPU).
func BenchmarkPipeline1M(b *testing.B) {
	if os.Getenv("UNDERCURRENT_BENCH_1M") == "" {
		b.Skip("UNDERCURRENT_BENCH_1M not set")
	}
	benchBuild(b, "generated-1m", genCorpus(1000000, 1))
}

// BenchmarkPipeline runs Build (the whole corpus pipeline) on the OSHA abstracts and on a
// generated corpus of 100,000 narratives, each also with only the steps the scikit-learn
// baseline has ("-core"); MB/s is raw narrative bytes per second. With
// UNDERCURRENT_BENCH_JSON set it also prints one JSON line per run (the last line of each
// corpus is the measured one):
//
//	UNDERCURRENT_BENCH_JSON=1 go test ./text -run XXX -bench 'Pipeline$' -benchtime 3x | grep '^{'
//
// The scikit-learn baseline on the same text: testdata/bench_sklearn.py (the generated corpus
// is written by TestWriteGeneratedCorpus).
func BenchmarkPipeline(b *testing.B) {
	b.Run("osha", func(b *testing.B) { benchBuild(b, "osha", loadOSHA(b, 0)) })
	b.Run("generated-100k", func(b *testing.B) { benchBuild(b, "generated-100k", genCorpus(100000, 1)) })
	// "-sentences": with the boilerplate-sentence step on (off by default).
	withSentences := DefaultSettings()
	withSentences.Sentences = SentenceSettings{Enabled: true, Repeats: true}
	b.Run("osha-sentences", func(b *testing.B) { benchBuildWith(b, "osha-sentences", loadOSHA(b, 0), withSentences) })
	b.Run("generated-100k-sentences", func(b *testing.B) {
		benchBuildWith(b, "generated-100k-sentences", genCorpus(100000, 1), withSentences)
	})
	b.Run("osha-core", func(b *testing.B) { benchBuildWith(b, "osha-core", loadOSHA(b, 0), coreSettings()) })
	b.Run("generated-100k-core", func(b *testing.B) {
		benchBuildWith(b, "generated-100k-core", genCorpus(100000, 1), coreSettings())
	})
}

// BenchmarkTransform streams narratives one at a time through a Frozen pipeline.
func BenchmarkTransform(b *testing.B) {
	docs := loadOSHA(b, 0)
	_, f, err := Build(context.Background(), docs, DefaultSettings())
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(totalBytes(docs))
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		for _, d := range docs {
			f.Transform(d)
		}
	}
}

// TestWriteGeneratedCorpus writes the generated benchmark corpus as CSV (column "narrative")
// to the file named by UNDERCURRENT_GEN_CORPUS, for testdata/bench_sklearn.py; it is skipped
// otherwise. UNDERCURRENT_GEN_DOCS sets the size (default 100000).
func TestWriteGeneratedCorpus(t *testing.T) {
	path := os.Getenv("UNDERCURRENT_GEN_CORPUS")
	if path == "" {
		t.Skip("UNDERCURRENT_GEN_CORPUS not set")
	}
	n := 100000
	if v := os.Getenv("UNDERCURRENT_GEN_DOCS"); v != "" {
		fmt.Sscan(v, &n)
	}
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	w := csv.NewWriter(f)
	w.Write([]string{"narrative"})
	for _, d := range genCorpus(n, 1) {
		w.Write([]string{d})
	}
	w.Flush()
	if err := w.Error(); err != nil {
		t.Fatal(err)
	}
	if err := f.Close(); err != nil {
		t.Fatal(err)
	}
}

// BenchmarkScan measures the tokenizer alone (normalisation and scanning, no interning) on
// the generated corpus.
func BenchmarkScan(b *testing.B) {
	docs := genCorpus(20000, 1)
	n := totalBytes(docs)
	b.SetBytes(n)
	var sc scanner
	b.ResetTimer()
	cpu0 := cpuSeconds()
	for i := 0; i < b.N; i++ {
		for _, d := range docs {
			sc.scan(d, false)
		}
	}
	b.ReportMetric(float64(n)*float64(b.N)/1e6/(cpuSeconds()-cpu0), "MB/cpu-s")
}
