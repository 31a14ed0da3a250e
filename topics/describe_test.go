package topics

import (
	"math"
	"reflect"
	"testing"
)

func handModel() *Model {
	return &Model{k: 2, v: 3, alpha: []float64{0.5, 0.5}, beta: 0.1,
		phi:    []float64{0.5, 0.3, 0.2, 0.1, 0.1, 0.8},
		theta:  []float64{0.9, 0.1, 0.2, 0.8, 0.6, 0.4, 0.5, 0.5},
		docLen: []int{3, 5, 2, 0}, freq: []int64{6, 4, 10},
		vocab: []string{"fall", "ladder", "press"}, display: []string{"fall", "ladder", "press"},
		names: []string{"", ""}}
}

// TestTopWordsRelevance checks relevance against Sievert & Shirley (2014), eq. 1, worked by
// hand: theme 0, p_w = (6, 4, 10)/20, λ = 0.6:
//
//	fall   0.6 ln 0.5 + 0.4 ln(0.5/0.3) = −0.41589 + 0.20433 = −0.21156
//	ladder 0.6 ln 0.3 + 0.4 ln(0.3/0.2) = −0.72238 + 0.16219 = −0.56020
//	press  0.6 ln 0.2 + 0.4 ln(0.2/0.5) = −0.96566 − 0.36652 = −1.33218
//
// Theme 1 by probability (λ = 1): press, then fall and ladder tied (tie to the lower id).
func TestTopWordsRelevance(t *testing.T) {
	m := handModel()
	got := m.TopWords(0, 3, 0.6)
	want := []float64{-0.21156, -0.56020, -1.33218}
	for i, w := range got {
		if w.ID != i || math.Abs(w.Relevance-want[i]) > 5e-5 {
			t.Errorf("rank %d: %s %.5f, want id %d %.5f", i, w.Term, w.Relevance, i, want[i])
		}
	}
	var ids []int
	for _, w := range m.TopWords(1, 3, 1) {
		ids = append(ids, w.ID)
	}
	if !reflect.DeepEqual(ids, []int{2, 0, 1}) {
		t.Errorf("theme 1 by probability: %v", ids)
	}
}

func TestSizesAndRepresentative(t *testing.T) {
	m := handModel()
	// Narrative 3 is empty and is left out; θ rows: (.9,.1) (.2,.8) (.6,.4).
	sz := m.Sizes()
	if sz[0].Dominant != 2 || sz[1].Dominant != 1 || math.Abs(sz[0].Expected-1.7) > 1e-12 || math.Abs(sz[1].Expected-1.3) > 1e-12 {
		t.Errorf("sizes %+v", sz)
	}
	if r := m.Representative(1, 2); !reflect.DeepEqual(r, []int{1, 2}) {
		t.Errorf("representative of theme 1: %v", r)
	}
	if d := m.Dominant(); !reflect.DeepEqual(d, []int{0, 1, 0, -1}) {
		t.Errorf("dominant %v", d)
	}
}

// TestCompareHelpers checks Assign, MatchedJaccard, Hellinger and NMI on small cases
// worked by hand, and NMI against scikit-learn's normalized_mutual_info_score.
func TestCompareHelpers(t *testing.T) {
	// The 3×3 example: the optimum is 0→1, 1→0, 2→2 with cost 1+2+2 = 5.
	if p := Assign([][]float64{{4, 1, 3}, {2, 0, 5}, {3, 2, 2}}); !reflect.DeepEqual(p, []int{1, 0, 2}) {
		t.Errorf("Assign: %v", p)
	}
	a := [][]int{{1, 2, 3}, {4, 5, 6}}
	b := [][]int{{4, 5, 7}, {1, 2, 3}}
	// Matched: {1,2,3}↔{1,2,3} = 1, {4,5,6}↔{4,5,7} = 2/4.
	if j := MatchedJaccard(a, b); math.Abs(j-0.75) > 1e-15 {
		t.Errorf("MatchedJaccard %v", j)
	}
	if h := Hellinger([]float64{1, 0}, []float64{0, 1}); h != 1 {
		t.Errorf("Hellinger of disjoint %v", h)
	}
	// sklearn.metrics.normalized_mutual_info_score([0,0,1,1,2,2],[0,0,1,1,1,1])
	// = 0.7336804366512113 (scikit-learn 1.2.1, Debian python3-sklearn).
	if n := NMI([]int{0, 0, 1, 1, 2, 2}, []int{0, 0, 1, 1, 1, 1}); math.Abs(n-0.7336804366512113) > 1e-12 {
		t.Errorf("NMI %v", n)
	}
}
