package cluster

import (
	"math"
	"math/bits"
	"math/rand/v2"
)

// SummarySettings tunes Summarize. The zero value is ready to use.
type SummarySettings struct {
	// K is the number of micro-clusters. Zero means min(n, 1000). When
	// K ≥ n every row is its own micro-cluster and the result is exact.
	K int
	// Iterations bounds the Lloyd iterations after seeding; zero means 10.
	// Iteration stops early when no assignment changes.
	Iterations int
	// Seed seeds the PCG generator of the k-means++ seeding
	// (rand.NewPCG(Seed, 0x756e646572)).
	Seed uint64
	// Workers as in Settings; results never depend on it.
	Workers int
}

// Summary is Ward's clustering of many rows through micro-clusters.
//
// What is exact and what is approximate: Ward's criterion between two
// clusters depends only on their sizes and centroids,
//
//	d(A, B)² = 2 |A||B| / (|A|+|B|) ‖a − b‖²
//
// so the weighted Ward tree over the micro-cluster centroids (weights =
// the micro-clusters' total weights) is exactly the tree that Ward's
// method builds on the full data when it starts from the micro-cluster
// partition instead of from single rows: every height above the
// micro-clusters is the exact Ward distance between the unions of rows.
// What is approximate is the starting partition itself: the
// micro-clusters come from seeded k-means++ and a few Lloyd iterations (a
// local optimum of the within-cluster sum of squares, not the bottom of
// Ward's tree), and the structure inside a micro-cluster is not kept.
// Cuts into fewer clusters than micro-clusters are therefore exact Ward
// cuts of that constrained tree, and rows of one micro-cluster always end
// up together.
type Summary struct {
	Centroids [][]float64 // micro-cluster centroids (non-empty ones only)
	Weights   []float64   // total weight of each micro-cluster
	Assign    []int       // micro-cluster of every row
	Tree      *Dendrogram // exact weighted Ward over the centroids; leaves are micro-clusters (Merge.Size counts them)
}

// Summarize groups the rows of x (optionally weighted; nil weights are
// all 1) into micro-clusters with deterministic seeded k-means++
// (Arthur & Vassilvitskii 2007, "k-means++: the advantages of careful
// seeding", SODA) followed by Lloyd iterations, then clusters the
// micro-cluster centroids with exact weighted Ward (LinkVectors with the
// micro-clusters' weights). Memory is O(n·d + K·d). Ties in the nearest
// centre go to the lowest centre index; the result is identical for any
// number of workers.
func Summarize(x [][]float64, weights []float64, set *SummarySettings) (*Summary, error) {
	if set == nil {
		set = &SummarySettings{}
	}
	flat, w, d, err := flatten(x, weights)
	if err != nil {
		return nil, err
	}
	n := len(x)
	k := set.K
	if k <= 0 {
		k = 1000
	}
	k = min(k, n)
	iters := set.Iterations
	if iters <= 0 {
		iters = 10
	}
	workers := (&Settings{Workers: set.Workers}).workers()
	if n == 0 {
		return &Summary{Tree: &Dendrogram{}}, nil
	}
	var cent []float64
	assign := make([]int, n)
	if k == n {
		cent = flat
		for i := range assign {
			assign[i] = i
		}
	} else {
		cent = seedPlusPlus(flat, w, n, d, k, set.Seed, workers)
		lloyd(flat, w, n, d, k, cent, assign, iters, workers)
	}
	// Drop empty micro-clusters, keep order.
	cw := make([]float64, k)
	for i, a := range assign {
		cw[a] += w[i]
	}
	remap := make([]int, k)
	sum := &Summary{Assign: assign}
	for c := 0; c < k; c++ {
		if cw[c] == 0 {
			remap[c] = -1
			continue
		}
		remap[c] = len(sum.Centroids)
		sum.Centroids = append(sum.Centroids, append([]float64(nil), cent[c*d:c*d+d]...))
		sum.Weights = append(sum.Weights, cw[c])
	}
	for i, a := range assign {
		assign[i] = remap[a]
	}
	sum.Tree, err = LinkVectors(sum.Centroids, sum.Weights, Ward, &Settings{Workers: set.Workers})
	if err != nil {
		return nil, err
	}
	return sum, nil
}

// CutCount labels the rows by the cut of the micro-cluster tree into at
// most k clusters (see Dendrogram.CutCount) and stores them in dst (nil,
// or one per row).
func (s *Summary) CutCount(dst []int, k int) []int {
	return s.mapLabels(dst, s.Tree.CutCount(nil, k))
}

// CutHeight labels the rows by the cut of the micro-cluster tree at height
// h (see Dendrogram.CutHeight). Labels are 0, 1, ... by first row.
func (s *Summary) CutHeight(dst []int, h float64) []int {
	return s.mapLabels(dst, s.Tree.CutHeight(nil, h))
}

