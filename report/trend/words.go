package trend

import (
	"fmt"
	"math"
	"sort"
)

// WordSettings controls LogOdds. The zero value is the uniform prior with α_w = 0.05.
type WordSettings struct {
	// Alpha is α_w of the uniform prior, the same for every word of the vocabulary (the
	// words seen in either side); 0 means 0.05. Then α_0 = V·Alpha for V words.
	Alpha float64
	// Background, if not nil, makes the prior informative: α_w = Alpha0 · b_w / Σ b,
	// b_w the word's count in Background (for instance the whole collection), Σ b over
	// all of Background. Every word of either side must have b_w > 0. α_0 in LogOdds is
	// then the sum of α_w over the compared vocabulary, at most Alpha0.
	Background map[string]int
	// Alpha0 is α_0 of the informative prior; it must be > 0 when Background is set.
	Alpha0 float64
}

// WordScore is one word's weighted log-odds ratio between side a and side b.
type WordScore struct {
	Word           string
	CountA, CountB int
	// Delta is δ_w, SE = sqrt(σ²_w), Z = δ_w/SE: positive when the word is more typical
	// of side a.
	Delta, SE, Z float64
}

// LogOdds returns the weighted log-odds ratio with an informative Dirichlet prior of
// every word between the counts a and b (Monroe, Colaresi & Quinn 2008, "Fightin' words:
// lexical feature selection and evaluation for identifying the content of political
// conflict", Political Analysis 16(4), eqs. 16, 20 and 22):
//
//	δ_w  = log[(y_wa + α_w) / (n_a + α_0 − y_wa − α_w)] − log[(y_wb + α_w) / (n_b + α_0 − y_wb − α_w)]
//	σ²_w ≈ 1/(y_wa + α_w) + 1/(y_wb + α_w)
//	z_w  = δ_w / sqrt(σ²_w)
//
// with y_wa the count of word w in a, n_a = Σ_w y_wa, and α_0 = Σ_w α_w over the
// vocabulary: the words seen on either side. The variance is the paper's approximation
// without the (n − y) terms. With the uniform prior α_w = 0.05 for each of the 11 words of "the quick
// brown fox jumps over the lazy pig" against "the lazy purple pig jumps over the lazier
// donkey", α_0 = 0.55 and z = ±0.6894227886807968 for the words of one side only.
// The scores are sorted by Z from high to low, ties by word. It returns an error for a
// negative count, an empty side, or a word missing from Background.
func LogOdds(a, b map[string]int, ws WordSettings) ([]WordScore, error) {
	vocab := map[string]struct{}{}
	na, nb := 0, 0
	for w, c := range a {
		if c < 0 {
			return nil, fmt.Errorf("trend: negative count %d of word %q", c, w)
		}
		na += c
		vocab[w] = struct{}{}
	}
	for w, c := range b {
		if c < 0 {
			return nil, fmt.Errorf("trend: negative count %d of word %q", c, w)
		}
		nb += c
		vocab[w] = struct{}{}
	}
	if na == 0 || nb == 0 {
		return nil, fmt.Errorf("trend: log-odds needs words on both sides (have %d and %d)", na, nb)
	}
	words := make([]string, 0, len(vocab))
	for w := range vocab {
		words = append(words, w)
	}
	sort.Strings(words)
	alpha := make([]float64, len(words))
	if ws.Background == nil {
		al := ws.Alpha
		if al == 0 {
			al = 0.05
		}
		if !(al > 0) {
			return nil, fmt.Errorf("trend: prior α_w = %v is not positive", al)
		}
		for i := range alpha {
			alpha[i] = al
		}
	} else {
		if !(ws.Alpha0 > 0) {
			return nil, fmt.Errorf("trend: informative prior needs α_0 > 0, have %v", ws.Alpha0)
		}
		total := 0
		for w, c := range ws.Background {
			if c < 0 {
				return nil, fmt.Errorf("trend: negative background count %d of word %q", c, w)
			}
			total += c
		}
		for i, w := range words {
			if ws.Background[w] <= 0 {
				return nil, fmt.Errorf("trend: word %q is not in the background counts", w)
			}
			alpha[i] = ws.Alpha0 * float64(ws.Background[w]) / float64(total)
		}
	}
	a0 := 0.0
	for _, v := range alpha {
		a0 += v
	}
	out := make([]WordScore, len(words))
	for i, w := range words {
		ya, yb, al := float64(a[w]), float64(b[w]), alpha[i]
		d := math.Log((ya+al)/(float64(na)+a0-ya-al)) - math.Log((yb+al)/(float64(nb)+a0-yb-al))
		se := math.Sqrt(1/(ya+al) + 1/(yb+al))
		out[i] = WordScore{Word: w, CountA: a[w], CountB: b[w], Delta: d, SE: se, Z: d / se}
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].Z > out[j].Z })
	return out, nil
}

// GroupWords compares the summed Words of the docs of group with those of the docs of
// the groups in others, or of every other group when others is nil ("one group against
// the rest"), by LogOdds. It returns an error when a side has no words.
func GroupWords(docs []Doc, group string, others []string, ws WordSettings) ([]WordScore, error) {
	in := map[string]bool{}
	for _, g := range others {
		if g == group {
			return nil, fmt.Errorf("trend: group %q is on both sides", g)
		}
		in[g] = true
	}
	a, b := map[string]int{}, map[string]int{}
	for _, d := range docs {
		var dst map[string]int
		switch {
		case d.Group == group:
			dst = a
		case others == nil || in[d.Group]:
			dst = b
		default:
			continue
		}
		for w, c := range d.Words {
			dst[w] += c
		}
	}
	s, err := LogOdds(a, b, ws)
	if err != nil {
		return nil, fmt.Errorf("group %q: %w", group, err)
	}
	return s, nil
}
