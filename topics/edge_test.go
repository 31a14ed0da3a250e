package topics

import (
	"bytes"
	"context"
	"math"
	"testing"
)

// TestEdgeCases: empty narratives, one theme, more themes than tokens, and tagging an empty
// narrative all work without panics and give proper distributions.
func TestEdgeCases(t *testing.T) {
	docs := [][]int32{{0, 1, 1}, {}, {2}, {0, 2, 2, 2}}
	for _, K := range []int{1, 2, 20} {
		m, err := Fit(context.Background(), Corpus{Counts: countMatrix(docs, 3)}, Settings{K: K, Iterations: 20, Seed: 1})
		if err != nil {
			t.Fatalf("K %d: %v", K, err)
		}
		for k := 0; k < K; k++ {
			if s := sum(m.TopicTerms(k)); math.Abs(s-1) > 1e-9 {
				t.Errorf("K %d theme %d: φ sums to %v", K, k, s)
			}
		}
		for d := range docs {
			if s := sum(m.DocTopics(d)); math.Abs(s-1) > 1e-9 {
				t.Errorf("K %d doc %d: θ sums to %v", K, d, s)
			}
		}
		if m.Dominant()[1] != -1 {
			t.Errorf("empty narrative has a dominant theme")
		}
		var buf bytes.Buffer
		if err := m.Save(&buf); err != nil {
			t.Fatal(err)
		}
		lm, err := Load(&buf)
		if err != nil {
			t.Fatalf("K %d: %v", K, err)
		}
		th := NewTagger(lm, InferSettings{}).Infer("empty", nil)
		if s := sum(th); math.Abs(s-1) > 1e-9 {
			t.Errorf("empty narrative θ sums to %v", s)
		}
	}
}
