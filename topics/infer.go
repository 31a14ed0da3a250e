package topics

import (
	"context"
	"crypto/sha256"
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"math/rand/v2"
	"sync"
)

// InferSettings controls fold-in inference. Every zero value selects a documented default.
type InferSettings struct {
	// Iterations is the number of Gibbs sweeps over a narrative's tokens. Zero means 60.
	Iterations int
	// BurnIn is the number of sweeps before θ estimates are averaged. Zero means
	// Iterations/3.
	BurnIn int
	// Workers is the number of goroutines Stream uses. Zero means 2.
	Workers int
}

// Tagger assigns theme proportions to new narratives with a frozen model. It is safe for
// concurrent use.
type Tagger struct {
	m    *Model
	s    InferSettings
	phiT []float64 // V×K, word-major
	a0   float64
	pool sync.Pool
}

// NewTagger returns a Tagger for m. It panics if the settings are negative or BurnIn is not
// below Iterations.
func NewTagger(m *Model, s InferSettings) *Tagger {
	if s.Iterations == 0 {
		s.Iterations = 60
	}
	if s.BurnIn == 0 {
		s.BurnIn = s.Iterations / 3
	}
	if s.Workers == 0 {
		s.Workers = 2
	}
	if s.Iterations < 1 || s.BurnIn < 0 || s.BurnIn >= s.Iterations || s.Workers < 1 {
		panic("topics: invalid inference settings")
	}
	t := &Tagger{m: m, s: s, phiT: make([]float64, m.v*m.k)}
	for k := 0; k < m.k; k++ {
		for w := 0; w < m.v; w++ {
			t.phiT[w*m.k+k] = m.phi[k*m.v+w]
		}
	}
	for _, a := range m.alpha {
		t.a0 += a
	}
	return t
}

// scratch is one goroutine's working memory for InferTo, kept in the Tagger's pool.
type scratch struct {
	z    []uint16
	ndk  []int32
	c    []float64 // c[k] = float64(ndk[k]) + α_k, kept in step with ndk
	p    []float64 // cumulative weights of the draw
	rows []float64 // the φ column of each token, token-major (len(ids) × K)
	seed []byte    // docSeed's message
}

// K returns the number of themes, the length of each θ.
func (t *Tagger) K() int { return t.m.k }

// Infer returns θ for one narrative given its word ids (one per token, in text order; ids
// must be columns of the model's vocabulary). See InferTo.
func (t *Tagger) Infer(id string, ids []int32) []float64 {
	return t.InferTo(make([]float64, t.m.k), id, ids)
}

// InferTo writes θ for one narrative into dst (length K) and returns dst. θ is estimated by
// Gibbs sampling the narrative's theme assignments with φ held fixed ("fold-in", Griffiths
// & Steyvers 2004; Wallach et al. 2009 §4):
//
//	p(z_i = k | z_−i) ∝ (n_dk^−i + α_k) φ_k,w_i,   θ_k = mean over sweeps after burn-in of (n_dk + α_k)/(N + α_0)
//
// The random stream is seeded from the SHA-256 of id and ids (see docSeed), so a
// narrative's θ depends only on the model, the settings, its id and its tokens — never on
// the other narratives in its batch or on the order they are tagged. An empty narrative
// gets the prior mean α/α_0. It panics if a word id is outside the vocabulary or dst has the
// wrong length.
//
// Each draw sums the K weights (n_dk + α_k) φ_k,w in theme order and picks the first theme
// whose running sum exceeds u·total, u uniform in [0, 1) from the narrative's PCG stream
// (53 bits, as rand.Rand.Float64). The result is pinned bit for bit (TestInferPinned):
// speed-ups must keep every floating-point operation and its order; a sparse sampler that
// splits the sum (α φ + n φ) would round differently, change draws and so change tags.
func (t *Tagger) InferTo(dst []float64, id string, ids []int32) []float64 {
	K := t.m.k
	if len(dst) != K {
		panic("topics: destination length does not match K")
	}
	for _, w := range ids {
		if w < 0 || int(w) >= t.m.v {
			panic(fmt.Sprintf("topics: word id %d outside vocabulary of %d", w, t.m.v))
		}
	}
	sc := t.getScratch()
	t.infer(sc, dst, id, ids)
	t.pool.Put(sc)
	return dst
}

