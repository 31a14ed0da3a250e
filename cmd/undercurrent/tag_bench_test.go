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
	"syscall"
	"testing"
	"time"

	"undercurrent/text"
	"undercurrent/text/demotown"
	"undercurrent/text/intake"
	"undercurrent/text/redact"
	"undercurrent/topics"
)

// BenchmarkTag measures tagging throughput (narratives/s) on demotown narratives with a
// model fitted on 2,000 of them (K = 14, the corpus's number of planted themes): the
// stages alone (fold-in one narrative at a time and in batches of tagBatch) and the whole
// of tagRecords (redact, blank, frozen pipeline and fold-in in the batch workers). Issue
// 9's goal is ≥ 20k narratives/s streaming with flat memory; BenchmarkTagCommand adds
// reading and writing the files.
//
//	go test -run '^$' -bench Tag -benchtime 20000x ./cmd/undercurrent/
func BenchmarkTag(b *testing.B) {
	m, recs := benchModel(b)
	red, err := redact.New(redact.Options{})
	if err != nil {
		b.Fatal(err)
	}
	pipes, err := framePipelines(m, 2)
	if err != nil {
		b.Fatal(err)
	}
	texts := make([]string, len(recs))
	docs := make([][]int32, len(recs))
	for i, r := range recs {
		out, _ := red.Redact(r.Text)
		texts[i] = redact.Blank(out)
		docs[i] = pipes[0].Transform(texts[i]).Terms
	}
	// The machine is shared, so wall-clock rates are noisy; cpu-µs/narrative (user + system
	// time of the process) is the steadier figure, and 2e6 / it is the rate two idle cores
	// would give when the stage runs on both.
	var cpu0 time.Duration
	rate := func(b *testing.B) {
		b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "narratives/s")
		b.ReportMetric(float64((cpuTime()-cpu0).Microseconds())/float64(b.N), "cpu-µs/narrative")
	}
	start := func(b *testing.B) {
		b.ResetTimer()
		cpu0 = cpuTime()
	}
	b.Run("redact", func(b *testing.B) {
		start(b)
		for i := 0; i < b.N; i++ {
			out, _ := red.Redact(recs[i%len(recs)].Text)
			_ = redact.Blank(out)
		}
		rate(b)
	})
	b.Run("transform", func(b *testing.B) {
		start(b)
		for i := 0; i < b.N; i++ {
			_ = pipes[0].Transform(texts[i%len(texts)])
		}
		rate(b)
	})
	b.Run("infer", func(b *testing.B) {
		tg := topics.NewTagger(m, topics.InferSettings{})
		theta := make([]float64, m.K())
		start(b)
		for i := 0; i < b.N; i++ {
			j := i % len(recs)
			tg.InferTo(theta, recs[j].ID, docs[j])
		}
		rate(b)
	})
	b.Run("infer-batch", func(b *testing.B) {
		tg := topics.NewTagger(m, topics.InferSettings{})
		batch := make([]topics.Doc, tagBatch)
		theta := make([]float64, tagBatch*m.K())
		start(b)
		for i := 0; i < b.N; i += tagBatch {
			n := min(tagBatch, b.N-i)
			for j := range n {
				r := (i + j) % len(recs)
				batch[j] = topics.Doc{ID: recs[r].ID, IDs: docs[r]}
			}
			tg.InferBatchTo(theta[:n*m.K()], batch[:n])
		}
		rate(b)
	})
	b.Run("whole", func(b *testing.B) {
		all := make([]intake.Record, b.N)
		for i := range all {
			all[i] = recs[i%len(recs)]
		}
		tg := topics.NewTagger(m, topics.InferSettings{Workers: len(pipes)})
		var ms0, ms1 runtime.MemStats
		runtime.GC()
		runtime.ReadMemStats(&ms0)
		start(b)
		if _, err := tagRecords(context.Background(), sliceRecords(all), red, pipes, tg, func(*intake.Record, []float64) error { return nil }); err != nil {
			b.Fatal(err)
		}
		b.StopTimer()
		runtime.ReadMemStats(&ms1)
		rate(b)
		b.ReportMetric(float64(ms1.TotalAlloc-ms0.TotalAlloc)/float64(b.N), "B/narrative")
	})
}

