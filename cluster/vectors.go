package cluster

import (
	"errors"
	"fmt"
	"math"
	"math/bits"
	"sync"
)

// VectorError reports a coordinate that is NaN, infinite or larger in
// magnitude than 1e100, or a weight that is not in (0, 1e100].
// Row and Col are 0-based indices into the caller's rows.
type VectorError struct {
	Row, Col int // Col is -1 for a weight
	Value    float64
}

func (e *VectorError) Error() string {
	if e.Col < 0 {
		return fmt.Sprintf("cluster: weight %v of row %d is not a positive finite number", e.Value, e.Row)
	}
	return fmt.Sprintf("cluster: row %d, column %d: %v is not a finite number of magnitude at most 1e100", e.Row, e.Col, e.Value)
}

// maxCoordinate bounds the magnitude of coordinates, so that squared
// distances and weighted sums cannot overflow.
const maxCoordinate = 1e100

// Unwrap returns ErrNotFinite.
func (e *VectorError) Unwrap() error { return ErrNotFinite }

// ErrNotFinite is wrapped by VectorError.
var ErrNotFinite = errors.New("not a finite number")

// flatten copies x into one row-major slice, checking values and weights.
func flatten(x [][]float64, weights []float64) (flat []float64, w []float64, d int, err error) {
	n := len(x)
	if n == 0 {
		return nil, nil, 0, nil
	}
	d = len(x[0])
	if weights != nil && len(weights) != n {
		panic("cluster: len(weights) != len(x)")
	}
	flat = make([]float64, n*d)
	w = make([]float64, n)
	for i, row := range x {
		if len(row) != d {
			panic("cluster: rows of x differ in length")
		}
		for j, v := range row {
			if !(math.Abs(v) <= maxCoordinate) {
				return nil, nil, 0, &VectorError{Row: i, Col: j, Value: v}
			}
		}
		copy(flat[i*d:], row)
		w[i] = 1
		if weights != nil {
			v := weights[i]
			if !(v > 0) || v > 1e100 {
				return nil, nil, 0, &VectorError{Row: i, Col: -1, Value: v}
			}
			w[i] = v
		}
	}
	return flat, w, d, nil
}

// LinkVectors clusters the rows of x (n rows of one length d) under the
// Euclidean distance; x is never modified. weights, if not nil, must have
// len(x) elements: row i then counts as weights[i] coincident points (the
// Lance–Williams sizes are the weights), which makes Ward and Centroid
// exact over weighted points. If weights is nil then all of the weights
// are 1. Median ignores weights, as its update has no sizes. Merge.Size
// always counts rows, not weight.
//
// Ward, Centroid and Median work on centroids in O(n·d) memory, with no
// distance matrix: Ward runs the nearest-neighbour chain with Ward
// distances computed from centroids and weights on the fly (squared Ward
// distance 2·wA·wB/(wA+wB)·‖a−b‖², compared without square roots and
// pruned by partial sums over the first coordinates); Centroid and
// Median run the generic algorithm. Single runs the MST algorithm with
// distances computed on the fly, also in O(n·d) memory. Complete, Average
// and Weighted compute the Euclidean distance matrix and run Link's
// nearest-neighbour chain on it: the full n×n matrix up to n = 16384
// (8n² bytes; rows are then read contiguously), the condensed one
// (4n² bytes) above. Distance computations are split over Settings.Workers
// goroutines and reduced in a fixed order with an associative tie rule,
// so results do not depend on the number of workers.
//
// Ties follow the rules of Link. Heights computed from centroids can
// differ from scipy's Lance–Williams values in the last bits; merges whose
// heights differ by less than that may then come out in another order.
func LinkVectors(x [][]float64, weights []float64, method Linkage, s *Settings) (*Dendrogram, error) {
	method.check()
	flat, w, d, err := flatten(x, weights)
	if err != nil {
		return nil, err
	}
	n := len(x)
	if n <= 1 {
		return &Dendrogram{N: n}, nil
	}
	switch method {
	case Ward:
		return wardVectors(flat, w, n, d, s.workers()), nil
	case Centroid, Median:
		return genericVectors(flat, w, n, d, method, s.workers()), nil
	case Single:
		if weights != nil {
			panic("cluster: weights need Ward, Centroid or Median linkage")
		}
		return prim(n, s.workers(), func(a, b int) float64 {
			return euclid(flat[a*d:a*d+d], flat[b*d:b*d+d])
		}), nil
	}
	if weights != nil {
		panic("cluster: weights need Ward, Centroid or Median linkage")
	}
	if n <= squareLimit {
		return nnChainSquare(euclideanSquare(flat, n, d, s.workers()), n, method, s.workers())
	}
	return link(EuclideanCondensed(nil, x, s), method, s, true)
}

