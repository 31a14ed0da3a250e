package cluster

import (
	"fmt"
	"math"
	"slices"
)

// mstSingle is Müllner's MST algorithm (Prim): grow one tree from point 0,
// keeping for every point outside it the smallest distance to the tree.
// Ties go to the lowest index. O(n²) time, O(n) extra memory.
func mstSingle(dist []float64, n int, workers int) *Dendrogram {
	return prim(n, workers, func(x, i int) float64 { return dist[cidx(n, x, i)] })
}

// prim runs Prim's algorithm over points 0..n-1 with distances from
// dist(x, i), which is called once per pair. The scan over the points
// outside the tree is split over workers; each keeps the smallest value
// with the lowest index, and the parts are combined in order, so the
// result does not depend on the split.
func prim(n, workers int, dist func(x, i int) float64) *Dendrogram {
	z := make([]Merge, n-1)
	// out lists the points outside the tree, ascending.
	out := make([]int, n-1)
	for i := range out {
		out[i] = i + 1
	}
	d := make([]float64, n)
	for i := range d {
		d[i] = math.Inf(1)
	}
	type best struct {
		v float64
		i int
	}
	parts := make([]best, max(1, workers))
	x := 0
	for k := 0; k < n-1; k++ {
		used := parallelRanges(len(out), workers, minParallel, func(w, lo, hi int) {
			b := best{math.Inf(1), -1}
			for _, i := range out[lo:hi] {
				if v := dist(x, i); d[i] > v {
					d[i] = v
				}
				if d[i] < b.v || b.i < 0 {
					b = best{d[i], i}
				}
			}
			parts[w] = b
		})
		r := parts[0]
		for w := 1; w < used; w++ {
			if p := parts[w]; p.i >= 0 && (r.i < 0 || p.v < r.v) {
				r = p
			}
		}
		z[k] = Merge{A: x, B: r.i, Height: r.v}
		x = r.i
		j, _ := slices.BinarySearch(out, x)
		out = slices.Delete(out, j, j+1)
	}
	sortAndLabel(z, n)
	return &Dendrogram{N: n, Merges: z}
}

// minParallel is the least number of active clusters per worker for the
// NN chain on a matrix to split a scan (a variable so tests can lower it).
var minParallel = 8192

