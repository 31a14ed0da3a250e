package cluster

import "math"

// OptimalOrderLimit is the largest N for which DisplayOrder computes the
// optimal leaf ordering; it takes O(N²) memory and O(N³) time.
const OptimalOrderLimit = 2000

// DisplayOrder returns a leaf order for drawing t: OptimalLeafOrder when
// t.N ≤ OptimalOrderLimit, the plain dendrogram order (Leaves) otherwise.
// dist is the condensed distance matrix the tree was built from; it is
// only read when the optimal order is computed and may then not be nil.
func (t *Dendrogram) DisplayOrder(dist []float64, s *Settings) []int {
	if t.N > OptimalOrderLimit || dist == nil {
		return t.Leaves(nil)
	}
	return t.OptimalLeafOrder(nil, dist, s)
}

// AdjacentCost returns the sum of dist between neighbouring leaves in
// order, the quantity the optimal leaf ordering minimises.
func AdjacentCost(order []int, dist []float64) float64 {
	n := len(order)
	var s float64
	for k := 1; k < n; k++ {
		s += dist[cidx(n, order[k-1], order[k])]
	}
	return s
}

// OptimalLeafOrder stores in dst (nil, or length N) the leaf order that
// minimises the sum of distances between adjacent leaves among the 2^(N-1)
// orders obtained by flipping merges of t (Bar-Joseph, Gifford & Jaakkola
// 2001, "Fast optimal leaf ordering for hierarchical clustering",
// Bioinformatics 17 suppl. 1: S22–S29), and returns it. dist is the
// condensed distance matrix (length N(N-1)/2), not modified. The leaves
// of each merge's left side are split over Settings.Workers goroutines (s
// may be nil); every cell is computed independently, so the result does
// not depend on the number.
//
// The dynamic programme keeps, for every pair of leaves i, j with lowest
// common ancestor v, the cost M(i, j) of the best order of v's leaves that
// starts at i and ends at j:
//
//	M(i, j) = min over k, m of M(i, k) + d(k, m) + M(m, j)
//
// where k runs over the leaves of the child of v's left part not holding
// i, and m likewise on the right. This costs O(N²) memory and O(N³) time
// (without the paper's pruning). Ties go to the first candidate in
// dendrogram order, so the result is deterministic; when several orders
// are optimal it may differ from scipy's optimal_leaf_ordering, with the
// same cost.
func (t *Dendrogram) OptimalLeafOrder(dst []int, dist []float64, s *Settings) []int {
	t.check()
	n := t.N
	if len(dist) != CondensedLen(n) {
		panic("cluster: len(dist) != N(N-1)/2")
	}
	if dst == nil {
		dst = make([]int, n)
	} else if len(dst) != n {
		panic("cluster: len(dst) != N")
	}
	if n <= 2 {
		return t.Leaves(dst)
	}
	order, lo, hi := t.members()
	// Work in positions of the dendrogram order: leaf order[p] is p.
	D := make([]float64, n*n)
	for a := 0; a < n; a++ {
		for b := a + 1; b < n; b++ {
			v := dist[cidx(n, order[a], order[b])]
			D[a*n+b], D[b*n+a] = v, v
		}
	}
	M := make([]float64, n*n)
	child := func(c int) (int, int) { m := t.Merges[c-n]; return m.A, m.B }
	// other returns the position range of the child of c not holding p,
	// or p itself for a leaf.
	other := func(c, p int) (int, int) {
		if c < n {
			return p, p + 1
		}
		a, b := child(c)
		if lo[a] <= p && p < hi[a] {
			return lo[b], hi[b]
		}
		return lo[a], hi[a]
	}
	workers := s.workers()
	tmps := make([][]float64, workers)
	for k := range tmps {
		tmps[k] = make([]float64, n)
	}
	for idx := range t.Merges {
		c := n + idx
		l, r := child(c)
		work := (hi[l] - lo[l]) * (hi[r] - lo[r]) * (hi[c] - lo[c])
		w := workers
		if work < 1<<16 {
			w = 1
		}
		parallelRanges(hi[l]-lo[l], w, 1, func(wk, a, b int) {
			tmp := tmps[wk]
			for i := lo[l] + a; i < lo[l]+b; i++ {
				// tmp[m] = min over k of M(i,k) + d(k,m), for m in r;
				// rows of D and M are read contiguously (M is symmetric).
				k0, k1 := other(l, i)
				row := tmp[lo[r]:hi[r]]
				for q := range row {
					row[q] = math.Inf(1)
				}
				for k := k0; k < k1; k++ {
					a := M[i*n+k]
					dk := D[k*n+lo[r] : k*n+hi[r]]
					for q, v := range dk {
						if sum := a + v; sum < row[q] {
							row[q] = sum
						}
					}
				}
				for j := lo[r]; j < hi[r]; j++ {
					m0, m1 := other(r, j)
					best := math.Inf(1)
					mj := M[j*n+m0 : j*n+m1]
					for q, v := range mj {
						if sum := tmp[m0+q] + v; sum < best {
							best = sum
						}
					}
					M[i*n+j], M[j*n+i] = best, best
				}
			}
		})
	}
	root := 2*n - 2
	l, r := child(root)
	bi, bj, best := -1, -1, math.Inf(1)
	for i := lo[l]; i < hi[l]; i++ {
		for j := lo[r]; j < hi[r]; j++ {
			if M[i*n+j] < best {
				bi, bj, best = i, j, M[i*n+j]
			}
		}
	}
	// Unfold: an explicit stack of (node, first, last) positions.
	type frame struct{ c, i, j int }
	stack := []frame{{root, bi, bj}}
	k := 0
	for len(stack) > 0 {
		f := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		if f.c < n {
			dst[k] = order[f.i]
			k++
			continue
		}
		p, q := child(f.c)
		if !(lo[p] <= f.i && f.i < hi[p]) {
			p, q = q, p
		}
		k0, k1 := other(p, f.i)
		m0, m1 := other(q, f.j)
		bk, bm, bv := -1, -1, math.Inf(1)
		for kk := k0; kk < k1; kk++ {
			for m := m0; m < m1; m++ {
				if v := M[f.i*n+kk] + D[kk*n+m] + M[m*n+f.j]; v < bv {
					bk, bm, bv = kk, m, v
				}
			}
		}
		stack = append(stack, frame{q, bm, f.j}, frame{p, f.i, bk})
	}
	return dst
}
