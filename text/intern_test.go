package text

import (
	"fmt"
	"testing"
)

func TestInternTable(t *testing.T) {
	tb := newInternTable(1)
	words := []string{}
	for i := 0; i < 5000; i++ {
		words = append(words, fmt.Sprint("w", i%1700))
		// Every length from 1 to 20 (packed keys up to 15 bytes, hashed beyond), texts that
		// differ only in their last byte or in their length.
		n := 1 + i%20
		words = append(words, fmt.Sprintf("%0*d", n, i%37), fmt.Sprintf("%0*d", n, i%37)+"\x00")
	}
	ref := map[string]int32{}
	for _, w := range words {
		id := tb.id([]byte(w))
		if r, ok := ref[w]; ok {
			if r != id {
				t.Fatalf("%s: %d then %d", w, r, id)
			}
		} else {
			if int(id) != len(ref) {
				t.Fatalf("%s: new id %d, want %d", w, id, len(ref))
			}
			ref[w] = id
		}
	}
	for w, id := range ref {
		if tb.findString(w) != id || tb.find([]byte(w)) != id || tb.idString(w) != id {
			t.Fatalf("%q: find/idString disagree with id %d", w, id)
		}
	}
	if tb.findString("not there") != -1 {
		t.Fatal("find of a missing text")
	}
	if id := tb.idString("new text"); int(id) != len(ref) || tb.strs[id] != "new text" {
		t.Fatalf("idString of a new text: %d", id)
	}
	tb.reset()
	if tb.id([]byte("x")) != 0 {
		t.Fatal("reset")
	}
}

// countTable agrees with a map on random keys (including 0).
func TestCountTable(t *testing.T) {
	ct := newCountTable(0)
	ref := map[uint64]int{}
	x := uint64(1)
	for i := 0; i < 20000; i++ {
		x = x*6364136223846793005 + 1442695040888963407
		k := x % 3000
		ct.add(k, 1+i%3)
		ref[k] += 1 + i%3
	}
	got := map[uint64]int{}
	ct.each(func(k uint64, c int) { got[k] = c })
	if len(got) != len(ref) || ct.n != len(ref) {
		t.Fatalf("%d keys, want %d", len(got), len(ref))
	}
	for k, v := range ref {
		if got[k] != v {
			t.Fatalf("key %d: %d, want %d", k, got[k], v)
		}
	}
}

// BenchmarkFusedScan is Build's first pass on one goroutine: scan and intern the OSHA
// abstracts (or the generated corpus when OSHA is missing).
func BenchmarkFusedScan(b *testing.B) {
	docs := genCorpus(5000, 1)
	if oshaPath != "" {
		docs = loadOSHA(b, 0)
	}
	b.SetBytes(totalBytes(docs))
	var sc scanner
	for i := 0; i < b.N; i++ {
		sc.in, sc.surfs, sc.ids = newInternTable(4096), sc.surfs[:0], sc.ids[:0]
		for _, d := range docs {
			sc.scan(d, false)
		}
	}
}
