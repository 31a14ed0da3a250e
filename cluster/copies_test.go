package cluster

import (
	"math"
	"math/rand/v2"
	"reflect"
	"slices"
	"testing"

	"undercurrent/text/sparse"
)

// sparseRows builds a matrix from dense rows (zeros dropped).
func sparseRows(rows [][]float64) *sparse.Matrix {
	b := sparse.NewBuilder(len(rows[0]))
	for _, r := range rows {
		var c []int32
		var v []float64
		for j, x := range r {
			if x != 0 {
				c, v = append(c, int32(j)), append(v, x)
			}
		}
		b.AddRow(c, v)
	}
	return b.Matrix()
}

// TestCopyGroupsWorked checks CopyGroups on small examples worked by hand. Cosine
// similarities (definition: a·b / (‖a‖ ‖b‖)):
//
//	a = (1, 1, 0), b = (2, 2, 0): cos = 4 / (√2 · √8) = 1, distance 0
//	a or b and c = (1, 0, 0):     cos = 1 / √2 = 0.707107, distance 0.292893
//	d = (0, 0, 1) and the others: cos = 0, distance 1
//
// Complete linkage merges a and b at 0, then {a, b} with c at max(0.292893, 0.292893);
// d joins at 1. And a chain x = (1, 0), y = (1, 1), z = (0, 1): cos(x, y) = cos(y, z) =
// 1/√2, cos(x, z) = 0. Single linkage would put all three together at 0.292893; complete
// linkage merges x and y first (the tie goes to the lowest pair, as scipy's NN chain
// does), and {x, y} with z only at max(0.292893, 1) = 1.
func TestCopyGroupsWorked(t *testing.T) {
	abcd := [][]float64{{1, 1, 0}, {2, 2, 0}, {1, 0, 0}, {0, 0, 1}}
	xyz := [][]float64{{1, 0}, {1, 1}, {0, 1}}
	flat := func(n int) [][]float64 { // theme vectors all equal: one block
		out := make([][]float64, n)
		for i := range out {
			out[i] = []float64{0.5, 0.5}
		}
		return out
	}
	c := 1 / math.Sqrt2
	cases := []struct {
		name  string
		words [][]float64
		theta [][]float64
		set   CopySettings
		want  []CopyGroup
	}{
		{"a, b and c at 0.7", abcd, flat(4), CopySettings{Similarity: 0.7},
			[]CopyGroup{{Rows: []int{0, 1, 2}, LeastSimilarity: c, Medoid: 0}}},
		{"c drops out at 0.75", abcd, flat(4), CopySettings{Similarity: 0.75, MinSize: 2},
			[]CopyGroup{{Rows: []int{0, 1}, LeastSimilarity: 1, Medoid: 0}}},
		{"fewer than MinSize", abcd, flat(4), CopySettings{Similarity: 0.75}, nil},
		// d shares no word (distance 1): it joins no group at any allowed similarity.
		{"d never joins", abcd, flat(4), CopySettings{Similarity: 1e-9, MinSize: 4}, nil},
		{"complete, not single, linkage", xyz, flat(3), CopySettings{Similarity: 0.7, MinSize: 2},
			[]CopyGroup{{Rows: []int{0, 1}, LeastSimilarity: c, Medoid: 0}}},
		// c's theme vector is 0.3 away from the others': with Eps 0.05 it is in no block
		// with them and is never compared (the blocking approximation); with Eps 0.5 it is.
		{"blocked out", abcd, [][]float64{{0.5, 0.5}, {0.5, 0.5}, {0.8, 0.5}, {0.5, 0.5}}, CopySettings{Similarity: 0.7, MinSize: 2},
			[]CopyGroup{{Rows: []int{0, 1}, LeastSimilarity: 1, Medoid: 0}}},
		{"blocked in", abcd, [][]float64{{0.5, 0.5}, {0.5, 0.5}, {0.8, 0.5}, {0.5, 0.5}}, CopySettings{Similarity: 0.7, MinSize: 2, Eps: 0.5},
			[]CopyGroup{{Rows: []int{0, 1, 2}, LeastSimilarity: c, Medoid: 0}}},
	}
	for _, tc := range cases {
		for _, w := range []int{1, 3} {
			set := tc.set
			set.Workers = w
			got, st, err := CopyGroups(tc.theta, sparseRows(tc.words), &set)
			if err != nil {
				t.Fatalf("%s: %v", tc.name, err)
			}
			if len(got) != len(tc.want) {
				t.Fatalf("%s (workers %d): groups %+v, want %+v", tc.name, w, got, tc.want)
			}
			for i := range got {
				g, wg := got[i], tc.want[i]
				if !slices.Equal(g.Rows, wg.Rows) || math.Abs(g.LeastSimilarity-wg.LeastSimilarity) > 1e-12 || g.Medoid != wg.Medoid {
					t.Errorf("%s (workers %d): group %d = %+v, want %+v", tc.name, w, i, g, wg)
				}
			}
			if st.Pairs <= 0 && len(tc.want) > 0 {
				t.Errorf("%s: stats %+v", tc.name, st)
			}
		}
	}
}