// BenchmarkTagCommand measures the whole tag command on a demotown file of b.N rows (Seed
// 11, the benchModel's model): reading and accounting for the rows (intake's two passes),
// redaction, the frozen pipeline, fold-in and writing the wide CSV. This is the figure
// issue 9's goal is about.
//
//	go test -run '^$' -bench TagCommand -benchtime 50000x ./cmd/undercurrent/
func BenchmarkTagCommand(b *testing.B) {
	m, _ := benchModel(b)
	dir := b.TempDir()
	var mb bytes.Buffer
	if err := m.Save(&mb); err != nil {
		b.Fatal(err)
	}
	model := filepath.Join(dir, "themes.ucmodel")
	if err := os.WriteFile(model, mb.Bytes(), 0o644); err != nil {
		b.Fatal(err)
	}
	if err := demotown.StreamDir(dir, demotown.Config{N: b.N, Seed: 11}); err != nil {
		b.Fatal(err)
	}
	out := filepath.Join(dir, "tagged.csv")
	var stderr bytes.Buffer
	e := &env{stdin: bytes.NewReader(nil), stdout: &bytes.Buffer{}, stderr: &stderr, quiet: true}
	args := []string{"tag", "-q", "-model", model, "-id", "incident_id", "-date", "reported", "-text", "narrative",
		"-out", out, filepath.Join(dir, demotown.IncidentsFile)}
	b.ResetTimer()
	cpu0 := cpuTime()
	if code := run(context.Background(), e, args); code != exitOK {
		b.Fatalf("tag: exit %d: %s", code, stderr.String())
	}
	b.StopTimer()
	rate, cpu := float64(b.N)/b.Elapsed().Seconds(), float64((cpuTime()-cpu0).Microseconds())/float64(b.N)
	b.ReportMetric(rate, "narratives/s")
	b.ReportMetric(cpu, "cpu-µs/narrative")
	if os.Getenv("UNDERCURRENT_BENCH_JSON") != "" && b.N >= 10000 {
		line, _ := json.Marshal(map[string]any{"bench": "tag", "system": "undercurrent", "corpus": "demotown",
			"narratives": b.N, "seconds": b.Elapsed().Seconds(), "narratives_per_s": math.Round(rate),
			"cpu_us_per_narrative": math.Round(cpu*10) / 10, "peak_mb": peakMB(), "gomaxprocs": runtime.GOMAXPROCS(0)})
		fmt.Println("\n" + string(line)) // after the benchmark name go test has printed
	}
}

// cpuTime returns the user and system CPU time of the process so far.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

// benchModel fits the benchmark's model on the first 2,000 of 6,000 demotown narratives and
// returns it with all 6,000 records.
func benchModel(b *testing.B) (*topics.Model, []intake.Record) {
	b.Helper()
	c := demotown.Generate(demotown.Config{Seed: 5, N: 6000})
	recs := make([]intake.Record, len(c.Incidents))
	for i, in := range c.Incidents {
		recs[i] = intake.Record{ID: in.ID, Text: in.Narrative}
	}
	red, err := redact.New(redact.Options{})
	if err != nil {
		b.Fatal(err)
	}
	blanked := make([]string, 2000)
	for i := range blanked {
		out, _ := red.Redact(recs[i].Text)
		blanked[i] = redact.Blank(out)
	}
	corpus, frozen, err := text.Build(context.Background(), blanked, text.DefaultSettings())
	if err != nil {
		b.Fatal(err)
	}
	blob, err := json.Marshal(frozen)
	if err != nil {
		b.Fatal(err)
	}
	m, err := topics.Fit(context.Background(), topics.Corpus{Counts: corpus.Counts, Vocabulary: corpus.Vocab, Display: corpus.Display, Pipeline: blob},
		topics.Settings{K: 14, Iterations: 60, Seed: 1})
	if err != nil {
		b.Fatal(err)
	}
	return m, recs
}
