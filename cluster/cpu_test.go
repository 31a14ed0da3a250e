package cluster

import (
	"fmt"
	"os"
	"syscall"
	"testing"
	"time"
)

func cpuTime() time.Duration {
	var r syscall.Rusage
	syscall.Getrusage(syscall.RUSAGE_SELF, &r)
	return time.Duration(r.Utime.Nano() + r.Stime.Nano())
}

func TestCPUWard(t *testing.T) {
	if os.Getenv("UC_CPU") == "" {
		t.Skip()
	}
	x := dirichletRows(5000, 20, benchSeed)
	defer func(v int) { headSplit = v }(headSplit)
	best := map[int]time.Duration{20: time.Hour, 99: time.Hour}
	for r := 0; r < 3; r++ {
		for _, hs := range []int{20, 99} {
			headSplit = hs
			c0 := cpuTime()
			LinkVectors(x, nil, Ward, &Settings{Workers: 1})
			best[hs] = min(best[hs], cpuTime()-c0)
		}
	}
	fmt.Println("cpu head16", best[20], "head12", best[99])
}

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

func TestCPUAverage(t *testing.T) {
	if os.Getenv("UC_CPU") == "" {
		t.Skip()
	}
	x := dirichletRows(10000, 20, benchSeed)
	defer func(v bool) { hugeHint = v }(hugeHint)
	for _, h := range []bool{true} {
		hugeHint = h
		c0 := cpuTime()
		w0 := time.Now()
		LinkVectors(x, nil, Average, &Settings{Workers: 1})
		fmt.Println("huge", h, "cpu", cpuTime()-c0, "wall", time.Since(w0))
	}
}

func TestCPUSummary(t *testing.T) {
	if os.Getenv("UC_CPU") == "" {
		t.Skip()
	}
	x := dirichletRows(20000, 20, benchSeed)
	flat, w, d, _ := flatten(x, nil)
	c0 := cpuTime()
	cent := seedPlusPlus(flat, w, len(x), d, 1000, 1, 1)
	fmt.Println("seed cpu", cpuTime()-c0)
	c0 = cpuTime()
	assign := make([]int, len(x))
	lloyd(flat, w, len(x), d, 1000, cent, assign, 10, 1)
	fmt.Println("lloyd cpu", cpuTime()-c0)
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
			v := sumHead8(xi, cent[j*20:]) + sqdistGo(xi[8:], cent[j*20+8:j*20+20])
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

func TestKernel16(t *testing.T) {
	x := dirichletRows(700, 20, 6)
	var c, w []float64
	for i, r := range x {
		c = append(c, r...)
		w = append(w, float64(1+i%7))
	}
	q := (*[16]float64)(x[3][:16])
	out1, out2 := make([]float64, 700), make([]float64, 700)
	m1, m2 := make([]uint64, 11), make([]uint64, 11)
	for _, lim := range []float64{0.001, 0.01, 0.05, 1} {
		ward16(q, c, 20, w, out1, m1, 6, lim, lim*3)
		ward16Go(q, c, 20, w, out2, m2, 6, lim, lim*3)
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