// templatedWords returns sparse word rows with planted families (a base row plus a
// few changed columns per copy) among random rows, and theme vectors: a family's copies
// share a theme vector up to a small jitter.
func templatedWords(r *rand.Rand, n, v, d int) ([][]float64, [][]float64) {
	words := make([][]float64, 0, n)
	theta := make([][]float64, 0, n)
	randRow := func(nnz int) []float64 {
		row := make([]float64, v)
		for k := 0; k < nnz; k++ {
			row[r.IntN(v)] = 1 + r.Float64()
		}
		return row
	}
	for f := 0; f < 5; f++ {
		base := randRow(25)
		th := dirichletRows(1, d, uint64(200+f))[0]
		for k := 0; k < 4+2*f; k++ {
			row := slices.Clone(base)
			for c := 0; c < 1+k%4; c++ {
				row[r.IntN(v)] = 1 + r.Float64()
			}
			tk := slices.Clone(th)
			for j := range tk {
				tk[j] += 0.01 * r.Float64()
			}
			words, theta = append(words, row), append(theta, tk)
		}
	}
	for len(words) < n {
		words = append(words, randRow(5+r.IntN(30)))
		theta = append(theta, dirichletRows(1, d, r.Uint64())[0])
	}
	return words, theta
}

// refCopyGroups is the definition, computed independently: complete linkage (Link, checked
// against scipy in scipy_test.go) on the condensed matrix of cosine distances of the rows
// of each block (all rows as one block when blocks is nil), cut at 1 − sim.
func refCopyGroups(words [][]float64, blocks [][]int, sim float64, minSize int) [][]int {
	if blocks == nil {
		all := make([]int, len(words))
		for i := range all {
			all[i] = i
		}
		blocks = [][]int{all}
	}
	cos := func(a, b []float64) float64 {
		var ab, aa, bb float64
		for i := range a {
			ab += a[i] * b[i]
			aa += a[i] * a[i]
			bb += b[i] * b[i]
		}
		return ab / math.Sqrt(aa*bb)
	}
	var out [][]int
	for _, b := range blocks {
		m := len(b)
		if m < 2 {
			continue
		}
		dist := make([]float64, CondensedLen(m))
		for p := 0; p < m; p++ {
			for q := p + 1; q < m; q++ {
				dist[CondensedIndex(m, p, q)] = max(0, 1-cos(words[b[p]], words[b[q]]))
			}
		}
		tr, err := Link(dist, Complete, nil)
		if err != nil {
			panic(err)
		}
		for _, g := range groupsAt(tr, 1-sim, minSize) {
			rows := make([]int, len(g.Themes))
			for k, v := range g.Themes {
				rows[k] = b[v]
			}
			out = append(out, rows)
		}
	}
	slices.SortStableFunc(out, func(a, b []int) int {
		if len(a) != len(b) {
			return len(b) - len(a)
		}
		return a[0] - b[0]
	})
	return out
}

