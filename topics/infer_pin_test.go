package topics

import (
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// pinModel builds a model by hand, independent of Fit: K themes over V words, each φ row a
// normalised Gamma(0.1) draw (sparse like fitted themes), an asymmetric α.
func pinModel(k, v int) *Model {
	rng := rand.New(rand.NewPCG(7, 8))
	m := &Model{k: k, v: v, alpha: make([]float64, k), phi: make([]float64, k*v)}
	for t := range k {
		m.alpha[t] = 0.02 + 0.2*rng.Float64()
		row := drawDirichlet(rng, constSlice(v, 0.1))
		copy(m.phi[t*v:], row)
	}
	return m
}

func constSlice(n int, x float64) []float64 {
	s := make([]float64, n)
	for i := range s {
		s[i] = x
	}
	return s
}

// TestInferPinned pins the fold-in results bit for bit: the SHA-256 of the θ of 300
// narratives (lengths 0 to 119 tokens, K = 14 and K = 3) was computed with the plain
// sampler before the fold-in was sped up (value from this test's first run, commit
// 1469ef9). Any change to the sampler that alters a single draw changes tags, and the
// tagging contract (issue 5 item 5) says tags do not change between versions of the code
// that keep the model file's format.
func TestInferPinned(t *testing.T) {
	for _, tc := range []struct {
		k, v int
		want string
	}{
		{14, 400, pinK14},
		{3, 50, pinK3},
	} {
		m := pinModel(tc.k, tc.v)
		tg := NewTagger(m, InferSettings{})
		rng := rand.New(rand.NewPCG(9, uint64(tc.k)))
		h := sha256.New()
		var b [8]byte
		var docs []Doc
		var alone []float64
		for i := range 300 {
			ids := make([]int32, i%120)
			for j := range ids {
				ids[j] = int32(rng.IntN(tc.v))
			}
			d := Doc{ID: fmt.Sprintf("pin-%d", i), IDs: ids}
			docs = append(docs, d)
			th := tg.Infer(d.ID, d.IDs)
			alone = append(alone, th...)
			for _, x := range th {
				binary.LittleEndian.PutUint64(b[:], math.Float64bits(x))
				h.Write(b[:])
			}
		}
		if got := hex.EncodeToString(h.Sum(nil)); got != tc.want {
			t.Errorf("K = %d: θ hash %s, want %s", tc.k, got, tc.want)
		}
		// InferBatchTo gives each narrative's θ bit for bit, whatever the batch size.
		for _, size := range []int{1, 7, 300} {
			got := make([]float64, len(alone))
			for lo := 0; lo < len(docs); lo += size {
				hi := min(lo+size, len(docs))
				tg.InferBatchTo(got[lo*tc.k:hi*tc.k], docs[lo:hi])
			}
			for i := range got {
				if math.Float64bits(got[i]) != math.Float64bits(alone[i]) {
					t.Fatalf("K = %d, batches of %d: θ of %s differs from InferTo's", tc.k, size, docs[i/tc.k].ID)
				}
			}
		}
	}
}

const (
	pinK14 = "e93f6dadfd60edca51f0e30a8dbc2f54475669d5d843e52131d2a4c1fcc58b8a"
	pinK3  = "b076d35b7b1c0aa0e1c0b348a10674b07de10152844f4ba40dd9147bd8daae8d"
)
