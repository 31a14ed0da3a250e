package topics

import (
	"math"

	"undercurrent/text/sparse"
)

// coherenceEpsilon is the ε of gensim's direct confirmation measures (EPSILON = 1e-12 in
// gensim/topic_coherence/direct_confirmation_measure.py, Debian python3-gensim).
const coherenceEpsilon = 1e-12

// CoherenceIndex answers document and co-document frequencies of words in a reference
// corpus, for topic coherence scores. Documents are the windows: a word occurs in a
// document if its count there is non-zero.
type CoherenceIndex struct {
	n     int
	posts [][]int32 // per column: sorted rows where it occurs
}

// NewCoherenceIndex indexes the reference corpus ref (rows are documents).
func NewCoherenceIndex(ref *sparse.Matrix) *CoherenceIndex {
	df := ref.DocumentFrequency()
	c := &CoherenceIndex{n: ref.Rows, posts: make([][]int32, ref.Cols)}
	for w, f := range df {
		c.posts[w] = make([]int32, 0, f)
	}
	for d := 0; d < ref.Rows; d++ {
		cols, vals := ref.Row(d)
		for j, w := range cols {
			if vals[j] != 0 {
				c.posts[w] = append(c.posts[w], int32(d))
			}
		}
	}
	return c
}

// Docs returns the number of reference documents.
func (c *CoherenceIndex) Docs() int { return c.n }

// DF returns the number of reference documents containing w.
func (c *CoherenceIndex) DF(w int) int { return len(c.posts[w]) }

// CoDF returns the number of reference documents containing both a and b.
func (c *CoherenceIndex) CoDF(a, b int) int {
	x, y := c.posts[a], c.posts[b]
	i, j, n := 0, 0, 0
	for i < len(x) && j < len(y) {
		switch {
		case x[i] < y[j]:
			i++
		case x[i] > y[j]:
			j++
		default:
			n++
			i++
			j++
		}
	}
	return n
}

// UMass returns the UMass coherence of a theme's top words, ordered from most probable
// (Mimno, Wallach, Talley, Leenders & McCallum 2011, "Optimizing semantic coherence in topic
// models"), in the form gensim's CoherenceModel(coherence='u_mass') computes it, so the two
// agree to rounding:
//
//	mean over m = 2..M, l = 1..m−1 of  log( (D(w_m, w_l)/N + ε) / (D(w_l)/N) ),  ε = 1e−12
//
// where D counts reference documents and N is their number. Mimno et al. sum
// log((D(w_m, w_l) + 1)/D(w_l)) instead; gensim replaces the +1 smoothing by ε and takes the
// mean. A pair whose conditioning word occurs nowhere scores 0 (as gensim does).
func (c *CoherenceIndex) UMass(top []int) float64 {
	n := float64(c.n)
	s, pairs := 0.0, 0
	for m := 1; m < len(top); m++ {
		for l := 0; l < m; l++ {
			pairs++
			dl := c.DF(top[l])
			if dl == 0 {
				continue
			}
			s += math.Log((float64(c.CoDF(top[m], top[l]))/n + coherenceEpsilon) / (float64(dl) / n))
		}
	}
	if pairs == 0 {
		return math.NaN()
	}
	return s / float64(pairs)
}

// NPMI returns the mean normalised pointwise mutual information of all pairs of a theme's
// top words (Bouma 2009, "Normalized (pointwise) mutual information in collocation
// extraction"), with documents as the co-occurrence windows:
//
//	NPMI(a, b) = log( (P(a,b) + ε) / (P(a) P(b)) ) / −log(P(a,b) + ε),  P(a) = D(a)/N
//
// This is gensim's CoherenceModel(coherence='c_npmi') when its boolean sliding window is at
// least as long as the longest document (each document is then one window) — ε = 1e−12 as
// in gensim, mean over ordered pairs (s_one_one segmentation; NPMI is symmetric so this is
// the mean over unordered pairs). A pair with a word that occurs nowhere scores 0 (gensim
// would return ±Inf or NaN).
func (c *CoherenceIndex) NPMI(top []int) float64 {
	n := float64(c.n)
	s, pairs := 0.0, 0
	for i := 0; i < len(top); i++ {
		for j := i + 1; j < len(top); j++ {
			pairs++
			da, db := c.DF(top[i]), c.DF(top[j])
			if da == 0 || db == 0 {
				continue
			}
			pab := float64(c.CoDF(top[i], top[j])) / n
			pmi := math.Log((pab + coherenceEpsilon) / ((float64(da) / n) * (float64(db) / n)))
			s += pmi / -math.Log(pab+coherenceEpsilon)
		}
	}
	if pairs == 0 {
		return math.NaN()
	}
	return s / float64(pairs)
}
