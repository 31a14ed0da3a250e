package text

import (
	"context"
	"fmt"
	"math/rand/v2"
	"strings"
	"testing"
)

// genCorpus makes n synthetic incident narratives from an invented vocabulary (no real people
// or places), seeded, with abbreviations, times, codes and some OCR noise.
func genCorpus(n int, seed uint64) []string {
	r := rand.New(rand.NewPCG(seed, 2))
	subj := []string{"RP", "subj", "susp", "the vic", "Ofc Lindqvist", "the caller", "a juv", "the driver"}
	verbs := []string{"reported", "stated", "observed", "advised", "located", "contacted", "struck", "fled from", "argued with", "followed"}
	objs := []string{"a blue veh", "the res on Alder Ct", "a neighbor", "the store clerk", "a bicycle", "the traffic stop", "an unknown male", "the apt door", "mental health staff", "a parked vehicle"}
	tails := []string{"GOA.", "UTL.", "10-50 no inj.", "w/ minor damage.", "approx 20 min later.", "per dispatch.", "and left NB on Birch St.", "0fficer cleared.", "see supplemental.", "resi-\ndence checked."}
	docs := make([]string, n)
	var b strings.Builder
	for i := range docs {
		b.Reset()
		k := 2 + r.IntN(6)
		fmt.Fprintf(&b, "At %02d%02d hrs on %d/%d/2026 ", r.IntN(24), r.IntN(60), 1+r.IntN(12), 1+r.IntN(28))
		for j := 0; j < k; j++ {
			fmt.Fprintf(&b, "%s %s %s %s ", subj[r.IntN(len(subj))], verbs[r.IntN(len(verbs))], objs[r.IntN(len(objs))], tails[r.IntN(len(tails))])
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

func benchBuild(b *testing.B, docs []string) {
	s := DefaultSettings()
	b.SetBytes(totalBytes(docs))
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, _, err := Build(context.Background(), docs, s); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkPipeline runs Build (the whole corpus pipeline) on the OSHA abstracts and on a
// generated corpus; MB/s is raw narrative bytes per second.
func BenchmarkPipeline(b *testing.B) {
	b.Run("osha", func(b *testing.B) { benchBuild(b, loadOSHA(b, 0)) })
	b.Run("generated-20k", func(b *testing.B) { benchBuild(b, genCorpus(20000, 1)) })
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
