package topics

import (
	"math"
	"math/rand/v2"
	"sync"
	"unsafe"

	"gonum.org/v1/gonum/mathext"
)

// chain is one collapsed Gibbs chain over the whole corpus, split into fixed document
// blocks sampled in parallel (AD-LDA) and merged after every sweep.
type chain struct {
	K, V     int
	alpha    []float64 // α_k
	beta     float64   // symmetric β
	betaSum  []float64 // Vβ + Σ_w η_wk
	seedRow  []int32   // per word: index into eta, or -1
	eta      [][]float64
	words    []int32 // token word ids, document by document
	docStart []int   // len D+1
	z        []uint16
	nwk      []int32 // V×K, word-major
	nk       []int32
	workers  []*worker
	sampler  samplerKind
}

// worker is one block's sampler state. The two blocks of a chain run on two cores and
// write their state on every token, so nothing a worker writes may share a cache line
// with the other's: the struct is padded at both ends, its random state is held inside
// it, and its small per-theme slices come from padded (measured: with the two PCG states
// and the per-theme slices allocated side by side, the 2-block fit took twice the CPU).
type worker struct {
	_         [64]byte
	c         *chain
	lo, hi    int // documents [lo,hi)
	nwk       []int32
	nk        []int32
	nzCnt     []uint16 // per word: number of themes with n_wk > 0
	nzTop     []uint16 // V×K: those themes (first nzCnt[w] used)
	pcg       *rand.PCG
	rng       *rand.Rand // reads pcg
	ndk       []int32
	docNZ     []uint16
	coef, q   []float64
	s, r      float64
	denom     []float64 // n_k + betaSum_k, kept in step with nk
	alphaBeta []float64 // α_k β, per sweep
	pcgState  rand.PCG
	_         [64]byte
}

// padded returns a new slice of n zero values with a cache line (64 bytes) of unused
// memory on both sides, so that no other allocation shares its cache lines.
func padded[T any](n int) []T {
	var z T
	pad := max(1, 64/max(1, int(unsafe.Sizeof(z))))
	s := make([]T, n+2*pad)
	return s[pad : pad+n : pad+n]
}

func newChain(K, V int, words []int32, docStart []int, alpha []float64, beta float64,
	seeds [][]int32, seedEta []float64, seed uint64, partitions int, sk samplerKind) *chain {
	c := &chain{K: K, V: V, words: words, docStart: docStart, beta: beta, sampler: sk}
	c.alpha = append([]float64(nil), alpha...)
	c.seedRow = make([]int32, V)
	for i := range c.seedRow {
		c.seedRow[i] = -1
	}
	for t, ids := range seeds {
		for _, w := range ids {
			if c.seedRow[w] < 0 {
				c.seedRow[w] = int32(len(c.eta))
				c.eta = append(c.eta, make([]float64, K))
			}
			c.eta[c.seedRow[w]][t] += seedEta[w]
		}
	}
	c.betaSum = make([]float64, K)
	c.setBeta(beta)

	// Initial state: uniform random themes, except seed words, which start in their theme
	// (one of them, chosen at random, if a word seeds several). Sequential initialisation
	// (each token drawn from the conditional given the tokens before it) was tried and
	// dropped: on the bars test it locked in merged bars (Hellinger up to 0.76 after 200
	// sweeps, against ≤ 0.15 from a random start).
	rng := rand.New(rand.NewPCG(seed, 0x9e3779b97f4a7c15))
	c.z = make([]uint16, len(words))
	c.nwk = make([]int32, V*K)
	c.nk = make([]int32, K)
	for i, w := range words {
		var k int
		if r := c.seedRow[w]; r >= 0 {
			var opts []int
			for t, e := range c.eta[r] {
				if e > 0 {
					opts = append(opts, t)
				}
			}
			k = opts[rng.IntN(len(opts))]
		} else {
			k = rng.IntN(K)
		}
		c.z[i] = uint16(k)
		c.nwk[int(w)*K+k]++
		c.nk[k]++
	}

	// Fixed partition: contiguous document blocks with about equal token counts.
	D := len(docStart) - 1
	if partitions > D {
		partitions = max(D, 1)
	}
	lo := 0
	for p := 0; p < partitions; p++ {
		hi := lo
		target := len(words) * (p + 1) / partitions
		for hi < D && (docStart[hi] < target || p == partitions-1) {
			hi++
		}
		wk := &worker{c: c, lo: lo, hi: hi,
			ndk:   padded[int32](K),
			docNZ: padded[uint16](K)[:0], coef: padded[float64](K), q: padded[float64](K),
			nzCnt: padded[uint16](V), nzTop: padded[uint16](V * K),
			denom: padded[float64](K), alphaBeta: padded[float64](K)}
		wk.pcgState.Seed(seed, uint64(p)+1)
		wk.pcg = &wk.pcgState
		if partitions == 1 {
			wk.nwk, wk.nk = c.nwk, c.nk
		} else {
			wk.nwk = append(padded[int32](len(c.nwk))[:0], c.nwk...)
			wk.nk = append(padded[int32](len(c.nk))[:0], c.nk...)
		}
		wk.rng = rand.New(wk.pcg)
		wk.rebuildNZ()
		c.workers = append(c.workers, wk)
		lo = hi
	}
	return c
}