// InferBatchTo writes θ of docs[j] into dst[j·K : (j+1)·K] and returns dst, exactly as
// InferTo would for each narrative (bit for bit), with one set of working memory. It
// panics if len(dst) is not len(docs)·K or a word id is outside the vocabulary.
func (t *Tagger) InferBatchTo(dst []float64, docs []Doc) []float64 {
	K := t.m.k
	if len(dst) != len(docs)*K {
		panic("topics: destination length does not match K × narratives")
	}
	for _, d := range docs {
		for _, w := range d.IDs {
			if w < 0 || int(w) >= t.m.v {
				panic(fmt.Sprintf("topics: word id %d outside vocabulary of %d", w, t.m.v))
			}
		}
	}
	sc := t.getScratch()
	for j, d := range docs {
		t.infer(sc, dst[j*K:j*K+K], d.ID, d.IDs)
	}
	t.pool.Put(sc)
	return dst
}

func (t *Tagger) getScratch() *scratch {
	if sc, _ := t.pool.Get().(*scratch); sc != nil {
		return sc
	}
	K := t.m.k
	// Padded: goroutines tagging side by side write these on every token (see worker).
	return &scratch{ndk: padded[int32](K), c: padded[float64](K), p: padded[float64](K)}
}

// infer is InferTo after the checks, with sc's memory.
func (t *Tagger) infer(sc *scratch, dst []float64, id string, ids []int32) {
	K := t.m.k
	clear(dst)
	alpha := t.m.alpha[:K]
	if len(ids) == 0 {
		for k, a := range alpha {
			dst[k] = a / t.a0
		}
		return
	}
	var s1, s2 uint64
	s1, s2, sc.seed = docSeed(sc.seed[:0], id, ids)
	var rng rand.PCG
	rng.Seed(s1, s2)
	N := len(ids)
	if cap(sc.z) < N {
		sc.z = make([]uint16, N)
	}
	if cap(sc.rows) < N*K {
		sc.rows = make([]float64, N*K)
	}
	z := sc.z[:N]
	rows := sc.rows[:N*K]
	for i, w := range ids {
		copy(rows[i*K:i*K+K], t.phiT[int(w)*K:int(w)*K+K])
	}
	ndk, c, p := sc.ndk[:K], sc.c[:K], sc.p[:K]
	clear(ndk)
	copy(c, alpha) // float64(0) + α_k == α_k
	// Start each token in a theme drawn from p(k) ∝ α_k φ_kw.
	for i := range z {
		k := draw(&rng, p, c, rows[i*K:i*K+K])
		z[i] = uint16(k)
		ndk[k]++
		c[k] = float64(ndk[k]) + alpha[k]
	}
	n := 0
	inv := 1 / (float64(N) + t.a0)
	for it := 0; it < t.s.Iterations; it++ {
		row := rows
		for i, k := range z {
			ndk[k]--
			c[k] = float64(ndk[k]) + alpha[k]
			// draw, inlined by hand (the compiler does not: too big).
			r := row[:K]
			row = row[K:]
			tot := 0.0
			for j := range p {
				tot += c[j] * r[j]
				p[j] = tot
			}
			u := float64(rng.Uint64()<<11>>11) / (1 << 53) * tot
			nk := K - 1
			for j, x := range p[:K-1] {
				if u < x {
					nk = j
					break
				}
			}
			z[i] = uint16(nk)
			ndk[nk]++
			c[nk] = float64(ndk[nk]) + alpha[nk]
		}
		if it >= t.s.BurnIn {
			for k := range dst {
				dst[k] += c[k] * inv
			}
			n++
		}
	}
	for k := range dst {
		dst[k] /= float64(n)
	}
}

