package intake

import (
	"bytes"
	"context"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"
)

// benchCSV builds an invented export of n rows (seeded, so every run reads the same bytes).
func benchCSV(n int) []byte {
	rng := rand.New(rand.NewPCG(1, 1))
	words := []string{"rp", "reported", "loud", "music", "veh", "parked", "subj", "checked", "area", "all", "clear",
		"alarm", "Alder", "Way", "Birch", "Street", "dog", "loose", "welfare", "check", "theft", "from"}
	var b bytes.Buffer
	b.WriteString("Incident No,Reported,District,Call Type,Narrative\n")
	for i := 0; i < n; i++ {
		fmt.Fprintf(&b, "24-%06d,%d/%d/2024 %02d:%02d,D%d,T%d,\"", i, 1+rng.IntN(12), 1+rng.IntN(28), rng.IntN(24), rng.IntN(60), rng.IntN(5), rng.IntN(9))
		for w := 20 + rng.IntN(60); w > 0; w-- {
			b.WriteString(words[rng.IntN(len(words))])
			b.WriteByte(' ')
		}
		b.WriteString("\"\n")
	}
	return b.Bytes()
}

func benchmarkRead(b *testing.B, n int) {
	data := benchCSV(n)
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	for b.Loop() {
		s, err := readBytes("bench.csv", data, Options{})
		if err != nil || len(s.Records) != n {
			b.Fatal(err)
		}
	}
}

func BenchmarkReadSmall(b *testing.B)  { benchmarkRead(b, 1000) }
func BenchmarkReadMedium(b *testing.B) { benchmarkRead(b, 100000) }

func BenchmarkSurveyMedium(b *testing.B) {
	s, err := readBytes("bench.csv", benchCSV(100000), Options{})
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		Survey(s, SurveyOptions{})
	}
}

// BenchmarkStreamMedium is BenchmarkReadMedium through Stream (two passes over a file
// on disk), for the cost of not holding the records.
func BenchmarkStreamMedium(b *testing.B) {
	data := benchCSV(100000)
	p := filepath.Join(b.TempDir(), "bench.csv")
	if err := os.WriteFile(p, data, 0o644); err != nil {
		b.Fatal(err)
	}
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	for b.Loop() {
		n := 0
		s, err := Stream(context.Background(), []string{p}, nil, Options{Now: testNow}, func(Record) error { n++; return nil })
		if err != nil || n != 100000 || s.Kept() != n {
			b.Fatal(err)
		}
	}
}
