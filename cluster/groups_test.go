package cluster

import (
	"math"
	"math/rand/v2"
	"reflect"
	"slices"
	"testing"
)

// templated returns rows made of a few templates (near-identical
// narratives: tiny jitter) plus scattered rows, as document-theme vectors.
func templated(r *rand.Rand, n, d int) ([][]float64, [][]int) {
	x := make([][]float64, 0, n)
	var want [][]int
	for t := 0; t < 4; t++ {
		base := dirichletRows(1, d, uint64(100+t))[0]
		var g []int
		for k := 0; k < 5+3*t; k++ {
			row := slices.Clone(base)
			for j := range row {
				row[j] += 1e-4 * r.Float64()
			}
			g = append(g, len(x))
			x = append(x, row)
		}
		want = append(want, g)
	}
	x = append(x, dirichletRows(n-len(x), d, 7)...)
	// Shuffle deterministically, remembering where rows went.
	perm := r.Perm(len(x))
	y := make([][]float64, len(x))
	for i, p := range perm {
		y[p] = x[i]
	}
	for _, g := range want {
		for k := range g {
			g[k] = perm[g[k]]
		}
		slices.Sort(g)
	}
	return y, want
}

// TestTightGroups: the groups equal the clusters of complete linkage on
// the full condensed matrix cut at eps (the definition; Link is checked
// against scipy above), and recover planted templates.
func TestTightGroups(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	x, want := templated(r, 400, 8)
	for _, eps := range []float64{1e-3, 0.05, 0.2} {
		got, err := TightGroups(x, eps, 2, &Settings{Workers: 2})
		if err != nil {
			t.Fatal(err)
		}
		full, _ := Link(EuclideanCondensed(nil, x, nil), Complete, nil)
		ref := groupsAt(full, eps, 2)
		var refRows [][]int
		for _, g := range ref {
			refRows = append(refRows, g.Themes)
		}
		var gotRows [][]int
		for _, g := range got {
			gotRows = append(gotRows, g.Rows)
			if g.Diameter > eps {
				t.Errorf("eps %v: diameter %v", eps, g.Diameter)
			}
		}
		slices.SortFunc(refRows, func(a, b []int) int { return a[0] - b[0] })
		slices.SortFunc(gotRows, func(a, b []int) int { return a[0] - b[0] })
		if !reflect.DeepEqual(gotRows, refRows) {
			t.Errorf("eps %v: groups %v, complete linkage %v", eps, gotRows, refRows)
		}
		if eps == 1e-3 {
			slices.SortFunc(want, func(a, b []int) int { return a[0] - b[0] })
			if !reflect.DeepEqual(gotRows, want) {
				t.Errorf("planted templates %v, found %v", want, gotRows)
			}
		}
	}
	if _, err := TightGroups(x, math.Inf(1), 2, nil); err != nil {
		t.Errorf("eps=Inf on 400 rows: %v", err)
	}
}

// TestSummaryExact: with K ≥ n the summary is exact Ward (equal to
// LinkVectors); with fewer micro-clusters every height is the exact Ward
// distance between the unions of rows, recomputed here from the rows
// (Ward's criterion depends only on sizes and centroids); results do not
// depend on the number of workers.
func TestSummaryExact(t *testing.T) {
	x := dirichletRows(600, 6, 11)
	s, err := Summarize(x, nil, &SummarySettings{K: 600})
	if err != nil {
		t.Fatal(err)
	}
	ref, _ := LinkVectors(x, nil, Ward, nil)
	if !reflect.DeepEqual(s.Tree, ref) {
		t.Error("K = n summary differs from LinkVectors")
	}
	var first *Summary
	for _, w := range []int{1, 2, 3} {
		s, err := Summarize(x, nil, &SummarySettings{K: 50, Seed: 9, Workers: w})
		if err != nil {
			t.Fatal(err)
		}
		if first == nil {
			first = s
		} else if !reflect.DeepEqual(first, s) {
			t.Errorf("workers=%d differs", w)
		}
	}
	s = first
	// Recompute each merge's height from the rows of its two sides.
	n := len(s.Centroids)
	rowsOf := make([][]int, 2*n-1)
	for i, a := range s.Assign {
		rowsOf[a] = append(rowsOf[a], i)
	}
	mean := func(rows []int) []float64 {
		m := make([]float64, len(x[0]))
		for _, i := range rows {
			for j, v := range x[i] {
				m[j] += v
			}
		}
		for j := range m {
			m[j] /= float64(len(rows))
		}
		return m
	}
	for i, m := range s.Tree.Merges {
		a, b := rowsOf[m.A], rowsOf[m.B]
		na, nb := float64(len(a)), float64(len(b))
		want := math.Sqrt(2 * na * nb / (na + nb) * sqdist(mean(a), mean(b)))
		if !relClose(m.Height, want, 1e-9) {
			t.Errorf("merge %d: height %v, Ward distance of the row sets %v", i, m.Height, want)
		}
		rowsOf[n+i] = append(slices.Clone(a), b...)
	}
	if got := s.CutCount(nil, 3); len(slices.Compact(slices.Sorted(slices.Values(got)))) != 3 {
		t.Errorf("CutCount(3) labels %v", got)
	}
	if o := s.Order(); len(o) != len(x) {
		t.Errorf("order has %d rows", len(o))
	}
}

// TestHeatmapOrder: a permutation that keeps Ward clusters contiguous.
func TestHeatmapOrder(t *testing.T) {
	x := dirichletRows(300, 5, 3)
	o, err := HeatmapOrder(x, 1, nil)
	if err != nil {
		t.Fatal(err)
	}
	tr, _ := LinkVectors(x, nil, Ward, nil)
	if !validOrder(tr, o) {
		t.Error("heatmap order breaks the Ward tree")
	}
}