// nnChainCondensed is the nearest-neighbour-chain algorithm (Müllner 2011,
// fig. 5) for the reducible methods on a working copy of dist. The chain
// starts at the lowest active index; a nearest neighbour is the lowest
// index at the smallest distance, except that the previous chain element
// is kept on a tie (which guarantees termination). The merged cluster
// takes the slot of the larger index. Scans and updates run over the
// sorted list of active slots, split over workers; the minimum under the
// total order (distance, not-previous, index) does not depend on the
// split.
//
// If own is true dist is the caller's scratch copy and is overwritten.
func nnChainCondensed(dist []float64, n int, m Linkage, workers int, own bool) (*Dendrogram, error) {
	d := dist
	if !own {
		d = make([]float64, len(dist))
		copy(d, dist)
	}
	z := make([]Merge, n-1)
	size := make([]float64, n)
	act := make([]int, n)
	for i := range size {
		size[i] = 1
		act[i] = i
	}
	// rs[i] + j is the position of d(i, j), i < j (see cidx).
	rs := make([]int, n)
	for i := range rs {
		rs[i] = n*i - i*(i+1)/2 - i - 1
	}
	// Column minima: for every active j, the smallest d(i, j) over the
	// active i < j (colV) and the lowest such i (colI, -1 if none), unless
	// stale[j]. Column j of the condensed matrix is strided (one entry per
	// row), so the scan of a chain tip x reads it only when stale[x]; the
	// rest of its scan is row x, contiguous. A merge of x < y into slot y
	// changes in column j > x only the entries of rows x and y, and the
	// new column minimum is min(old minimum, new d(y, j)) unless the old
	// one was at x or y (then the column is stale); column y is rewritten
	// by the update, which computes its minimum on the way. This is exact:
	// the same comparisons on the same values as a full scan, so the
	// chain, its ties and the merges are unchanged.
	colV := make([]float64, n)
	colI := make([]int, n)
	stale := make([]bool, n)
	initColumns(d, rs, n, colV, colI, workers)
	chain := make([]int, 0, n)
	best := make([]cand, max(1, workers))
	bad := make([]bool, max(1, workers))
	type colMin struct {
		v float64
		i int
	}
	ymin := make([]colMin, max(1, workers))
	for k := 0; k < n-1; k++ {
		if len(chain) == 0 {
			chain = append(chain, act[0])
		}
		var x, y int
		var cur float64
		for {
			x = chain[len(chain)-1]
			prev := -1
			b0 := cand{v: math.Inf(1), key: -1}
			if len(chain) > 1 {
				prev = chain[len(chain)-2]
				b0 = cand{v: d[cidx(n, x, prev)], prev: true, key: prev}
			}
			if stale[x] {
				rescanColumn(d, rs, act, x, colV, colI)
				stale[x] = false
			}
			mid, _ := slices.BinarySearch(act, x)
			above := act[mid+1:]
			used := parallelRanges(len(above), workers, minParallel, func(w, lo, hi int) {
				// An ascending scan with strict comparisons: the previous
				// chain element (b0) keeps a tie, and otherwise the lowest
				// index wins, as the order (distance, not-previous, index)
				// asks. Distances are finite (checked), so the first
				// element always beats b0 = +Inf.
				bv, bk := b0.v, b0.key
				rx := rs[x]
				for _, i := range above[lo:hi] {
					if v := d[rx+i]; v < bv {
						bv, bk = v, i
					}
				}
				best[w] = cand{v: bv, prev: bk >= 0 && bk == prev, key: bk}
			})
			r := b0
			if ci := colI[x]; ci >= 0 {
				if c := (cand{v: colV[x], prev: ci == prev, key: ci}); c.less(r) {
					r = c
				}
			}
			for w := 0; w < used; w++ {
				if best[w].less(r) {
					r = best[w]
				}
			}
			y, cur = r.key, r.v
			if prev >= 0 && y == prev {
				break
			}
			chain = append(chain, y)
		}
		chain = chain[:len(chain)-2]
		if x > y {
			x, y = y, x
		}
		nx, ny := size[x], size[y]
		z[k] = Merge{A: x, B: y, Height: cur}
		size[x] = 0
		size[y] = nx + ny
		ax, _ := slices.BinarySearch(act, x)
		act = slices.Delete(act, ax, ax+1)
		used := parallelRanges(len(act), workers, minParallel, func(wk, lo, hi int) {
			part := act[lo:hi]
			// d(i, x) and d(i, y) by where i lies: below x both are in row
			// i; between x and y, d(x, i) is in row x and d(i, y) in row
			// i; above y both are in rows x and y (contiguous).
			px, _ := slices.BinarySearch(part, x)
			py, _ := slices.BinarySearch(part, y)
			rx, ry := rs[x], rs[y]
			nan := false
			mv, mi := math.Inf(1), -1 // minimum of the new column y
			for _, i := range part[:px] {
				ri := rs[i]
				var v float64
				if m == Average {
					// update(Average, ...) written out, same operations.
					v = (float64(nx*d[ri+x]) + float64(ny*d[ri+y])) / (nx + ny)
				} else {
					v = update(m, d[ri+x], d[ri+y], cur, nx, ny, size[i])
					nan = nan || math.IsNaN(v)
				}
				d[ri+y] = v
				if v < mv {
					mv, mi = v, i
				}
			}
			for _, i := range part[px:py] {
				iy := rs[i] + y
				var v float64
				if m == Average {
					v = (float64(nx*d[rx+i]) + float64(ny*d[iy])) / (nx + ny)
				} else {
					v = update(m, d[rx+i], d[iy], cur, nx, ny, size[i])
					nan = nan || math.IsNaN(v)
				}
				d[iy] = v
				if v < mv {
					mv, mi = v, i
				}
				// Column i (x < i < y) loses the entry of row x.
				if colI[i] == x {
					stale[i] = true
				}
			}
			for _, i := range part[py:] {
				if i == y {
					continue
				}
				var v float64
				if m == Average {
					v = (float64(nx*d[rx+i]) + float64(ny*d[ry+i])) / (nx + ny)
				} else {
					v = update(m, d[rx+i], d[ry+i], cur, nx, ny, size[i])
					nan = nan || math.IsNaN(v)
				}
				d[ry+i] = v
				// Column i (> y) loses row x and gets a new row y entry.
				switch ci := colI[i]; {
				case stale[i]:
				case ci == x || ci == y:
					stale[i] = true
				case v < colV[i] || (v == colV[i] && y < ci):
					colV[i], colI[i] = v, y
				}
			}
			if nan {
				bad[wk] = true
			}
			ymin[wk] = colMin{mv, mi}
		})
		// Parts are in ascending index order: the first of equal minima
		// has the lowest index.
		c := colMin{math.Inf(1), -1}
		for w := 0; w < used; w++ {
			if p := ymin[w]; p.i >= 0 && (c.i < 0 || p.v < c.v) {
				c = p
			}
		}
		colV[y], colI[y], stale[y] = c.v, c.i, false
		if slices.Contains(bad, true) {
			return nil, nonReal(m, k)
		}
	}
	sortAndLabel(z, n)
	return &Dendrogram{N: n, Merges: z}, nil
}