// EuclideanCondensed stores the Euclidean distances between the rows of x
// in dst (condensed layout, see CondensedIndex) and returns it. If dst is
// nil a new slice is made; otherwise it must have length CondensedLen(n).
// Rows are split over Settings.Workers goroutines.
func EuclideanCondensed(dst []float64, x [][]float64, s *Settings) []float64 {
	n := len(x)
	if n == 0 {
		return PairwiseCondensed(dst, x, euclid, s)
	}
	d := len(x[0])
	flat := make([]float64, n*d)
	for i, r := range x {
		if len(r) != d {
			panic("cluster: rows of x differ in length")
		}
		copy(flat[i*d:], r)
	}
	return pairwise(dst, n, s, func(i int, out []float64) {
		rowDist(flat[i*d:i*d+d], flat[(i+1)*d:], out)
	})
}

// squareLimit is the largest n for which LinkVectors keeps the full n×n
// matrix (8n² bytes, 2 GiB at the limit) instead of the condensed one:
// twice the memory, but the NN chain then reads rows instead of columns
// (measured here: a third less time at n = 10000, little gain at 20000,
// where the strided column writes of the update dominate).
const squareLimit = 16384

// euclideanSquare returns the full n×n Euclidean distance matrix of the
// rows of flat (d columns), rows split over workers; entry (i, j) and
// (j, i) are computed alike, so the matrix is exactly symmetric.
func euclideanSquare(flat []float64, n, d, workers int) []float64 {
	D := make([]float64, n*n)
	parallelRanges(n, workers, 1, func(_, lo, hi int) {
		for i := lo; i < hi; i++ {
			rowDist(flat[i*d:i*d+d], flat, D[i*n:i*n+n])
		}
	})
	return D
}

// rowDistGo is the portable rowDist.
func rowDistGo(x, c []float64, out []float64) {
	d := len(x)
	for k := range out {
		out[k] = euclid(x, c[k*d:k*d+d])
	}
}

// euclid is the Euclidean distance, summed in four lanes as sqdist.
func euclid(a, b []float64) float64 {
	if len(a) != len(b) {
		panic("cluster: slice lengths do not match")
	}
	return math.Sqrt(sqdist(a, b))
}

// PairwiseCondensed stores dist(x[i], x[j]) for all i < j in dst
// (condensed layout) and returns it; dst may be nil. dist must be safe for
// concurrent use. Rows are split over Settings.Workers goroutines; each
// value is computed independently, so the result does not depend on it.
func PairwiseCondensed(dst []float64, x [][]float64, dist func(a, b []float64) float64, s *Settings) []float64 {
	return pairwise(dst, len(x), s, func(i int, out []float64) {
		for k := range out {
			out[k] = dist(x[i], x[i+1+k])
		}
	})
}

