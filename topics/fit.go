package topics

import (
	"bufio"
	"context"
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"fmt"
	"math"
	"sync"

	"undercurrent/text/sparse"
)

// Fit fits an LDA model (Blei, Ng & Jordan 2003) to c by collapsed Gibbs sampling
// (Griffiths & Steyvers 2004). For K ≥ 50 it uses the SparseLDA bucket sampler (Yao, Mimno &
// McCallum 2009); below that the plain sampler over all K themes, which we measured to be
// faster there (see sparseFromK). Both draw from the same exact conditional.
//
// Documents are split into Settings.Partitions fixed blocks that are swept in parallel
// against a copy of the word-theme counts and merged after every sweep (approximate
// distributed LDA, Newman, Asuncion, Smyth & Welling 2009). Each block has its own random
// stream seeded from Settings.Seed, so the result depends on the seed and the number of
// blocks, never on GOMAXPROCS or scheduling.
//
// After Settings.BurnIn sweeps, Settings.Samples states are averaged:
//
//	φ_kw = mean_s (n_wk + β + η_wk)/(n_k + Vβ + η_k),   θ_dk = mean_s (n_dk + α_k)/(n_d + α_0)
//
// Guided themes use seeded word priors in the spirit of Jagarlamudi, Daumé & Udupa (2012):
// a seed word w of theme t gets extra Dirichlet mass η_wt = SeedStrength × count(w) in that
// theme's prior (and nowhere else), and its tokens start in theme t. The extra mass stays
// in the prior for the whole fit, so the theme keeps its seed words across refits.
//
// Memory: 6 bytes per token (word id and theme), 4·V·K bytes of counts per partition plus
// one merged copy, and 8·D·K bytes for the averaged θ of the D training narratives.
//
// Fit returns an error for data problems (a count that is not a whole number, an empty
// corpus, labels of the wrong length, seed words missing from the vocabulary) and for a
// cancelled context. It panics if c.Counts is nil.
func Fit(ctx context.Context, c Corpus, s Settings) (*Model, error) {
	if c.Counts == nil {
		panic("topics: nil count matrix")
	}
	s, err := s.resolved()
	if err != nil {
		return nil, err
	}
	m := c.Counts
	V := m.Cols
	if V == 0 {
		return nil, fmt.Errorf("topics: empty vocabulary (count matrix has no columns)")
	}
	if c.Vocabulary != nil && len(c.Vocabulary) != V {
		return nil, fmt.Errorf("topics: %d vocabulary terms for %d columns", len(c.Vocabulary), V)
	}
	if c.Display != nil && len(c.Display) != V {
		return nil, fmt.Errorf("topics: %d display words for %d columns", len(c.Display), V)
	}
	words, docStart, err := tokens(m)
	if err != nil {
		return nil, err
	}
	if len(words) == 0 {
		return nil, fmt.Errorf("topics: the corpus has no tokens")
	}
	vocab := c.Vocabulary
	if vocab == nil {
		vocab = make([]string, V)
		for i := range vocab {
			vocab[i] = fmt.Sprintf("w%d", i)
		}
	}
	display := c.Display
	if display == nil {
		display = vocab
	}
	var seeds [][]int32
	if len(s.Seeds) > 0 {
		if c.Vocabulary == nil {
			return nil, fmt.Errorf("topics: seed themes need a vocabulary")
		}
		if seeds, err = resolveSeeds(s.Seeds, vocab, display); err != nil {
			return nil, err
		}
	}
	freq := make([]float64, V)
	for _, w := range words {
		freq[w]++
	}
	eta := make([]float64, V)
	for i := range eta {
		eta[i] = s.SeedStrength * freq[i]
	}

	K := s.K
	alpha0 := make([]float64, K)
	for k := range alpha0 {
		alpha0[k] = s.Alpha
	}
	total := s.Iterations * s.Chains
	optFrom := s.optFrom
	if optFrom == 0 {
		optFrom = 24
	}
	done := 0
	results := make([]chainResult, s.Chains)
	// Chains run concurrently, each on its own goroutines; progress reaches Fit's goroutine
	// through a channel so Settings.Progress is called from one goroutine only.
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	tick := make(chan struct{}, 64)
	errs := make([]error, s.Chains)
	var wg sync.WaitGroup
	for ci := 0; ci < s.Chains; ci++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			res, err := runChain(ctx, s, K, V, words, docStart, alpha0, seeds, eta,
				s.Seed+uint64(ci)*chainSeedStep, optFrom, tick)
			results[ci], errs[ci] = res, err
			if err != nil {
				cancel()
			}
		}()
	}
	go func() { wg.Wait(); close(tick) }()
	for range tick {
		done++
		if s.Progress != nil {
			s.Progress(done, total)
		}
	}
	for _, err := range errs {
		if err != nil {
			return nil, err
		}
	}
	best := 0
	for ci := range results {
		if results[ci].ll > results[best].ll {
			best = ci
		}
	}
	r := results[best]
	model := &Model{
		k: K, v: V, alpha: r.alpha, beta: r.beta, phi: r.phi, theta: r.theta,
		vocab: vocab, display: display, pipeline: append([]byte(nil), c.Pipeline...),
		fingerprint: Fingerprint(m), fit: s.record(), Stability: math.NaN(),
		docLen: make([]int, len(docStart)-1), freq: make([]int64, V),
	}
	for d := range model.docLen {
		model.docLen[d] = docStart[d+1] - docStart[d]
	}
	for w, f := range freq {
		model.freq[w] = int64(f)
	}
	model.names = make([]string, K)
	for t, st := range s.Seeds {
		model.names[t] = st.Name
	}
	for _, res := range results {
		model.ChainLogLikelihood = append(model.ChainLogLikelihood, res.ll)
	}
	if s.Chains > 1 {
		sum := 0.0
		ref := topIDs(r.phi, K, V, stabilityTop)
		for ci, res := range results {
			if ci != best {
				sum += MatchedJaccard(ref, topIDs(res.phi, K, V, stabilityTop))
			}
		}
		model.Stability = sum / float64(s.Chains-1)
	}
	return model, nil
}

