package topics

import (
	"math"
	"math/rand/v2"

	"undercurrent/text/sparse"
)

// drawDirichlet draws from a symmetric or asymmetric Dirichlet by normalised gamma draws.
func drawDirichlet(rng *rand.Rand, alpha []float64) []float64 {
	x := make([]float64, len(alpha))
	s := 0.0
	for i, a := range alpha {
		x[i] = drawGamma(rng, a)
		s += x[i]
	}
	for i := range x {
		x[i] /= s
	}
	return x
}

// drawGamma draws Gamma(a, 1) by Marsaglia & Tsang (2000), with the a < 1 boost.
func drawGamma(rng *rand.Rand, a float64) float64 {
	if a < 1 {
		return drawGamma(rng, a+1) * math.Pow(rng.Float64(), 1/a)
	}
	d := a - 1.0/3
	c := 1 / math.Sqrt(9*d)
	for {
		x := rng.NormFloat64()
		v := 1 + c*x
		if v <= 0 {
			continue
		}
		v = v * v * v
		u := rng.Float64()
		if math.Log(u) < 0.5*x*x+d-d*v+d*math.Log(v) {
			return d * v
		}
	}
}

func drawCategorical(rng *rand.Rand, p []float64) int {
	u := rng.Float64()
	for i, x := range p {
		u -= x
		if u < 0 {
			return i
		}
	}
	return len(p) - 1
}

// generated is a corpus drawn from a known LDA model.
type generated struct {
	phi   [][]float64
	theta [][]float64
	docs  [][]int32
	label []int // dominant true theme by θ
	z     [][]int
}

func generate(seed uint64, phi [][]float64, D, N int, alpha float64) generated {
	rng := rand.New(rand.NewPCG(seed, 1))
	K := len(phi)
	al := make([]float64, K)
	for i := range al {
		al[i] = alpha
	}
	g := generated{phi: phi}
	for d := 0; d < D; d++ {
		th := drawDirichlet(rng, al)
		doc := make([]int32, N)
		zs := make([]int, N)
		for i := range doc {
			k := drawCategorical(rng, th)
			zs[i] = k
			doc[i] = int32(drawCategorical(rng, phi[k]))
		}
		g.z = append(g.z, zs)
		g.theta = append(g.theta, th)
		g.docs = append(g.docs, doc)
		g.label = append(g.label, argmax(th))
	}
	return g
}

func countMatrix(docs [][]int32, V int) *sparse.Matrix {
	b := sparse.NewBuilder(V)
	for _, d := range docs {
		b.AddCounts(d)
	}
	return b.Matrix()
}

// bars returns the 10 "bars" topics of Griffiths & Steyvers (2004): on a 5×5 grid of 25
// words, 5 horizontal and 5 vertical bars, each uniform over its 5 words.
func bars() [][]float64 {
	var out [][]float64
	for r := 0; r < 5; r++ {
		p := make([]float64, 25)
		for c := 0; c < 5; c++ {
			p[r*5+c] = 0.2
		}
		out = append(out, p)
	}
	for c := 0; c < 5; c++ {
		p := make([]float64, 25)
		for r := 0; r < 5; r++ {
			p[r*5+c] = 0.2
		}
		out = append(out, p)
	}
	return out
}

func rows(m *Model) [][]float64 {
	out := make([][]float64, m.K())
	for k := range out {
		out[k] = m.TopicTerms(k)
	}
	return out
}
