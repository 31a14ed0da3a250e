package redact

import (
	"strings"
	"testing"
)

// BenchmarkRedact measures throughput on generated narratives (goal, issue 6: at least
// 5 MB/s).
func BenchmarkRedact(b *testing.B) {
	docs, listed := generate(2, 500)
	r, _ := New(Options{Names: listed})
	var sb strings.Builder
	for _, d := range docs {
		sb.WriteString(d.text)
		sb.WriteString("\n\n")
	}
	texts := make([]string, len(docs))
	n := 0
	for i, d := range docs {
		texts[i] = d.text
		n += len(d.text)
	}
	b.SetBytes(int64(n))
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		for _, t := range texts {
			r.Redact(t)
		}
	}
}