type chainResult struct {
	phi, theta []float64
	alpha      []float64
	beta, ll   float64
}

// runChain runs one chain to the end and returns its averaged estimates; it sends one tick
// per sweep.
func runChain(ctx context.Context, s Settings, K, V int, words []int32, docStart []int, alpha0 []float64,
	seeds [][]int32, eta []float64, seed uint64, optFrom int, tick chan<- struct{}) (chainResult, error) {
	ch := newChain(K, V, words, docStart, alpha0, s.Beta, seeds, eta, seed, s.Partitions, s.sampler)
	D := len(docStart) - 1
	phi := make([]float64, K*V)
	theta := make([]float64, D*K)
	lag := (s.Iterations - s.BurnIn) / s.Samples
	next := s.BurnIn + lag - 1
	taken := 0
	for it := 0; it < s.Iterations; it++ {
		if err := ctx.Err(); err != nil {
			return chainResult{}, err
		}
		ch.sweep()
		if !s.FixedPriors && it < s.BurnIn && it >= optFrom && it%10 == 9 {
			ch.optimizePriors(!s.fixedBeta)
		}
		if it == next && taken < s.Samples {
			ch.accumulate(phi, theta)
			taken++
			next += lag
		}
		tick <- struct{}{}
	}
	inv := 1 / float64(taken)
	for i := range phi {
		phi[i] *= inv
	}
	for i := range theta {
		theta[i] *= inv
	}
	return chainResult{phi, theta, append([]float64(nil), ch.alpha...), ch.beta, ch.logLikelihood()}, nil
}

// chainSeedStep separates the seeds of a fit's chains (the 64-bit golden-ratio constant).
const chainSeedStep = 0x9E3779B97F4A7C15

// stabilityTop is the number of top words compared between chains and seeds.
const stabilityTop = 10

func (c *chain) accumulate(phi, theta []float64) {
	K, V := c.K, c.V
	for k := 0; k < K; k++ {
		inv := 1 / (float64(c.nk[k]) + c.betaSum[k])
		row := phi[k*V : k*V+V]
		for w := 0; w < V; w++ {
			b := c.beta
			if r := c.seedRow[w]; r >= 0 {
				b += c.eta[r][k]
			}
			row[w] += (float64(c.nwk[w*K+k]) + b) * inv
		}
	}
	a0 := 0.0
	for _, a := range c.alpha {
		a0 += a
	}
	ndk := make([]int, K)
	for d := 0; d+1 < len(c.docStart); d++ {
		a, b := c.docStart[d], c.docStart[d+1]
		clear(ndk)
		for _, t := range c.z[a:b] {
			ndk[t]++
		}
		inv := 1 / (float64(b-a) + a0)
		row := theta[d*K : d*K+K]
		for k := range row {
			row[k] += (float64(ndk[k]) + c.alpha[k]) * inv
		}
	}
}

// tokens expands the count matrix into one word id per token, document by document
// (columns in increasing order within a document).
func tokens(m *sparse.Matrix) ([]int32, []int, error) {
	if len(m.Indptr) != m.Rows+1 {
		return nil, nil, fmt.Errorf("topics: count matrix has %d row pointers for %d rows", len(m.Indptr), m.Rows)
	}
	n := 0
	for i, v := range m.Data {
		if v < 0 || v != math.Trunc(v) || v > math.MaxInt32 {
			row := 0
			for row < m.Rows && m.Indptr[row+1] <= i {
				row++
			}
			return nil, nil, fmt.Errorf("topics: count matrix row %d, column %d: %v is not a whole non-negative count", row, m.Indices[i], v)
		}
		n += int(v)
	}
	words := make([]int32, 0, n)
	docStart := make([]int, m.Rows+1)
	for d := 0; d < m.Rows; d++ {
		cols, vals := m.Row(d)
		for j, c := range cols {
			for x := 0; x < int(vals[j]); x++ {
				words = append(words, c)
			}
		}
		docStart[d+1] = len(words)
	}
	return words, docStart, nil
}

// Fingerprint returns the hex SHA-256 of a canonical encoding of m: the ASCII tag
// "undercurrent/sparse/v1", then Rows, Cols, every Indptr entry and every Indices entry as
// little-endian uint64, then every Data value's IEEE-754 bits as little-endian uint64.
func Fingerprint(m *sparse.Matrix) string {
	h := sha256.New()
	bw := bufio.NewWriter(h)
	bw.WriteString("undercurrent/sparse/v1")
	var b [8]byte
	put := func(x uint64) {
		binary.LittleEndian.PutUint64(b[:], x)
		bw.Write(b[:])
	}
	put(uint64(m.Rows))
	put(uint64(m.Cols))
	for _, p := range m.Indptr {
		put(uint64(p))
	}
	for _, c := range m.Indices {
		put(uint64(c))
	}
	for _, v := range m.Data {
		put(math.Float64bits(v))
	}
	bw.Flush()
	return hex.EncodeToString(h.Sum(nil))
}