func (c *chain) setBeta(beta float64) {
	c.beta = beta
	for k := range c.betaSum {
		c.betaSum[k] = float64(c.V) * beta
	}
	for _, e := range c.eta {
		for k, v := range e {
			c.betaSum[k] += v
		}
	}
}

func (w *worker) rebuildNZ() {
	K := w.c.K
	for v := 0; v < w.c.V; v++ {
		n := 0
		row := w.nwk[v*K : v*K+K]
		top := w.nzTop[v*K : v*K+K]
		for k, x := range row {
			if x > 0 {
				top[n] = uint16(k)
				n++
			}
		}
		w.nzCnt[v] = uint16(n)
	}
}

// sweep runs one Gibbs sweep of every block and merges the blocks' counts.
func (c *chain) sweep() {
	if len(c.workers) == 1 {
		c.workers[0].sweep()
		return
	}
	var wg sync.WaitGroup
	for _, wk := range c.workers {
		wg.Add(1)
		go func() { defer wg.Done(); wk.sweep() }()
	}
	wg.Wait()
	// AD-LDA merge: n ← n + Σ_p (n_p − n), in a fixed order.
	for i, g := range c.nwk {
		s := g
		for _, wk := range c.workers {
			s += wk.nwk[i] - g
		}
		c.nwk[i] = s
	}
	for k, g := range c.nk {
		s := g
		for _, wk := range c.workers {
			s += wk.nk[k] - g
		}
		c.nk[k] = s
	}
	var wg2 sync.WaitGroup
	for _, wk := range c.workers {
		wg2.Add(1)
		go func() {
			defer wg2.Done()
			copy(wk.nwk, c.nwk)
			copy(wk.nk, c.nk)
			wk.rebuildNZ()
		}()
	}
	wg2.Wait()
}

func (w *worker) sweep() {
	c := w.c
	K := c.K
	for k := 0; k < K; k++ {
		w.denom[k] = float64(w.nk[k]) + c.betaSum[k]
		w.alphaBeta[k] = c.alpha[k] * c.beta
	}
	for d := w.lo; d < w.hi; d++ {
		w.doc(d)
	}
}

func (w *worker) doc(d int) {
	c := w.c
	K := c.K
	a, b := c.docStart[d], c.docStart[d+1]
	if a == b {
		return
	}
	ndk := w.ndk
	w.docNZ = w.docNZ[:0]
	for _, t := range c.z[a:b] {
		if ndk[t] == 0 {
			w.docNZ = append(w.docNZ, t)
		}
		ndk[t]++
	}
	// Buckets of Yao, Mimno & McCallum (2009), eq. 3:
	//	s = Σ_k α_k β/(n_k+Vβ), r = Σ_k n_dk β/(n_k+Vβ), q = Σ_k (α_k+n_dk) n_wk/(n_k+Vβ)
	s := 0.0
	for k := 0; k < K; k++ {
		s += w.alphaBeta[k] / w.denom[k]
		w.coef[k] = c.alpha[k] / w.denom[k]
	}
	r := 0.0
	for _, t := range w.docNZ {
		r += float64(ndk[t]) * c.beta / w.denom[t]
		w.coef[t] = (c.alpha[t] + float64(ndk[t])) / w.denom[t]
	}
	w.s, w.r = s, r
	if c.sampler == denseSampler {
		w.docDense(a, b)
		for _, t := range w.docNZ {
			ndk[t] = 0
		}
		return
	}
	for i := a; i < b; i++ {
		word := int(c.words[i])
		t := int(c.z[i])
		w.move(word, t, -1)
		var nt int
		if c.seedRow[word] >= 0 {
			nt = w.drawDense(word)
		} else {
			nt = w.drawSparse(word)
		}
		w.move(word, nt, +1)
		c.z[i] = uint16(nt)
	}
	for _, t := range w.docNZ {
		ndk[t] = 0
	}
}

