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

type scratch struct {
	z   []uint16
	ndk []int32
	p   []float64
}

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
	clear(dst)
	alpha := t.m.alpha
	if len(ids) == 0 {
		for k, a := range alpha {
			dst[k] = a / t.a0
		}
		return dst
	}
	sc, _ := t.pool.Get().(*scratch)
	if sc == nil {
		sc = &scratch{ndk: make([]int32, K), p: make([]float64, K)}
	}
	defer t.pool.Put(sc)
	s1, s2 := docSeed(id, ids)
	rng := rand.New(rand.NewPCG(s1, s2))
	if cap(sc.z) < len(ids) {
		sc.z = make([]uint16, len(ids))
	}
	z := sc.z[:len(ids)]
	ndk, p := sc.ndk, sc.p
	clear(ndk)
	// Start each token in a theme drawn from p(k) ∝ α_k φ_kw.
	for i, w := range ids {
		k := t.draw(rng, p, ndk, int(w))
		z[i] = uint16(k)
		ndk[k]++
	}
	n := 0
	inv := 1 / (float64(len(ids)) + t.a0)
	for it := 0; it < t.s.Iterations; it++ {
		for i, w := range ids {
			ndk[z[i]]--
			k := t.draw(rng, p, ndk, int(w))
			z[i] = uint16(k)
			ndk[k]++
		}
		if it >= t.s.BurnIn {
			for k := range dst {
				dst[k] += (float64(ndk[k]) + alpha[k]) * inv
			}
			n++
		}
	}
	for k := range dst {
		dst[k] /= float64(n)
	}
	return dst
}

func (t *Tagger) draw(rng *rand.Rand, p []float64, ndk []int32, w int) int {
	K := t.m.k
	row := t.phiT[w*K : w*K+K]
	tot := 0.0
	for k := 0; k < K; k++ {
		tot += (float64(ndk[k]) + t.m.alpha[k]) * row[k]
		p[k] = tot
	}
	u := rng.Float64() * tot
	for k := 0; k < K; k++ {
		if u < p[k] {
			return k
		}
	}
	return K - 1
}

// docSeed returns the two PCG seeds of a narrative: the first 16 bytes (two little-endian
// uint64) of SHA-256("undercurrent/tag/v1" ‖ uint64 len(id) ‖ id ‖ each id as int32 LE).
func docSeed(id string, ids []int32) (uint64, uint64) {
	h := sha256.New()
	var b [8]byte
	h.Write([]byte("undercurrent/tag/v1"))
	binary.LittleEndian.PutUint64(b[:], uint64(len(id)))
	h.Write(b[:])
	h.Write([]byte(id))
	buf := make([]byte, 0, 4*min(len(ids), 1024))
	for i, w := range ids {
		buf = binary.LittleEndian.AppendUint32(buf, uint32(w))
		if len(buf) == cap(buf) || i == len(ids)-1 {
			h.Write(buf)
			buf = buf[:0]
		}
	}
	s := h.Sum(nil)
	return binary.LittleEndian.Uint64(s[:8]), binary.LittleEndian.Uint64(s[8:16])
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