// pairwise fills the condensed matrix row by row: row(i, out) stores
// d(i, j) for j = i+1..n-1 in out. Rows are split over workers in ranges
// of about equal numbers of values.
func pairwise(dst []float64, n int, s *Settings, row func(i int, out []float64)) []float64 {
	m := CondensedLen(n)
	if dst == nil {
		dst = make([]float64, m)
	} else if len(dst) != m {
		panic("cluster: len(dst) != n(n-1)/2")
	}
	nw := s.workers()
	if nw > n {
		nw = n
	}
	var wg sync.WaitGroup
	lo := 0
	for k := 0; k < nw; k++ {
		target := (m * (k + 1)) / nw
		hi := lo
		for hi < n && m-CondensedLen(n-hi) < target {
			hi++
		}
		if k == nw-1 {
			hi = n
		}
		wg.Add(1)
		go func(lo, hi int) {
			defer wg.Done()
			for i := lo; i < hi; i++ {
				start := m - CondensedLen(n-i) // index of d(i, i+1)
				row(i, dst[start:start+n-1-i])
			}
		}(lo, hi)
		lo = hi
	}
	wg.Wait()
	return dst
}

// parallelRanges runs f over [0, m) split into at most w contiguous
// ranges, in parallel, and waits. Ranges are small when m is.
func parallelRanges(m, w, minPer int, f func(k, lo, hi int)) int {
	if w > 1 && m/w < minPer {
		w = max(1, m/minPer)
	}
	if w <= 1 {
		f(0, 0, m)
		return 1
	}
	var wg sync.WaitGroup
	for k := 1; k < w; k++ {
		lo, hi := m*k/w, m*(k+1)/w
		wg.Add(1)
		go func() {
			defer wg.Done()
			f(k, lo, hi)
		}()
	}
	f(0, 0, m/w)
	wg.Wait()
	return w
}

// sqdistGo returns ‖a−b‖² for len(a) == len(b) summed in four lanes
// s0..s3 (coordinate k goes to lane k%4, the tail beyond a multiple of
// four to s0) and then (s0+s1)+(s2+s3).
func sqdistGo(a, b []float64) float64 {
	var s0, s1, s2, s3 float64
	k := 0
	for ; k+4 <= len(a); k += 4 {
		t0 := a[k] - b[k]
		t1 := a[k+1] - b[k+1]
		t2 := a[k+2] - b[k+2]
		t3 := a[k+3] - b[k+3]
		s0 += t0 * t0
		s1 += t1 * t1
		s2 += t2 * t2
		s3 += t3 * t3
	}
	for ; k < len(a); k++ {
		t := a[k] - b[k]
		s0 += t * t
	}
	return (s0 + s1) + (s2 + s3)
}

// cand is a nearest-neighbour candidate: the order (v, !prev, key) is
// total, so the minimum over any split of the candidates is the same.
type cand struct {
	v    float64
	prev bool
	key  int
	pos  int
}

func (c cand) less(o cand) bool {
	if o.key < 0 { // no candidate yet
		return c.key >= 0
	}
	if c.v != o.v {
		return c.v < o.v
	}
	if c.prev != o.prev {
		return c.prev
	}
	return c.key < o.key
}

