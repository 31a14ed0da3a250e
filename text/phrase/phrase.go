package phrase

import (
	"math"
	"sort"
)

func xlogx(k, e float64) float64 {
	if k == 0 {
		return 0
	}
	return k * math.Log(k/e)
}

// LLR returns Dunning's log-likelihood ratio G² of a 2×2 table (see the package comment). It
// returns 0 for an empty table.
func LLR(k11, k12, k21, k22 float64) float64 {
	n := k11 + k12 + k21 + k22
	if n == 0 {
		return 0
	}
	r1, r2 := k11+k12, k21+k22
	c1, c2 := k11+k21, k12+k22
	g := xlogx(k11, r1*c1/n) + xlogx(k12, r1*c2/n) + xlogx(k21, r2*c1/n) + xlogx(k22, r2*c2/n)
	g *= 2
	if g < 0 { // rounding
		g = 0
	}
	return g
}

// NPMI returns the normalised pointwise mutual information of a pair seen k11 times, whose
// first word starts ka pairs and second word ends kb pairs, out of n pairs. It is 1 for a
// pair whose words only ever occur together and -1 in the limit of never together.
func NPMI(k11, ka, kb, n float64) float64 {
	if k11 <= 0 {
		return -1
	}
	pab, pa, pb := k11/n, ka/n, kb/n
	if pab >= 1 {
		return 1
	}
	return math.Log(pab/(pa*pb)) / -math.Log(pab)
}

// Settings choose the phrases. Zero values mean the defaults given.
type Settings struct {
	// MinCount is the least number of times the pair must occur; zero means 5.
	MinCount int `json:"min_count"`
	// MinLLR is the least G² score; zero means 10.83 (chi-squared, 1 df, p = 0.001).
	MinLLR float64 `json:"min_llr"`
	// Max keeps at most this many phrases, highest score first; zero means no limit.
	Max int `json:"max"`
}

// Pair is a scored collocation of tokens A then B.
type Pair struct {
	A, B  int32
	Count int
	Score float64
}

// Select scores every pair in counts (a map from (first, second) token ids to the number of
// adjacent occurrences). left[a] is how many pairs start with a, right[b] how many end with
// b, n the number of pairs. It returns the chosen pairs by descending score, ties broken by
// ascending (A, B).
func Select(counts map[[2]int32]int, left, right []int, n int, s Settings) []Pair {
	minCount := s.MinCount
	if minCount <= 0 {
		minCount = 5
	}
	minLLR := s.MinLLR
	if minLLR <= 0 {
		minLLR = 10.83
	}
	var out []Pair
	fn := float64(n)
	for k, c := range counts {
		if c < minCount {
			continue
		}
		k11 := float64(c)
		k12 := float64(left[k[0]]) - k11
		k21 := float64(right[k[1]]) - k11
		k22 := fn - k11 - k12 - k21
		if k11*fn <= float64(left[k[0]])*float64(right[k[1]]) {
			continue // not more often than expected
		}
		g := LLR(k11, k12, k21, k22)
		if g < minLLR {
			continue
		}
		out = append(out, Pair{k[0], k[1], c, g})
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].Score != out[j].Score {
			return out[i].Score > out[j].Score
		}
		if out[i].A != out[j].A {
			return out[i].A < out[j].A
		}
		return out[i].B < out[j].B
	})
	if s.Max > 0 && len(out) > s.Max {
		out = out[:s.Max]
	}
	return out
}