func (s *Summary) mapLabels(dst, micro []int) []int {
	if dst == nil {
		dst = make([]int, len(s.Assign))
	} else if len(dst) != len(s.Assign) {
		panic("cluster: len(dst) != number of rows")
	}
	for i, a := range s.Assign {
		dst[i] = micro[a]
	}
	return canonInPlace(dst)
}

// canonInPlace renumbers labels 0, 1, ... by first appearance.
func canonInPlace(l []int) []int {
	m := make(map[int]int)
	for i, v := range l {
		c, ok := m[v]
		if !ok {
			c = len(m)
			m[v] = c
		}
		l[i] = c
	}
	return l
}

// Order returns the rows ordered by their micro-cluster's position in the
// Ward tree's leaf order, then by row index.
func (s *Summary) Order() []int {
	leaves := s.Tree.Leaves(nil)
	rank := make([]int, len(leaves))
	for p, c := range leaves {
		rank[c] = p
	}
	buckets := make([][]int, len(leaves))
	for i, a := range s.Assign {
		buckets[rank[a]] = append(buckets[rank[a]], i)
	}
	out := make([]int, 0, len(s.Assign))
	for _, b := range buckets {
		out = append(out, b...)
	}
	return out
}

const chunk = 4096

// seedPlusPlus picks k centres by D² sampling: the first with probability
// proportional to weight, each next one with probability proportional to
// weight × squared distance to the nearest centre so far. Partial sums are
// taken over fixed chunks of rows and added in chunk order, so the draw
// does not depend on the number of workers.
func seedPlusPlus(x, w []float64, n, d, k int, seed uint64, workers int) []float64 {
	rng := rand.New(rand.NewPCG(seed, 0x756e646572))
	cent := make([]float64, k*d)
	d2 := make([]float64, n)
	for i := range d2 {
		d2[i] = math.Inf(1)
	}
	nc := (n + chunk - 1) / chunk
	part := make([]float64, nc)
	pick := func(weight func(i int) float64, total float64) int {
		r := rng.Float64() * total
		c := 0
		for ; c < nc-1 && r >= part[c]; c++ {
			r -= part[c]
		}
		last := -1
		for i := c * chunk; i < min(n, (c+1)*chunk); i++ {
			v := weight(i)
			if v > 0 {
				last = i
			}
			if r < v {
				return i
			}
			r -= v
		}
		if last < 0 {
			return c * chunk
		}
		return last
	}
	// First centre: by weight.
	var total float64
	for c := 0; c < nc; c++ {
		var s float64
		for i := c * chunk; i < min(n, (c+1)*chunk); i++ {
			s += w[i]
		}
		part[c] = s
		total += s
	}
	first := pick(func(i int) float64 { return w[i] }, total)
	copy(cent, x[first*d:first*d+d])
	for j := 1; j <= k; j++ {
		cj := cent[(j-1)*d : j*d]
		parallelRanges(nc, workers, 1, func(_, lo, hi int) {
			for c := lo; c < hi; c++ {
				var s float64
				for i := c * chunk; i < min(n, (c+1)*chunk); i++ {
					if v := sqdist(x[i*d:i*d+d], cj); v < d2[i] {
						d2[i] = v
					}
					s += w[i] * d2[i]
				}
				part[c] = s
			}
		})
		if j == k {
			break
		}
		total = 0
		for _, s := range part {
			total += s
		}
		var next int
		if total > 0 {
			next = pick(func(i int) float64 { return w[i] * d2[i] }, total)
		} else {
			next = rng.IntN(n) // all rows coincide with centres
		}
		copy(cent[j*d:], x[next*d:next*d+d])
	}
	return cent
}