// initColumns sets colV[j], colI[j] to the smallest d(i, j) over i < j
// and its lowest i (colI[0] = -1), reading the rows of d in order; the
// columns are split over workers.
func initColumns(d []float64, rs []int, n int, colV []float64, colI []int, workers int) {
	for j := range colV {
		colV[j], colI[j] = math.Inf(1), -1
	}
	parallelRanges(n, workers, 1024, func(_, lo, hi int) {
		for i := 0; i < hi-1; i++ {
			for j := max(lo, i+1); j < hi; j++ {
				if v := d[rs[i]+j]; v < colV[j] {
					colV[j], colI[j] = v, i
				}
			}
		}
	})
}

// rescanColumn recomputes the minimum of column x over the active rows
// below x (act ascending).
func rescanColumn(d []float64, rs, act []int, x int, colV []float64, colI []int) {
	mid, _ := slices.BinarySearch(act, x)
	bv, bk := math.Inf(1), -1
	for _, i := range act[:mid] {
		if v := d[rs[i]+x]; v < bv {
			bv, bk = v, i
		}
	}
	colV[x], colI[x] = bv, bk
}

// genericCondensed is Müllner's generic algorithm (2011, fig. 3) for
// methods that may invert. For every active x it keeps a candidate nearest
// neighbour among the larger indices and a lower bound of that distance in
// a binary heap; candidates are recomputed only when they come to the top
// stale. Heap ties and scans resolve as in scipy 1.10's fast_linkage, so
// the merge list equals scipy's.
func genericCondensed(dist []float64, n int, m Linkage, own bool) (*Dendrogram, error) {
	d := dist
	if !own {
		d = make([]float64, len(dist))
		copy(d, dist)
	}
	z := make([]Merge, n-1)
	size := make([]float64, n)
	id := make([]int, n)
	for i := range size {
		size[i] = 1
		id[i] = i
	}
	nbr := make([]int, n-1)
	mind := make([]float64, n-1)
	findMin := func(x int) (int, float64) {
		best, bd := -1, math.Inf(1)
		for i := x + 1; i < n; i++ {
			if size[i] == 0 {
				continue
			}
			// best < 0: an infinite distance (overflow) is still a candidate.
			if v := d[cidx(n, x, i)]; v < bd || best < 0 {
				best, bd = i, v
			}
		}
		return best, bd
	}
	for x := 0; x < n-1; x++ {
		nbr[x], mind[x] = findMin(x)
	}
	h := newIndexHeap(mind)
	for k := 0; k < n-1; k++ {
		var x, y int
		var dxy float64
		for i := 0; i < n-k; i++ {
			x, dxy = h.min()
			y = nbr[x]
			if dxy == d[cidx(n, x, y)] {
				break
			}
			y, dxy = findMin(x)
			nbr[x], mind[x] = y, dxy
			h.change(x, dxy)
		}
		h.removeMin()
		a, b := id[x], id[y]
		if a > b {
			a, b = b, a
		}
		nx, ny := size[x], size[y]
		z[k] = Merge{A: a, B: b, Height: dxy, Size: int(nx + ny)}
		size[x] = 0
		size[y] = nx + ny
		id[y] = n + k
		for w := 0; w < n; w++ {
			nw := size[w]
			if nw == 0 || w == y {
				continue
			}
			wy := cidx(n, w, y)
			v := update(m, d[cidx(n, w, x)], d[wy], dxy, nx, ny, nw)
			if math.IsNaN(v) {
				return nil, nonReal(m, k)
			}
			d[wy] = v
		}
		for w := 0; w < x; w++ {
			if size[w] > 0 && nbr[w] == x {
				nbr[w] = y
			}
		}
		for w := 0; w < y; w++ {
			if size[w] == 0 {
				continue
			}
			if v := d[cidx(n, w, y)]; v < mind[w] {
				nbr[w], mind[w] = y, v
				h.change(w, v)
			}
		}
		if y < n-1 {
			if w, v := findMin(y); w != -1 {
				nbr[y], mind[y] = w, v
				h.change(y, v)
			}
		}
	}
	return &Dendrogram{N: n, Merges: z}, nil
}

// nonReal is the error for a Lance–Williams update that is not a number.
// With distances bounded as Link requires, Ward, Centroid and Median stay
// real (the merged pair is the closest, so the radicands are positive) and
// nothing overflows; this is a guard, not an expected outcome.
func nonReal(m Linkage, k int) error {
	return fmt.Errorf("cluster: %v linkage: a distance update is not a number at merge %d", m, k)
}

// indexHeap is a binary min-heap of values addressed by key. Children
// replace a parent only when strictly smaller, and the right child is
// taken only when strictly smaller than the left.
type indexHeap struct {
	vals  []float64 // by heap position
	key   []int     // key at heap position
	pos   []int     // heap position of key
	count int
}

