package cluster

import (
	"math"
	"slices"
	"strconv"
	"testing"
)

// canon relabels a label vector by first appearance, so that two
// partitions are equal exactly when their canonical forms are.
func canon(l []int) []int {
	m := map[int]int{}
	out := make([]int, len(l))
	for i, v := range l {
		c, ok := m[v]
		if !ok {
			c = len(m)
			m[v] = c
		}
		out[i] = c
	}
	return out
}

// TestTreeScipy checks, on every fixture case, Leaves against
// scipy.cluster.hierarchy.leaves_list, Cophenetic and CopheneticCorrelation
// against cophenet, CutCount against fcluster(criterion="maxclust"),
// CutHeight against fcluster(criterion="distance") and OptimalLeafOrder
// against leaves_list(optimal_leaf_ordering(Z, y)) (same order, reversed,
// or the same adjacent-distance sum). Fixture: testdata/scipy_linkage.json
// from testdata/gen_scipy.py, Debian python3-scipy 1.10.1.
func TestTreeScipy(t *testing.T) {
	for _, c := range loadScipy(t) {
		name := c.Name + "/" + c.Method
		tree := scipyTree(c)
		if got := tree.Leaves(nil); !slices.Equal(got, c.Leaves) {
			t.Errorf("%s: leaves %v, scipy %v", name, got, c.Leaves)
		}
		y := c.condensed()
		coph := tree.Cophenetic(nil)
		for i := range coph {
			if !relClose(coph[i], c.Cophenetic[i], 1e-12) {
				t.Errorf("%s: cophenetic[%d] = %v, scipy %v", name, i, coph[i], c.Cophenetic[i])
				break
			}
		}
		r := tree.CopheneticCorrelation(y)
		if c.CophCorr == nil {
			if !math.IsNaN(r) {
				t.Errorf("%s: cophenetic correlation %v, scipy nan", name, r)
			}
		} else if !relClose(r, *c.CophCorr, 1e-10) {
			t.Errorf("%s: cophenetic correlation %v, scipy %v", name, r, *c.CophCorr)
		}
		for ks, want := range c.Maxclust {
			k, _ := strconv.Atoi(ks)
			if k == c.N {
				// scipy 1.10 applies at least one merge even for k = n;
				// CutCount(n) keeps every leaf apart ("at most k").
				continue
			}
			if got := tree.CutCount(nil, k); !slices.Equal(canon(got), canon(want)) {
				t.Errorf("%s: CutCount(%d) = %v, scipy %v", name, k, got, want)
			}
		}
		for _, d := range c.Distance {
			if got := tree.CutHeight(nil, d.T); !slices.Equal(canon(got), canon(d.Labels)) {
				t.Errorf("%s: CutHeight(%v) = %v, scipy %v", name, d.T, got, d.Labels)
			}
		}
		if c.OLO != nil {
			got := tree.OptimalLeafOrder(nil, y, &Settings{Workers: 3})
			rev := slices.Clone(c.OLO)
			slices.Reverse(rev)
			if !validOrder(tree, got) {
				t.Errorf("%s: optimal order %v breaks the tree", name, got)
			}
			gc, wc := AdjacentCost(got, y), AdjacentCost(c.OLO, y)
			// scipy's result is not always optimal (scipy issue #11227,
			// open): ours must be the same order or cost no more.
			if !slices.Equal(got, c.OLO) && !slices.Equal(got, rev) && gc > wc*(1+1e-12) {
				t.Errorf("%s: optimal order cost %v (%v), scipy %v (%v)", name, gc, got, wc, c.OLO)
			}
			if c.N <= 12 {
				if b := bruteOrderCost(tree, y); !relClose(gc, b, 1e-12) {
					t.Errorf("%s: optimal order cost %v, exhaustive search %v", name, gc, b)
				}
			}
			if gc > AdjacentCost(c.Leaves, y)*(1+1e-12) {
				t.Errorf("%s: optimal order worse than plain order", name)
			}
		}
	}
}

// scipyTree returns scipy's Z as a Dendrogram.
func scipyTree(c scipyCase) *Dendrogram {
	d := &Dendrogram{N: c.N}
	for _, r := range c.Z {
		d.Merges = append(d.Merges, Merge{A: int(r[0]), B: int(r[1]), Height: r[2], Size: int(r[3])})
	}
	return d
}

// validOrder reports whether order is a flip order of t: every cluster's
// leaves are contiguous.
func validOrder(t *Dendrogram, order []int) bool {
	n := t.N
	pos := make([]int, n)
	for p, l := range order {
		pos[l] = p
	}
	lo := make([]int, 2*n-1)
	hi := make([]int, 2*n-1)
	cnt := make([]int, 2*n-1)
	for i := 0; i < n; i++ {
		lo[i], hi[i], cnt[i] = pos[i], pos[i], 1
	}
	for i, m := range t.Merges {
		c := n + i
		lo[c], hi[c], cnt[c] = min(lo[m.A], lo[m.B]), max(hi[m.A], hi[m.B]), cnt[m.A]+cnt[m.B]
		if hi[c]-lo[c]+1 != cnt[c] {
			return false
		}
	}
	return true
}

// bruteOrderCost tries all 2^(N-1) flips of t and returns the least
// adjacent cost (the definition of the optimal leaf order).
func bruteOrderCost(t *Dendrogram, dist []float64) float64 {
	best := math.Inf(1)
	nm := len(t.Merges)
	for mask := 0; mask < 1<<nm; mask++ {
		f := &Dendrogram{N: t.N, Merges: slices.Clone(t.Merges)}
		for i := range f.Merges {
			if mask>>i&1 == 1 {
				f.Merges[i].A, f.Merges[i].B = f.Merges[i].B, f.Merges[i].A
			}
		}
		best = min(best, AdjacentCost(f.Leaves(nil), dist))
	}
	return best
}

// TestTinyTrees: trees of zero and one leaf have empty results, no panics.
func TestTinyTrees(t *testing.T) {
	for _, n := range []int{0, 1} {
		d := &Dendrogram{N: n}
		if len(d.Leaves(nil)) != n || len(d.Cophenetic(nil)) != 0 || len(d.CutHeight(nil, 1)) != n ||
			len(d.CutCount(nil, 1)) != n || len(d.OptimalLeafOrder(nil, nil, nil)) != n {
			t.Errorf("n=%d: wrong lengths", n)
		}
	}
}
