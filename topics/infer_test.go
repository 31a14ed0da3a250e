package topics

import (
	"context"
	"fmt"
	"io"
	"runtime"
	"slices"
	"sync"
	"testing"
)

type sliceSource struct {
	docs []Doc
	i    int
}

func (s *sliceSource) Next() (Doc, error) {
	if s.i == len(s.docs) {
		return Doc{}, io.EOF
	}
	s.i++
	return s.docs[s.i-1], nil
}

// TestTagsIndependentOfBatch checks the tagging contract of issue 5: a narrative's θ
// depends on its id and tokens only — not its batch, its position or GOMAXPROCS.
func TestTagsIndependentOfBatch(t *testing.T) {
	m, g := smallModel(t, Settings{Seed: 5})
	tg := NewTagger(m, InferSettings{})
	var docs []Doc
	for i, d := range g.docs[:40] {
		docs = append(docs, Doc{ID: fmt.Sprintf("n-%d", i), IDs: d})
	}
	alone := make([][]float64, len(docs))
	for i, d := range docs {
		alone[i] = tg.Infer(d.ID, d.IDs)
	}
	for _, procs := range []int{1, 2} {
		prev := runtime.GOMAXPROCS(procs)
		// Reverse order, in a stream with other narratives.
		rev := slices.Clone(docs)
		slices.Reverse(rev)
		var got [][]float64
		var ids []string
		err := tg.Stream(context.Background(), &sliceSource{docs: rev}, func(d Doc, th []float64) error {
			got = append(got, slices.Clone(th))
			ids = append(ids, d.ID)
			return nil
		})
		runtime.GOMAXPROCS(prev)
		if err != nil {
			t.Fatal(err)
		}
		for i := range rev {
			if ids[i] != rev[i].ID {
				t.Fatalf("output order: got %s at %d, want %s", ids[i], i, rev[i].ID)
			}
			j := len(docs) - 1 - i
			if !slices.Equal(got[i], alone[j]) {
				t.Fatalf("GOMAXPROCS %d: θ of %s differs between stream and single call", procs, ids[i])
			}
		}
	}
	// The dominant theme of a tagged training narrative agrees with the fit's θ.
	agree := 0
	for i, d := range docs {
		if argmax(alone[i]) == argmax(m.DocTopics(i)) {
			agree++
		}
		_ = d
	}
	if agree < 36 {
		t.Fatalf("fold-in dominant theme agrees with the fit on %d of 40 narratives", agree)
	}
	// The same text under another id gets its own stream (so tags are seeded per narrative).
	a1, a2, _ := docSeed(nil, "x", docs[0].IDs)
	b1, b2, _ := docSeed(nil, "y", docs[0].IDs)
	c1, c2, _ := docSeed(nil, "x", docs[1].IDs)
	if a1 == b1 && a2 == b2 || a1 == c1 && a2 == c2 {
		t.Fatal("seed ignores the id or the tokens")
	}
}

func TestStreamStopsOnEmitError(t *testing.T) {
	m, g := smallModel(t, Settings{Seed: 5})
	tg := NewTagger(m, InferSettings{Iterations: 10})
	var docs []Doc
	for i, d := range g.docs {
		docs = append(docs, Doc{ID: fmt.Sprint(i), IDs: d})
	}
	n := 0
	stop := fmt.Errorf("stop")
	err := tg.Stream(context.Background(), &sliceSource{docs: docs}, func(Doc, []float64) error {
		n++
		if n == 5 {
			return stop
		}
		return nil
	})
	if err != stop || n != 5 {
		t.Fatalf("err %v after %d", err, n)
	}
}

type countingSource struct {
	n, read, emitted, maxOut int
	doc                      []int32
}

func (s *countingSource) Next() (Doc, error) {
	if s.read == s.n {
		return Doc{}, io.EOF
	}
	s.read++
	if out := s.read - s.emitted; out > s.maxOut {
		s.maxOut = out
	}
	return Doc{ID: fmt.Sprint(s.read), IDs: s.doc}, nil
}

// TestStreamFlatMemory: however long the input, at most 4 × Workers narratives are read
// ahead of the one being emitted (the test source's counters are shared by the reader
// goroutine and emit, hence the lock).
func TestStreamFlatMemory(t *testing.T) {
	m, g := smallModel(t, Settings{Seed: 5})
	tg := NewTagger(m, InferSettings{Iterations: 5, Workers: 2})
	src := &countingSource{n: 3000, doc: g.docs[0]}
	var mu sync.Mutex
	emitted := 0
	err := tg.Stream(context.Background(), lockedSource{src, &mu}, func(d Doc, th []float64) error {
		mu.Lock()
		src.emitted++
		emitted++
		mu.Unlock()
		return nil
	})
	if err != nil || emitted != 3000 {
		t.Fatalf("err %v, emitted %d", err, emitted)
	}
	if src.maxOut > 4*2+1 {
		t.Fatalf("%d narratives in flight, want ≤ 9", src.maxOut)
	}
}

type lockedSource struct {
	s  *countingSource
	mu *sync.Mutex
}

func (l lockedSource) Next() (Doc, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.s.Next()
}
