package phrase

import (
	"math"
	"testing"
)

// Expected G values come from Debian's python3-scipy 1.10.1, as made by testdata/gen_llr.py
// (committed output testdata/llr_scipy.txt), e.g.
//
//	>>> from scipy.stats import chi2_contingency
//	>>> chi2_contingency([[110, 2442], [111, 29114]], correction=False, lambda_="log-likelihood")[0]
//	270.721876936225
//
// The test reads the committed fixture, so it needs no Python.
func TestLLRAgainstScipy(t *testing.T) {
	for _, c := range loadFixture(t) {
		got := LLR(c.k[0], c.k[1], c.k[2], c.k[3])
		if math.Abs(got-c.g) > 1e-9*math.Max(1, c.g) {
			t.Errorf("LLR%v = %.12g, want %.12g (scipy)", c.k, got, c.g)
		}
	}
}

// A hand computation: the independent table [[10,10],[10,10]] has G² = 0; [[1,0],[0,1]] has
// G² = 2*(1*ln(1/0.5) + 1*ln(1/0.5)) = 4 ln 2.
func TestLLRHand(t *testing.T) {
	tests := []struct {
		k    [4]float64
		want float64
	}{
		{[4]float64{10, 10, 10, 10}, 0},
		{[4]float64{1, 0, 0, 1}, 4 * math.Ln2},
		{[4]float64{0, 0, 0, 0}, 0},
	}
	for _, tt := range tests {
		if got := LLR(tt.k[0], tt.k[1], tt.k[2], tt.k[3]); math.Abs(got-tt.want) > 1e-12 {
			t.Errorf("LLR%v = %v, want %v", tt.k, got, tt.want)
		}
	}
}

// NPMI bounds from Bouma (2009): 1 for perfect co-occurrence, 0 for independence.
func TestNPMI(t *testing.T) {
	if got := NPMI(5, 5, 5, 5); got != 1 {
		t.Errorf("perfect = %v", got)
	}
	if got := NPMI(25, 50, 50, 100); math.Abs(got) > 1e-12 {
		t.Errorf("independent = %v", got)
	}
}

func TestSelect(t *testing.T) {
	// tokens 0 1 always together (20 times) in 1000 pairs; 2 3 together 2 times (below MinCount).
	counts := map[[2]int32]int{{0, 1}: 20, {2, 3}: 2, {4, 5}: 30}
	left := []int{20, 0, 100, 0, 500, 0}
	right := []int{0, 20, 0, 100, 0, 60}
	got := Select(counts, left, right, 1000, Settings{})
	if len(got) != 1 || got[0].A != 0 || got[0].B != 1 {
		t.Fatalf("got %+v", got)
	}
}
