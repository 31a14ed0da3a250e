package cluster

import (
	"fmt"
	"math"
	"slices"
	"sync"
	"sync/atomic"
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
// Method: every pair at distance ≤ eps is found as LinkedSets finds them
// (sweeps along the coordinate of largest variance, after a split by each
// row's largest coordinate where that pays); the
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
// O(n·d), with no list of the pairs found. It panics if eps < 0 or
// minSize < 1.
//
// Every pair within eps is found (exactly; slack far above rounding keeps
// the tests safe) by sweeps: rows sorted on the coordinate of largest
// variance, a window of width eps along it (a pair farther apart on one
// coordinate is farther apart in all), three more coordinates rejecting
// most pairs before the full distance, the sweep split over
// Settings.Workers goroutines, each keeping its own union–find. Rows that
// lie near the corners of the space, such as document-theme shares, are
// first split by their largest coordinate: if ‖a − b‖ ≤ eps, a's largest
// coordinate is i and b's is j ≠ i, then
//
//	a_i − a_j ≤ (b_i + eps) − (b_j − eps) ≤ 2 eps   (as b_i ≤ b_j)
//
// and likewise b_j − b_i ≤ 2 eps, so rows whose largest coordinate beats
// every other by more than 2 eps are only compared with rows of the same
// largest coordinate (one sweep each), and the few others across: a with
// b when j is within 2 eps of a's largest coordinate and i of b's. When
// more than half of the rows are of the second kind, one sweep over all
// rows is used instead.
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
	w := s.workers()
	all := newForest(n)
	// near[a] lists the coordinates within 2 eps of a's largest (its largest,
	// the lowest on ties, first).
	margin := 2 * eps * (1 + 1e-9)
	top := make([]int, n)
	var near [][]int32
	ambiguous := 0
	if d >= 2 && !math.IsInf(eps, 0) {
		near = make([][]int32, n)
		for a := 0; a < n; a++ {
			row := flat[a*d : a*d+d]
			best := 0
			for k, v := range row {
				if v > row[best] {
					best = k
				}
			}
			top[a] = best
			for k, v := range row {
				if k != best && row[best]-v <= margin {
					if near[a] == nil {
						near[a] = []int32{int32(best)}
					}
					near[a] = append(near[a], int32(k))
				}
			}
			if near[a] != nil {
				ambiguous++
			}
		}
	}
	if near == nil || 2*ambiguous > n {
		rows := make([]int, n)
		for i := range rows {
			rows[i] = i
		}
		sweepPairs(flat, d, rows, eps, w, all)
		return all.sets(minSize), nil
	}
	buckets := make([][]int, d)
	for a := 0; a < n; a++ {
		buckets[top[a]] = append(buckets[top[a]], a)
	}
	for _, rows := range buckets {
		if len(rows) > 1 {
			sweepPairs(flat, d, rows, eps, w, all)
		}
	}
	// Across buckets: lists[i*d+j] holds the rows of largest coordinate i
	// with j near it; pairs of lists[i*d+j] and lists[j*d+i], i < j.
	lists := make([][]int, d*d)
	for a := 0; a < n; a++ {
		for _, j := range near[a][min(1, len(near[a])):] {
			lists[top[a]*d+int(j)] = append(lists[top[a]*d+int(j)], a)
		}
	}
	type task struct{ i, j int }
	var tasks []task
	for i := 0; i < d; i++ {
		for j := i + 1; j < d; j++ {
			if len(lists[i*d+j]) > 0 && len(lists[j*d+i]) > 0 {
				tasks = append(tasks, task{i, j})
			}
		}
	}
	e2 := eps * eps * (1 + 1e-12)
	forEachTask(len(tasks), w, n, func(_, t int, f forest) {
		for _, a := range lists[tasks[t].i*d+tasks[t].j] {
			xa := flat[a*d : a*d+d]
			for _, b := range lists[tasks[t].j*d+tasks[t].i] {
				if sqdist(xa, flat[b*d:b*d+d]) <= e2 {
					f.union(a, b)
				}
			}
		}
	}, all)
	return all.sets(minSize), nil
}

// forEachTask runs do(k, t, f) for t in [0, tasks) on up to w goroutines
// (k is the goroutine's number, below w), each with its own union–find f
// over n items, taking tasks in turn, and merges every union–find into
// dst. The sets in dst do not depend on the order of the unions.
func forEachTask(tasks, w, n int, do func(k, t int, f forest), dst forest) {
	w = max(1, min(w, tasks))
	if tasks == 0 {
		return
	}
	forests := make([]forest, w)
	var next atomic.Int64
	var wg sync.WaitGroup
	for k := 0; k < w; k++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			f := newForest(n)
			for {
				t := int(next.Add(1)) - 1
				if t >= tasks {
					break
				}
				do(k, t, f)
			}
			forests[k] = f
		}()
	}
	wg.Wait()
	for _, f := range forests {
		dst.merge(f)
	}
}

// sweepPairs unions into dst every pair of rows (indices into the flat
// n×d rows) within eps, by the sweep LinkedSets describes.
func sweepPairs(flat []float64, d int, rows []int, eps float64, w int, dst forest) {
	m := len(rows)
	// Coordinates by decreasing variance: the first orders the sweep, the
	// next three reject pairs cheaply before the full distance.
	vars := make([]float64, d)
	for k := 0; k < d; k++ {
		var mu, m2 float64
		for _, i := range rows {
			v := flat[i*d+k]
			mu += v
			m2 += v * v
		}
		mu /= float64(m)
		vars[k] = m2/float64(m) - mu*mu
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
	idx := slices.Clone(rows)
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
	sorted := make([]float64, m*d)
	for a, i := range idx {
		copy(sorted[a*d:], flat[i*d:i*d+d])
	}
	// Slack far above rounding keeps the tests safe.
	e2 := eps * eps * (1 + 1e-12)
	epsS := eps * (1 + 1e-12)
	forests := make([]forest, max(1, w))
	used := parallelRanges(m, w, 1024, func(k, lo, hi int) {
		f := newForest(m) // over positions in idx
		for a := lo; a < hi; a++ {
			xa := sorted[a*d : a*d+d]
			for b := a + 1; b < m; b++ {
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
					f.union(a, b)
				}
			}
		}
		forests[k] = f
	})
	for _, f := range forests[:used] {
		for p := range f {
			if r := f.find(p); r != p {
				dst.union(idx[p], idx[r])
			}
		}
	}
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