// move adds delta (±1) to the counts of theme t for word, keeping s, r, coef and the
// non-zero lists in step.
func (w *worker) move(word, t int, delta int32) {
	c := w.c
	K := c.K
	ndk := w.ndk
	den := w.denom[t]
	w.s -= w.alphaBeta[t] / den
	w.r -= float64(ndk[t]) * c.beta / den
	ndk[t] += delta
	w.nwk[word*K+t] += delta
	w.nk[t] += delta
	den = float64(w.nk[t]) + c.betaSum[t]
	w.denom[t] = den
	w.s += w.alphaBeta[t] / den
	w.r += float64(ndk[t]) * c.beta / den
	w.coef[t] = (c.alpha[t] + float64(ndk[t])) / den
	if delta < 0 {
		if ndk[t] == 0 {
			removeU16(&w.docNZ, uint16(t))
		}
		if w.nwk[word*K+t] == 0 {
			top := w.nzTop[word*K : word*K+K]
			n := int(w.nzCnt[word])
			for j := 0; j < n; j++ {
				if int(top[j]) == t {
					top[j] = top[n-1]
					break
				}
			}
			w.nzCnt[word]--
		}
	} else {
		if ndk[t] == 1 {
			w.docNZ = append(w.docNZ, uint16(t))
		}
		if w.nwk[word*K+t] == 1 {
			w.nzTop[word*K+int(w.nzCnt[word])] = uint16(t)
			w.nzCnt[word]++
		}
	}
}

func removeU16(s *[]uint16, v uint16) {
	x := *s
	for j, y := range x {
		if y == v {
			x[j] = x[len(x)-1]
			*s = x[:len(x)-1]
			return
		}
	}
}

func (w *worker) drawSparse(word int) int {
	c := w.c
	K := c.K
	row := w.nwk[word*K : word*K+K]
	top := w.nzTop[word*K : word*K+int(w.nzCnt[word])]
	qs := 0.0
	for j, k := range top {
		v := w.coef[k] * float64(row[k])
		w.q[j] = v
		qs += v
	}
	s, r := w.s, w.r
	if s < 0 {
		s = 0
	}
	if r < 0 {
		r = 0
	}
	u := w.rng.Float64() * (s + r + qs)
	if u < qs {
		for j, k := range top {
			u -= w.q[j]
			if u <= 0 {
				return int(k)
			}
		}
		return int(top[len(top)-1])
	}
	u -= qs
	if u < r && len(w.docNZ) > 0 {
		for _, k := range w.docNZ {
			u -= float64(w.ndk[k]) * c.beta / w.denom[k]
			if u <= 0 {
				return int(k)
			}
		}
		return int(w.docNZ[len(w.docNZ)-1])
	}
	u -= r
	for k := 0; k < K; k++ {
		u -= w.alphaBeta[k] / w.denom[k]
		if u <= 0 {
			return k
		}
	}
	return K - 1
}

// drawDense samples from p(k) ∝ (α_k+n_dk)(n_wk+β+η_wk)/(n_k+β_k) over every theme; used for
// seed words (whose prior is not symmetric) and for measuring the sparse sampler's gain.
func (w *worker) drawDense(word int) int {
	c := w.c
	K := c.K
	row := w.nwk[word*K : word*K+K]
	var eta []float64
	if r := c.seedRow[word]; r >= 0 {
		eta = c.eta[r]
	}
	tot := 0.0
	for k := 0; k < K; k++ {
		p := float64(row[k]) + c.beta
		if eta != nil {
			p += eta[k]
		}
		tot += w.coef[k] * p
		w.q[k] = tot
	}
	u := w.rng.Float64() * tot
	for k := 0; k < K; k++ {
		if u < w.q[k] {
			return k
		}
	}
	return K - 1
}