// TestCopyGroupsExact: without blocking (Eps = +Inf) the groups are those of complete
// linkage on all rows; with blocking, those of complete linkage within each block of
// LinkedSets; the planted families are found; and nothing depends on the workers.
func TestCopyGroupsExact(t *testing.T) {
	r := rand.New(rand.NewPCG(8, 9))
	words, theta := templatedWords(r, 300, 120, 6)
	m := sparseRows(words)
	// splitBlocks is the blocking rule written out: the sets linked within eps, those of
	// more than maxBlock rows replaced by their own sets within eps/2, and so on.
	var splitBlocks func(rows []int, eps float64, maxBlock, splits int) [][]int
	splitBlocks = func(rows []int, eps float64, maxBlock, splits int) [][]int {
		sub := make([][]float64, len(rows))
		for k, i := range rows {
			sub[k] = theta[i]
		}
		sets, err := LinkedSets(sub, eps, 3, nil)
		if err != nil {
			t.Fatal(err)
		}
		var out [][]int
		for _, set := range sets {
			for k := range set {
				set[k] = rows[set[k]]
			}
			if len(set) > maxBlock && splits > 0 {
				out = append(out, splitBlocks(set, eps/2, maxBlock, splits-1)...)
			} else {
				out = append(out, set)
			}
		}
		return out
	}
	all := make([]int, len(theta))
	for i := range all {
		all[i] = i
	}
	for _, tc := range []struct {
		eps, sim float64
		maxBlock int
	}{{math.Inf(1), 0.7, 1000}, {math.Inf(1), 0.9, 1000}, {0.05, 0.7, 1000}, {0.02, 0.8, 1000}, {0.5, 0.7, 20}, {0.5, 0.7, 60}} {
		var blocks [][]int
		if !math.IsInf(tc.eps, 1) {
			blocks = splitBlocks(all, tc.eps, tc.maxBlock, copySplits)
		}
		want := refCopyGroups(words, blocks, tc.sim, 3)
		var first []CopyGroup
		for _, w := range []int{1, 2, 4} {
			got, st, err := CopyGroups(theta, m, &CopySettings{Eps: tc.eps, Similarity: tc.sim, MaxBlock: tc.maxBlock, Workers: w})
			if err != nil {
				t.Fatal(err)
			}
			var rows [][]int
			for _, g := range got {
				rows = append(rows, g.Rows)
				if g.LeastSimilarity < tc.sim-1e-12 || !slices.Contains(g.Rows, g.Medoid) {
					t.Errorf("eps %v sim %v: group %+v", tc.eps, tc.sim, g)
				}
			}
			if !reflect.DeepEqual(rows, want) {
				t.Errorf("eps %v sim %v workers %d: groups %v, complete linkage %v", tc.eps, tc.sim, w, rows, want)
			}
			if tc.maxBlock < 100 && st.LeastEps >= tc.eps {
				t.Errorf("eps %v max block %d: no block was split (%+v)", tc.eps, tc.maxBlock, st)
			}
			if first == nil {
				first = got
			} else if !reflect.DeepEqual(got, first) {
				t.Errorf("eps %v sim %v: workers %d changed the result", tc.eps, tc.sim, w)
			}
		}
		if tc.sim == 0.7 && tc.maxBlock > 100 && len(want) < 5 {
			t.Errorf("eps %v: %d groups, want the 5 planted families at least", tc.eps, len(want))
		}
	}
}