// draw returns a theme drawn with weights c[k]·row[k]: the first k whose running sum
// exceeds u·total, or the last theme.
func draw(rng *rand.PCG, p, c, row []float64) int {
	K := len(p)
	c, row = c[:K], row[:K]
	tot := 0.0
	for k := range p {
		tot += c[k] * row[k]
		p[k] = tot
	}
	u := float64(rng.Uint64()<<11>>11) / (1 << 53) * tot
	for k := 0; k < K; k++ {
		if u < p[k] {
			return k
		}
	}
	return K - 1
}

// docSeed returns the two PCG seeds of a narrative: the first 16 bytes (two little-endian
// uint64) of SHA-256("undercurrent/tag/v1" ‖ uint64 len(id) ‖ id ‖ each id as int32 LE).
// buf is scratch space for the message; the grown buffer is returned for reuse.
func docSeed(buf []byte, id string, ids []int32) (uint64, uint64, []byte) {
	buf = append(buf, "undercurrent/tag/v1"...)
	buf = binary.LittleEndian.AppendUint64(buf, uint64(len(id)))
	buf = append(buf, id...)
	for _, w := range ids {
		buf = binary.LittleEndian.AppendUint32(buf, uint32(w))
	}
	s := sha256.Sum256(buf)
	return binary.LittleEndian.Uint64(s[:8]), binary.LittleEndian.Uint64(s[8:16]), buf
}

// Doc is one narrative to tag: its id and its word ids, one per token.
type Doc struct {
	ID  string
	IDs []int32
}

// DocSource yields narratives one at a time; Next returns io.EOF after the last one. A Doc
// returned by Next must stay unchanged until it has been passed to the emit function.
type DocSource interface {
	Next() (Doc, error)
}

// Stream tags every narrative from src with InferSettings.Workers goroutines and calls emit
// with each narrative and its θ in input order, from Stream's goroutine. At most
// 4 × Workers narratives are in flight, so memory stays flat however long src is. θ passed
// to emit is reused afterwards; copy it to keep it. Stream stops at the first error from
// src (other than io.EOF), from emit or from ctx and returns it.
func (t *Tagger) Stream(ctx context.Context, src DocSource, emit func(d Doc, theta []float64) error) error {
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	W := t.s.Workers
	window := 4 * W
	type job struct {
		seq   int
		doc   Doc
		theta []float64
	}
	free := make(chan []float64, window)
	for i := 0; i < window; i++ {
		free <- make([]float64, t.m.k)
	}
	jobs := make(chan job, window)
	done := make(chan job, window)
	var srcErr error
	go func() {
		defer close(jobs)
		for seq := 0; ; seq++ {
			var buf []float64
			select {
			case buf = <-free:
			case <-ctx.Done():
				return
			}
			d, err := src.Next()
			if err != nil {
				if !errors.Is(err, io.EOF) {
					srcErr = err
				}
				return
			}
			select {
			case jobs <- job{seq, d, buf}:
			case <-ctx.Done():
				return
			}
		}
	}()
	var wg sync.WaitGroup
	for i := 0; i < W; i++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for j := range jobs {
				t.InferTo(j.theta, j.doc.ID, j.doc.IDs)
				done <- j
			}
		}()
	}
	go func() { wg.Wait(); close(done) }()
	pending := map[int]job{}
	next := 0
	var emitErr error
	for j := range done {
		if emitErr != nil {
			continue // drain
		}
		pending[j.seq] = j
		for {
			p, ok := pending[next]
			if !ok {
				break
			}
			delete(pending, next)
			next++
			if err := emit(p.doc, p.theta); err != nil {
				emitErr = err
				cancel()
				break
			}
			free <- p.theta
		}
	}
	if emitErr != nil {
		return emitErr
	}
	if srcErr != nil {
		return srcErr
	}
	return context.Cause(ctx)
}