func newIndexHeap(v []float64) *indexHeap {
	h := &indexHeap{vals: append([]float64(nil), v...), key: make([]int, len(v)), pos: make([]int, len(v)), count: len(v)}
	for i := range v {
		h.key[i], h.pos[i] = i, i
	}
	for i := len(v)/2 - 1; i >= 0; i-- {
		h.down(i)
	}
	return h
}

func (h *indexHeap) min() (int, float64) { return h.key[0], h.vals[0] }

func (h *indexHeap) removeMin() {
	h.swap(0, h.count-1)
	h.count--
	h.down(0)
}

func (h *indexHeap) change(key int, v float64) {
	i := h.pos[key]
	old := h.vals[i]
	h.vals[i] = v
	if v < old {
		h.up(i)
	} else {
		h.down(i)
	}
}

func (h *indexHeap) swap(i, j int) {
	h.vals[i], h.vals[j] = h.vals[j], h.vals[i]
	h.key[i], h.key[j] = h.key[j], h.key[i]
	h.pos[h.key[i]] = i
	h.pos[h.key[j]] = j
}

func (h *indexHeap) up(i int) {
	for i > 0 {
		p := (i - 1) / 2
		if !(h.vals[p] > h.vals[i]) {
			return
		}
		h.swap(i, p)
		i = p
	}
}

func (h *indexHeap) down(i int) {
	for {
		c := 2*i + 1
		if c >= h.count {
			return
		}
		if c+1 < h.count && h.vals[c+1] < h.vals[c] {
			c++
		}
		if !(h.vals[i] > h.vals[c]) {
			return
		}
		h.swap(i, c)
		i = c
	}
}

// nnChainSquare is nnChainCondensed on a full symmetric n×n matrix d
// (overwritten): the same chain, scans, tie rules and update formulas, so
// the same merges, but a scan reads one row, contiguously, instead of a
// column of the condensed matrix; only the update writes a column.
func nnChainSquare(d []float64, n int, m Linkage, workers int) (*Dendrogram, error) {
	z := make([]Merge, n-1)
	size := make([]float64, n)
	act := make([]int, n)
	for i := range size {
		size[i] = 1
		act[i] = i
	}
	chain := make([]int, 0, n)
	best := make([]cand, max(1, workers))
	bad := make([]bool, max(1, workers))
	for k := 0; k < n-1; k++ {
		if len(chain) == 0 {
			chain = append(chain, act[0])
		}
		var x, y int
		var cur float64
		for {
			x = chain[len(chain)-1]
			prev := -1
			b0 := cand{v: math.Inf(1), key: -1}
			if len(chain) > 1 {
				prev = chain[len(chain)-2]
				b0 = cand{v: d[x*n+prev], prev: true, key: prev}
			}
			row := d[x*n : x*n+n]
			used := parallelRanges(len(act), workers, minParallel, func(w, lo, hi int) {
				b := b0
				for _, i := range act[lo:hi] {
					if i == x {
						continue
					}
					v := row[i]
					if v < b.v || (v == b.v && !b.prev && i < b.key) || b.key < 0 {
						b = cand{v: v, prev: i == prev, key: i}
					}
				}
				best[w] = b
			})
			r := best[0]
			for w := 1; w < used; w++ {
				if best[w].less(r) {
					r = best[w]
				}
			}
			y, cur = r.key, r.v
			if prev >= 0 && y == prev {
				break
			}
			chain = append(chain, y)
		}
		chain = chain[:len(chain)-2]
		if x > y {
			x, y = y, x
		}
		nx, ny := size[x], size[y]
		z[k] = Merge{A: x, B: y, Height: cur}
		size[x] = 0
		size[y] = nx + ny
		ax, _ := slices.BinarySearch(act, x)
		act = slices.Delete(act, ax, ax+1)
		rx, ry := d[x*n:x*n+n], d[y*n:y*n+n]
		parallelRanges(len(act), workers, minParallel, func(wk, lo, hi int) {
			part := act[lo:hi]
			if m == Average {
				for _, i := range part {
					if i == y {
						continue
					}
					v := (float64(nx*rx[i]) + float64(ny*ry[i])) / (nx + ny)
					ry[i], d[i*n+y] = v, v
				}
				return
			}
			for _, i := range part {
				if i == y {
					continue
				}
				v := update(m, rx[i], ry[i], cur, nx, ny, size[i])
				if math.IsNaN(v) {
					bad[wk] = true
				}
				ry[i], d[i*n+y] = v, v
			}
		})
		if slices.Contains(bad, true) {
			return nil, nonReal(m, k)
		}
	}
	sortAndLabel(z, n)
	return &Dendrogram{N: n, Merges: z}, nil
}
