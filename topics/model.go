package topics

import (
	"encoding/json"
	"math"
	"slices"

	"gonum.org/v1/gonum/mat"
)

// Model is a fitted LDA model: K themes over a V-term vocabulary.
//
// A Model returned by Fit also holds the averaged document-theme estimates θ of the
// training narratives; a Model returned by Load does not (HasDocTopics reports which).
type Model struct {
	k, v        int
	alpha       []float64
	beta        float64
	phi         []float64 // K×V, row-major
	theta       []float64 // D×K, row-major; nil after Load
	docLen      []int
	freq        []int64 // training count of each word
	vocab       []string
	display     []string
	names       []string
	pipeline    json.RawMessage
	fingerprint string
	fit         fitRecord

	// Stability is the mean matched top-10-word Jaccard agreement (Greene, O'Callaghan &
	// Cunningham 2014) of the other chains with the kept one; NaN with a single chain.
	Stability float64
	// ChainLogLikelihood is each chain's final log p(w|z).
	ChainLogLikelihood []float64
}

// K returns the number of themes.
func (m *Model) K() int { return m.k }

// V returns the vocabulary size.
func (m *Model) V() int { return m.v }

// Alpha returns a copy of the document-theme prior α (one value per theme).
func (m *Model) Alpha() []float64 { return slices.Clone(m.alpha) }

// Beta returns the symmetric theme-word prior β.
func (m *Model) Beta() float64 { return m.beta }

// Vocabulary returns the term of each column (shared; do not modify).
func (m *Model) Vocabulary() []string { return m.vocab }

// Display returns the display form of each column (shared; do not modify).
func (m *Model) Display() []string { return m.display }

// ThemeName returns the name of a guided theme, or "" for an unguided one.
func (m *Model) ThemeName(k int) string { m.checkTheme(k); return m.names[k] }

// Pipeline returns the text pipeline's settings stored with the model.
func (m *Model) Pipeline() json.RawMessage { return m.pipeline }

// InputFingerprint returns the hex SHA-256 Fingerprint of the training count matrix.
func (m *Model) InputFingerprint() string { return m.fingerprint }

// HasDocTopics reports whether the model holds θ for its training narratives.
func (m *Model) HasDocTopics() bool { return m.theta != nil }

// Docs returns the number of training narratives whose θ the model holds (0 after Load).
func (m *Model) Docs() int {
	if m.theta == nil {
		return 0
	}
	return len(m.theta) / m.k
}

func (m *Model) checkTheme(k int) {
	if k < 0 || k >= m.k {
		panic("topics: theme index out of range")
	}
}

// TopicTermsTo copies φ into dst (K×V; a zero dst is resized) and returns dst. Row k is
// theme k's word distribution.
func (m *Model) TopicTermsTo(dst *mat.Dense) *mat.Dense {
	if dst == nil {
		dst = &mat.Dense{}
	}
	if dst.IsEmpty() {
		dst.ReuseAs(m.k, m.v)
	} else if r, c := dst.Dims(); r != m.k || c != m.v {
		panic("topics: destination dimensions do not match K×V")
	}
	for k := 0; k < m.k; k++ {
		dst.SetRow(k, m.phi[k*m.v:(k+1)*m.v])
	}
	return dst
}

// DocTopicsTo copies θ of the training narratives into dst (D×K; a zero dst is resized)
// and returns dst. It panics if the model has no θ (see HasDocTopics).
func (m *Model) DocTopicsTo(dst *mat.Dense) *mat.Dense {
	if m.theta == nil {
		panic("topics: model has no document-theme estimates (loaded from a file)")
	}
	D := len(m.theta) / m.k
	if dst == nil {
		dst = &mat.Dense{}
	}
	if dst.IsEmpty() {
		dst.ReuseAs(D, m.k)
	} else if r, c := dst.Dims(); r != D || c != m.k {
		panic("topics: destination dimensions do not match D×K")
	}
	for d := 0; d < D; d++ {
		dst.SetRow(d, m.theta[d*m.k:(d+1)*m.k])
	}
	return dst
}

// DocTopics returns θ_d of training narrative d (shared; do not modify).
func (m *Model) DocTopics(d int) []float64 {
	if m.theta == nil {
		panic("topics: model has no document-theme estimates (loaded from a file)")
	}
	return m.theta[d*m.k : (d+1)*m.k]
}

// TopicTerms returns φ_k (shared; do not modify).
func (m *Model) TopicTerms(k int) []float64 { m.checkTheme(k); return m.phi[k*m.v : (k+1)*m.v] }

// Word is one entry of a theme's word list.
type Word struct {
	ID        int
	Term      string
	Display   string
	Prob      float64 // φ_kw
	Relevance float64 // λ log φ_kw + (1−λ) log(φ_kw / p_w)
}

