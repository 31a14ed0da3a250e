package cluster

import "testing"

// These tests check the assembly kernels (kernel_amd64.s) against the
// portable code: the same bits and the same pruning decisions. With
// -tags purego, or without AVX2, both sides are the portable code.

// TestKernels: the AVX2 kernels agree with the portable code bit for bit
// (partial sums) and on every pruning decision.
func TestKernels(t *testing.T) {
	x := dirichletRows(700, 20, 5)
	var c []float64
	var w []float64
	for i, r := range x {
		c = append(c, r...)
		w = append(w, float64(1+i%7))
	}
	q := (*[8]float64)(x[3][:8])
	out1 := make([]float64, 700)
	out2 := make([]float64, 700)
	m1 := make([]uint64, 11)
	m2 := make([]uint64, 11)
	for _, lim := range []float64{0.001, 0.01, 0.05, 1} {
		ward8(q, c, 20, w, out1, m1, 2*3, lim, lim*3)
		ward8Go(q, c, 20, w, out2, m2, 2*3, lim, lim*3)
		for k := range out1 {
			if out1[k] != out2[k] {
				t.Fatalf("partial %d: %v vs %v", k, out1[k], out2[k])
			}
		}
		for k := range m1 {
			if m1[k] != m2[k] {
				t.Fatalf("lim %v mask %d: %x vs %x", lim, k, m1[k], m2[k])
			}
		}
	}
}

// TestSqdistKernel: sqdist (AVX2 from 8 coordinates up) equals sqdistGo
// bit for bit for every length and tail.
func TestSqdistKernel(t *testing.T) {
	x := dirichletRows(50, 37, 8)
	for n := 0; n <= 37; n++ {
		for i := 1; i < 50; i++ {
			a, b := x[0][:n], x[i][:n]
			if g, w := sqdist(a, b), sqdistGo(a, b); g != w {
				t.Fatalf("n=%d: %v vs %v", n, g, w)
			}
		}
	}
}

// TestNearest2: the pruned scan equals a full scan.
func TestNearest2(t *testing.T) {
	x := dirichletRows(300, 20, 4)
	var cent []float64
	for _, r := range x[:200] {
		cent = append(cent, r...)
	}
	cent = append(cent, x[5]...) // a tie with centre 5
	ones := make([]float64, 201)
	for i := range ones {
		ones[i] = 1
	}
	for _, xi := range x {
		b1, v1, v2 := nearest2(xi, cent, 201, 20, ones)
		c1, w1, w2 := -1, 1e300, 1e300
		for j := 0; j < 201; j++ {
			v := sumHead16(xi, cent[j*20:]) + sqdistGo(xi[16:], cent[j*20+16:j*20+20])
			if v < w1 {
				c1, w1, w2 = j, v, w1
			} else if v < w2 {
				w2 = v
			}
		}
		if b1 != c1 || v1 != w1 || v2 != w2 {
			t.Fatalf("pruned %d %v %v, full %d %v %v", b1, v1, v2, c1, w1, w2)
		}
	}
}

// TestKernel12: as TestKernels for the twelve-coordinate stage.
func TestKernel12(t *testing.T) {
	x := dirichletRows(700, 20, 6)
	var c, w []float64
	for i, r := range x {
		c = append(c, r...)
		w = append(w, float64(1+i%7))
	}
	q := (*[12]float64)(x[3][:12])
	out1, out2 := make([]float64, 700), make([]float64, 700)
	m1, m2 := make([]uint64, 11), make([]uint64, 11)
	for _, lim := range []float64{0.001, 0.01, 0.05, 1} {
		ward12(q, c, 20, w, out1, m1, 6, lim, lim*3)
		ward12Go(q, c, 20, w, out2, m2, 6, lim, lim*3)
		for k := range out1 {
			if out1[k] != out2[k] {
				t.Fatalf("partial %d: %v vs %v", k, out1[k], out2[k])
			}
		}
		for k := range m1 {
			if m1[k] != m2[k] {
				t.Fatalf("lim %v mask %d: %x vs %x", lim, k, m1[k], m2[k])
			}
		}
	}
}

// TestKernel16: as TestKernels for the sixteen-coordinate stage.
func TestKernel16(t *testing.T) {
	x := dirichletRows(700, 20, 6)
	var c, w []float64
	for i, r := range x {
		c = append(c, r...)
		w = append(w, float64(1+i%7))
	}
	q := (*[16]float64)(x[3][:16])
	for _, n := range []int{1, 2, 3, 4, 5, 63, 64, 65, 67, 697, 698, 699, 700} {
		out1, out2 := make([]float64, n), make([]float64, n)
		m1, m2 := make([]uint64, 11), make([]uint64, 11)
		for _, lim := range []float64{0.001, 0.01, 0.05, 1} {
			ward16(q, c, 20, w, out1, m1, 6, lim, lim*3)
			ward16Go(q, c, 20, w, out2, m2, 6, lim, lim*3)
			for k := range out1 {
				if out1[k] != out2[k] {
					t.Fatalf("n=%d partial %d: %v vs %v", n, k, out1[k], out2[k])
				}
			}
			for k := 0; k < (n+63)/64; k++ {
				if m1[k] != m2[k] {
					t.Fatalf("n=%d lim %v mask %d: %x vs %x", n, lim, k, m1[k], m2[k])
				}
			}
		}
	}
}

// TestRowDist: the batched Euclidean kernel equals euclid bit for bit.
func TestRowDist(t *testing.T) {
	for _, d := range []int{3, 8, 9, 20, 23} {
		x := dirichletRows(40, d, uint64(d))
		var c []float64
		for _, r := range x {
			c = append(c, r...)
		}
		out := make([]float64, 40)
		rowDist(x[5], c, out)
		for k := range out {
			if w := euclid(x[5], x[k]); out[k] != w {
				t.Fatalf("d=%d row %d: %v vs %v", d, k, out[k], w)
			}
		}
	}
}