// wardVectors is the nearest-neighbour chain for Ward on centroids.
// Clusters live at positions 0..m-1 of cent (row-major, d columns),
// compacted by moving the last cluster into a freed position; key[p] is
// the cluster's slot in scipy's sense (the larger slot of the two merged;
// a leaf of the cluster), used for ties and for labelling.
func wardVectors(cent, w []float64, n, d, workers int) *Dendrogram {
	key := make([]int, n)
	pos := make([]int, n)
	for i := range key {
		key[i], pos[i] = i, i
	}
	m := n
	z := make([]Merge, 0, n-1)
	chain := make([]int, 0, n) // keys
	last := -1                 // key of the cluster merged last
	head := d                  // coordinates summed before the pruning test
	switch {
	case d >= 20:
		head = 16
	case d >= 16:
		head = 12
	case d >= 12:
		head = 8
	}
	best := make([]cand, max(workers, 1))
	// search scans every cluster for the nearest neighbour of the one at
	// px, starting from candidate start (the previous chain element, the
	// cluster merged last, or none), which only tightens the pruning.
	search := func(px int, prevKey int, start cand) cand {
		cx := cent[px*d : px*d+d]
		used := parallelRanges(m, workers, 2048/max(1, d/8), func(k, lo, hi int) {
			best[k] = scanWard(cent, w, key, cx, w[px], d, head, px, prevKey, lo, hi, start)
		})
		r := best[0]
		for k := 1; k < used; k++ {
			if best[k].less(r) {
				r = best[k]
			}
		}
		return r
	}
	for m > 1 {
		if len(chain) == 0 {
			lo := key[0]
			for p := 1; p < m; p++ {
				lo = min(lo, key[p])
			}
			chain = append(chain, lo)
		}
		var kx, ky int
		var v float64
		for {
			kx = chain[len(chain)-1]
			px := pos[kx]
			prev := -1
			start := cand{v: math.Inf(1), key: -1, pos: -1}
			if len(chain) > 1 {
				prev = chain[len(chain)-2]
				pp := pos[prev]
				start = cand{v: wardValue(cent[px*d:px*d+d], cent[pp*d:pp*d+d], w[px], w[pp], head), prev: true, key: prev, pos: pp}
			} else if last >= 0 && last != kx {
				// The cluster merged last is often the new neighbour.
				pl := pos[last]
				start = cand{v: wardValue(cent[px*d:px*d+d], cent[pl*d:pl*d+d], w[px], w[pl], head), key: last, pos: pl}
			}
			c := search(px, prev, start)
			ky, v = c.key, c.v
			if prev >= 0 && ky == prev {
				break
			}
			chain = append(chain, ky)
		}
		chain = chain[:len(chain)-2]
		if kx > ky {
			kx, ky = ky, kx
		}
		z = append(z, Merge{A: kx, B: ky, Height: math.Sqrt(v)})
		last = ky
		px, py := pos[kx], pos[ky]
		wx, wy := w[px], w[py]
		cx, cy := cent[px*d:px*d+d], cent[py*d:py*d+d]
		t := wx + wy
		for k := range cy {
			cy[k] = (wx*cx[k] + wy*cy[k]) / t
		}
		w[py] = t
		// Move the last cluster into px.
		last := m - 1
		if px != last {
			copy(cent[px*d:px*d+d], cent[last*d:last*d+d])
			w[px] = w[last]
			key[px] = key[last]
			pos[key[px]] = px
		}
		m--
	}
	sortAndLabel(z, n)
	return &Dendrogram{N: n, Merges: z}
}

