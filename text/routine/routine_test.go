package routine

import (
	"math"
	"strings"
	"testing"
)

func hashes(s string) []uint64 {
	var out []uint64
	for _, w := range strings.Fields(s) {
		out = append(out, HashString(w))
	}
	return out
}

// jaccard of 3-shingle sets, computed directly (the quantity MinHash estimates, Broder 1997).
func jaccard(a, b string) float64 {
	set := func(s string) map[string]bool {
		f := strings.Fields(s)
		m := map[string]bool{}
		for i := 0; i+3 <= len(f); i++ {
			m[strings.Join(f[i:i+3], " ")] = true
		}
		return m
	}
	x, y := set(a), set(b)
	inter := 0
	for k := range x {
		if y[k] {
			inter++
		}
	}
	return float64(inter) / float64(len(x)+len(y)-inter)
}

func TestGroups(t *testing.T) {
	base := "caller reported loud music from the apartment upstairs officer advised the tenant to lower the volume and cleared"
	docs := []string{
		base,
		"suspect fled on foot northbound through the alley and was not located after a search of the area by two units",
		base + " no further action",
		base,
		"",
	}
	h := NewHasher(Settings{Seed: 1})
	sigs := make([][]uint64, len(docs))
	for i, d := range docs {
		sigs[i] = h.Signature(nil, hashes(d))
	}
	g := h.Groups(sigs)
	want := []int{0, 1, 0, 0, 4}
	for i := range want {
		if g[i] != want[i] {
			t.Errorf("group[%d] = %d, want %d (groups %v)", i, g[i], want[i], g)
		}
	}
	// The estimate is near the true Jaccard similarity (0.86 here); 64 hashes give a standard
	// error of about sqrt(J(1-J)/64) ≈ 0.04.
	j := jaccard(docs[0], docs[2])
	if est := Similarity(sigs[0], sigs[2]); math.Abs(est-j) > 0.15 {
		t.Errorf("estimate %v, jaccard %v", est, j)
	}
}
