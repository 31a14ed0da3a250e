package cluster

import (
	"math"
	"slices"
)

func (t *Dendrogram) check() {
	if t == nil || t.N < 0 || (t.N > 0 && len(t.Merges) != t.N-1) {
		panic("cluster: malformed dendrogram")
	}
}

// members returns, for every cluster id (leaves 0..N-1 then merges), the
// range of its leaves in order: leaves of cluster c are order[lo[c]:hi[c]]
// where order is the dendrogram's leaf order (A before B).
func (t *Dendrogram) members() (order []int, lo, hi []int) {
	n := t.N
	if n == 0 {
		return nil, nil, nil
	}
	order = t.Leaves(nil)
	lo = make([]int, 2*n-1)
	hi = make([]int, 2*n-1)
	for p, leaf := range order {
		lo[leaf], hi[leaf] = p, p+1
	}
	for i, m := range t.Merges {
		c := n + i
		lo[c] = min(lo[m.A], lo[m.B])
		hi[c] = max(hi[m.A], hi[m.B])
	}
	return order, lo, hi
}

// Leaves stores in dst (nil, or length N) the leaves in dendrogram order
// (for every merge, the leaves of A before those of B, as scipy's
// leaves_list) and returns it.
func (t *Dendrogram) Leaves(dst []int) []int {
	t.check()
	n := t.N
	if dst == nil {
		dst = make([]int, n)
	} else if len(dst) != n {
		panic("cluster: len(dst) != N")
	}
	if n == 0 {
		return dst
	}
	stack := []int{2*n - 2}
	if n == 1 {
		stack[0] = 0
	}
	k := 0
	for len(stack) > 0 {
		c := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		if c < n {
			dst[k] = c
			k++
			continue
		}
		m := t.Merges[c-n]
		stack = append(stack, m.B, m.A)
	}
	return dst
}

// Cophenetic stores in dst (nil, or length N(N-1)/2) the cophenetic
// distances, condensed: for leaves i < j, the height of the merge that
// first joins them. It returns dst.
func (t *Dendrogram) Cophenetic(dst []float64) []float64 {
	t.check()
	n := t.N
	if dst == nil {
		dst = make([]float64, CondensedLen(n))
	} else if len(dst) != CondensedLen(n) {
		panic("cluster: len(dst) != N(N-1)/2")
	}
	order, lo, hi := t.members()
	for _, m := range t.Merges {
		for _, i := range order[lo[m.A]:hi[m.A]] {
			for _, j := range order[lo[m.B]:hi[m.B]] {
				dst[cidx(n, i, j)] = m.Height
			}
		}
	}
	return dst
}

// CopheneticCorrelation returns Pearson's correlation between the
// cophenetic distances of t and dist (condensed, length N(N-1)/2), as
// scipy.cluster.hierarchy.cophenet does; NaN when either is constant.
//
//	c = Σ (x−x̄)(y−ȳ) / sqrt(Σ (x−x̄)² Σ (y−ȳ)²)
func (t *Dendrogram) CopheneticCorrelation(dist []float64) float64 {
	if len(dist) != CondensedLen(t.N) {
		panic("cluster: len(dist) != N(N-1)/2")
	}
	c := t.Cophenetic(nil)
	var mx, my float64
	for i := range c {
		mx += c[i]
		my += dist[i]
	}
	mx /= float64(len(c))
	my /= float64(len(c))
	var sxy, sxx, syy float64
	for i := range c {
		a, b := c[i]-mx, dist[i]-my
		sxy += a * b
		sxx += a * a
		syy += b * b
	}
	if sxx == 0 || syy == 0 {
		return math.NaN()
	}
	return sxy / math.Sqrt(sxx*syy)
}

// maxHeights returns, for every merge, the largest height in its subtree
// (equal to the height for monotone linkages). Cuts use it so that a cut
// of an inverted tree still gives nested clusters (scipy's maxdists).
func (t *Dendrogram) maxHeights() []float64 {
	n := t.N
	md := make([]float64, len(t.Merges))
	for i, m := range t.Merges {
		h := m.Height
		if m.A >= n {
			h = max(h, md[m.A-n])
		}
		if m.B >= n {
			h = max(h, md[m.B-n])
		}
		md[i] = h
	}
	return md
}

// labelsFor labels leaves by the clusters formed by the merges i with
// keep[i]; labels are 0, 1, ... in order of each cluster's smallest leaf.
func (t *Dendrogram) labelsFor(dst []int, keep func(i int) bool) []int {
	n := t.N
	if dst == nil {
		dst = make([]int, n)
	} else if len(dst) != n {
		panic("cluster: len(dst) != N")
	}
	if n == 0 {
		return dst
	}
	parent := make([]int, 2*n-1)
	for i := range parent {
		parent[i] = i
	}
	for i, m := range t.Merges {
		if keep(i) {
			parent[m.A], parent[m.B] = n+i, n+i
		}
	}
	root := func(x int) int {
		for parent[x] != x {
			x = parent[x]
		}
		return x
	}
	lab := make(map[int]int)
	for i := 0; i < n; i++ {
		r := root(i)
		l, ok := lab[r]
		if !ok {
			l = len(lab)
			lab[r] = l
		}
		dst[i] = l
	}
	return dst
}

// CutHeight stores in dst (nil, or length N) flat cluster labels for the
// cut at height h and returns it: leaves share a cluster when a merge at
// or below h joins them (for inverted trees, a merge counts when every
// merge beneath it is also at or below h), as scipy's fcluster with
// criterion "distance". Labels are 0, 1, ... in order of the clusters'
// smallest leaves.
func (t *Dendrogram) CutHeight(dst []int, h float64) []int {
	t.check()
	md := t.maxHeights()
	return t.labelsFor(dst, func(i int) bool { return md[i] <= h })
}

// CutCount stores in dst (nil, or length N) labels for the lowest cut
// that gives at most k clusters (scipy's fcluster criterion "maxclust")
// and returns it. Fewer than k clusters come back when merges tie at the
// cut height. It panics if k < 1.
func (t *Dendrogram) CutCount(dst []int, k int) []int {
	t.check()
	if k < 1 {
		panic("cluster: k < 1")
	}
	md := t.maxHeights()
	if k >= t.N {
		return t.labelsFor(dst, func(int) bool { return false })
	}
	s := slices.Clone(md)
	slices.Sort(s)
	// With threshold s[j], at least j+1 merges apply; we need n-k merges.
	h := s[t.N-k-1]
	return t.labelsFor(dst, func(i int) bool { return md[i] <= h })
}