// genericVectors is the generic algorithm (Müllner 2011, fig. 3) on
// centres: Centroid keeps weighted centroids, Median midpoints. Slots are
// the leaf indices as in genericCondensed; distances are Euclidean
// distances between centres, computed on demand into a row buffer.
func genericVectors(cent, w []float64, n, d int, method Linkage, workers int) *Dendrogram {
	z := make([]Merge, n-1)
	size := make([]int, n)
	id := make([]int, n)
	for i := range size {
		size[i] = 1
		id[i] = i
	}
	row := make([]float64, n)
	// distRow fills row[i] for active i in [lo, n) with the distance to x.
	distRow := func(x, lo int) {
		cx := cent[x*d : x*d+d]
		parallelRanges(n-lo, workers, 4096/max(1, d/8), func(_, a, b int) {
			for i := lo + a; i < lo+b; i++ {
				if size[i] == 0 || i == x {
					continue
				}
				row[i] = math.Sqrt(sqdist(cx, cent[i*d:i*d+d]))
			}
		})
	}
	dist := func(x, y int) float64 { return math.Sqrt(sqdist(cent[x*d:x*d+d], cent[y*d:y*d+d])) }
	nbr := make([]int, n-1)
	mind := make([]float64, n-1)
	findMin := func(x int) (int, float64) {
		distRow(x, x+1)
		best, bd := -1, math.Inf(1)
		for i := x + 1; i < n; i++ {
			if size[i] != 0 && (row[i] < bd || best < 0) {
				best, bd = i, row[i]
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
			if dxy == dist(x, y) {
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
		z[k] = Merge{A: a, B: b, Height: dxy, Size: size[x] + size[y]}
		cx, cy := cent[x*d:x*d+d], cent[y*d:y*d+d]
		if method == Median {
			for j := range cy {
				cy[j] = 0.5 * (cx[j] + cy[j])
			}
		} else {
			t := w[x] + w[y]
			for j := range cy {
				cy[j] = (w[x]*cx[j] + w[y]*cy[j]) / t
			}
			w[y] = t
		}
		size[y] += size[x]
		size[x] = 0
		id[y] = n + k
		for v := 0; v < x; v++ {
			if size[v] > 0 && nbr[v] == x {
				nbr[v] = y
			}
		}
		distRow(y, 0)
		for v := 0; v < y; v++ {
			if size[v] == 0 {
				continue
			}
			if r := row[v]; r < mind[v] {
				nbr[v], mind[v] = y, r
				h.change(v, r)
			}
		}
		if y < n-1 {
			if v, r := findMin(y); v != -1 {
				nbr[y], mind[y] = v, r
				h.change(y, r)
			}
		}
	}
	return &Dendrogram{N: n, Merges: z}
}

// scanWard returns the best Ward candidate for the cluster at position px
// (centroid cx, weight wx) among positions [lo, hi), starting from b.
// With head == 8 the first eight coordinates of 256 rows at a time are
// summed by ward8 (sumHead8's order; AVX2 when present) and a row is
// dropped when that partial value, which can only grow, already exceeds
// the best one by a relative 1e-12 (far above rounding), a branch-free
// test that yields a bit mask; survivors are evaluated exactly as
// wardValue does.
func scanWard(cent, w []float64, key []int, cx []float64, wx float64, d, head, px, prevKey, lo, hi int, b cand) cand {
	ww := 2 * wx
	cx = cx[:d:d]
	if head != 8 && head != 12 && head != 16 {
		for p := lo; p < hi; p++ {
			if p == px {
				continue
			}
			wp := w[p]
			v := ww * wp / (wx + wp) * sqdist(cx, cent[p*d:][:d:d])
			if v > b.v {
				continue
			}
			if cc := (cand{v: v, prev: key[p] == prevKey, key: key[p], pos: p}); cc.less(b) {
				b = cc
			}
		}
		return b
	}
	lim := b.v * (1 + 1e-12)
	var buf [256]float64
	var mask [4]uint64
	for blk := lo; blk < hi; blk += len(buf) {
		end := min(hi, blk+len(buf))
		part := buf[:end-blk]
		switch head {
		case 16:
			ward16((*[16]float64)(cx[:16]), cent[blk*d:], d, w[blk:], part, mask[:], ww, lim, lim*wx)
		case 12:
			ward12((*[12]float64)(cx[:12]), cent[blk*d:], d, w[blk:], part, mask[:], ww, lim, lim*wx)
		default:
			ward8((*[8]float64)(cx[:8]), cent[blk*d:], d, w[blk:], part, mask[:], ww, lim, lim*wx)
		}
		for mi, mw := range mask[:(len(part)+63)/64] {
			for mw != 0 {
				k := mi*64 + bits.TrailingZeros64(mw)
				mw &= mw - 1
				p := blk + k
				if p == px {
					continue
				}
				wp := w[p]
				s := part[k] + sqdist(cx[head:], cent[p*d+head:p*d+d])
				v := ww * wp / (wx + wp) * s
				if v > b.v {
					continue
				}
				if cc := (cand{v: v, prev: key[p] == prevKey, key: key[p], pos: p}); cc.less(b) {
					b = cc
					lim = b.v * (1 + 1e-12)
				}
			}
		}
	}
	return b
}

// sumHead8 is the partial sum of scanWard over the first eight
// coordinates, in the order the AVX2 kernel adds its lanes:
//
//	((t0²+t4²) + (t2²+t6²)) + ((t1²+t5²) + (t3²+t7²)),  t_j = a_j − b_j
func sumHead8(a, b []float64) float64 {
	t0, t1, t2, t3 := a[0]-b[0], a[1]-b[1], a[2]-b[2], a[3]-b[3]
	t4, t5, t6, t7 := a[4]-b[4], a[5]-b[5], a[6]-b[6], a[7]-b[7]
	return (float64(float64(t0*t0)+float64(t4*t4)) + float64(float64(t2*t2)+float64(t6*t6))) +
		(float64(float64(t1*t1)+float64(t5*t5)) + float64(float64(t3*t3)+float64(t7*t7)))
}

// sumHead12 is the partial sum over the first twelve coordinates, in the
// order of the AVX2 kernel:
//
//	u_j = (t_j² + t_{j+4}²) + t_{j+8}²,  s = (u0 + u2) + (u1 + u3)
func sumHead12(a, b []float64) float64 {
	var u [4]float64
	for j := range u {
		t0, t1, t2 := a[j]-b[j], a[j+4]-b[j+4], a[j+8]-b[j+8]
		u[j] = float64(float64(t0*t0)+float64(t1*t1)) + float64(t2*t2)
	}
	return (u[0] + u[2]) + (u[1] + u[3])
}

// ward12Go is the portable ward12.
func ward12Go(x *[12]float64, c []float64, d int, w []float64, out []float64, mask []uint64, ww, lim, limwx float64) {
	clear(mask[:(len(out)+63)/64])
	for k := range out {
		s := sumHead12(x[:], c[k*d:k*d+12])
		out[k] = s
		if w[k]*(s*ww-lim) <= limwx {
			mask[k/64] |= 1 << (k % 64)
		}
	}
}

// sumHead16 is the partial sum over the first sixteen coordinates, in
// the order of the AVX2 kernel:
//
//	u_j = ((t_j² + t_{j+4}²) + t_{j+8}²) + t_{j+12}²,  s = (u0 + u1) + (u2 + u3)
func sumHead16(a, b []float64) float64 {
	var u [4]float64
	for j := range u {
		t0, t1, t2, t3 := a[j]-b[j], a[j+4]-b[j+4], a[j+8]-b[j+8], a[j+12]-b[j+12]
		u[j] = float64(float64(float64(t0*t0)+float64(t1*t1))+float64(t2*t2)) + float64(t3*t3)
	}
	return (u[0] + u[1]) + (u[2] + u[3])
}

// ward16Go is the portable ward16.
func ward16Go(x *[16]float64, c []float64, d int, w []float64, out []float64, mask []uint64, ww, lim, limwx float64) {
	clear(mask[:(len(out)+63)/64])
	for k := range out {
		s := sumHead16(x[:], c[k*d:k*d+16])
		out[k] = s
		if w[k]*(s*ww-lim) <= limwx {
			mask[k/64] |= 1 << (k % 64)
		}
	}
}

// ward8Go is the portable ward8.
func ward8Go(x *[8]float64, c []float64, d int, w []float64, out []float64, mask []uint64, ww, lim, limwx float64) {
	clear(mask[:(len(out)+63)/64])
	for k := range out {
		s := sumHead8(x[:], c[k*d:k*d+8])
		out[k] = s
		if w[k]*(s*ww-lim) <= limwx {
			mask[k/64] |= 1 << (k % 64)
		}
	}
}

// wardValue is the squared Ward distance between centroids a and b with
// weights wa and wb, computed exactly as scanWard computes it.
func wardValue(a, b []float64, wa, wb float64, head int) float64 {
	var s float64
	switch head {
	case 8:
		s = sumHead8(a, b) + sqdist(a[8:], b[8:])
	case 12:
		s = sumHead12(a, b) + sqdist(a[12:], b[12:])
	case 16:
		s = sumHead16(a, b) + sqdist(a[16:], b[16:])
	default:
		s = sqdist(a, b)
	}
	return 2 * wa * wb / (wa + wb) * s
}
