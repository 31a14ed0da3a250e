package cluster

import (
	"fmt"
	"math"
	"slices"
)

// JensenShannon returns the Jensen–Shannon distance between probability
// vectors p and q (natural logarithm), the square root of the
// Jensen–Shannon divergence, as scipy.spatial.distance.jensenshannon with
// its default base:
//
//	m = (p + q) / 2
//	JS(p, q) = sqrt( (KL(p‖m) + KL(q‖m)) / 2 ),  KL(p‖m) = Σ p_i log(p_i / m_i)
//
// with 0 log 0 = 0 (Lin 1991, "Divergence measures based on the Shannon
// entropy", IEEE Trans. Inf. Theory 37(1)). It lies in [0, sqrt(log 2)]
// and is a metric (Endres & Schindelin 2003). p and q are used as given
// (not normalised). It panics if their lengths differ.
func JensenShannon(p, q []float64) float64 {
	if len(p) != len(q) {
		panic("cluster: slice lengths do not match")
	}
	var s float64
	for i := range p {
		a, b := p[i], q[i]
		m := 0.5 * (a + b)
		if a > 0 {
			s += a * math.Log(a/m)
		}
		if b > 0 {
			s += b * math.Log(b/m)
		}
	}
	return math.Sqrt(max(0, s/2))
}

// Hellinger returns the Hellinger distance between probability vectors p
// and q:
//
//	H(p, q) = sqrt( Σ (sqrt(p_i) − sqrt(q_i))² / 2 )
//
// in [0, 1] (Hellinger 1909; the form with the factor 1/2, common
// practice). It panics if the lengths differ.
func Hellinger(p, q []float64) float64 {
	if len(p) != len(q) {
		panic("cluster: slice lengths do not match")
	}
	var s float64
	for i := range p {
		d := math.Sqrt(p[i]) - math.Sqrt(q[i])
		s += d * d
	}
	return math.Sqrt(s / 2)
}

// ProbabilityError reports a row that is not a probability vector.
type ProbabilityError struct {
	Row, Col int // Col is -1 when the sum is wrong
	Value    float64
}

func (e *ProbabilityError) Error() string {
	if e.Col < 0 {
		return fmt.Sprintf("cluster: row %d sums to %v, not 1", e.Row, e.Value)
	}
	return fmt.Sprintf("cluster: row %d, column %d: %v is not a probability", e.Row, e.Col, e.Value)
}

// checkProb verifies that every row is non-negative, finite and sums to
// 1 within 1e-6.
func checkProb(rows [][]float64) error {
	for i, r := range rows {
		if len(r) != len(rows[0]) {
			panic("cluster: rows differ in length")
		}
		var s float64
		for j, v := range r {
			if !(v >= 0) || math.IsInf(v, 0) {
				return &ProbabilityError{Row: i, Col: j, Value: v}
			}
			s += v
		}
		if math.Abs(s-1) > 1e-6 {
			return &ProbabilityError{Row: i, Col: -1, Value: s}
		}
	}
	return nil
}

// ThemeTree is a tree of themes clustered by the distance between their
// word distributions.
type ThemeTree struct {
	Tree  *Dendrogram
	Dist  []float64 // condensed distances between themes
	Order []int     // display order of the themes (optimal leaf order)
}

// MergeSuggestion is a group of themes whose word distributions are close
// enough to be read together or merged.
type MergeSuggestion struct {
	Themes []int   // ascending
	Height float64 // height of the merge that joins them all
}

// NewThemeTree clusters the rows of phi (one word distribution per theme,
// each summing to 1) by dist (JensenShannon or Hellinger; any function of
// two rows that is symmetric and non-negative) with average linkage
// (UPGMA: the height of a merge is the mean distance between the themes
// of its two sides). It returns a *ProbabilityError if a row is not a
// probability vector.
func NewThemeTree(phi [][]float64, dist func(p, q []float64) float64, s *Settings) (*ThemeTree, error) {
	if err := checkProb(phi); err != nil {
		return nil, err
	}
	d := PairwiseCondensed(nil, phi, dist, s)
	t, err := Link(d, Average, s)
	if err != nil {
		return nil, err
	}
	return &ThemeTree{Tree: t, Dist: d, Order: t.DisplayOrder(d, s)}, nil
}

// Suggestions returns the groups of two or more themes that the cut at
// maxHeight forms, lowest height first (ties by first theme). They are
// suggestions for a reader, not findings: close word distributions may
// still describe different events.
func (t *ThemeTree) Suggestions(maxHeight float64) []MergeSuggestion {
	return groupsAt(t.Tree, maxHeight, 2)
}

// groupsAt returns the clusters of the cut at h with at least minSize
// leaves, with the height of each cluster's top merge.
func groupsAt(t *Dendrogram, h float64, minSize int) []MergeSuggestion {
	n := t.N
	labels := t.CutHeight(nil, h)
	top := make(map[int]float64)
	md := t.maxHeights()
	// The top merge of a cluster is the highest applied merge among its
	// leaves; walk merges and record per label.
	for i, m := range t.Merges {
		if md[i] > h {
			continue
		}
		leaf := m.A
		for leaf >= n {
			leaf = t.Merges[leaf-n].A
		}
		l := labels[leaf]
		top[l] = max(top[l], md[i])
	}
	groups := make(map[int][]int)
	for i, l := range labels {
		groups[l] = append(groups[l], i)
	}
	var out []MergeSuggestion
	for l := 0; l < len(groups); l++ {
		if g := groups[l]; len(g) >= minSize {
			out = append(out, MergeSuggestion{Themes: g, Height: top[l]})
		}
	}
	slices.SortStableFunc(out, func(a, b MergeSuggestion) int {
		if a.Height != b.Height {
			if a.Height < b.Height {
				return -1
			}
			return 1
		}
		return a.Themes[0] - b.Themes[0]
	})
	return out
}
