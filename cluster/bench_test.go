package cluster

import (
	"bufio"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"
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
	var t *Dendrogram
	var err error
	c0 := processCPU()
	b.ResetTimer()
	for b.Loop() {
		if t, err = LinkVectors(x, nil, m, nil); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	cpu := (processCPU() - c0).Seconds() / float64(b.N)
	b.ReportMetric(cpu, "cpu_s/op")
	b.ReportMetric(peakMB(), "peak_MB")
	jsonLine(b, m.String(), n, cpu)
	compareRef(b, t, m, n)
}

// jsonLine prints, when UNDERCURRENT_BENCH_JSON is set, one line in the
// format of testdata/bench_ref.py:
//
//	{"bench": "ward", "system": "undercurrent", "n": 20000, "seconds": ..., "cpu_seconds": ..., "peak_mb": ...}
//
// peak_mb is the process's peak resident memory so far (run one benchmark
// per process for a figure of its own).
func jsonLine(b *testing.B, bench string, n int, cpu float64) {
	if os.Getenv("UNDERCURRENT_BENCH_JSON") == "" {
		return
	}
	sec := b.Elapsed().Seconds() / float64(b.N)
	fmt.Printf("{\"bench\": %q, \"system\": \"undercurrent\", \"n\": %d, \"seconds\": %.3f, \"cpu_seconds\": %.3f, \"peak_mb\": %.1f}\n",
		bench, n, sec, cpu, peakMB())
}

// processCPU returns the user + system time of this process so far, less
// disturbed than wall time on a shared machine.
func processCPU() time.Duration {
	var r syscall.Rusage
	syscall.Getrusage(syscall.RUSAGE_SELF, &r)
	return time.Duration(r.Utime.Nano() + r.Stime.Nano())
}

// peakMB returns the peak resident memory of this process (VmHWM), which
// includes the test binary and the input rows.
func peakMB() float64 {
	b, err := os.ReadFile("/proc/self/status")
	if err != nil {
		return 0
	}
	for _, line := range strings.Split(string(b), "\n") {
		if f := strings.Fields(line); len(f) >= 2 && f[0] == "VmHWM:" {
			kb, _ := strconv.ParseFloat(f[1], 64)
			return kb / 1024
		}
	}
	return 0
}

// compareRef checks the merge pairs against the dumps of
// testdata/bench_ref.py --dump DIR when UNDERCURRENT_BENCH_REF=DIR is set
// (fastcluster's files, else scipy's), and reports the number of merges
// that differ.
func compareRef(b *testing.B, t *Dendrogram, m Linkage, n int) {
	dir := os.Getenv("UNDERCURRENT_BENCH_REF")
	if dir == "" {
		return
	}
	for _, sys := range []string{"fastcluster", "scipy"} {
		f, err := os.Open(filepath.Join(dir, fmt.Sprintf("%s-%v-%d.txt", sys, m, n)))
		if err != nil {
			continue
		}
		defer f.Close()
		sc := bufio.NewScanner(f)
		diff, k := 0, 0
		for sc.Scan() {
			var a, c int
			var h float64
			fmt.Sscan(sc.Text(), &a, &c, &h)
			if k >= len(t.Merges) || t.Merges[k].A != a || t.Merges[k].B != c {
				diff++
			}
			k++
		}
		b.ReportMetric(float64(diff), "merges_differing_from_"+sys)
		return
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

// BenchmarkSummary100k: 100,000 Dirichlet rows (d = 20) through 1000
// micro-clusters (seeded k-means++, Lloyd) and exact weighted Ward.
func BenchmarkSummary100k(b *testing.B) {
	x := dirichletRows(100000, 20, benchSeed)
	c0 := processCPU()
	b.ResetTimer()
	for b.Loop() {
		if _, err := Summarize(x, nil, &SummarySettings{Seed: 1}); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	cpu := (processCPU() - c0).Seconds() / float64(b.N)
	b.ReportMetric(cpu, "cpu_s/op")
	b.ReportMetric(peakMB(), "peak_MB")
	jsonLine(b, "summary", 100000, cpu)
}

// BenchmarkWardSmall etc.: quick sizes for regressions.
func BenchmarkWardSmall(b *testing.B)    { benchmarkLink(b, 2000, Ward) }
func BenchmarkAverageSmall(b *testing.B) { benchmarkLink(b, 2000, Average) }

// BenchmarkOptimalLeafOrder: optimal leaf ordering of Ward's tree on
// OptimalOrderLimit Dirichlet rows (d = 20), the largest DisplayOrder
// computes.
func BenchmarkOptimalLeafOrder(b *testing.B) {
	x := dirichletRows(OptimalOrderLimit, 20, benchSeed)
	t, err := LinkVectors(x, nil, Ward, nil)
	if err != nil {
		b.Fatal(err)
	}
	d := EuclideanCondensed(nil, x, nil)
	b.ResetTimer()
	for b.Loop() {
		t.OptimalLeafOrder(nil, d, nil)
	}
}
