package cluster

import (
	"math/rand/v2"
	"reflect"
	"runtime"
	"testing"
)

// TestLinkVectorsScipy compares LinkVectors with scipy.cluster.hierarchy.linkage
// on the same observation matrix (fixture testdata/scipy_linkage.json from
// testdata/gen_scipy.py, Debian python3-scipy 1.10.1). Ward, Centroid and
// Median here never build a distance matrix, so heights agree to rounding
// (1e-9 relative) rather than bit for bit; pairs and sizes are identical,
// including the grid whose heights tie up to a 1e-9 jitter.
func TestLinkVectorsScipy(t *testing.T) {
	defer func(v int) { minParallel = v }(minParallel)
	minParallel = 4
	for _, c := range loadScipy(t) {
		if c.Vectors == nil {
			continue
		}
		for _, workers := range []int{1, 2, 3} {
			got, err := LinkVectors(c.Vectors, nil, c.linkage(t), &Settings{Workers: workers})
			if err != nil {
				t.Fatal(err)
			}
			sameMerges(t, c.Name+"/"+c.Method, got, c.Z, 1e-9)
		}
	}
}

// TestWard1D checks Ward on the 1-D points 0, 1, 3, 7, 15. Expected heights
// 1, 2.886751, 6.940221, 15.495161 (scipy's convention sqrt(2·ΔSSE)) are
// from the task statement and equal scipy's linkage output in the fixture.
func TestWard1D(t *testing.T) {
	x := [][]float64{{0}, {1}, {3}, {7}, {15}}
	want := []float64{1, 2.886751, 6.940221, 15.495161}
	for _, w := range [][]float64{nil, {1, 1, 1, 1, 1}} {
		got, err := LinkVectors(x, w, Ward, nil)
		if err != nil {
			t.Fatal(err)
		}
		for i, m := range got.Merges {
			if !relClose(m.Height, want[i], 1e-6) {
				t.Errorf("merge %d height %v, want %v", i, m.Height, want[i])
			}
		}
	}
}

// TestWeightedWardExact checks that a point of weight w behaves as w
// coincident points, for Ward and Centroid: duplicating rows gives the same heights as weights
// (the merges of the duplicates, at height 0, come first and are dropped).
// Source: the definition of Ward's criterion (common practice).
func TestWeightedWardExact(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	var x, dup [][]float64
	var w []float64
	for i := 0; i < 30; i++ {
		p := []float64{r.Float64(), r.Float64(), r.Float64()}
		k := 1 + r.IntN(4)
		x = append(x, p)
		w = append(w, float64(k))
		for j := 0; j < k; j++ {
			dup = append(dup, p)
		}
	}
	for _, m := range []Linkage{Ward, Centroid} {
		a, err := LinkVectors(x, w, m, nil)
		if err != nil {
			t.Fatal(err)
		}
		b, err := LinkVectors(dup, nil, m, nil)
		if err != nil {
			t.Fatal(err)
		}
		var hb []float64
		for _, mg := range b.Merges {
			if mg.Height > 1e-9 {
				hb = append(hb, mg.Height)
			}
		}
		if len(hb) != len(a.Merges) {
			t.Fatalf("%v: %d positive heights with duplicates, %d merges with weights", m, len(hb), len(a.Merges))
		}
		for i, mg := range a.Merges {
			if !relClose(mg.Height, hb[i], 1e-9) {
				t.Errorf("%v merge %d: weighted %v, duplicated %v", m, i, mg.Height, hb[i])
			}
		}
	}
}

// TestDeterministicWorkers: byte-identical merges for 1, 2 and 5 workers
// (project rule: results independent of GOMAXPROCS).
func TestDeterministicWorkers(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 1))
	x := make([][]float64, 3000)
	for i := range x {
		x[i] = make([]float64, 5)
		for j := range x[i] {
			x[i][j] = float64(r.IntN(4)) // many exact ties
		}
		x[i][0] += r.Float64() * 0.01
	}
	for _, m := range []Linkage{Ward, Centroid, Average} {
		var ref *Dendrogram
		for _, w := range []int{1, 2, 5} {
			got, err := LinkVectors(x[:600], nil, m, &Settings{Workers: w})
			if m == Ward {
				got, err = LinkVectors(x, nil, m, &Settings{Workers: w})
			}
			if err != nil {
				t.Fatal(err)
			}
			if ref == nil {
				ref = got
			} else if !reflect.DeepEqual(ref, got) {
				t.Errorf("%v: workers=%d differs from workers=1", m, w)
			}
		}
	}
}

// TestLinkVectorsTiesPartitions: on an integer grid (exact ties) the
// vector algorithms give the same partition as scipy's linkage at every
// distinct merge height (fixture grid-exact-12, Debian python3-scipy
// 1.10.1). For the monotone methods every level is compared.
func TestLinkVectorsTiesPartitions(t *testing.T) {
	for _, c := range loadScipy(t) {
		if c.Name != "grid-exact-12" {
			continue
		}
		m := c.linkage(t)
		got, err := LinkVectors(c.Vectors, nil, m, nil)
		if err != nil {
			t.Fatal(err)
		}
		ref := scipyTree(c)
		for _, r := range c.Z {
			h := r[2]
			a, b := got.CutHeight(nil, h), ref.CutHeight(nil, h)
			if !reflect.DeepEqual(a, b) {
				t.Errorf("%v: partition at height %v: %v, scipy %v", m, h, a, b)
			}
		}
	}
}

// TestGOMAXPROCS: with default Settings the results are byte-identical at
// GOMAXPROCS 1 and 2 (project rule), for the vector, matrix, summary and
// ordering code.
func TestGOMAXPROCS(t *testing.T) {
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(0))
	defer func(v int) { minParallel = v }(minParallel)
	minParallel = 16
	x := dirichletRows(2500, 20, 12)
	run := func() []any {
		var out []any
		for _, m := range []Linkage{Ward, Centroid, Single} {
			d, err := LinkVectors(x, nil, m, nil)
			if err != nil {
				t.Fatal(err)
			}
			out = append(out, d)
		}
		d, _ := LinkVectors(x[:800], nil, Average, nil)
		out = append(out, d, d.OptimalLeafOrder(nil, EuclideanCondensed(nil, x[:800], nil), nil))
		s, _ := Summarize(x, nil, &SummarySettings{K: 100, Seed: 3})
		g, _ := TightGroups(x, 0.1, 2, nil)
		return append(out, s, g)
	}
	runtime.GOMAXPROCS(1)
	a := run()
	runtime.GOMAXPROCS(2)
	b := run()
	if !reflect.DeepEqual(a, b) {
		t.Error("results differ between GOMAXPROCS 1 and 2")
	}
}
