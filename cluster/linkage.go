package cluster

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"
)

// Linkage names the rule that gives the distance between two clusters.
type Linkage int

// The linkage methods. The zero value is not a method; the functions of
// this package panic when given it.
const (
	// Single linkage: the smallest distance between members.
	//	d(A∪B, C) = min(d(A,C), d(B,C))
	Single Linkage = iota + 1
	// Complete linkage: the largest distance between members.
	//	d(A∪B, C) = max(d(A,C), d(B,C))
	Complete
	// Average linkage (UPGMA): the mean distance between members.
	//	d(A∪B, C) = (|A| d(A,C) + |B| d(B,C)) / (|A| + |B|)
	Average
	// Weighted linkage (WPGMA, McQuitty): the mean of the two children.
	//	d(A∪B, C) = (d(A,C) + d(B,C)) / 2
	Weighted
	// Ward's minimum-variance method. Heights follow scipy: for clusters
	// with centroids a, b and sizes |A|, |B|
	//	d(A, B) = sqrt(2 |A| |B| / (|A| + |B|)) ‖a − b‖
	// so that d² / 2 is the increase in the within-cluster sum of squares.
	// Lance–Williams form (used on a distance matrix):
	//	d(A∪B, C)² = ((|A|+|C|) d(A,C)² + (|B|+|C|) d(B,C)² − |C| d(A,B)²) / (|A|+|B|+|C|)
	Ward
	// Centroid linkage (UPGMC): the Euclidean distance between centroids.
	//	d(A∪B, C)² = (|A| d(A,C)² + |B| d(B,C)²)/(|A|+|B|) − |A||B| d(A,B)²/(|A|+|B|)²
	// Heights can decrease from one merge to the next (inversions).
	Centroid
	// Median linkage (WPGMC): the distance between "centres" where the
	// centre of a merged cluster is the midpoint of its children's centres.
	//	d(A∪B, C)² = d(A,C)²/2 + d(B,C)²/2 − d(A,B)²/4
	// Heights can decrease from one merge to the next (inversions).
	Median
)

// String returns the lower-case name of the linkage, as scipy spells it.
func (l Linkage) String() string {
	switch l {
	case Single:
		return "single"
	case Complete:
		return "complete"
	case Average:
		return "average"
	case Weighted:
		return "weighted"
	case Ward:
		return "ward"
	case Centroid:
		return "centroid"
	case Median:
		return "median"
	}
	return fmt.Sprintf("Linkage(%d)", int(l))
}

// ParseLinkage returns the linkage whose String is s.
func ParseLinkage(s string) (Linkage, error) {
	for l := Single; l <= Median; l++ {
		if l.String() == s {
			return l, nil
		}
	}
	return 0, fmt.Errorf("cluster: unknown linkage %q (use single, complete, average, weighted, ward, centroid or median)", s)
}

// Monotone reports whether merge heights never decrease for l (all
// methods but Centroid and Median).
func (l Linkage) Monotone() bool { return l != Centroid && l != Median }

func (l Linkage) check() {
	if l < Single || l > Median {
		panic("cluster: invalid linkage " + l.String())
	}
}

// Merge is one step of agglomerative clustering, a row of scipy's Z matrix.
// Leaves are clusters 0..n-1; the cluster made by the i-th merge (0-based)
// is n+i. A < B always.
type Merge struct {
	A, B   int
	Height float64
	Size   int // number of leaves in the merged cluster
}

// Dendrogram is the result of agglomerative clustering of N leaves: N-1
// merges in scipy's convention (see Merge).
type Dendrogram struct {
	N      int
	Merges []Merge
}

// Settings tunes the clustering functions. The zero value is ready to use.
type Settings struct {
	// Workers is the number of goroutines used for distance computations.
	// Zero means runtime.GOMAXPROCS(0). Results never depend on it.
	Workers int
}

func (s *Settings) workers() int {
	if s == nil || s.Workers <= 0 {
		return runtime.GOMAXPROCS(0)
	}
	return s.Workers
}

// ErrDistance is wrapped by the errors returned for an invalid distance.
var ErrDistance = errors.New("invalid distance")

// maxDistance bounds input distances so that Ward's, Centroid's and
// Median's squares cannot overflow.
const maxDistance = 1e150

// DistanceError reports a distance that is NaN, negative or larger than
// 1e150; I and J are the 0-based points of the pair.
type DistanceError struct {
	Index int // index in the condensed matrix
	I, J  int // the pair, i < j
	Value float64
	Err   error
}

func (e *DistanceError) Error() string {
	return fmt.Sprintf("cluster: %v %v at pair (%d, %d) (condensed index %d)", e.Err, e.Value, e.I, e.J, e.Index)
}

func (e *DistanceError) Unwrap() error { return e.Err }

// CondensedLen returns n(n-1)/2, the length of a condensed distance matrix
// over n points.
func CondensedLen(n int) int { return n * (n - 1) / 2 }

// CondensedIndex returns the position of d(i, j), i ≠ j, in a condensed
// distance matrix over n points, in scipy's layout:
//
//	n*i - i*(i+1)/2 + j - i - 1   for i < j
//
// It panics if i == j or either is out of range.
func CondensedIndex(n, i, j int) int {
	if i == j || i < 0 || j < 0 || i >= n || j >= n {
		panic("cluster: condensed index out of range")
	}
	if i > j {
		i, j = j, i
	}
	return n*i - i*(i+1)/2 + j - i - 1
}