// lloyd alternates nearest-centre assignment (parallel over rows; ties to
// the lowest centre) and weighted centroid updates (sequential in row
// order) until no row moves or iters is reached. A centre that loses all
// its rows keeps its position. Assignment skips rows whose centre cannot
// have changed by Hamerly's bounds (Hamerly 2010, "Making k-means even
// faster", SIAM SDM): an upper bound u on the distance to the assigned
// centre and a lower bound l on the distance to any other; a row is
// rescanned only when u > max(l, s/2), s being the distance from its
// centre to the nearest other centre. Every decision depends on the row's
// own numbers only, so the result does not depend on the workers.
func lloyd(x, w []float64, n, d, k int, cent []float64, assign []int, iters, workers int) {
	for i := range assign {
		assign[i] = -1
	}
	sums := make([]float64, k*d)
	cw := make([]float64, k)
	up := make([]float64, n)
	lo := make([]float64, n)
	half := make([]float64, k)
	old := make([]float64, k*d)
	delta := make([]float64, k)
	ones := make([]float64, k)
	for j := range ones {
		ones[j] = 1
	}
	for it := 0; it < iters; it++ {
		// Half the distance from each centre to its nearest other centre.
		parallelRanges(k, workers, 16, func(_, a, b int) {
			for j := a; j < b; j++ {
				best := math.Inf(1)
				for q := 0; q < k; q++ {
					if q != j {
						best = min(best, sqdist(cent[j*d:j*d+d], cent[q*d:q*d+d]))
					}
				}
				half[j] = math.Sqrt(best) / 2
			}
		})
		moved := make([]int, (n+chunk-1)/chunk)
		parallelRanges(len(moved), workers, 1, func(_, clo, chi int) {
			for c := clo; c < chi; c++ {
				for i := c * chunk; i < min(n, (c+1)*chunk); i++ {
					xi := x[i*d : i*d+d]
					a := assign[i]
					if a >= 0 {
						m := max(half[a], lo[i])
						if up[i] <= m {
							continue
						}
						up[i] = math.Sqrt(sqdist(xi, cent[a*d:a*d+d]))
						if up[i] <= m {
							continue
						}
					}
					b1, v1, v2 := nearest2(xi, cent, k, d, ones)
					up[i], lo[i] = math.Sqrt(v1), math.Sqrt(v2)
					if b1 != a {
						assign[i] = b1
						moved[c]++
					}
				}
			}
		})
		total := 0
		for _, m := range moved {
			total += m
		}
		if total == 0 {
			return
		}
		copy(old, cent)
		clear(sums)
		clear(cw)
		for i := 0; i < n; i++ {
			a := assign[i]
			cw[a] += w[i]
			s := sums[a*d : a*d+d]
			for j, v := range x[i*d : i*d+d] {
				s[j] += w[i] * v
			}
		}
		for j := 0; j < k; j++ {
			if cw[j] > 0 {
				for c := 0; c < d; c++ {
					cent[j*d+c] = sums[j*d+c] / cw[j]
				}
			}
		}
		// Move the bounds with the centres.
		m1, m2, j1 := 0.0, 0.0, -1
		for j := 0; j < k; j++ {
			delta[j] = math.Sqrt(sqdist(cent[j*d:j*d+d], old[j*d:j*d+d]))
			if delta[j] > m1 {
				m1, m2, j1 = delta[j], m1, j
			} else if delta[j] > m2 {
				m2 = delta[j]
			}
		}
		for i := 0; i < n; i++ {
			a := assign[i]
			// Slack far above rounding keeps the bounds safe.
			up[i] = (up[i] + delta[a]) * (1 + 1e-12)
			if a == j1 {
				lo[i] = (lo[i] - m2) * (1 - 1e-12)
			} else {
				lo[i] = (lo[i] - m1) * (1 - 1e-12)
			}
		}
	}
}

// nearest2 returns the nearest centre to xi (lowest index on ties) and the
// squared distances to the nearest and the second nearest. For d ≥ 12 the
// first eight (sixteen for d ≥ 20) coordinates of 256 centres at a time
// are summed by ward8 (ward16)
// and centres whose partial sum already exceeds the second-best value
// (by a relative 1e-12, far above rounding) are skipped; the others get
// their exact squared distance, so the result is that of a full scan.
func nearest2(xi, cent []float64, k, d int, ones []float64) (int, float64, float64) {
	b1, v1, v2 := -1, math.Inf(1), math.Inf(1)
	if d < 12 {
		for j := 0; j < k; j++ {
			v := sqdist(xi, cent[j*d:j*d+d])
			if v < v1 {
				b1, v1, v2 = j, v, v1
			} else if v < v2 {
				v2 = v
			}
		}
		return b1, v1, v2
	}
	head := 8
	if d >= 20 {
		head = 16
	}
	var buf [256]float64
	var mask [4]uint64
	for blk := 0; blk < k; blk += len(buf) {
		end := min(k, blk+len(buf))
		part := buf[:end-blk]
		lim := v2 * (1 + 1e-12)
		if head == 16 {
			ward16((*[16]float64)(xi[:16]), cent[blk*d:], d, ones[blk:], part, mask[:], 1, lim, 0)
		} else {
			ward8((*[8]float64)(xi[:8]), cent[blk*d:], d, ones[blk:], part, mask[:], 1, lim, 0)
		}
		for mi, mw := range mask[:(len(part)+63)/64] {
			for mw != 0 {
				j := blk + mi*64 + bits.TrailingZeros64(mw)
				mw &= mw - 1
				v := part[j-blk] + sqdist(xi[head:], cent[j*d+head:j*d+d])
				if v < v1 {
					b1, v1, v2 = j, v, v1
				} else if v < v2 {
					v2 = v
				}
			}
		}
	}
	return b1, v1, v2
}
