package cluster

import (
	"fmt"
	"math"
	"slices"
)

// Group is a set of rows (ascending indices) found together.
type Group struct {
	Rows     []int
	Diameter float64 // largest distance between two of its rows
}

// MaxComponent is the largest set of rows, linked by chains of distances
// ≤ eps, that TightGroups accepts; beyond it the eps is too coarse for
// "near-identical" and the condensed matrix of the set would be large.
const MaxComponent = 20000

// TightGroups returns the groups of at least minSize rows of x (for
// example document-theme vectors, or TF-IDF rows) whose Euclidean
// diameter is at most eps: exactly the clusters of complete linkage cut
// at height eps, computed without an n² matrix. Useful to find templated,
// near-identical narratives. Groups come largest first, ties by first row.
//
// Method: every pair at distance ≤ eps is found by sorting the rows on the
// coordinate with the largest variance and sweeping a window of width eps
// (a pair farther apart on one coordinate is farther apart in all; three
// more coordinates reject most pairs before the full distance; the sweep
// is split over Settings.Workers goroutines); the
// eps-graph's connected components are the single-linkage clusters at eps,
// and complete linkage never merges across them below eps, so complete
// linkage is run on each component alone (condensed matrix of the
// component) and cut at eps. It returns an error if a component exceeds
// MaxComponent rows. It panics if eps < 0 or minSize < 1.
func TightGroups(x [][]float64, eps float64, minSize int, s *Settings) ([]Group, error) {
	if eps < 0 || minSize < 1 {
		panic("cluster: TightGroups needs eps ≥ 0 and minSize ≥ 1")
	}
	sets, err := LinkedSets(x, eps, minSize, s)
	if err != nil {
		return nil, err
	}
	var out []Group
	for _, rows := range sets {
		if len(rows) > MaxComponent {
			return nil, fmt.Errorf("cluster: %d rows are chained within distance %v (more than %d); use a smaller eps", len(rows), eps, MaxComponent)
		}
		sub := make([][]float64, len(rows))
		for k, i := range rows {
			sub[k] = x[i]
		}
		dist := EuclideanCondensed(nil, sub, s)
		t, err := Link(dist, Complete, s)
		if err != nil {
			return nil, err
		}
		for _, g := range groupsAt(t, eps, minSize) {
			gr := Group{Rows: make([]int, len(g.Themes)), Diameter: g.Height}
			for k, v := range g.Themes {
				gr.Rows[k] = rows[v]
			}
			out = append(out, gr)
		}
	}
	slices.SortStableFunc(out, func(a, b Group) int {
		if len(a.Rows) != len(b.Rows) {
			return len(b.Rows) - len(a.Rows)
		}
		return a.Rows[0] - b.Rows[0]
	})
	return out, nil
}

// LinkedSets returns the sets of at least minSize rows of x linked by
// chains of Euclidean distances ≤ eps: the connected components of the
// graph joining every pair at distance ≤ eps, which are exactly the
// clusters of single linkage cut at height eps. Rows within a set are
// ascending and sets come in order of their smallest row. Memory is
// O(n·d) plus the pairs found; the pair search is TightGroups'. It panics
// if eps < 0 or minSize < 1.
func LinkedSets(x [][]float64, eps float64, minSize int, s *Settings) ([][]int, error) {
	if eps < 0 || minSize < 1 {
		panic("cluster: LinkedSets needs eps ≥ 0 and minSize ≥ 1")
	}
	flat, _, d, err := flatten(x, nil)
	if err != nil {
		return nil, err
	}
	n := len(x)
	if n == 0 {
		return nil, nil
	}
	// Coordinates by decreasing variance: the first orders the sweep, the
	// next three reject pairs cheaply before the full distance.
	vars := make([]float64, d)
	for k := 0; k < d; k++ {
		var m, m2 float64
		for i := 0; i < n; i++ {
			v := flat[i*d+k]
			m += v
			m2 += v * v
		}
		m /= float64(n)
		vars[k] = m2/float64(n) - m*m
	}
	byVar := make([]int, d)
	for k := range byVar {
		byVar[k] = k
	}
	slices.SortStableFunc(byVar, func(a, b int) int {
		switch {
		case vars[a] > vars[b]:
			return -1
		case vars[a] < vars[b]:
			return 1
		}
		return 0
	})
	axis := byVar[0]
	checks := byVar[1:min(d, 4)]
	// Sorted copy of the rows, so that the sweep reads memory in order.
	idx := make([]int, n)
	for i := range idx {
		idx[i] = i
	}
	slices.SortStableFunc(idx, func(a, b int) int {
		va, vb := flat[a*d+axis], flat[b*d+axis]
		switch {
		case va < vb:
			return -1
		case va > vb:
			return 1
		}
		return 0
	})
	sorted := make([]float64, n*d)
	for a, i := range idx {
		copy(sorted[a*d:], flat[i*d:i*d+d])
	}
	// Every pair within eps, found in parallel over ranges of sweep
	// starts; slack far above rounding keeps the tests safe.
	e2 := eps * eps * (1 + 1e-12)
	epsS := eps * (1 + 1e-12)
	w := s.workers()
	forests := make([]forest, max(1, w))
	used := parallelRanges(n, w, 1024, func(k, lo, hi int) {
		f := newForest(n)
		for a := lo; a < hi; a++ {
			xa := sorted[a*d : a*d+d]
			for b := a + 1; b < n; b++ {
				xb := sorted[b*d : b*d+d]
				if xb[axis]-xa[axis] > epsS {
					break
				}
				far := false
				for _, c := range checks {
					if math.Abs(xb[c]-xa[c]) > epsS {
						far = true
						break
					}
				}
				if !far && sqdist(xa, xb) <= e2 {
					f.union(idx[a], idx[b])
				}
			}
		}
		forests[k] = f
	})
	// Each range kept its own union–find (O(n) memory, not one entry per
	// pair found); the sets do not depend on the order of the unions, and
	// the root of each is its smallest row.
	all := forests[0]
	for _, f := range forests[1:used] {
		all.merge(f)
	}
	return all.sets(minSize), nil
}

// HeatmapOrder returns an order of the rows of x for drawing a heatmap in
// which similar rows sit together: Ward's tree on the rows (LinkVectors)
// in optimal leaf order when len(x) ≤ OptimalOrderLimit, in plain
// dendrogram order up to exactLimit rows, and above that the order of a
// Summary (micro-clusters in the order of their Ward tree, rows within a
// micro-cluster by index), seeded by seed.
func HeatmapOrder(x [][]float64, seed uint64, s *Settings) ([]int, error) {
	const exactLimit = 20000
	n := len(x)
	if n > exactLimit {
		sum, err := Summarize(x, nil, &SummarySettings{Seed: seed, Workers: s.workersOrZero()})
		if err != nil {
			return nil, err
		}
		return sum.Order(), nil
	}
	t, err := LinkVectors(x, nil, Ward, s)
	if err != nil {
		return nil, err
	}
	if n <= OptimalOrderLimit {
		return t.OptimalLeafOrder(nil, EuclideanCondensed(nil, x, s), s), nil
	}
	return t.Leaves(nil), nil
}

func (s *Settings) workersOrZero() int {
	if s == nil {
		return 0
	}
	return s.Workers
}
