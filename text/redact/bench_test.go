package redact

import (
	"bytes"
	"encoding/csv"
	"os"
	"strings"
	"syscall"
	"testing"
	"time"
)

// cpuTime returns the process's user+system CPU time, so that throughput can be reported
// per CPU second as well as per wall second on a shared machine.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

// reportCPU adds a "cpu-MB/s" metric, bytes redacted per CPU second, and "cpu-us/doc",
// CPU microseconds per narrative, for a loop redacting docs narratives of bytes bytes in all.
func reportCPU(b *testing.B, start time.Duration, bytes, docs int) {
	if d := cpuTime() - start; d > 0 {
		b.ReportMetric(float64(bytes)*float64(b.N)/d.Seconds()/1e6, "cpu-MB/s")
		b.ReportMetric(d.Seconds()*1e6/float64(b.N)/float64(docs), "cpu-us/doc")
	}
}

// BenchmarkRedactDemo measures throughput on the default demo corpus (package demotown),
// the narratives `undercurrent tag` is sized by (goal, issue 9: tagging at 20k
// narratives/s on 2 cores, of which redaction may take at most about 40 CPU µs each).
func BenchmarkRedactDemo(b *testing.B) {
	texts := demoTexts()
	r, _ := New(Options{})
	n := 0
	for _, t := range texts {
		n += len(t)
	}
	b.SetBytes(int64(n))
	b.ResetTimer()
	c0 := cpuTime()
	for i := 0; i < b.N; i++ {
		for _, t := range texts {
			r.Redact(t)
		}
	}
	reportCPU(b, c0, n, len(texts))
}

// BenchmarkRedact measures throughput on generated narratives (goal, issue 6: at least
// 5 MB/s).
func BenchmarkRedact(b *testing.B) {
	docs, listed := generate(2, 500)
	r, _ := New(Options{Names: listed})
	texts := make([]string, len(docs))
	n := 0
	for i, d := range docs {
		texts[i] = d.text
		n += len(d.text)
	}
	b.SetBytes(int64(n))
	b.ResetTimer()
	c0 := cpuTime()
	for i := 0; i < b.N; i++ {
		for _, t := range texts {
			r.Redact(t)
		}
	}
	reportCPU(b, c0, n, len(texts))
}

// BenchmarkPathological runs inputs built to provoke slow paths (long runs without spaces,
// repeated cues, many triggers); each must stay roughly linear.
func BenchmarkPathological(b *testing.B) {
	r, _ := New(Options{Names: []string{"Tobin Marsh"}})
	for _, c := range []struct{ name, in string }{
		{"digits", strings.Repeat("555 ", 20000)},
		{"emails", strings.Repeat("a@b.cc ", 10000)},
		{"names", strings.Repeat("Mr. Quosby Zed ", 5000)},
		{"streets", strings.Repeat("12 Elm St and ", 5000)},
		{"nospace", strings.Repeat("1a@", 20000)},
		{"ssn", strings.Repeat("123-45-6789 ", 5000)},
	} {
		b.Run(c.name, func(b *testing.B) {
			b.SetBytes(int64(len(c.in)))
			for i := 0; i < b.N; i++ {
				r.Redact(c.in)
			}
		})
	}
}

// BenchmarkRedactOSHA measures throughput on the real OSHA abstracts (few items to
// redact), when shared/corpora is present.
func BenchmarkRedactOSHA(b *testing.B) {
	p := sharedFile("corpora/osha-abstracts/osha.csv")
	if p == "" {
		b.Skip("osha.csv not found")
	}
	raw, err := os.ReadFile(p)
	if err != nil {
		b.Fatal(err)
	}
	rows, err := csv.NewReader(bytes.NewReader(raw)).ReadAll()
	if err != nil {
		b.Fatal(err)
	}
	var texts []string
	n := 0
	for _, row := range rows[1:] {
		texts = append(texts, row[2])
		n += len(row[2])
	}
	r, _ := New(Options{})
	b.SetBytes(int64(n))
	b.ResetTimer()
	c0 := cpuTime()
	for i := 0; i < b.N; i++ {
		for _, t := range texts {
			r.Redact(t)
		}
	}
	reportCPU(b, c0, n, len(texts))
}