// TestLinkedSets: the sets are the clusters of single linkage on the full Euclidean
// condensed matrix cut at eps (the definition), for any number of workers.
func TestLinkedSets(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	x, _ := templated(r, 500, 6)
	full, err := Link(EuclideanCondensed(nil, x, nil), Single, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, eps := range []float64{0, 1e-3, 0.05, 0.1, 0.3} {
		want := singleSets(full, eps)
		for _, w := range []int{1, 3} {
			got, err := LinkedSets(x, eps, 2, &Settings{Workers: w})
			if err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(got, want) {
				t.Errorf("eps %v workers %d: %d sets, single linkage %d", eps, w, len(got), len(want))
			}
		}
	}
}

func TestCopyGroupsPanics(t *testing.T) {
	m := sparseRows([][]float64{{1, 0}, {0, 1}})
	empty := sparse.NewBuilder(2)
	empty.AddRow(nil, nil)
	empty.AddRow([]int32{0}, []float64{1})
	th := [][]float64{{1}, {1}}
	for _, tc := range []struct {
		name string
		f    func()
	}{
		{"similarity above 1", func() { CopyGroups(th, m, &CopySettings{Similarity: 1.5}) }},
		{"negative eps", func() { CopyGroups(th, m, &CopySettings{Eps: -1}) }},
		{"row count", func() { CopyGroups(th[:1], m, nil) }},
		{"empty word row", func() { CopyGroups(th, empty.Matrix(), &CopySettings{MinSize: 2}) }},
	} {
		if !panics(tc.f) {
			t.Errorf("%s: no panic", tc.name)
		}
	}
}

// cornerRows returns theme-share-like rows: most near a corner of the simplex (one
// coordinate about 0.9), some near the middle of an edge (two coordinates about 0.45, the
// larger one either), so that LinkedSets compares rows across its buckets of largest
// coordinate.
func cornerRows(r *rand.Rand, n, d int) [][]float64 {
	x := make([][]float64, n)
	for i := range x {
		row := make([]float64, d)
		k := r.IntN(d)
		if i%8 == 0 {
			j := (k + 1 + r.IntN(d-1)) % d
			row[k], row[j] = 0.45+0.02*r.Float64(), 0.45+0.02*r.Float64()
		} else {
			row[k] = 0.88 + 0.1*r.Float64()
		}
		var s float64
		for c := range row {
			row[c] += 0.01 * r.Float64()
			s += row[c]
		}
		for c := range row {
			row[c] /= s
		}
		x[i] = row
	}
	return x
}

// TestLinkedSetsCorners: on rows near the corners and edges of the simplex (where the
// buckets by largest coordinate are used; the test checks that they were) and on rows
// where most are ambiguous (the single sweep), the sets equal single linkage cut at eps.
func TestLinkedSetsCorners(t *testing.T) {
	r := rand.New(rand.NewPCG(12, 13))
	for _, tc := range []struct {
		name string
		x    [][]float64
	}{
		{"corners", cornerRows(r, 700, 5)},
		{"uniform", dirichletRows(400, 3, 21)},
	} {
		full, err := Link(EuclideanCondensed(nil, tc.x, nil), Single, nil)
		if err != nil {
			t.Fatal(err)
		}
		for _, eps := range []float64{0.005, 0.02, 0.05, 0.1} {
			want := singleSets(full, eps)
			for _, w := range []int{1, 2} {
				got, err := LinkedSets(tc.x, eps, 2, &Settings{Workers: w})
				if err != nil {
					t.Fatal(err)
				}
				if !reflect.DeepEqual(got, want) {
					t.Errorf("%s eps %v workers %d: %d sets, single linkage %d", tc.name, eps, w, len(got), len(want))
				}
			}
		}
	}
	// The corner rows do take the bucketed route: fewer than half are within 2 eps of a
	// second coordinate (the edge rows, 1 in 8), at eps 0.05.
	x := cornerRows(rand.New(rand.NewPCG(12, 13)), 700, 5)
	amb := 0
	for _, row := range x {
		s := slices.Clone(row)
		slices.Sort(s)
		if s[len(s)-1]-s[len(s)-2] <= 0.1 {
			amb++
		}
	}
	if amb == 0 || 2*amb > len(x) {
		t.Errorf("%d of %d corner rows ambiguous: the test does not exercise both routes", amb, len(x))
	}
}

// singleSets returns the clusters of at least two rows of single linkage's tree full cut at
// height eps, in label order: the sets LinkedSets must return.
func singleSets(full *Dendrogram, eps float64) [][]int {
	by := map[int][]int{}
	for i, l := range full.CutHeight(nil, eps) {
		by[l] = append(by[l], i)
	}
	var want [][]int
	for l := 0; l < len(by); l++ {
		if len(by[l]) >= 2 {
			want = append(want, by[l])
		}
	}
	return want
}