// logLikelihood returns log p(w | z) under the current priors (Griffiths & Steyvers 2004,
// eq. 2, with β_wk = β + η_wk):
//
//	Σ_k [lnΓ(Σ_w β_wk) − lnΓ(n_k + Σ_w β_wk)] + Σ_k Σ_w [lnΓ(n_wk + β_wk) − lnΓ(β_wk)]
func (c *chain) logLikelihood() float64 {
	K := c.K
	lgb, _ := math.Lgamma(c.beta)
	ll := 0.0
	for k := 0; k < K; k++ {
		a, _ := math.Lgamma(c.betaSum[k])
		b, _ := math.Lgamma(float64(c.nk[k]) + c.betaSum[k])
		ll += a - b
	}
	for v := 0; v < c.V; v++ {
		var eta []float64
		if r := c.seedRow[v]; r >= 0 {
			eta = c.eta[r]
		}
		for k := 0; k < K; k++ {
			n := c.nwk[v*K+k]
			if n == 0 && eta == nil {
				continue
			}
			bw := c.beta
			if eta != nil {
				bw += eta[k]
			}
			a, _ := math.Lgamma(float64(n) + bw)
			var b float64
			if eta != nil {
				b, _ = math.Lgamma(bw)
			} else {
				b = lgb
			}
			ll += a - b
		}
	}
	return ll
}

// optimizePriors re-estimates the asymmetric α and the symmetric β by Minka's fixed-point
// iteration written with count histograms (Wallach 2008, thesis §2.3; Wallach, Mimno &
// McCallum 2009):
//
//	α_k ← α_k Σ_n C_k(n) Σ_{j=1..n} 1/(α_k+j−1) / Σ_n C(n) Σ_{j=1..n} 1/(α_0+j−1)
//	β   ← β Σ_{w,k} Σ_{j=1..n_wk} 1/(β+j−1) / (V Σ_k Σ_{j=1..n_k} 1/(Vβ+j−1))
//
// where C_k(n) is the number of documents with n tokens in theme k, C(n) the number of
// documents of length n and α_0 = Σ_k α_k. The seed-word mass η is held fixed and left out
// of the β update (an approximation; seed words are few).
func (c *chain) optimizePriors(withBeta bool) {
	K := c.K
	D := len(c.docStart) - 1
	maxLen := 0
	for d := 0; d < D; d++ {
		maxLen = max(maxLen, c.docStart[d+1]-c.docStart[d])
	}
	hist := make([]int, (maxLen+1)*K) // hist[n*K+k] = C_k(n)
	lenHist := make([]int, maxLen+1)
	ndk := make([]int, K)
	for d := 0; d < D; d++ {
		a, b := c.docStart[d], c.docStart[d+1]
		clear(ndk)
		for _, t := range c.z[a:b] {
			ndk[t]++
		}
		for k, n := range ndk {
			if n > 0 {
				hist[n*K+k]++
			}
		}
		lenHist[b-a]++
	}
	for round := 0; round < 50; round++ {
		a0 := 0.0
		for _, a := range c.alpha {
			a0 += a
		}
		den, acc := 0.0, 0.0
		for n := 1; n <= maxLen; n++ {
			acc += 1 / (a0 + float64(n-1))
			den += float64(lenHist[n]) * acc
		}
		change := 0.0
		for k := 0; k < K; k++ {
			num, acc := 0.0, 0.0
			for n := 1; n <= maxLen; n++ {
				acc += 1 / (c.alpha[k] + float64(n-1))
				num += float64(hist[n*K+k]) * acc
			}
			na := c.alpha[k] * num / den
			if na < 1e-6 {
				na = 1e-6
			}
			change = max(change, math.Abs(na-c.alpha[k])/c.alpha[k])
			c.alpha[k] = na
		}
		if change < 1e-6 {
			break
		}
	}

	if !withBeta {
		return
	}
	// β: histogram of the word-theme counts.
	maxN := int32(0)
	for _, n := range c.nwk {
		maxN = max(maxN, n)
	}
	wh := make([]int, maxN+1)
	for _, n := range c.nwk {
		wh[n]++
	}
	beta := c.beta
	for round := 0; round < 50; round++ {
		num, acc := 0.0, 0.0
		for n := 1; n <= int(maxN); n++ {
			acc += 1 / (beta + float64(n-1))
			num += float64(wh[n]) * acc
		}
		vb := float64(c.V) * beta
		den := 0.0
		for k := 0; k < K; k++ {
			// Σ_{j=0..n−1} 1/(x+j) = ψ(x+n) − ψ(x).
			den += mathext.Digamma(vb+float64(c.nk[k])) - mathext.Digamma(vb)
		}
		nb := beta * num / (float64(c.V) * den)
		if nb < 1e-6 {
			nb = 1e-6
		}
		ch := math.Abs(nb-beta) / beta
		beta = nb
		if ch < 1e-6 {
			break
		}
	}
	c.setBeta(beta)
}

