package cluster

import (
	"encoding/json"
	"errors"
	"math"
	"os"
	"testing"
)

type probFixture struct {
	Rows          [][]float64  `json:"rows"`
	JensenShannon []float64    `json:"jensenshannon"`
	Hellinger     []float64    `json:"hellinger"`
	AverageJSZ    [][4]float64 `json:"average_js_z"`
}

func loadProb(t *testing.T) probFixture {
	b, err := os.ReadFile("testdata/scipy_linkage.json")
	if err != nil {
		t.Fatal(err)
	}
	var f struct {
		Prob probFixture `json:"prob"`
	}
	if err := json.Unmarshal(b, &f); err != nil {
		t.Fatal(err)
	}
	return f.Prob
}

// TestProbDistancesScipy: JensenShannon against
// scipy.spatial.distance.jensenshannon and Hellinger against
// pdist(sqrt(p))/sqrt(2) (Debian python3-scipy 1.10.1, rows with exact
// zeros; fixture from testdata/gen_scipy.py).
func TestProbDistancesScipy(t *testing.T) {
	f := loadProb(t)
	js := PairwiseCondensed(nil, f.Rows, JensenShannon, nil)
	he := PairwiseCondensed(nil, f.Rows, Hellinger, nil)
	for i := range js {
		if !relClose(js[i], f.JensenShannon[i], 1e-12) {
			t.Errorf("JS[%d] = %v, scipy %v", i, js[i], f.JensenShannon[i])
		}
		if !relClose(he[i], f.Hellinger[i], 1e-12) {
			t.Errorf("Hellinger[%d] = %v, scipy %v", i, he[i], f.Hellinger[i])
		}
	}
	// Bounds (common practice): JS ≤ sqrt(ln 2), Hellinger ≤ 1, both 0 on
	// identical rows.
	a, b := []float64{1, 0}, []float64{0, 1}
	if v := JensenShannon(a, b); !relClose(v, math.Sqrt(math.Ln2), 1e-15) {
		t.Errorf("JS of disjoint supports %v, want sqrt(ln 2)", v)
	}
	if v := Hellinger(a, b); v != 1 {
		t.Errorf("Hellinger of disjoint supports %v, want 1", v)
	}
	if JensenShannon(f.Rows[0], f.Rows[0]) != 0 || Hellinger(f.Rows[0], f.Rows[0]) != 0 {
		t.Error("distance of a row to itself is not 0")
	}
}

// TestThemeTree: the theme tree equals scipy's average linkage on the
// Jensen–Shannon distances (fixture above); suggestions are the cut's
// groups; bad rows are errors, not panics.
func TestThemeTree(t *testing.T) {
	f := loadProb(t)
	tt, err := NewThemeTree(f.Rows, JensenShannon, nil)
	if err != nil {
		t.Fatal(err)
	}
	sameMerges(t, "theme tree", tt.Tree, f.AverageJSZ, 1e-12)
	if !validOrder(tt.Tree, tt.Order) {
		t.Error("theme order breaks the tree")
	}
	h := tt.Tree.Merges[2].Height
	sug := tt.Suggestions(h)
	n := 0
	for _, s := range sug {
		n += len(s.Themes) - 1
		if s.Height > h {
			t.Errorf("suggestion above the cut: %v", s)
		}
	}
	if n != 3 {
		t.Errorf("suggestions %v cover %d merges, want 3", sug, n)
	}
	bad := [][]float64{{0.5, 0.5}, {0.7, 0.7}}
	var pe *ProbabilityError
	if _, err := NewThemeTree(bad, Hellinger, nil); !errors.As(err, &pe) || pe.Row != 1 {
		t.Errorf("row summing to 1.4: err %v", err)
	}
	bad[1] = []float64{math.NaN(), 1}
	if _, err := NewThemeTree(bad, Hellinger, nil); !errors.As(err, &pe) || pe.Col != 0 {
		t.Errorf("NaN entry: err %v", err)
	}
}

// TestBadInput: data problems are errors naming the position, never panics.
func TestBadInput(t *testing.T) {
	if _, err := Link([]float64{1, 2}, Single, nil); err == nil {
		t.Error("length 2 accepted")
	}
	var de *DistanceError
	_, err := Link([]float64{1, math.NaN(), 3}, Average, nil)
	if !errors.As(err, &de) || de.I != 0 || de.J != 2 || !errors.Is(err, ErrDistance) {
		t.Errorf("NaN distance: %v", err)
	}
	_, err = Link([]float64{1, 2, -3}, Ward, nil)
	if !errors.As(err, &de) || de.I != 1 || de.J != 2 {
		t.Errorf("negative distance: %v", err)
	}
	var ve *VectorError
	_, err = LinkVectors([][]float64{{1, 2}, {3, math.Inf(1)}}, nil, Ward, nil)
	if !errors.As(err, &ve) || ve.Row != 1 || ve.Col != 1 {
		t.Errorf("Inf coordinate: %v", err)
	}
	_, err = LinkVectors([][]float64{{1}, {2}}, []float64{1, 0}, Ward, nil)
	if !errors.As(err, &ve) || ve.Row != 1 || ve.Col != -1 {
		t.Errorf("zero weight: %v", err)
	}
	for _, tc := range []struct {
		name string
		f    func()
	}{
		{"invalid linkage", func() { Link([]float64{1}, 0, nil) }},
		{"ragged rows", func() { LinkVectors([][]float64{{1}, {1, 2}}, nil, Ward, nil) }},
		{"weights length", func() { LinkVectors([][]float64{{1}, {2}}, []float64{1}, Ward, nil) }},
		{"k < 1", func() { (&Dendrogram{N: 1}).CutCount(nil, 0) }},
	} {
		if !panics(tc.f) {
			t.Errorf("%s: no panic", tc.name)
		}
	}
	// Degenerate sizes.
	for _, n := range []int{0, 1} {
		d, err := LinkVectors(make([][]float64, n), nil, Ward, nil)
		if err != nil || d.N != n || len(d.Merges) != 0 {
			t.Errorf("n=%d: %v %v", n, d, err)
		}
	}
	if d, err := Link(nil, Single, nil); err != nil || d.N != 1 {
		t.Errorf("empty condensed matrix: %v %v, want one leaf", d, err)
	}
}

func panics(f func()) (p bool) {
	defer func() { p = recover() != nil }()
	f()
	return false
}
