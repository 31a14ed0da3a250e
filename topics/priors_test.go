package topics

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestMinkaRecoversTruePriors: with the theme assignments set to the ones the corpus was
// drawn with, the fixed-point updates (Minka 2000; Wallach 2008 §2.3) must return the
// generating priors. Corpus (ours): K = 20, φ_k ~ Dirichlet(0.5) over V = 50 words,
// θ_d ~ Dirichlet(0.3), 3,000 documents of 50 tokens. Tolerances (ours): 10% for each α_k,
// 10% for β — sampling noise of the finite corpus, not the method, sets them (with only
// 5 topics the β estimate alone has about 7% standard deviation; we measured 0.585 there).
func TestMinkaRecoversTruePriors(t *testing.T) {
	const K, V = 20, 50
	rng := rand.New(rand.NewPCG(9, 9))
	phi := make([][]float64, K)
	b := make([]float64, V)
	for i := range b {
		b[i] = 0.5
	}
	for k := range phi {
		phi[k] = drawDirichlet(rng, b)
	}
	g := generate(10, phi, 3000, 50, 0.3)
	// Build the chain from the generated tokens in drawing order, with the true z.
	var words []int32
	docStart := []int{0}
	for _, d := range g.docs {
		words = append(words, d...)
		docStart = append(docStart, len(words))
	}
	start := make([]float64, K)
	for k := range start {
		start[k] = 1
	}
	c := newChain(K, V, words, docStart, start, 0.01, nil, nil, 1, 1, denseSampler)
	clear(c.nwk)
	clear(c.nk)
	i := 0
	for _, zs := range g.z {
		for _, k := range zs {
			c.z[i] = uint16(k)
			c.nwk[int(words[i])*K+k]++
			c.nk[k]++
			i++
		}
	}
	c.optimizePriors(true)
	for k, a := range c.alpha {
		if math.Abs(a-0.3)/0.3 > 0.1 {
			t.Errorf("α_%d = %.4f, generated with 0.3", k, a)
		}
	}
	if math.Abs(c.beta-0.5)/0.5 > 0.1 {
		t.Errorf("β = %.4f, generated with 0.5", c.beta)
	}
	t.Logf("α = %.4f, β = %.4f", c.alpha, c.beta)
}
