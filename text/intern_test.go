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
	tb.reset()
	if tb.id([]byte("x")) != 0 {
		t.Fatal("reset")
	}
}