// docDense sweeps tokens [a,b) of one document with the plain collapsed Gibbs conditional
//
//	p(z_i = k | z_−i) ∝ (n_dk + α_k)(n_wk + β + η_wk)/(n_k + Vβ + η_k)
//
// over all K themes: K multiply-adds per token and no bucket bookkeeping, which measures
// faster than the SparseLDA buckets for small K (see BenchmarkSweep). It keeps ndk and the
// block's counts; docNZ is kept only as the list of themes to reset (it may hold themes whose
// count fell back to zero).
//
// Tried and dropped, each measured on BenchmarkSweep's corpus at K = 20 against this loop
// (CPU ns per token, best of 2–4 interleaved runs on the shared machine; this loop 47–55):
// fixed-point int64 partial sums with a 128-bit multiply draw and a branchless count (no
// change); a two-bucket word-sparse variant (q over the word's non-zero themes, β·Σc_k
// kept in O(1)), faster at sweep 20 but 58 against 53 once converged at β ≈ 0.2; a
// branchless search over the float bits (no change); reciprocals instead of the two
// divisions (no change); uint16 word-theme counts, halving the rows (no change); loading
// the row two tokens ahead (no change). Dropping the K-term loop altogether (not a valid
// sampler) leaves 34–37 ns, and reading 8 rows instead of V leaves 30–44 ns: the random row reads
// and the per-token overhead, not the arithmetic, dominate.
func (w *worker) docDense(a, b int) {
	c := w.c
	K := c.K
	ndk := w.ndk[:K]
	coef := w.coef[:K]
	cum := w.q[:K]
	nk := w.nk[:K]
	alpha := c.alpha[:K]
	betaSum := c.betaSum[:K]
	beta := c.beta
	words := c.words[a:b]
	z := c.z[a:b]
	pcg := w.pcg
	for i, word := range words {
		t := int(z[i])
		row := w.nwk[int(word)*K : int(word)*K+K]
		ndk[t]--
		row[t]--
		nk[t]--
		coef[t] = (alpha[t] + float64(ndk[t])) / (float64(nk[t]) + betaSum[t])
		tot := 0.0
		if r := c.seedRow[word]; r >= 0 {
			eta := c.eta[r][:K]
			for k := range cum {
				tot += coef[k] * (float64(row[k]) + beta + eta[k])
				cum[k] = tot
			}
		} else {
			for k := range cum {
				tot += coef[k] * (float64(row[k]) + beta)
				cum[k] = tot
			}
		}
		u := float64(pcg.Uint64()>>11) * 0x1p-53 * tot
		nt := 0
		for nt < K-1 && cum[nt] <= u {
			nt++
		}
		if ndk[nt] == 0 {
			w.docNZ = append(w.docNZ, uint16(nt))
		}
		ndk[nt]++
		row[nt]++
		nk[nt]++
		coef[nt] = (alpha[nt] + float64(ndk[nt])) / (float64(nk[nt]) + betaSum[nt])
		z[i] = uint16(nt)
	}
}
