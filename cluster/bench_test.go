package cluster

import (
	"fmt"
	"slices"
	"testing"
)

// splitmix64 is a tiny generator that testdata/bench_ref.py reproduces
// exactly, so that both sides cluster the same numbers.
type splitmix64 uint64

func (s *splitmix64) next() uint64 {
	*s += 0x9e3779b97f4a7c15
	z := uint64(*s)
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

// dirichletRows returns n rows drawn from the flat Dirichlet distribution
// on d components (spacings of d-1 sorted uniforms; exact in both Go and
// numpy, no logarithms), seeded by seed.
func dirichletRows(n, d int, seed uint64) [][]float64 {
	s := splitmix64(seed)
	x := make([][]float64, n)
	u := make([]float64, d+1)
	for i := range x {
		u[0], u[d] = 0, 1
		for k := 1; k < d; k++ {
			u[k] = float64(s.next()>>11) * 0x1p-53
		}
		slices.Sort(u[1:d])
		row := make([]float64, d)
		for k := range row {
			row[k] = u[k+1] - u[k]
		}
		x[i] = row
	}
	return x
}

const benchSeed = 20260101

var benchSizes = []int{5000, 10000, 20000}

func benchmarkLink(b *testing.B, n int, m Linkage) {
	x := dirichletRows(n, 20, benchSeed)
	b.ResetTimer()
	for b.Loop() {
		if _, err := LinkVectors(x, nil, m, nil); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkWardVectors: Ward on Dirichlet vectors (d = 20), O(n·d) memory.
// Compare with testdata/bench_ref.py (scipy linkage, fastcluster
// linkage_vector) on the same rows.
func BenchmarkWardVectors(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprint(n), func(b *testing.B) { benchmarkLink(b, n, Ward) })
	}
}

// BenchmarkAverage: average linkage on the same rows (condensed Euclidean
// matrix, n(n-1)/2 values, then the NN chain).
func BenchmarkAverage(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprint(n), func(b *testing.B) { benchmarkLink(b, n, Average) })
	}
}