func cidx(n, i, j int) int {
	if i > j {
		i, j = j, i
	}
	return n*i - i*(i+1)/2 + j - i - 1
}

// condensedN returns n for a condensed matrix of length m, or -1.
func condensedN(m int) int {
	n := int((1 + math.Sqrt(1+8*float64(m))) / 2)
	for c := n - 1; c <= n+1; c++ {
		if c >= 1 && CondensedLen(c) == m {
			return c
		}
	}
	return -1
}

func checkCondensed(dist []float64) (int, error) {
	n := condensedN(len(dist))
	if n < 0 {
		return 0, fmt.Errorf("cluster: condensed distance matrix of length %d is not n(n-1)/2 for any n", len(dist))
	}
	i, j := 0, 1
	for k, v := range dist {
		if !(v >= 0 && v <= maxDistance) {
			return 0, &DistanceError{Index: k, I: i, J: j, Value: v, Err: ErrDistance}
		}
		j++
		if j == n {
			i++
			j = i + 1
		}
	}
	return n, nil
}

// Link clusters n points given their condensed distance matrix dist (scipy's
// layout, see CondensedIndex), which is never modified. It returns an error
// if len(dist) is not n(n-1)/2 or a value is NaN, negative or larger than
// 1e150 (so that squares cannot overflow).
//
// Algorithms (Müllner 2011, "Modern hierarchical, agglomerative clustering
// algorithms", arXiv:1109.2378): Single uses the minimum-spanning-tree
// algorithm (Prim-like; O(n²) time, O(n) extra memory); Complete, Average,
// Weighted and Ward use the nearest-neighbour chain on a copy of dist;
// Centroid and Median use the generic algorithm with a heap of nearest
// neighbour candidates.
//
// Tie-breaking is deterministic and follows scipy 1.10's
// scipy.cluster.hierarchy.linkage step by step (scans in increasing index,
// strict comparisons so that the lowest index wins; the NN chain prefers
// the previous chain element; the merge list of the MST and NN-chain
// algorithms is stably sorted by height and relabelled), so results equal
// scipy's Z matrix whenever the floating-point values agree, ties included.
func Link(dist []float64, method Linkage, s *Settings) (*Dendrogram, error) {
	return link(dist, method, s, false)
}

// link is Link; with own set, dist may be overwritten (LinkVectors passes
// the matrix it made, saving a copy of n(n-1)/2 values).
func link(dist []float64, method Linkage, s *Settings, own bool) (*Dendrogram, error) {
	method.check()
	n, err := checkCondensed(dist)
	if err != nil {
		return nil, err
	}
	if n == 1 {
		return &Dendrogram{N: 1}, nil
	}
	switch method {
	case Single:
		return mstSingle(dist, n, s.workers()), nil
	case Centroid, Median:
		return genericCondensed(dist, n, method, own)
	default:
		return nnChainCondensed(dist, n, method, s.workers(), own)
	}
}

// update is the Lance–Williams update for the distance between the merge
// of x and y and a third cluster i, written in the same operation order as
// scipy so that results agree to the last bit.
func update(m Linkage, dxi, dyi, dxy, sx, sy, si float64) float64 {
	switch m {
	case Single:
		return min(dxi, dyi)
	case Complete:
		return max(dxi, dyi)
	case Average:
		return (float64(sx*dxi) + float64(sy*dyi)) / (sx + sy)
	case Weighted:
		return 0.5 * (dxi + dyi)
	case Ward:
		t := 1.0 / (sx + sy + si)
		return math.Sqrt(float64(float64(float64((si+sx)*t)*dxi)*dxi) +
			float64(float64(float64((si+sy)*t)*dyi)*dyi) -
			float64(float64(float64(si*t)*dxy)*dxy))
	case Centroid:
		return math.Sqrt(float64(float64(float64(sx*dxi)*dxi)+float64(float64(sy*dyi)*dyi)-
			float64(float64(float64(sx*sy)*dxy)*dxy)/(sx+sy)) / (sx + sy))
	case Median:
		return math.Sqrt(float64(0.5*float64(float64(dxi*dxi)+float64(dyi*dyi))) - float64(0.25*float64(dxy*dxy)))
	}
	panic("cluster: invalid linkage")
}

// sortAndLabel stably sorts merges by height and renames the clusters in
// scipy's convention; on input A and B are any leaves (representatives) of
// the two clusters merged.
func sortAndLabel(z []Merge, n int) {
	slices.SortStableFunc(z, func(a, b Merge) int {
		switch {
		case a.Height < b.Height:
			return -1
		case a.Height > b.Height:
			return 1
		}
		return 0
	})
	relabel(z, n)
}

// relabel turns leaf representatives into cluster ids with a union–find.
func relabel(z []Merge, n int) {
	parent := make([]int32, 2*n-1)
	size := make([]int32, 2*n-1)
	for i := range parent {
		parent[i] = -1
		size[i] = 1
	}
	find := func(x int) int {
		r := x
		for parent[r] >= 0 {
			r = int(parent[r])
		}
		for parent[x] >= 0 {
			p := int(parent[x])
			parent[x] = int32(r)
			x = p
		}
		return r
	}
	next := n
	for i := range z {
		a, b := find(z[i].A), find(z[i].B)
		if a > b {
			a, b = b, a
		}
		z[i].A, z[i].B = a, b
		parent[a], parent[b] = int32(next), int32(next)
		size[next] = size[a] + size[b]
		z[i].Size = int(size[next])
		next++
	}
}