// TopWords returns theme k's n words ranked by relevance (Sievert & Shirley 2014):
//
//	r(w, k | λ) = λ log φ_kw + (1 − λ) log(φ_kw / p_w)
//
// where p_w is the word's share of all training tokens (stored in the model file). λ = 1
// ranks by probability; Sievert & Shirley's user study favoured λ ≈ 0.6 (DefaultLambda).
// Ties are broken by column number.
func (m *Model) TopWords(k, n int, lambda float64) []Word {
	m.checkTheme(k)
	if lambda < 0 || lambda > 1 {
		panic("topics: lambda outside [0,1]")
	}
	pw := m.marginal()
	row := m.TopicTerms(k)
	ws := make([]Word, m.v)
	for w := range ws {
		p := row[w]
		ws[w] = Word{ID: w, Term: m.vocab[w], Display: m.display[w], Prob: p,
			Relevance: lambda*math.Log(p) + (1-lambda)*math.Log(p/pw[w])}
	}
	slices.SortStableFunc(ws, func(a, b Word) int {
		switch {
		case a.Relevance > b.Relevance:
			return -1
		case a.Relevance < b.Relevance:
			return 1
		}
		return a.ID - b.ID
	})
	return ws[:min(n, len(ws))]
}

// DefaultLambda is the relevance weight λ recommended by Sievert & Shirley (2014).
const DefaultLambda = 0.6

func (m *Model) marginal() []float64 {
	n := 0.0
	for _, f := range m.freq {
		n += float64(f)
	}
	pw := make([]float64, m.v)
	for w, f := range m.freq {
		// A word never seen in training has φ_kw = β/(n_k+Vβ); give it half a count so the
		// ratio stays finite.
		pw[w] = max(float64(f), 0.5) / n
	}
	return pw
}

// Representative returns the n training narratives with the highest θ_dk, highest first
// (ties by narrative number). It panics if the model has no θ.
func (m *Model) Representative(k, n int) []int {
	m.checkTheme(k)
	D := m.Docs()
	if m.theta == nil {
		panic("topics: model has no document-theme estimates (loaded from a file)")
	}
	idx := make([]int, 0, D)
	for d := 0; d < D; d++ {
		if m.docLen[d] > 0 {
			idx = append(idx, d)
		}
	}
	slices.SortStableFunc(idx, func(a, b int) int {
		ta, tb := m.theta[a*m.k+k], m.theta[b*m.k+k]
		switch {
		case ta > tb:
			return -1
		case ta < tb:
			return 1
		}
		return a - b
	})
	return idx[:min(n, len(idx))]
}

// Size is how much of the training corpus a theme covers.
type Size struct {
	Dominant int     // narratives whose largest θ_dk is this theme (ties to the lower k)
	Expected float64 // Σ_d θ_dk
}

// Sizes returns each theme's size over the non-empty training narratives. It panics if the
// model has no θ.
func (m *Model) Sizes() []Size {
	if m.theta == nil {
		panic("topics: model has no document-theme estimates (loaded from a file)")
	}
	out := make([]Size, m.k)
	for d := 0; d < m.Docs(); d++ {
		if m.docLen[d] == 0 {
			continue
		}
		row := m.theta[d*m.k : (d+1)*m.k]
		out[argmax(row)].Dominant++
		for k, t := range row {
			out[k].Expected += t
		}
	}
	return out
}

// Dominant returns each training narrative's theme with the largest θ (ties to the lower
// k); -1 for an empty narrative.
func (m *Model) Dominant() []int {
	out := make([]int, m.Docs())
	for d := range out {
		if m.docLen[d] == 0 {
			out[d] = -1
			continue
		}
		out[d] = argmax(m.theta[d*m.k : (d+1)*m.k])
	}
	return out
}

func argmax(x []float64) int {
	b := 0
	for i, v := range x {
		if v > x[b] {
			b = i
		}
	}
	return b
}

// topIDs returns the n most probable word ids of each theme (ties by id).
func topIDs(phi []float64, K, V, n int) [][]int {
	out := make([][]int, K)
	for k := 0; k < K; k++ {
		row := phi[k*V : (k+1)*V]
		idx := make([]int, V)
		for i := range idx {
			idx[i] = i
		}
		slices.SortStableFunc(idx, func(a, b int) int {
			switch {
			case row[a] > row[b]:
				return -1
			case row[a] < row[b]:
				return 1
			}
			return a - b
		})
		out[k] = idx[:min(n, V)]
	}
	return out
}

// TopIDs returns the n most probable word ids of every theme (ties by id).
func (m *Model) TopIDs(n int) [][]int { return topIDs(m.phi, m.k, m.v, n) }
